package kernels

import (
	"math"
	"strings"
	"testing"

	"mgorbit/scenarios/units"
)

// The vDVZ factor: with the massless coupling, linear massive spin-2
// exchange gives a static force 4/3 of Newton's at r << lambda (van Dam &
// Veltman 1970; Zakharov 1970; PHYSICS.md kernel 2), and none at r >> lambda.
func TestMassiveGravitonCouplingLimits(t *testing.T) {
	const mu, lambda = units.GMSun, 1.973269804e16 // lambda of 1e-23 eV
	g := ykwNew(t, "massive-graviton", map[string]float64{"lambda": lambda}, nil)
	if f := g.(*MassiveGraviton).Factor(); f != 4.0/3 {
		t.Fatalf("default normalisation factor %g, want 4/3 (coupling)", f)
	}
	total := func(r float64) (force, pot float64) {
		ar, phi := g.Radial(mu, r)
		return (-mu/(r*r) + ar) / (-mu / (r * r)), (-mu/r + phi) / (-mu / r)
	}
	// r = 1e-6 lambda: (4/3)(1 + u) e^-u = (4/3)(1 - u^2/2 + u^3/3 ...),
	// (4/3) e^-u = (4/3)(1 - u + u^2/2 ...) (Taylor series)
	u := 1e-6
	force, pot := total(u * lambda)
	if e := ykwRelErr(force, 4.0/3*(1-u*u/2)); e > 1e-15 {
		t.Errorf("r = 1e-6 lambda: force/Newton = %.17g, want 4/3 (rel err %.2g)", force, e)
	}
	if e := ykwRelErr(pot, 4.0/3*(1-u+u*u/2)); e > 1e-15 {
		t.Errorf("r = 1e-6 lambda: Phi/Newton = %.17g, want 4/3 (1 - u) (rel err %.2g)", pot, e)
	}
	// r = 40 lambda: the whole law is (4/3) 41 e^-40 = 2.3e-16 of Newton,
	// and newton + correction cancels to within rounding of the Newtonian
	// term (1.1e-16 per operation): at most 4.4e-16 is left.
	u = 40
	force, pot = total(u * lambda)
	if math.Abs(force) > 4.4e-16 || math.Abs(pot) > 4.4e-16 {
		t.Errorf("r = 40 lambda: force/Newton = %.3g, Phi/Newton = %.3g, want below 4.4e-16 (no force at r >> lambda)", force, pot)
	}
	if info := g.Info(); !strings.Contains(info.Mu, "massless") || !strings.Contains(info.Mu, "no Newtonian limit") ||
		!strings.Contains(info.Summary, "minus Newton") {
		t.Errorf("Info must say mu is the massless coupling and the law has no Newtonian limit: %+v", info)
	}
}

// Static normalisation: the force equals Newton's at r << lambda, so the
// correction vanishes as -(u^2/2 - u^3/3 + u^4/8) of Newton (Taylor series
// of (1 + u) e^-u - 1) and the potential's as -(u - u^2/2 + u^3/6). At
// u = 1e-8 the force correction is 5e-17 of Newton: computing 1 - (1+u)e^-u
// directly would leave only rounding noise, so this checks the expm1 form.
func TestMassiveGravitonStaticLimit(t *testing.T) {
	const mu, lambda = 1.0, 1.0
	g := ykwNew(t, "massive-graviton", map[string]float64{"lambda": lambda},
		map[string]string{"normalisation": "static"})
	for _, u := range []float64{1e-8, 1e-5, 1e-3} {
		ar, phi := g.Radial(mu, u)
		fc := ar / (-mu / (u * u))
		wantF := -(u*u/2 - u*u*u/3 + u*u*u*u/8)
		pc := phi / (-mu / u)
		wantP := -(u - u*u/2 + u*u*u/6)
		// the first omitted terms are u^3/15 and u^3/24 of the series' sums
		if e := ykwRelErr(fc, wantF); e > 1e-13+u*u*u {
			t.Errorf("u = %g: force correction/Newton = %.17g, want %.17g (rel err %.2g)", u, fc, wantF, e)
		}
		if e := ykwRelErr(pc, wantP); e > 1e-13+u*u*u {
			t.Errorf("u = %g: potential correction/Newton = %.17g, want %.17g (rel err %.2g)", u, pc, wantP, e)
		}
	}
	// Coupling normalisation where (4/3) e^-u = 1, u0 = ln(4/3): at
	// u0 + delta the bracket (4/3) e^-u - 1 is e^-delta - 1 = -delta + delta^2/2.
	c := ykwNew(t, "massive-graviton", map[string]float64{"lambda": lambda}, nil)
	delta := 1e-9
	u := math.Log(4.0/3) + delta
	_, phi := c.Radial(mu, u)
	// u carries a rounding of ~3e-17 absolute, 3e-8 of delta
	if e := ykwRelErr(phi/(-mu/u), -delta+delta*delta/2); e > 1e-7 {
		t.Errorf("u = ln(4/3) + 1e-9: bracket = %.17g, want %.17g (rel err %.2g)", phi/(-mu/u), -delta, e)
	}
}

