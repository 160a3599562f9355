package integrator

import (
	"math"
	"testing"

	"mgorbit/integrator/kepler"
	"mgorbit/kernels"
	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

func yukawaStack(t testing.TB, alpha, lambda float64) *kernels.Stack {
	t.Helper()
	y, err := kernels.New("yukawa", kernels.Values{Num: map[string]float64{"alpha": alpha, "lambda": lambda}})
	if err != nil {
		t.Fatal(err)
	}
	return kernels.MustStack(kernels.Newton{}, y)
}

// TestWisdomHolmanKeplerExact: with nothing to kick (plain Newton, one
// body about one mass) the map is the exact Kepler flow, so after 1000
// orbits at a coarse 7.3 steps per orbit the state must match Kepler's
// equation (kepler.ToState at the propagated mean anomaly) to rounding,
// for a test body and for a massive pair (relative orbit, mu = G(M + m)).
// Rounding: the energy random-walks by ~1e-16 per drift, so the mean motion
// by 1.5 times that, and the phase error after N steps and n t = 6283 rad
// is ~1.5e-16 sqrt(3N) n t ~ 1.5e-10 rad, times the speed boost
// sqrt((1+e)/(1-e)) = 2 at pericentre: the position check is at 1e-8 (a = 1),
// while the orbit's shape (energy, Runge-Lenz vector) is checked at 1e-12.
// A fixed-step method at this step has O(1) errors.
func TestWisdomHolmanKeplerExact(t *testing.T) {
	for _, m := range []float64{0, 1e-3} {
		mu := 1.0
		el := kepler.Elements{A: 1, E: 0.6, I: 0.3, Node: 0.2, Peri: 1.1, M: 0.4}
		x, v, err := kepler.ToState(mu+m, el)
		if err != nil {
			t.Fatal(err)
		}
		s := &System{X: []vec.V{{}, x}, V: []vec.V{{}, v}, A: make([]vec.V, 2), GM: []float64{mu, m}}
		P := 2 * math.Pi / math.Sqrt(mu+m)
		steps := 7300
		h := 1000 * P / float64(steps)
		integrate(NewWisdomHolman4(), kernels.MustStack(kernels.Newton{}), s, h, steps)
		el.M += math.Sqrt(mu+m) * h * float64(steps)
		want, _, _ := kepler.ToState(mu+m, el)
		got := s.X[1].Sub(s.X[0])
		gv := s.V[1].Sub(s.V[0])
		_, wv, _ := kepler.ToState(mu+m, el)
		energy := func(x, v vec.V) float64 { return 0.5*v.Norm2() - (mu+m)/x.Norm() }
		lenz := func(x, v vec.V) vec.V { return v.Cross(x.Cross(v)).Scale(1 / (mu + m)).Sub(x.Unit()) }
		if d := math.Abs(energy(got, gv)/energy(want, wv) - 1); d > 1e-12 {
			t.Errorf("m = %g: energy off by %.2g relative after 1000 orbits", m, d)
		}
		if d := lenz(got, gv).Sub(lenz(want, wv)).Norm(); d > 1e-12 {
			t.Errorf("m = %g: Runge-Lenz vector off by %.2g after 1000 orbits", m, d)
		}
		if d := got.Sub(want).Norm(); d > 1e-8 {
			t.Errorf("m = %g: after 1000 orbits the relative position is off by %.2g (a = 1)", m, d)
		} else {
			t.Logf("m = %g: 1000 orbits at 7.3 steps/orbit, off Kepler's equation by %.2g", m, d)
		}
	}
}

// TestWisdomHolmanOrder measures the order at 0.37 of a period (n, 2n, 4n
// steps) for a test body under a weak Yukawa term (eps = alpha ~ 1e-6):
// the splittings' error is O(eps h^(2n)) there, so the orders must be 2,
// 4, 6; and the error must scale with eps (ten times alpha, ten times the
// error), which is the point of the method.
func TestWisdomHolmanOrder(t *testing.T) {
	mu, a, e := 1.0, 1.0, 0.5
	x, v := pericentreState(mu, a, e)
	T := 0.37 * 2 * math.Pi
	for _, c := range []struct {
		mk    func() Stepper
		order float64
		n     int
	}{
		{func() Stepper { return NewWisdomHolman() }, 2, 16},
		{func() Stepper { return NewWisdomHolman4() }, 4, 8},
		{func() Stepper { return NewWisdomHolman6() }, 6, 6},
	} {
		errAt := func(alpha float64, n int) float64 {
			st := yukawaStack(t, alpha, 1.3)
			ref := integrate(NewYoshida6(), st, twoBody(mu, x, v), T/4000, 4000).X[1]
			got := integrate(c.mk(), st, twoBody(mu, x, v), T/float64(n), n).X[1]
			return got.Sub(ref).Norm()
		}
		alpha := 1e-5
		e1, e2, e4 := errAt(alpha, c.n), errAt(alpha, 2*c.n), errAt(alpha, 4*c.n)
		p1, p2 := math.Log2(e1/e2), math.Log2(e2/e4)
		ratio := errAt(10*alpha, c.n) / e1
		name := c.mk().Name()
		t.Logf("%s: errors %.3g %.3g %.3g at %d, %d, %d steps: orders %.2f %.2f; error ratio for 10x eps %.3f",
			name, e1, e2, e4, c.n, 2*c.n, 4*c.n, p1, p2, ratio)
		if math.Abs(p2-c.order) > 0.3 {
			t.Errorf("%s: measured order %.2f, want %g", name, p2, c.order)
		}
		if ratio < 9 || ratio > 11 {
			t.Errorf("%s: error grows by %.2f for ten times the perturbation, want about 10 (linear in eps)", name, ratio)
		}
	}
}

// TestWisdomHolmanPlanets: a star and two planets (mass ratios eps ~ 1e-3,
// as the built-in halden-pair), the map in Jacobi coordinates against
// Yoshida6 at a fine step after two inner orbits. Laskar & Robutel's error
// for SBAB_n is O(eps h^(2n) + eps^2 h^2): the classic map's error is
// linear in the planet masses and second order; the fourth-order one's
// planet-planet error is dominated by the eps^2 h^2 term at these steps
// (order 2), so it falls faster than the masses: more than 20 times (an
// error linear in eps would fall 10 times, a pure eps^2 one 100 times; the
// eps h^4 term makes up the rest). The total momentum stays zero.
func TestWisdomHolmanPlanets(t *testing.T) {
	mk := func(scale float64) *System {
		gm := []float64{1, 1e-3 * scale, 3e-4 * scale}
		s := &System{GM: gm, X: make([]vec.V, 3), V: make([]vec.V, 3), A: make([]vec.V, 3)}
		for k, el := range []kepler.Elements{{A: 1, E: 0.05, I: 0.01, M: 0.3}, {A: 2.3, E: 0.08, I: 0.03, Node: 1, Peri: 2, M: 4}} {
			x, v, err := kepler.ToState(gm[0]+gm[k+1], el)
			if err != nil {
				t.Fatal(err)
			}
			s.X[k+1], s.V[k+1] = x, v
		}
		// barycentric frame
		var m float64
		var px, pv vec.V
		for i := range gm {
			m += gm[i]
			px = px.AddScaled(gm[i], s.X[i])
			pv = pv.AddScaled(gm[i], s.V[i])
		}
		for i := range gm {
			s.X[i] = s.X[i].Sub(px.Scale(1 / m))
			s.V[i] = s.V[i].Sub(pv.Scale(1 / m))
		}
		return s
	}
	newton := kernels.MustStack(kernels.Newton{})
	T := 2 * 2 * math.Pi
	maxErr := func(st Stepper, scale float64, n int) float64 {
		ref := integrate(NewYoshida6(), newton, mk(scale), T/20000, 20000)
		s := integrate(st, newton, mk(scale), T/float64(n), n)
		var p vec.V
		for i := range s.V {
			p = p.AddScaled(s.GM[i], s.V[i])
		}
		if p.Norm() > 1e-17 {
			t.Errorf("%s: total momentum %.2g after the run, want 0", st.Name(), p.Norm())
		}
		d := 0.0
		for i := range s.X {
			d = math.Max(d, s.X[i].Sub(ref.X[i]).Norm())
		}
		return d
	}
	for _, c := range []struct {
		mk        func() Stepper
		order     float64
		massRatio float64 // error ratio for ten times smaller masses
	}{{func() Stepper { return NewWisdomHolman() }, 2, 10}, {func() Stepper { return NewWisdomHolman4() }, 2, 0}} {
		n := 100
		e1, e2 := maxErr(c.mk(), 1, n), maxErr(c.mk(), 1, 2*n)
		small := maxErr(c.mk(), 0.1, n)
		p := math.Log2(e1 / e2)
		r := e1 / small
		t.Logf("%s: position errors %.3g, %.3g at %d, %d steps: order %.2f; masses / 10: error / %.1f", c.mk().Name(), e1, e2, n, 2*n, p, r)
		if math.Abs(p-c.order) > 0.3 {
			t.Errorf("%s with two planets: order %.2f, want %g", c.mk().Name(), p, c.order)
		}
		switch {
		case c.massRatio > 0 && (r < 0.8*c.massRatio || r > 1.25*c.massRatio):
			t.Errorf("%s: error falls by %.1f for ten times smaller masses, want about %g", c.mk().Name(), r, c.massRatio)
		case c.massRatio == 0 && (r < 20 || r > 125):
			t.Errorf("%s: error falls by %.1f for ten times smaller masses, want between 20 and 100 (eps^2 h^2 + eps h^4)", c.mk().Name(), r)
		}
	}
}

// TestWisdomHolmanEnergyBounded: 1e5 orbits of a relativistic-strength
// gr-orbit perturbation (mu/(c^2 a) = 1e-4, e = 0.3) at a coarse 20.3 steps
// per orbit. A symplectic map has no secular energy drift, so the largest
// error in the last tenth is no larger than in the first; and the error is
// the method's (it halves when eps halves), not rounding.
func TestWisdomHolmanEnergyBounded(t *testing.T) {
	if testing.Short() {
		t.Skip("1e5 orbits")
	}
	mu := units.GMSun
	stack := kernels.MustStack(kernels.GROrbit{})
	run := func(eps float64, orbits float64) (first, last float64) {
		a := mu / (units.C * units.C) / eps
		x, v := pericentreState(mu, a, 0.3)
		s := twoBody(mu, x, v)
		f := NewField(stack, s.GM)
		f.Prime(s)
		st := NewWisdomHolman()
		P := kepler.Period(mu, a)
		steps := 20.3
		h := P / steps
		n := int(orbits * steps)
		e0 := stack.Energy(mu, s.X[1], s.V[1])
		for k := 0; k < n; k++ {
			st.Step(s, f, h)
			if k%5 != 0 {
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
	first, last := run(1e-4, 1e5)
	t.Logf("1e5 orbits: max relative energy error first tenth %.3g, last tenth %.3g", first, last)
	if last > 1.2*first+1e-14 {
		t.Errorf("energy error grows from %.3g to %.3g over 1e5 orbits (drift)", first, last)
	}
	half, _ := run(0.5e-4, 1e3)
	full, _ := run(1e-4, 1e3)
	t.Logf("energy error %.3g at eps 1e-4, %.3g at 5e-5: ratio %.2f", full, half, full/half)
	if r := full / half; r < 1.7 || r > 2.3 {
		t.Errorf("energy error ratio %.2f for twice eps, want about 2 (error linear in the perturbation)", r)
	}
}

// TestWisdomHolmanRejects: velocity-dependent stacks and systems without a
// dominant mass are refused with an error, and Recommend falls back.
func TestWisdomHolmanRejects(t *testing.T) {
	gr := kernels.MustStack(kernels.GR1PN{})
	if err := NewWisdomHolman4().Applies(gr, []float64{1, 0}); err == nil {
		t.Error("gr1pn accepted by the Wisdom-Holman map")
	}
	newton := kernels.MustStack(kernels.Newton{})
	if err := NewWisdomHolman4().Applies(newton, []float64{1, 0.55, 0}); err == nil {
		t.Error("a binary with mass ratio 0.55 accepted by the Wisdom-Holman map")
	}
	if got := Recommend(newton, []float64{1, 1e-3, 0}); got != "wisdom-holman-4" {
		t.Errorf("Recommend(star + planet) = %s", got)
	}
	if got := Recommend(gr, []float64{1, 0}); got != "yoshida6" {
		t.Errorf("Recommend(gr1pn) = %s", got)
	}
	if err := NewLogHLeapfrog().Applies(gr, []float64{1, 0}); err == nil {
		t.Error("gr1pn accepted by the logH leapfrog")
	}
}

// TestLogHKeplerOrbit: for a pure Kepler problem the logH leapfrog follows
// the exact orbit, erring only in the time along it (Preto & Tremaine 1999;
// Mikkola & Tanikawa 1999): energy and the Runge-Lenz vector stay at
// rounding level on e = 0.9 and 0.99 orbits at only 50 steps per orbit,
// where the fixed-step leapfrog with the same number of force evaluations
// (two per logH step, so 100.6 leapfrog steps per orbit) loses the orbit.
// The comparison is logged. Rounding level: v^2/2 - mu/r cancels by
// (v^2/2 + mu/r)/|E| = (3 + e)/(1 - e) at pericentre, and rounding errors
// of 1e-16 random-walk over the N steps: 5e-16 (3+e)/(1-e) sqrt(N).
func TestLogHKeplerOrbit(t *testing.T) {
	mu := 1.0
	newton := kernels.MustStack(kernels.Newton{})
	for _, e := range []float64{0.9, 0.99} {
		x, v := pericentreState(mu, 1, e)
		lenz := func(x, v vec.V) vec.V { return v.Cross(x.Cross(v)).Scale(1 / mu).Sub(x.Unit()) }
		measure := func(st Stepper, steps float64) (de, dl float64) {
			s := twoBody(mu, x, v)
			f := NewField(newton, s.GM)
			f.Prime(s)
			h := 2 * math.Pi / steps
			e0 := newton.Energy(mu, x, v)
			l0 := lenz(x, v)
			for s.T < 100*2*math.Pi {
				st.Step(s, f, h)
				de = math.Max(de, math.Abs(newton.Energy(mu, s.X[1], s.V[1])/e0-1))
				dl = math.Max(dl, lenz(s.X[1], s.V[1]).Sub(l0).Norm())
			}
			return de, dl
		}
		lde, ldl := measure(NewLogHLeapfrog(), 50.3)
		fde, fdl := measure(NewLeapfrog(), 100.6)
		t.Logf("e = %.2f, 100 orbits at 50.3 steps/orbit: logH energy error %.2g, Runge-Lenz error %.2g; fixed-step leapfrog %.2g, %.2g",
			e, lde, ldl, fde, fdl)
		tol := 5e-16 * (3 + e) / (1 - e) * math.Sqrt(100*50.3)
		if lde > tol || ldl > tol {
			t.Errorf("e = %g: the logH leapfrog leaves the Kepler orbit: energy %.2g, Runge-Lenz vector %.2g", e, lde, ldl)
		}
		if fde < 1e3*lde {
			t.Errorf("e = %g: fixed-step leapfrog energy error %.2g is not far above logH's %.2g", e, fde, lde)
		}
	}
}

// TestLogHOrder: the time error of the logH methods at 0.37 of an e = 0.9
// orbit... measured as the position at a fixed physical time is awkward
// with a variable step, so the order is measured on the state after a fixed
// number of steps against the exact Kepler solution at the reached time
// (kepler.Drift, checked against Kepler's equation and mpmath).
func TestLogHOrder(t *testing.T) {
	mu := 1.0
	x, v := pericentreState(mu, 1, 0.9)
	newton := kernels.MustStack(kernels.Newton{})
	for _, c := range []struct {
		mk    func() Stepper
		order float64
		n     int
	}{{func() Stepper { return NewLogHLeapfrog() }, 2, 64}, {func() Stepper { return NewLogHYoshida4() }, 4, 32}} {
		var errs [3]float64
		for k, n := range []int{c.n, 2 * c.n, 4 * c.n} {
			s := integrate(c.mk(), newton, twoBody(mu, x, v), 2*math.Pi*0.37*2/float64(n), n)
			want, _ := kepler.Drift(mu, x, v, s.T)
			errs[k] = s.X[1].Sub(want).Norm()
		}
		p := math.Log2(errs[1] / errs[2])
		t.Logf("%s: errors %.3g %.3g %.3g: order %.2f", c.mk().Name(), errs[0], errs[1], errs[2], p)
		if math.Abs(p-c.order) > 0.3 {
			t.Errorf("%s: order %.2f, want %g", c.mk().Name(), p, c.order)
		}
	}
}

// TestParallelBitIdentical: the force loop and the Wisdom-Holman drift and
// kick loops give the same bits with one worker and with several.
func TestParallelBitIdentical(t *testing.T) {
	n := 3 * testChunk
	mk := func() *System {
		s := &System{GM: make([]float64, n), X: make([]vec.V, n), V: make([]vec.V, n), A: make([]vec.V, n)}
		s.GM[0], s.GM[1] = 1, 1e-3
		s.X[1], s.V[1] = vec.V{5, 0, 0}, vec.V{0, 0.447, 0}
		for i := 2; i < n; i++ {
			r := 1 + 2*float64(i)/float64(n)
			th := 2.399963229728653 * float64(i)
			s.X[i] = vec.V{r * math.Cos(th), r * math.Sin(th), 0.01 * r * math.Sin(3*th)}
			s.V[i] = vec.V{-math.Sin(th) / math.Sqrt(r), math.Cos(th) / math.Sqrt(r), 0}
		}
		return s
	}
	for _, st := range []*kernels.Stack{kernels.MustStack(kernels.Newton{}), yukawaStack(t, 1e-3, 2)} {
		for _, mkStep := range []func() Stepper{func() Stepper { return NewLeapfrog() }, func() Stepper { return NewWisdomHolman4() }} {
			var out [2]*System
			for k, workers := range []int{1, 4} {
				s := mk()
				f := NewField(st, s.GM)
				f.SetWorkers(workers)
				f.Prime(s)
				stp := mkStep()
				for i := 0; i < 5; i++ {
					stp.Step(s, f, 0.01)
				}
				out[k] = s
			}
			for i := range out[0].X {
				if out[0].X[i] != out[1].X[i] || out[0].V[i] != out[1].V[i] || out[0].A[i] != out[1].A[i] {
					t.Fatalf("%s, %s: body %d differs between 1 and 4 workers", st, mkStep().Name(), i)
				}
			}
		}
	}
}

// TestStepsDoNotAllocate: the hot loops allocate nothing per step.
func TestStepsDoNotAllocate(t *testing.T) {
	n := 1000
	s := &System{GM: make([]float64, n+1), X: make([]vec.V, n+1), V: make([]vec.V, n+1), A: make([]vec.V, n+1)}
	s.GM[0] = 1
	for i := 1; i <= n; i++ {
		r := 1 + float64(i)/float64(n)
		s.X[i] = vec.V{r, 0, 0}
		s.V[i] = vec.V{0, 1 / math.Sqrt(r), 0.01}
	}
	for _, st := range []*kernels.Stack{kernels.MustStack(kernels.Newton{}), yukawaStack(t, 1e-3, 2), kernels.MustStack(kernels.GROrbit{})} {
		for _, stp := range []Stepper{NewLeapfrog(), NewYoshida6(), NewWisdomHolman4(), NewLogHLeapfrog()} {
			f := NewField(st, s.GM)
			f.Prime(s)
			stp.Step(s, f, 1e-3) // scratch sized on first use
			if a := testing.AllocsPerRun(20, func() { stp.Step(s, f, 1e-3) }); a != 0 {
				t.Errorf("%s with %s: %.1f allocations per step", stp.Name(), st, a)
			}
		}
	}
}
