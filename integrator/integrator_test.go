package integrator

import (
	"math"
	"testing"

	"mgorbit/kernels"
	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

// twoBody is a test body about a fixed centre: index 0 the centre, 1 the body.
func twoBody(mu float64, x, v vec.V) *System {
	return &System{X: []vec.V{{}, x}, V: []vec.V{{}, v}, A: make([]vec.V, 2), GM: []float64{mu, 0}}
}

// pericentreState puts an orbit of semi-major axis a, eccentricity e at
// pericentre on +x, moving along +y (vis-viva: v_p^2 = mu (1+e)/(a(1-e))).
func pericentreState(mu, a, e float64) (vec.V, vec.V) {
	rp := a * (1 - e)
	return vec.V{rp, 0, 0}, vec.V{0, math.Sqrt(mu * (1 + e) / rp), 0}
}

func integrate(st Stepper, stack *kernels.Stack, s *System, h float64, n int) *System {
	f := NewField(stack, s.GM)
	f.Prime(s)
	for k := 0; k < n; k++ {
		st.Step(s, f, h)
	}
	return s
}

// measuredOrder integrates to a fraction 0.37 of a period (not whole periods,
// where a wrongly ordered composition still looks sixth order) with n, 2n and
// 4n steps and returns log2 of the ratio of successive differences.
func measuredOrder(t *testing.T, mk func() Stepper, stack *kernels.Stack, mu, a, e float64, n int) float64 {
	t.Helper()
	x, v := pericentreState(mu, a, e)
	P := 2 * math.Pi * math.Sqrt(a*a*a/mu)
	T := 0.37 * P
	var xs [3]vec.V
	for k, m := range []int{n, 2 * n, 4 * n} {
		s := integrate(mk(), stack, twoBody(mu, x, v), T/float64(m), m)
		xs[k] = s.X[1]
	}
	d1 := xs[0].Sub(xs[1]).Norm()
	d2 := xs[1].Sub(xs[2]).Norm()
	return math.Log2(d1 / d2)
}

func TestConvergenceOrder(t *testing.T) {
	newton := kernels.MustStack(kernels.Newton{})
	gr := kernels.MustStack(kernels.GR1PN{})
	mu := units.GMSun
	// a relativistic orbit: mu/(c^2 a) = 1e-5 makes the 1PN terms large
	// enough to matter at these step sizes.
	aGR := mu / (units.C * units.C) * 1e5
	cases := []struct {
		name  string
		mk    func() Stepper
		order float64
		n     int
	}{
		{"leapfrog", func() Stepper { return NewLeapfrog() }, 2, 400},
		{"yoshida4", func() Stepper { return NewYoshida4() }, 4, 200},
		{"yoshida6", func() Stepper { return NewYoshida6() }, 6, 60},
	}
	for _, c := range cases {
		for _, k := range []struct {
			name  string
			stack *kernels.Stack
			a     float64
		}{{"newton", newton, units.AU}, {"gr1pn", gr, aGR}} {
			p := measuredOrder(t, c.mk, k.stack, mu, k.a, 0.5, c.n)
			t.Logf("%s %s: measured order %.3f", c.name, k.name, p)
			// The asymptotic order within 0.15 (the next error term shifts it slightly).
			if math.Abs(p-c.order) > 0.15 {
				t.Errorf("%s with %s: measured order %.3f, want %g", c.name, k.name, p, c.order)
			}
		}
	}
}

// TestWrongYoshidaOrderIsCaught checks that the order measurement can
// fail: solution A's weights in another symmetric order (w1 w2 w3 w0 w3 w2
// w1: same weights, so the fourth-order condition sum w^3 = 0 still holds)
// give only a fourth-order method.
func TestWrongYoshidaOrderIsCaught(t *testing.T) {
	w := NewYoshida6().Weights() // w3 w2 w1 w0 w1 w2 w3
	wrong := []float64{w[2], w[1], w[0], w[3], w[0], w[1], w[2]}
	p := measuredOrder(t, func() Stepper {
		return &Composition{name: "misordered", order: 6, weights: wrong}
	}, kernels.MustStack(kernels.Newton{}), units.GMSun, units.AU, 0.5, 60)
	t.Logf("misordered composition: measured order %.3f", p)
	if p > 4.5 || p < 3.5 {
		t.Errorf("misordered composition measured order %.2f, want about 4", p)
	}
}

// TestEnergyBounded integrates 1e4 orbits of an e = 0.3 Kepler orbit at a
// non-integer number of steps per orbit and checks the energy error stays
// bounded: the symplectic methods have no secular drift, so the largest
// error in the last tenth is no larger than that of the first tenth. The
// size of the error must scale as h^order (halving the step divides it by
// 2^order), which pins the bound to the method rather than to a number
// chosen to pass.
func TestEnergyBounded(t *testing.T) {
	if testing.Short() {
		t.Skip("long integration")
	}
	mu, a, e := 1.0, 1.0, 0.3
	stack := kernels.MustStack(kernels.Newton{})
	maxErr := func(st Stepper, steps, orbits float64) (first, last float64) {
		x, v := pericentreState(mu, a, e)
		s := twoBody(mu, x, v)
		f := NewField(stack, s.GM)
		f.Prime(s)
		h := 2 * math.Pi / steps
		n := int(orbits * steps)
		e0 := stack.Energy(mu, s.X[1], s.V[1])
		for k := 0; k < n; k++ {
			st.Step(s, f, h)
			if k%7 != 0 {
				continue
			}
			de := math.Abs(stack.Energy(mu, s.X[1], s.V[1])/e0 - 1)
			if k < n/10 {
				first = math.Max(first, de)
			}
			if k > n-n/10 {
				last = math.Max(last, de)
			}
		}
		return first, last
	}
	for _, c := range []struct {
		mk    func() Stepper
		steps float64
	}{
		{func() Stepper { return NewLeapfrog() }, 200.37},
		{func() Stepper { return NewYoshida4() }, 100.37},
		{func() Stepper { return NewYoshida6() }, 60.37},
	} {
		st := c.mk()
		first, last := maxErr(st, c.steps, 1e4)
		t.Logf("%s at %.2f steps/orbit: max relative energy error first tenth %.3g, last tenth %.3g", st.Name(), c.steps, first, last)
		if last > 1.2*first+1e-14 {
			t.Errorf("%s: energy error grows from %.3g to %.3g over 1e4 orbits (drift)", st.Name(), first, last)
		}
		coarse, _ := maxErr(c.mk(), c.steps, 50)
		fine, _ := maxErr(c.mk(), 2*c.steps, 50)
		p := math.Log2(coarse / fine)
		t.Logf("%s: energy error %.3g -> %.3g at half the step: order %.2f", st.Name(), coarse, fine, p)
		if math.Abs(p-float64(st.Order())) > 0.3 {
			t.Errorf("%s: energy error scales with order %.2f, want %d", st.Name(), p, st.Order())
		}
	}
}

// TestCircularOrbitExact compares each method after a fraction of a period
// with the exact circular solution x = r (cos wt, sin wt), w^2 = mu/r^3
// (Kepler's third law), at two steps: the error must fall by 2^order.
func TestCircularOrbitExact(t *testing.T) {
	mu, r := 1.0, 1.0
	w := math.Sqrt(mu / (r * r * r))
	T := 1.3
	exact := vec.V{r * math.Cos(w*T), r * math.Sin(w*T), 0}
	stack := kernels.MustStack(kernels.Newton{})
	for _, c := range []struct {
		mk func() Stepper
		n  int
	}{{func() Stepper { return NewLeapfrog() }, 200}, {func() Stepper { return NewYoshida4() }, 40}, {func() Stepper { return NewYoshida6() }, 20}} {
		var errs [2]float64
		var name string
		var order int
		for k, n := range []int{c.n, 2 * c.n} {
			st := c.mk()
			name, order = st.Name(), st.Order()
			s := integrate(st, stack, twoBody(mu, vec.V{r, 0, 0}, vec.V{0, w * r, 0}), T/float64(n), n)
			errs[k] = s.X[1].Sub(exact).Norm()
		}
		p := math.Log2(errs[0] / errs[1])
		t.Logf("%s: errors %.3g, %.3g, order %.2f", name, errs[0], errs[1], p)
		if math.Abs(p-float64(order)) > 0.2 {
			t.Errorf("%s: order %.2f against the exact circular orbit, want %d", name, p, order)
		}
	}
	// rk45 with error control against the same exact solution
	rk := NewRK45(1e-12)
	s := integrate(rk, stack, twoBody(mu, vec.V{r, 0, 0}, vec.V{0, w * r, 0}), T, 1)
	if d := s.X[1].Sub(exact).Norm(); d > 1e-10 {
		t.Errorf("rk45 at tol 1e-12: position error %.3g after %.1f rad, want < 1e-10", d, w*T)
	} else {
		t.Logf("rk45: error %.3g with %d substeps (%d rejected)", d, rk.Substeps, rk.Rejected)
	}
}

// TestRK45Order checks the Dormand-Prince tableau: with the error control
// defeated (huge tolerance) and fixed substeps, the propagated solution is
// fifth order.
func TestRK45Order(t *testing.T) {
	mu, a, e := 1.0, 1.0, 0.5
	x, v := pericentreState(mu, a, e)
	stack := kernels.MustStack(kernels.Newton{})
	T := 0.37 * 2 * math.Pi
	var xs [3]vec.V
	for k, n := range []int{100, 200, 400} {
		rk := NewRK45(1e6) // every trial step accepted
		s := twoBody(mu, x, v)
		f := NewField(stack, s.GM)
		f.Prime(s)
		for i := 0; i < n; i++ {
			rk.hsub = T / float64(n)
			rk.Step(s, f, T/float64(n))
		}
		xs[k] = s.X[1]
	}
	p := math.Log2(xs[0].Sub(xs[1]).Norm() / xs[1].Sub(xs[2]).Norm())
	t.Logf("rk45 fixed-step order %.3f", p)
	if math.Abs(p-5) > 0.25 {
		t.Errorf("rk45 fixed-step order %.2f, want 5", p)
	}
}
