package integrator

import (
	"fmt"

	"mgorbit/kernels"
	"mgorbit/kernels/vec"
)

// LogH is the logarithmic-Hamiltonian leapfrog (Mikkola & Tanikawa, Mon.
// Not. R. Astron. Soc. 310, 745 (1999); Preto & Tremaine, Astron. J. 118,
// 2532 (1999)), and compositions of it. With H = T(v) + U(x), W = -U > 0
// and the binding energy B = -H fixed at its initial value, the
// time-transformed Hamiltonian ln(T + B) - ln(W) splits into a drift and a
// kick that are both exact:
//
//	drift by ds:  dt = ds/(T + B),  x += dt v,  t += dt
//	kick  by ds:  dt = ds/W,        v += dt a(x)
//
// The physical step is proportional to W ~ 1/r, short at pericentre and long
// at apocentre, and for a pure Kepler problem the drift-kick-drift map
// follows the exact orbit, the error being only in the time along it
// (Preto & Tremaine 1999; measured here: the energy stays at rounding level
// for e = 0.99 at 50 steps per orbit, while kick-drift-kick loses 20 per
// cent at e = 0.9). So e = 0.9 or 0.99 orbits need no tiny fixed step.
// Each step costs two force evaluations per substep weight (the kick's and
// the end's, which keeps s.A valid).
//
// T and U: with two or more massive bodies, those of the massive bodies
// (kinetic energy relative to their barycentre, pair potentials from the
// stack, both per G); test bodies ride along with the same time steps. With
// one massive body, the test bodies' orbits about it: T = sum |v - v_c|^2/2,
// U = sum of their potentials. The fictitious step is ds = 2 B_0 h (by the
// virial theorem the mean of W over time is 2B for 1/r potentials, so the
// mean physical step is h), or W_0 h for unbound systems.
//
// Step(h) advances s.T by a varying amount (VariableStep). Velocity-dependent
// stacks (gr1pn) are not separable: Applies returns an error for them (use
// gr-orbit, the position-only relativistic form, whose potential depends
// on h = |x x v|, which the kicks and drifts conserve).
type LogH struct {
	name    string
	order   int
	weights []float64

	ready   bool
	gm      []float64
	central int // the only massive body, or -1 with several
	massive []int
	tests   []int
	binding float64 // B = -(T + U) at the start
	dsPerH  float64
}

// NewLogHLeapfrog returns the logarithmic-Hamiltonian leapfrog (drift-kick-
// drift in the fictitious time), second order.
func NewLogHLeapfrog() *LogH {
	return &LogH{name: "logh-leapfrog", order: 2, weights: []float64{1}}
}

// NewLogHYoshida4 returns Yoshida's fourth-order triple jump of the
// logarithmic-Hamiltonian leapfrog (weights as NewYoshida4).
func NewLogHYoshida4() *LogH {
	return &LogH{name: "logh-yoshida4", order: 4, weights: NewYoshida4().Weights()}
}

// Name implements Stepper.
func (l *LogH) Name() string { return l.name }

// Order implements Stepper.
func (l *LogH) Order() int { return l.order }

// VariableStep implements VariableStep.
func (l *LogH) VariableStep() {}

// Applies implements Applicability.
func (l *LogH) Applies(stack *kernels.Stack, gm []float64) error {
	if stack.VelocityDependent() {
		return fmt.Errorf("the logarithmic-Hamiltonian leapfrog needs a separable Hamiltonian, but the stack %s depends on the velocity; "+
			"use gr-orbit (the position-only relativistic orbit) instead of gr1pn, or a Yoshida method", stack)
	}
	nm, nt := 0, 0
	for _, m := range gm {
		if m != 0 {
			nm++
		} else {
			nt++
		}
	}
	if nm == 0 || (nm == 1 && nt == 0) {
		return fmt.Errorf("the logarithmic-Hamiltonian leapfrog needs an orbit: two massive bodies, or a massive body and a test body")
	}
	return nil
}

