package integrator

import (
	"math"
	"math/rand/v2"
	"testing"

	"mgorbit/kernels"
	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

const invC2 = 1 / (units.C * units.C)

// relative1PN is the 1PN part of the relative acceleration of two bodies
// (M = m1 + m2, nu = m1 m2/M^2, harmonic gauge), PHYSICS.md:
//
//	a = -(G M/r^2) {[1 + ((1 + 3 nu) v^2 - (3/2) nu rdot^2 - 2 (2 + nu) G M/r)/c^2] n - 2 (2 - nu) rdot v/c^2}
//
// (memory there, integrated there against the Damour-Deruelle rate).
func relative1PN(m, nu float64, x, v vec.V) vec.V {
	r := x.Norm()
	n := x.Scale(1 / r)
	rdot := n.Dot(v)
	v2 := v.Dot(v)
	k := -m / (r * r) * invC2
	radial := (1+3*nu)*v2 - 1.5*nu*rdot*rdot - 2*(2+nu)*m/r
	return n.Scale(k*radial).AddScaled(-k*2*(2-nu)*rdot, v)
}

// comState places two bodies at relative state (x, v) in the Newtonian
// centre-of-mass frame.
func comState(m1, m2 float64, x, v vec.V) (xs, vs []vec.V) {
	m := m1 + m2
	return []vec.V{x.Scale(m2 / m), x.Scale(-m1 / m)}, []vec.V{v.Scale(m2 / m), v.Scale(-m1 / m)}
}

func newtonAccel(gm []float64, x []vec.V) []vec.V {
	a := make([]vec.V, len(x))
	for i := range x {
		for j := range x {
			if j != i && gm[j] != 0 {
				d := x[i].Sub(x[j])
				r := d.Norm()
				a[i] = a[i].AddScaled(-gm[j]/(r*r*r), d)
			}
		}
	}
	return a
}

// randomRelative returns a bound-ish relative state with G M/(c^2 r) = eps.
func randomRelative(rng *rand.Rand, m, eps float64) (vec.V, vec.V) {
	r := m * invC2 / eps
	dir := vec.V{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Unit()
	vdir := vec.V{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Unit()
	speed := math.Sqrt(m/r) * (0.3 + 1.0*rng.Float64())
	return dir.Scale(r), vdir.Scale(speed)
}

// Two bodies under EIH, in the centre-of-mass frame: a_1 - a_2 is the
// relative-motion equation with the symmetric mass ratio, term by term (the
// frame's O(eps v) motion against the 1PN centre of mass leaves nothing in
// the relative acceleration at this order: measured, the parts agree to the
// rounding of the subtracted Newtonian term, 1e-16/eps of the 1PN part).
func TestEIHTwoBodyIsRelativeMotion(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	const eps = 1e-3
	const tol = 1e-10 // 1e-16/eps rounding, with room
	worst := 0.0
	for _, q := range []float64{1, 0.6, 0.2, 0.05} { // mass ratio m2/m1
		m1 := 1.4 * units.GMSun
		m2 := q * m1
		m := m1 + m2
		nu := m1 * m2 / (m * m)
		for k := 0; k < 20; k++ {
			x, v := randomRelative(rng, m, eps)
			xs, vs := comState(m1, m2, x, v)
			gm := []float64{m1, m2}
			a := make([]vec.V, 2)
			kernels.EIH{}.NBodyAccel(gm, xs, vs, a)
			an := newtonAccel(gm, xs)
			got := a[0].Sub(an[0]).Sub(a[1].Sub(an[1]))
			want := relative1PN(m, nu, x, v)
			e := got.Sub(want).Norm() / want.Norm()
			worst = math.Max(worst, e)
			if e > tol {
				t.Errorf("q = %g, state %d: 1PN relative acceleration %v, two-body formula %v (rel %.2g)", q, k, got, want, e)
			}
		}
	}
	t.Logf("largest relative difference of the 1PN parts: %.2g (bound %.0e)", worst, tol)
}

// A test body about one mass at rest: EIH is gr1pn term by term (its
// test-body limit, Will 2014), exactly when the test body has no mass, and
// to O(m_test/M) of the 1PN part when it has a little.
func TestEIHTestBodyLimit(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	m := units.GMSun
	for k := 0; k < 20; k++ {
		x, v := randomRelative(rng, m, 1e-4)
		for _, small := range []float64{0, 1e-9 * m} {
			gm := []float64{m, small}
			xs := []vec.V{{}, x}
			vs := []vec.V{{}, v}
			a := make([]vec.V, 2)
			kernels.EIH{}.NBodyAccel(gm, xs, vs, a)
			want := kernels.GR1PN{}.Accel(m+small, x, v)
			pn := want.Sub(kernels.Newton{}.Accel(m+small, x, v)).Norm()
			tol := 1e-15 * want.Norm() // rounding
			if small != 0 {
				tol += 10 * small / m * pn
			}
			if d := a[1].Sub(a[0]).Sub(want).Norm(); d > tol {
				t.Errorf("state %d, m_test = %g: relative EIH acceleration differs from gr1pn by %.3g (1PN part %.3g)", k, small, d, pn)
			}
		}
	}
}

// The EIH energy reduces, for two bodies, to the relative orbit's
// (kernels.EIH doc: Landau & Lifshitz against Blanchet 2014, both memory):
// measured, to the rounding of the subtracted Newtonian energy.
func TestEIHEnergyTwoBody(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	const eps = 1e-3
	const tol = 1e-10 // 1e-16/eps rounding, with room
	worst := 0.0
	defer func() { t.Logf("largest relative difference of the 1PN energies: %.2g", worst) }()
	for _, q := range []float64{1, 0.3, 0.01} {
		m1 := 10 * units.GMSun
		m2 := q * m1
		m := m1 + m2
		reduced := m1 * m2 / m
		for k := 0; k < 10; k++ {
			x, v := randomRelative(rng, m, eps)
			xs, vs := comState(m1, m2, x, v)
			gm := []float64{m1, m2}
			newt := reduced * (0.5*v.Dot(v) - m/x.Norm())
			got := kernels.EIH{}.NBodyEnergy(gm, xs, vs) - newt
			want := reduced*kernels.EIH{}.PairEnergy(m1, m2, x, v) + reduced*m/x.Norm()
			worst = math.Max(worst, math.Abs(got/want-1))
			if e := math.Abs(got/want - 1); e > tol {
				t.Errorf("q = %g, state %d: 1PN energy %.10g, two-body form %.10g (rel %.2g)", q, k, got, want, e)
			}
		}
	}
}

// conservedRun integrates an EIH system with yoshida6 and returns the
// largest relative change of the EIH energy and of the Newtonian energy.
func conservedRun(t *testing.T, gm []float64, x, v []vec.V, h float64, steps int, extra func(s *System) float64) (eihErr, newtErr, extraErr float64) {
	t.Helper()
	st := kernels.MustStack(kernels.EIH{})
	s := &System{X: x, V: v, A: make([]vec.V, len(x)), GM: gm}
	f := NewField(st, gm)
	f.Prime(s)
	newtonE := func() float64 {
		e := 0.0
		for i := range s.X {
			e += 0.5 * gm[i] * s.V[i].Norm2()
			for j := i + 1; j < len(s.X); j++ {
				e -= gm[i] * gm[j] / s.X[i].Sub(s.X[j]).Norm()
			}
		}
		return e
	}
	e0, n0 := kernels.EIH{}.NBodyEnergy(gm, s.X, s.V), newtonE()
	x0 := 0.0
	if extra != nil {
		x0 = extra(s)
	}
	stepper := NewYoshida6()
	for k := 0; k < steps; k++ {
		stepper.Step(s, f, h)
		eihErr = math.Max(eihErr, math.Abs(kernels.EIH{}.NBodyEnergy(gm, s.X, s.V)/e0-1))
		newtErr = math.Max(newtErr, math.Abs(newtonE()/n0-1))
		if extra != nil {
			extraErr = math.Max(extraErr, math.Abs(extra(s)/x0-1))
		}
	}
	return eihErr, newtErr, extraErr
}

// Integrated, the EIH energy is conserved up to what the 1PN equations
// leave, O(eps^2), while the Newtonian energy swings by O(eps): a wrong term
// in the equations or in the energy would leave an O(eps) swing. So the
// drift must fall as eps^2 (100 times per decade of eps), the Newtonian
// swing as eps. Two bodies (q = 0.5, e = 0.5; also the relative orbit's pair
// energy and angular momentum) and three comparable bodies, at
// eps = G M/(c^2 a) = 1e-5 and 1e-6.
func TestEIHConservation(t *testing.T) {
	type drift struct{ eih, newt, pairE, pairJ float64 }
	twoBody := func(eps float64) drift {
		m1, m2 := 2*units.GMSun, units.GMSun
		m := m1 + m2
		a := m * invC2 / eps
		e := 0.5
		rp := a * (1 - e)
		x := vec.V{rp, 0, 0}
		v := vec.V{0, math.Sqrt(m * (1 + e) / rp), 0}
		period := 2 * math.Pi * math.Sqrt(a*a*a/m)
		st := kernels.MustStack(kernels.EIH{})
		pairE := func(s *System) float64 { return st.PairEnergy(m1, m2, s.X[0].Sub(s.X[1]), s.V[0].Sub(s.V[1])) }
		pairJ := func(s *System) float64 {
			return st.PairAngularMomentum(m1, m2, s.X[0].Sub(s.X[1]), s.V[0].Sub(s.V[1]))
		}
		var d drift
		xs, vs := comState(m1, m2, x, v)
		d.eih, d.newt, d.pairE = conservedRun(t, []float64{m1, m2}, xs, vs, period/800.3, 2401, pairE)
		xs, vs = comState(m1, m2, x, v)
		_, _, d.pairJ = conservedRun(t, []float64{m1, m2}, xs, vs, period/400.3, 1201, pairJ)
		return d
	}
	threeBody := func(eps float64) drift {
		// a triangle of comparable masses, off equilibrium, centre of mass at rest
		gm := []float64{units.GMSun, 0.8 * units.GMSun, 0.6 * units.GMSun}
		l := units.GMSun * invC2 / eps
		x3 := []vec.V{{l, 0, 0}, {-0.5 * l, 0.9 * l, 0}, {-0.4 * l, -0.8 * l, 0.1 * l}}
		v3 := []vec.V{{0, 0.5, 0.05}, {-0.45, -0.2, 0}, {0.3, -0.35, -0.02}}
		speed := math.Sqrt(units.GMSun / l)
		var p vec.V
		var mt float64
		for i := range v3 {
			v3[i] = v3[i].Scale(speed)
			p = p.AddScaled(gm[i], v3[i])
			mt += gm[i]
		}
		for i := range v3 {
			v3[i] = v3[i].AddScaled(-1/mt, p)
		}
		tl := 2 * math.Pi * math.Sqrt(l*l*l/mt)
		var d drift
		d.eih, d.newt, _ = conservedRun(t, gm, x3, v3, tl/4000.3, 3000, nil)
		return d
	}
	for _, c := range []struct {
		name string
		run  func(float64) drift
	}{{"two bodies", twoBody}, {"three bodies", threeBody}} {
		hi, lo := c.run(1e-5), c.run(1e-6)
		t.Logf("%s: EIH energy drift %.2g at eps 1e-5, %.2g at 1e-6 (ratio %.0f); Newtonian swing %.2g, %.2g (ratio %.1f); pair energy %.2g, %.2g; pair J %.2g, %.2g",
			c.name, hi.eih, lo.eih, hi.eih/lo.eih, hi.newt, lo.newt, hi.newt/lo.newt, hi.pairE, lo.pairE, hi.pairJ, lo.pairJ)
		if r := hi.eih / lo.eih; r < 50 || hi.eih > 1e-3*hi.newt {
			t.Errorf("%s: EIH energy drift falls by %.1f per decade of eps (want about 100, eps^2), and is %.2g of the Newtonian swing", c.name, r, hi.eih/hi.newt)
		}
		if c.name == "two bodies" {
			if math.Abs(hi.pairE/hi.eih-1) > 0.1 || hi.pairJ/lo.pairJ < 50 {
				t.Errorf("two bodies: pair energy drift %.2g against the EIH energy's %.2g; pair J falls by %.1f per decade", hi.pairE, hi.eih, hi.pairJ/lo.pairJ)
			}
		}
	}
}

// A hierarchical triple: a light, distant third body barely changes the
// inner pair's 1PN relative acceleration, which is then the two-body
// equation (its cross terms are O(m3/M) and tidal O((a/R)^3)).
func TestEIHDominantPair(t *testing.T) {
	m1, m2, m3 := 1.4*units.GMSun, 0.9*units.GMSun, 1e-4*units.GMSun
	m := m1 + m2
	nu := m1 * m2 / (m * m)
	rng := rand.New(rand.NewPCG(7, 8))
	for k := 0; k < 10; k++ {
		x, v := randomRelative(rng, m, 1e-6)
		xs, vs := comState(m1, m2, x, v)
		xs = append(xs, vec.V{1e3 * x.Norm(), 2e2 * x.Norm(), 0})
		vs = append(vs, vec.V{0, math.Sqrt(m / (1e3 * x.Norm())), 0})
		g := []float64{m1, m2, m3}
		a := make([]vec.V, 3)
		kernels.EIH{}.NBodyAccel(g, xs, vs, a)
		an := newtonAccel(g, xs)
		got := a[0].Sub(an[0]).Sub(a[1].Sub(an[1]))
		want := relative1PN(m, nu, x, v)
		if e := got.Sub(want).Norm() / want.Norm(); e > 1e-4 {
			t.Errorf("state %d: inner 1PN relative acceleration %v, two-body formula %v (rel %.2g)", k, got, want, e)
		}
	}
}

// The Field dispatches an EIH stack to the N-body law, and adds
// corrections pairwise on top.
func TestFieldUsesNBodyLaw(t *testing.T) {
	gm := []float64{units.GMSun, 0.5 * units.GMSun, 0}
	x := []vec.V{{0, 0, 0}, {1e9, 0, 0}, {0, 3e9, 0}}
	v := []vec.V{{0, -1e5, 0}, {0, 2e5, 0}, {1e5, 0, 0}}
	want := make([]vec.V, 3)
	kernels.EIH{}.NBodyAccel(gm, x, v, want)
	got := make([]vec.V, 3)
	f := NewField(kernels.MustStack(kernels.EIH{}), gm)
	f.Eval(gm, x, v, got)
	for i := range got {
		if got[i] != want[i] || f.EvalBody(gm, x, v, i) != want[i] {
			t.Errorf("body %d: field %v, EIH %v", i, got[i], want[i])
		}
	}
	y, err := kernels.New("yukawa", kernels.Values{Num: map[string]float64{"alpha": 0.1, "lambda": 2e9}})
	if err != nil {
		t.Fatal(err)
	}
	fy := NewField(kernels.MustStack(kernels.EIH{}, y), gm)
	fy.Eval(gm, x, v, got)
	for i := range got {
		extra := vec.V{}
		for j := range x {
			if j != i && gm[j] != 0 {
				extra = extra.Add(y.Accel(gm[j], x[i].Sub(x[j]), v[i].Sub(v[j])))
			}
		}
		if d := got[i].Sub(want[i].Add(extra)).Norm(); d > 1e-15*got[i].Norm() {
			t.Errorf("body %d: EIH + yukawa %v, EIH %v plus pairwise yukawa %v", i, got[i], want[i], extra)
		}
	}
}
