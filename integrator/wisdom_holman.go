package integrator

import (
	"fmt"
	"math"
	"sort"

	"mgorbit/integrator/kepler"
	"mgorbit/kernels"
	"mgorbit/kernels/vec"
)

// WisdomHolman is the Wisdom-Holman map (Wisdom & Holman, Astron. J. 102,
// 1528 (1991)) for systems with one dominant mass: the Hamiltonian is split
// into Kepler motion about the dominant body, advanced exactly
// (kepler.Drift), and everything else, applied as kicks: the stack's
// departures from Newton (corrections, or a base law such as gr-orbit) and
// the pulls between the other bodies. The kick per body is the field's full
// acceleration in the map's coordinates minus the Kepler term, so any
// velocity-independent stack works unchanged.
//
// Coordinates: massive bodies other than the dominant one in Jacobi
// coordinates (ordered by initial distance from it, each relative to the
// barycentre of those inside, orbiting G times the interior mass plus its
// own); test bodies heliocentric (relative to the dominant body, orbiting
// its GM, the dominant body's own acceleration entering their kick as the
// indirect term).
//
// The step is one of Laskar & Robutel's SBAB_n splittings (Celest. Mech.
// Dyn. Astron. 80, 39 (2001)): kicks at the Lobatto quadrature nodes of the
// step with its weights, exact Kepler drifts between. The error terms
// linear in the perturbation's size eps are those of the quadrature,
// O(eps h^(2n)); the leading term quadratic in eps stays O(eps^2 h^2). With
// eps ~ 1e-7 (relativity at Mercury) or 1e-3 (planets) the first dominates
// at practical steps. n = 1 is the classic kick-drift-kick map. Each step
// costs n force evaluations (the last kick's acceleration is the next
// step's first).
//
// Velocity-dependent stacks (gr1pn) have no position-only kick: Applies
// returns an error for them, and Step panics. The position-only
// relativistic form is the gr-orbit kernel.
type WisdomHolman struct {
	name   string
	order  int
	kicks  []float64 // kick weights (Lobatto weights), len n+1
	drifts []float64 // drift fractions between kicks, len n

	plan   whPlan
	jx, jv []vec.V // map coordinates, by body index
	ja     []vec.V // kick accelerations in map coordinates
}

// whPlan is the coordinate layout for one system.
type whPlan struct {
	stack   *kernels.Stack
	n       int
	gm      []float64 // the GM values the plan was made for
	central int
	chain   []int     // massive bodies in Jacobi order, central excluded
	eta     []float64 // eta[k]: GM of the central body and chain[0..k]
	tests   []int
}

// Lobatto nodes and weights on [0, 1] (Abramowitz & Stegun 25.4.32):
// 3 points 0, 1/2, 1 with 1/6, 2/3, 1/6; 4 points 0, (5 -+ sqrt 5)/10, 1
// with 1/12, 5/12, 5/12, 1/12.
var (
	sbab1Kicks  = []float64{0.5, 0.5}
	sbab1Drifts = []float64{1}
	sbab2Kicks  = []float64{1.0 / 6, 2.0 / 3, 1.0 / 6}
	sbab2Drifts = []float64{0.5, 0.5}
	sbab3Kicks  = []float64{1.0 / 12, 5.0 / 12, 5.0 / 12, 1.0 / 12}
	sbab3Drifts = []float64{(5 - math.Sqrt(5)) / 10, math.Sqrt(5) / 5, (5 - math.Sqrt(5)) / 10}
)

// NewWisdomHolman returns the second-order (kick-drift-kick) map.
func NewWisdomHolman() *WisdomHolman {
	return &WisdomHolman{name: "wisdom-holman", order: 2, kicks: sbab1Kicks, drifts: sbab1Drifts}
}

// NewWisdomHolman4 returns SBAB_2: error O(eps h^4 + eps^2 h^2).
func NewWisdomHolman4() *WisdomHolman {
	return &WisdomHolman{name: "wisdom-holman-4", order: 4, kicks: sbab2Kicks, drifts: sbab2Drifts}
}

// NewWisdomHolman6 returns SBAB_3: error O(eps h^6 + eps^2 h^2).
func NewWisdomHolman6() *WisdomHolman {
	return &WisdomHolman{name: "wisdom-holman-6", order: 6, kicks: sbab3Kicks, drifts: sbab3Drifts}
}

// Name implements Stepper.
func (w *WisdomHolman) Name() string { return w.name }

// Order implements Stepper: the order of the error linear in the
// perturbation, which dominates unless the perturbation is large.
func (w *WisdomHolman) Order() int { return w.order }

