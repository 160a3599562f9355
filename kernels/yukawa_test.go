package kernels

import (
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/diff/fd"

	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

// fivePoint is the fourth-order central difference for a first derivative
// (Abramowitz & Stegun 25.3.6): f' = [f(-2h) - 8 f(-h) + 8 f(h) - f(2h)]/(12 h).
var fivePoint = fd.Formula{
	Stencil: []fd.Point{
		{Loc: -2, Coeff: 1.0 / 12}, {Loc: -1, Coeff: -8.0 / 12},
		{Loc: 1, Coeff: 8.0 / 12}, {Loc: 2, Coeff: -1.0 / 12},
	},
	Derivative: 1,
	Step:       1e-3,
}

// ykwPotentialSlope returns -dphi/dr at r from the kernel's potential alone,
// by gonum's finite differences with a step h of 1e-3 of the shorter of r
// and the potential's own length scale. Its relative error is about
// (h/scale)^4 = 1e-12 from truncation plus 1e-16 scale/h = 1e-13 from
// rounding (common practice), so 1e-9 is a safe bound.
func ykwPotentialSlope(c Central, mu, r, scale float64) float64 {
	phi := func(rr float64) float64 { _, p := c.Radial(mu, rr); return p }
	return -fd.Derivative(phi, r, &fd.Settings{Formula: fivePoint, Step: 1e-3 * math.Min(r, scale)})
}

func ykwNew(t *testing.T, name string, num map[string]float64, str map[string]string) Central {
	t.Helper()
	k, err := New(name, Values{Num: num, Str: str})
	if err != nil {
		t.Fatalf("New(%s): %v", name, err)
	}
	c, ok := k.(Central)
	if !ok {
		t.Fatalf("%s does not implement Central", name)
	}
	return c
}

func ykwRelErr(got, want float64) float64 { return math.Abs(got/want - 1) }

// The stack newton + yukawa against the published law (PHYSICS.md, kernel
// 2): Newton far outside the range, (1 + alpha) Newton well inside.
func TestYukawaLimits(t *testing.T) {
	const mu, lambda = units.GMSun, 1e12
	for _, alpha := range []float64{0.3, -0.2, 2e-9} {
		y := ykwNew(t, "yukawa", map[string]float64{"alpha": alpha, "lambda": lambda}, nil)
		st := MustStack(Newton{}, y)

		// r = 60 lambda: alpha (1 + u) e^-u = 61 e^-60 alpha < 1e-24, below
		// float64 resolution: the stack must give Newton's force exactly.
		r := 60 * lambda
		x := vec.V{0.28 * r, -0.96 * r, 0}
		a := st.Accel(mu, x, vec.V{})
		if n := MustStack(Newton{}).Accel(mu, x, vec.V{}); a != n {
			t.Errorf("alpha %g, r = 60 lambda: force %v, want Newton's %v", alpha, a, n)
		}

		// r = 1e-6 lambda: the force is (1 + alpha) mu/r^2 times
		// (1 + alpha (1+u) e^-u)/(1 + alpha) = 1 - alpha u^2/(2(1+alpha)) + O(u^3)
		// (Taylor series of (1+u) e^-u); the potential bracket is
		// 1 + alpha - alpha u + O(u^2).
		u := 1e-6
		r = u * lambda
		ar, phi := y.Radial(mu, r)
		force := (-mu/(r*r) + ar) / (-mu / (r * r))
		wantF := 1 + alpha - alpha*u*u/2
		if e := ykwRelErr(force, wantF); e > 1e-14 {
			t.Errorf("alpha %g, r = 1e-6 lambda: force/Newton = %.17g, want %.17g (rel err %.2g)", alpha, force, wantF, e)
		}
		pot := (-mu/r + phi) / (-mu / r)
		wantP := 1 + alpha - alpha*u
		if e := ykwRelErr(pot, wantP); e > 1e-12 {
			t.Errorf("alpha %g, r = 1e-6 lambda: Phi/Newton = %.17g, want %.17g (rel err %.2g)", alpha, pot, wantP, e)
		}
	}
}

// The formulas of PHYSICS.md kernel 2 at a point where neither limit holds,
// and a_r = -dPhi/dr by finite differences.
func TestYukawaFormulaAndSlope(t *testing.T) {
	const mu, lambda, alpha = 3.986004418e14, 7e6, 0.45 // mu: Earth's GM (IERS 2010), any value serves
	y := ykwNew(t, "yukawa", map[string]float64{"alpha": alpha, "lambda": lambda}, nil)
	for _, u := range []float64{0.01, 0.3, 1, 4.5, 20} {
		r := u * lambda
		ar, phi := y.Radial(mu, r)
		wantPhi := -mu / r * alpha * math.Exp(-u)
		wantAr := -mu / (r * r) * alpha * (1 + u) * math.Exp(-u)
		if e := ykwRelErr(phi, wantPhi); e > 4e-16 {
			t.Errorf("u = %g: phi = %g, want %g (rel %.2g)", u, phi, wantPhi, e)
		}
		if e := ykwRelErr(ar, wantAr); e > 4e-16 {
			t.Errorf("u = %g: a_r = %g, want %g (rel %.2g)", u, ar, wantAr, e)
		}
		if e := ykwRelErr(ar, ykwPotentialSlope(y, mu, r, lambda)); e > 1e-9 {
			t.Errorf("u = %g: a_r = %g differs from -dphi/dr by %.2g", u, ar, e)
		}
		// Accel is a_r along x/r, Energy is phi
		x := vec.V{0.6 * r, -0.8 * r, 0}
		acc := y.Accel(mu, x, vec.V{1, 2, 3})
		for i := range 3 {
			want := ar * x[i] / r
			if math.Abs(acc[i]-want) > 1e-15*math.Abs(ar) {
				t.Errorf("u = %g: Accel[%d] = %g, want %g", u, i, acc[i], want)
			}
		}
		if e := y.Energy(mu, x, vec.V{}); math.Abs(e-phi) > 1e-15*math.Abs(phi) {
			t.Errorf("u = %g: Energy = %g, want phi = %g", u, e, phi)
		}
	}
}

// The range from the mediator mass: PHYSICS.md gives 1e-23 eV -> 1.973e16 m,
// and hbar c = 197.3269804 MeV fm (CODATA 2018) gives 1.973269804e16 m.
func TestYukawaRangeFromMass(t *testing.T) {
	y := ykwNew(t, "yukawa", map[string]float64{"alpha": 1, "mediator_mass": 1e-23}, nil).(*Yukawa)
	// 4 significant figures: half a unit in the last is 2.5e-4 relative
	if e := ykwRelErr(y.Lambda(), 1.973e16); e > 2.6e-4 {
		t.Errorf("lambda(1e-23 eV) = %g m, want 1.973e16 m (PHYSICS.md)", y.Lambda())
	}
	if e := ykwRelErr(y.Lambda(), 1.973269804e16); e > 1e-15 {
		t.Errorf("lambda(1e-23 eV) = %.10g m, want 1.973269804e16 m (CODATA 2018 hbar c)", y.Lambda())
	}
	// the same kernel as one given the range directly
	z := ykwNew(t, "yukawa", map[string]float64{"alpha": 1, "lambda": 1.973269804e16}, nil)
	for _, r := range []float64{1e15, 2e16, 9e16} {
		a1, p1 := y.Radial(1e20, r)
		a2, p2 := z.Radial(1e20, r)
		if ykwRelErr(a1, a2) > 1e-14 || ykwRelErr(p1, p2) > 1e-14 {
			t.Errorf("r = %g: mass route (%g, %g) differs from range route (%g, %g)", r, a1, p1, a2, p2)
		}
	}
	// Values keeps what was given and rebuilds the same kernel
	v := y.Values()
	if _, ok := v.Num["lambda"]; ok || v.Num["mediator_mass"] != 1e-23 || v.Str["exchange"] != "scalar" {
		t.Errorf("Values = %+v, want mediator_mass 1e-23 and exchange scalar only", v)
	}
	again, err := New("yukawa", v)
	if err != nil {
		t.Fatal(err)
	}
	if again.(*Yukawa).Lambda() != y.Lambda() {
		t.Errorf("rebuilt lambda %g != %g", again.(*Yukawa).Lambda(), y.Lambda())
	}
}

func TestYukawaExchangeRecorded(t *testing.T) {
	s := ykwNew(t, "yukawa", map[string]float64{"alpha": 0.1, "lambda": 5}, nil).(*Yukawa)
	g := ykwNew(t, "yukawa", map[string]float64{"alpha": 0.1, "lambda": 5}, map[string]string{"exchange": "tensor"}).(*Yukawa)
	if s.Exchange() != "scalar" || g.Exchange() != "tensor" {
		t.Errorf("exchange = %q, %q; want scalar (default), tensor", s.Exchange(), g.Exchange())
	}
	a1, p1 := s.Radial(2, 3)
	a2, p2 := g.Radial(2, 3)
	if a1 != a2 || p1 != p2 {
		t.Errorf("exchange changed the orbit force: (%g, %g) vs (%g, %g)", a1, p1, a2, p2)
	}
	if info := s.Info(); info.Role != Correction || !strings.Contains(info.Mu, "large distance") {
		t.Errorf("Info: role %v, Mu %q; want a correction with mu at large distance (PHYSICS.md, Which mu)", info.Role, info.Mu)
	}
}

func TestYukawaValidation(t *testing.T) {
	inf := math.Inf(1)
	cases := []struct {
		num  map[string]float64
		str  map[string]string
		want string
	}{
		{map[string]float64{"lambda": 1}, nil, "alpha is required"},
		{map[string]float64{"alpha": 1}, nil, "give lambda"},
		{map[string]float64{"alpha": 1, "lambda": 1, "mediator_mass": 1e-20}, nil, "not both"},
		{map[string]float64{"alpha": 1, "lambda": 0}, nil, "out of range"},
		{map[string]float64{"alpha": 1, "lambda": -3}, nil, "out of range"},
		{map[string]float64{"alpha": 1, "mediator_mass": 0}, nil, "out of range"},
		{map[string]float64{"alpha": inf, "lambda": 1}, nil, "not finite"},
		{map[string]float64{"alpha": math.NaN(), "lambda": 1}, nil, "not a number"},
		{map[string]float64{"alpha": 1, "lambda": inf}, nil, "not finite"},
		{map[string]float64{"alpha": 1, "lambda": 1}, map[string]string{"exchange": "vector"}, "not allowed"},
		{map[string]float64{"alpha": 1, "range": 1}, nil, "unknown parameter"},
		// the smallest subnormal mass gives a range beyond float64
		{map[string]float64{"alpha": 1, "mediator_mass": 5e-324}, nil, "outside the float64 range"},
	}
	for _, c := range cases {
		_, err := New("yukawa", Values{Num: c.num, Str: c.str})
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("New(yukawa, %v %v): error %v, want one containing %q", c.num, c.str, err, c.want)
		}
	}
}

func BenchmarkYukawaRadial(b *testing.B) {
	k, err := New("yukawa", Values{Num: map[string]float64{"alpha": 1e-9, "lambda": 1e13}})
	if err != nil {
		b.Fatal(err)
	}
	y := k.(Central)
	r, sum := 5.79e10, 0.0
	for b.Loop() {
		ar, _ := y.Radial(units.GMSun, r)
		sum += ar
	}
	_ = sum
}