// The formulas of PHYSICS.md kernel 2 at intermediate u, a_r = -dPhi/dr by
// finite differences, and the graviton-mass route to lambda.
func TestMassiveGravitonFormulaAndSlope(t *testing.T) {
	const mu = units.GMSun
	for _, norm := range []string{"coupling", "static"} {
		k := 4.0 / 3
		if norm == "static" {
			k = 1
		}
		g := ykwNew(t, "massive-graviton", map[string]float64{"graviton_mass": 1e-23},
			map[string]string{"normalisation": norm})
		lambda := g.(*MassiveGraviton).Lambda()
		if e := ykwRelErr(lambda, 1.973269804e16); e > 1e-15 {
			t.Errorf("lambda(1e-23 eV) = %.10g, want 1.973269804e16 m (CODATA 2018 hbar c)", lambda)
		}
		for _, u := range []float64{0.05, 0.7, 3, 15} {
			r := u * lambda
			ar, phi := g.Radial(mu, r)
			// the direct brackets below round to about 4e-16 of their
			// larger term, which bounds the comparison (common practice)
			bp, ba := k*math.Exp(-u)-1, k*(1+u)*math.Exp(-u)-1
			wantPhi := -mu / r * bp
			wantAr := -mu / (r * r) * ba
			if e := ykwRelErr(phi, wantPhi); e > 4e-16*math.Max(1, k*math.Exp(-u))/math.Abs(bp) {
				t.Errorf("%s u = %g: phi = %g, want %g (rel %.2g)", norm, u, phi, wantPhi, e)
			}
			if e := ykwRelErr(ar, wantAr); e > 4e-16*math.Max(1, k*(1+u)*math.Exp(-u))/math.Abs(ba) {
				t.Errorf("%s u = %g: a_r = %g, want %g (rel %.2g)", norm, u, ar, wantAr, e)
			}
			if e := ykwRelErr(ar, ykwPotentialSlope(g, mu, r, lambda)); e > 1e-9 {
				t.Errorf("%s u = %g: a_r differs from -dphi/dr by %.2g", norm, u, e)
			}
		}
	}
}

func TestMassiveGravitonValidation(t *testing.T) {
	cases := []struct {
		num  map[string]float64
		str  map[string]string
		want string
	}{
		{nil, nil, "give lambda"},
		{map[string]float64{"lambda": 1, "graviton_mass": 1e-23}, nil, "not both"},
		{map[string]float64{"graviton_mass": -1}, nil, "out of range"},
		{map[string]float64{"lambda": 1}, map[string]string{"normalisation": "newton"}, "not allowed"},
		{map[string]float64{"lambda": 1, "alpha": 1}, nil, "unknown parameter"},
	}
	for _, c := range cases {
		_, err := New("massive-graviton", Values{Num: c.num, Str: c.str})
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("New(massive-graviton, %v %v): error %v, want one containing %q", c.num, c.str, err, c.want)
		}
	}
}

func BenchmarkMassiveGravitonRadial(b *testing.B) {
	k, err := New("massive-graviton", Values{Num: map[string]float64{"graviton_mass": 1e-23}})
	if err != nil {
		b.Fatal(err)
	}
	g := k.(Central)
	r, sum := 5.79e10, 0.0
	for b.Loop() {
		ar, _ := g.Radial(units.GMSun, r)
		sum += ar
	}
	_ = sum
}