// DominanceLimit is the largest total GM of the other bodies, as a fraction
// of the dominant one's, for which the Wisdom-Holman split is offered: its
// error scales with that ratio, and beyond a few percent a composition
// method is as good (common practice).
const DominanceLimit = 0.05

// Applies reports whether the map can integrate a system with these GM
// values under stack, and if not, why.
// ExactKeplerDrift implements KeplerSplit.
func (w *WisdomHolman) ExactKeplerDrift() {}

func (w *WisdomHolman) Applies(stack *kernels.Stack, gm []float64) error {
	return wisdomHolmanApplies(stack, gm)
}

func wisdomHolmanApplies(stack *kernels.Stack, gm []float64) error {
	if stack.VelocityDependent() {
		return fmt.Errorf("the Wisdom-Holman map needs position-only kicks, but the stack %s depends on the velocity; "+
			"use gr-orbit (the position-only relativistic orbit) instead of gr1pn, or a Yoshida method", stack)
	}
	c := dominant(gm)
	if c < 0 {
		return fmt.Errorf("the Wisdom-Holman map needs a massive body to orbit")
	}
	var others float64
	for i, m := range gm {
		if i != c {
			others += m
		}
	}
	if others > DominanceLimit*gm[c] {
		return fmt.Errorf("the Wisdom-Holman map needs one dominant mass: the other bodies have %.3g of the largest GM (limit %g); use yoshida6",
			others/gm[c], DominanceLimit)
	}
	return nil
}

// dominant returns the index of the largest GM (first on ties), -1 if none
// is positive.
func dominant(gm []float64) int {
	c := -1
	for i, m := range gm {
		if m > 0 && (c < 0 || m > gm[c]) {
			c = i
		}
	}
	return c
}

// Recommend returns the method to use when a scenario names none: the
// fourth-order Wisdom-Holman map where it applies (one dominant mass,
// position-only kicks), else Yoshida's sixth-order composition.
func Recommend(stack *kernels.Stack, gm []float64) string {
	if wisdomHolmanApplies(stack, gm) == nil {
		return "wisdom-holman-4"
	}
	return "yoshida6"
}

func (w *WisdomHolman) prepare(s *System, stack *kernels.Stack) {
	p := &w.plan
	if p.stack == stack && p.n == len(s.GM) && equalFloats(p.gm, s.GM) {
		return
	}
	if err := wisdomHolmanApplies(stack, s.GM); err != nil {
		panic("integrator: " + err.Error())
	}
	n := len(s.GM)
	*p = whPlan{stack: stack, n: n, gm: append([]float64(nil), s.GM...), central: dominant(s.GM)}
	c := p.central
	for i, m := range s.GM {
		switch {
		case i == c:
		case m != 0:
			p.chain = append(p.chain, i)
		default:
			p.tests = append(p.tests, i)
		}
	}
	// Jacobi order: by distance from the dominant body at the start.
	sort.SliceStable(p.chain, func(a, b int) bool {
		return s.X[p.chain[a]].Sub(s.X[c]).Norm2() < s.X[p.chain[b]].Sub(s.X[c]).Norm2()
	})
	p.eta = make([]float64, len(p.chain))
	sum := s.GM[c]
	for k, j := range p.chain {
		sum += s.GM[j]
		p.eta[k] = sum
	}
	w.jx = make([]vec.V, n)
	w.jv = make([]vec.V, n)
	w.ja = make([]vec.V, n)
}

func equalFloats(a, b []float64) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// toMap fills jx, jv from the Cartesian state. The central slot holds the
// barycentre of the massive bodies.
func (w *WisdomHolman) toMap(s *System) {
	p := &w.plan
	c := p.central
	gm := s.GM
	sumM := gm[c]
	sumX := s.X[c].Scale(gm[c])
	sumV := s.V[c].Scale(gm[c])
	for _, j := range p.chain {
		w.jx[j] = s.X[j].Sub(sumX.Scale(1 / sumM))
		w.jv[j] = s.V[j].Sub(sumV.Scale(1 / sumM))
		sumM += gm[j]
		sumX = sumX.AddScaled(gm[j], s.X[j])
		sumV = sumV.AddScaled(gm[j], s.V[j])
	}
	w.jx[c] = sumX.Scale(1 / sumM)
	w.jv[c] = sumV.Scale(1 / sumM)
	xc, vc := s.X[c], s.V[c]
	for _, t := range p.tests {
		w.jx[t] = s.X[t].Sub(xc)
		w.jv[t] = s.V[t].Sub(vc)
	}
}