func (l *LogH) prepare(s *System, st *kernels.Stack) {
	if l.ready && equalFloats(l.gm, s.GM) {
		return
	}
	if err := l.Applies(st, s.GM); err != nil {
		panic("integrator: " + err.Error())
	}
	l.ready = true
	l.gm = append([]float64(nil), s.GM...)
	l.massive, l.tests = nil, nil
	for i, m := range s.GM {
		if m != 0 {
			l.massive = append(l.massive, i)
		} else {
			l.tests = append(l.tests, i)
		}
	}
	l.central = -1
	if len(l.massive) == 1 {
		l.central = l.massive[0]
	}
	w := l.attraction(s, st)
	if !(w > 0) {
		panic(fmt.Sprintf("integrator: logarithmic-Hamiltonian leapfrog: the potential must be attractive (-U = %g)", w))
	}
	l.binding = w - l.kinetic(s)
	l.dsPerH = 2 * l.binding
	if !(l.binding > 0) {
		l.dsPerH = w
	}
}

// kinetic is T: see the type's comment.
func (l *LogH) kinetic(s *System) float64 {
	var t float64
	if l.central >= 0 {
		vc := s.V[l.central]
		for _, i := range l.tests {
			t += s.V[i].Sub(vc).Norm2()
		}
		return 0.5 * t
	}
	var m float64
	var p vec.V
	for _, i := range l.massive {
		m += s.GM[i]
		p = p.AddScaled(s.GM[i], s.V[i])
	}
	vcm := p.Scale(1 / m)
	for _, i := range l.massive {
		t += s.GM[i] * s.V[i].Sub(vcm).Norm2()
	}
	return 0.5 * t
}

// attraction is W = -U.
func (l *LogH) attraction(s *System, st *kernels.Stack) float64 {
	var w float64
	if c := l.central; c >= 0 {
		mu := s.GM[c]
		for _, i := range l.tests {
			w -= potential(st, mu, s.X[i].Sub(s.X[c]), s.V[i].Sub(s.V[c]))
		}
		return w
	}
	for a, i := range l.massive {
		for _, j := range l.massive[a+1:] {
			w -= s.GM[i] * potential(st, s.GM[j], s.X[i].Sub(s.X[j]), s.V[i].Sub(s.V[j]))
		}
	}
	return w
}

// potential is the stack's specific potential energy of a relative orbit:
// every term's Energy, without the kinetic v^2/2.
func potential(st *kernels.Stack, mu float64, x, v vec.V) float64 {
	p := st.Base.Energy(mu, x, v)
	for _, c := range st.Corrections {
		p += c.Energy(mu, x, v)
	}
	return p
}

// Step implements Stepper: drift-kick-drift in the fictitious time (the
// ordering for which the Kepler orbit is exact; kick-drift-kick is not),
// with the half-drifts of successive substeps merged, then one force
// evaluation at the end so that s.A is valid.
func (l *LogH) Step(s *System, f *Field, h float64) {
	l.prepare(s, f.Stack)
	ds := l.dsPerH * h
	w := l.weights
	pending := 0.5 * w[0]
	for k, wk := range w {
		l.drift(s, pending*ds)
		f.Eval(s.GM, s.X, s.V, s.A)
		kick(s, wk*ds/l.attraction(s, f.Stack))
		if k+1 < len(w) {
			pending = 0.5 * (wk + w[k+1])
		} else {
			pending = 0.5 * wk
		}
	}
	l.drift(s, pending*ds)
	f.Eval(s.GM, s.X, s.V, s.A)
}

// drift moves every body along its velocity for the physical time that
// the fictitious step sigma takes at the current kinetic energy.
func (l *LogH) drift(s *System, sigma float64) {
	dt := sigma / (l.kinetic(s) + l.binding)
	drift(s, dt)
	s.T += dt
}
