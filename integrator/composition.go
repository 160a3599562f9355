package integrator

import (
	"math"

	"mgorbit/kernels/vec"
)

// Composition is a symmetric composition of kick-drift-kick leapfrog steps
// S(w_1 h) ... S(w_n h). One weight is the leapfrog itself.
type Composition struct {
	name    string
	order   int
	weights []float64

	v0, vm, tmp []vec.V // scratch for implicit kicks
}

// NewLeapfrog returns the kick-drift-kick leapfrog (Stormer-Verlet), second
// order. Its spurious apsidal precession is about -1.8 (h Omega)^2 rad per
// orbit, so use it for anomalies by difference, not absolute values.
func NewLeapfrog() *Composition {
	return &Composition{name: "leapfrog", order: 2, weights: []float64{1}}
}

// NewYoshida4 returns Yoshida's fourth-order triple-jump composition
// (Yoshida, Phys. Lett. A 150, 262 (1990)): w1 = 1/(2 - 2^(1/3)),
// w0 = -2^(1/3)/(2 - 2^(1/3)), S(w1 h) S(w0 h) S(w1 h).
func NewYoshida4() *Composition {
	cbrt2 := math.Cbrt(2)
	w1 := 1 / (2 - cbrt2)
	w0 := -cbrt2 / (2 - cbrt2)
	return &Composition{name: "yoshida4", order: 4, weights: []float64{w1, w0, w1}}
}

// Yoshida's sixth-order "solution A" (Phys. Lett. A 150, 262 (1990), Table 1).
const (
	yoshidaA1 = -1.17767998417887
	yoshidaA2 = 0.235573213359357
	yoshidaA3 = 0.784513610477560
)

// NewYoshida6 returns Yoshida's sixth-order composition, solution A:
// S(w3 h) S(w2 h) S(w1 h) S(w0 h) S(w1 h) S(w2 h) S(w3 h) with
// w0 = 1 - 2 (w1 + w2 + w3). (In the reverse order of weights it is only
// fourth order: the tests measure the order at a fraction of a period.)
func NewYoshida6() *Composition {
	w0 := 1 - 2*(yoshidaA1+yoshidaA2+yoshidaA3)
	return &Composition{name: "yoshida6", order: 6,
		weights: []float64{yoshidaA3, yoshidaA2, yoshidaA1, w0, yoshidaA1, yoshidaA2, yoshidaA3}}
}

// Name implements Stepper.
func (c *Composition) Name() string { return c.name }

// Order implements Stepper.
func (c *Composition) Order() int { return c.order }

// Weights returns the substep weights (for tests and documentation).
func (c *Composition) Weights() []float64 { return append([]float64(nil), c.weights...) }

// Step implements Stepper.
func (c *Composition) Step(s *System, f *Field, h float64) {
	if f.Stack.VelocityDependent() {
		c.stepImplicit(s, f, h)
		return
	}
	// Velocity-independent kicks commute, so the closing half-kick of one
	// substep and the opening one of the next merge: one force evaluation
	// per substep.
	w := c.weights
	pending := 0.5 * w[0]
	for k, wk := range w {
		kickDrift(s, pending*h, wk*h)
		f.Eval(s.GM, s.X, s.V, s.A)
		if k+1 < len(w) {
			pending = 0.5 * (wk + w[k+1])
		} else {
			pending = 0.5 * wk
		}
	}
	kickOnly(s, pending*h)
	s.T += h
}

func kick(s *System, tau float64) {
	for i := range s.V {
		s.V[i] = s.V[i].AddScaled(tau, s.A[i])
	}
}

func drift(s *System, tau float64) {
	for i := range s.X {
		s.X[i] = s.X[i].AddScaled(tau, s.V[i])
	}
}

func (c *Composition) stepImplicit(s *System, f *Field, h float64) {
	for _, wk := range c.weights {
		c.implicitKick(s, f, 0.5*wk*h)
		drift(s, wk*h)
		f.Eval(s.GM, s.X, s.V, s.A)
		c.implicitKick(s, f, 0.5*wk*h)
	}
	f.Eval(s.GM, s.X, s.V, s.A)
	s.T += h
}

// maxKickIterations bounds the fixed-point iteration; post-Newtonian kicks
// converge to rounding in two or three passes.
const maxKickIterations = 12

// implicitKick solves v' = v + tau a(x, (v + v')/2) by fixed-point
// iteration, starting from the explicit guess v + tau a(x, v) (s.A holds
// a(x, v) or a close approximation on entry).
func (c *Composition) implicitKick(s *System, f *Field, tau float64) {
	n := len(s.V)
	if len(c.v0) != n {
		c.v0 = make([]vec.V, n)
		c.vm = make([]vec.V, n)
		c.tmp = make([]vec.V, n)
	}
	copy(c.v0, s.V)
	for i := range s.V {
		s.V[i] = c.v0[i].AddScaled(tau, s.A[i])
	}
	for it := 0; it < maxKickIterations; it++ {
		for i := range s.V {
			c.vm[i] = c.v0[i].Add(s.V[i]).Scale(0.5)
		}
		f.Eval(s.GM, s.X, c.vm, c.tmp)
		done := true
		for i := range s.V {
			nv := c.v0[i].AddScaled(tau, c.tmp[i])
			d := nv.Sub(s.V[i]).Norm2()
			if d > 1e-32*nv.Norm2() {
				done = false
			}
			s.V[i] = nv
		}
		if done {
			break
		}
	}
	copy(s.A, c.tmp) // a(x, v_mid): a close starting guess for the next kick
}