// fromMap writes the Cartesian state back from jx, jv.
func (w *WisdomHolman) fromMap(s *System) {
	p := &w.plan
	c := p.central
	bx, bv := w.jx[c], w.jv[c] // barycentre of chain[0..k]
	for k := len(p.chain) - 1; k >= 0; k-- {
		j := p.chain[k]
		f := s.GM[j] / p.eta[k]
		bx = bx.AddScaled(-f, w.jx[j])
		bv = bv.AddScaled(-f, w.jv[j])
		s.X[j] = w.jx[j].Add(bx)
		s.V[j] = w.jv[j].Add(bv)
	}
	s.X[c], s.V[c] = bx, bv
	w.fromMapTests(s, 0, len(p.tests))
}

func (w *WisdomHolman) fromMapTests(s *System, lo, hi int) {
	c := w.plan.central
	xc, vc := s.X[c], s.V[c]
	for _, t := range w.plan.tests[lo:hi] {
		s.X[t] = w.jx[t].Add(xc)
		s.V[t] = w.jv[t].Add(vc)
	}
}

// kickAccel turns Cartesian accelerations a into the kick accelerations ja:
// the map-coordinate acceleration minus its Kepler term.
func (w *WisdomHolman) kickAccel(gm []float64, a []vec.V) {
	p := &w.plan
	c := p.central
	sumM := gm[c]
	sumA := a[c].Scale(gm[c])
	for k, j := range p.chain {
		aj := a[j].Sub(sumA.Scale(1 / sumM))
		x := w.jx[j]
		r2 := x.Dot(x)
		w.ja[j] = aj.AddScaled(p.eta[k]/(r2*math.Sqrt(r2)), x)
		sumM += gm[j]
		sumA = sumA.AddScaled(gm[j], a[j])
	}
	w.ja[c] = sumA.Scale(1 / sumM)
}

func (w *WisdomHolman) kickAccelTests(gm []float64, a []vec.V, lo, hi int) {
	c := w.plan.central
	ac, mu := a[c], gm[c]
	for _, t := range w.plan.tests[lo:hi] {
		x := w.jx[t]
		r2 := x.Dot(x)
		w.ja[t] = a[t].Sub(ac).AddScaled(mu/(r2*math.Sqrt(r2)), x)
	}
}

// kick applies tau times the kick accelerations, after computing them.
func (w *WisdomHolman) kick(s *System, pool *workPool, tau float64) {
	w.kickAccel(s.GM, s.A)
	for _, j := range w.plan.chain {
		w.jv[j] = w.jv[j].AddScaled(tau, w.ja[j])
	}
	c := w.plan.central
	w.jv[c] = w.jv[c].AddScaled(tau, w.ja[c])
	nt := len(w.plan.tests)
	if pool.count(nt, testChunk) <= 1 {
		w.kickTests(s, tau, 0, nt)
		return
	}
	pool.run(nt, testChunk, func(lo, hi int) { w.kickTests(s, tau, lo, hi) })
}

func (w *WisdomHolman) kickTests(s *System, tau float64, lo, hi int) {
	w.kickAccelTests(s.GM, s.A, lo, hi)
	for _, t := range w.plan.tests[lo:hi] {
		w.jv[t] = w.jv[t].AddScaled(tau, w.ja[t])
	}
}

// drift advances every Kepler orbit exactly by tau, and the barycentre in
// a straight line.
func (w *WisdomHolman) drift(pool *workPool, tau float64) {
	p := &w.plan
	c := p.central
	for k, j := range p.chain {
		w.jx[j], w.jv[j] = kepler.Drift(p.eta[k], w.jx[j], w.jv[j], tau)
	}
	w.jx[c] = w.jx[c].AddScaled(tau, w.jv[c])
	nt := len(p.tests)
	if pool.count(nt, testChunk) <= 1 {
		w.driftTests(tau, 0, nt)
		return
	}
	pool.run(nt, testChunk, func(lo, hi int) { w.driftTests(tau, lo, hi) })
}

func (w *WisdomHolman) driftTests(tau float64, lo, hi int) {
	mu := w.plan.gm[w.plan.central]
	for _, t := range w.plan.tests[lo:hi] {
		w.jx[t], w.jv[t] = kepler.Drift(mu, w.jx[t], w.jv[t], tau)
	}
}

// testChunk is the fewest test bodies per worker for the drift and kick
// loops (a Kepler drift costs ~0.1 us: below this, starting goroutines
// costs more than it saves).
const testChunk = 2048

// Step implements Stepper.
func (w *WisdomHolman) Step(s *System, f *Field, h float64) {
	w.prepare(s, f.Stack)
	w.toMap(s)
	last := len(w.kicks) - 1
	for k, d := range w.kicks {
		w.kick(s, &f.pool, d*h)
		if k == last {
			break
		}
		w.drift(&f.pool, w.drifts[k]*h)
		w.fromMap(s)
		f.Eval(s.GM, s.X, s.V, s.A)
	}
	w.fromMap(s)
	s.T += h
}
