package integrator

import (
	"fmt"
	"sort"
	"strings"

	"mgorbit/kernels"
)

// Stepper advances a System by one step.
type Stepper interface {
	// Name is the method's name as scenarios write it.
	Name() string
	// Order is the global order of accuracy (error ~ h^Order).
	Order() int
	// Step advances s by h. s.A must be valid on entry and is valid on exit.
	Step(s *System, f *Field, h float64)
}

var steppers = map[string]func() Stepper{
	"leapfrog": func() Stepper { return NewLeapfrog() },
	"yoshida4": func() Stepper { return NewYoshida4() },
	"yoshida6": func() Stepper { return NewYoshida6() },
	"rk45":     func() Stepper { return NewRK45(1e-12) },

	"wisdom-holman":   func() Stepper { return NewWisdomHolman() },
	"wisdom-holman-4": func() Stepper { return NewWisdomHolman4() },
	"wisdom-holman-6": func() Stepper { return NewWisdomHolman6() },
	"logh-leapfrog":   func() Stepper { return NewLogHLeapfrog() },
	"logh-yoshida4":   func() Stepper { return NewLogHYoshida4() },
}

// Applicability is implemented by steppers that work only for some
// systems (the Wisdom-Holman map needs one dominant mass and position-only
// kicks). Callers check it before the first Step, which panics otherwise.
type Applicability interface {
	Applies(stack *kernels.Stack, gm []float64) error
}

// KeplerSplit is implemented by steppers whose drift is the exact Kepler
// flow about the dominant mass (Wisdom-Holman): the step need not resolve
// the pericentre passage, only the perturbation.
type KeplerSplit interface {
	ExactKeplerDrift()
}

// VariableStep is implemented by time-transformed steppers: Step(h)
// advances s.T by an amount that varies along the orbit (short near
// pericentre), h setting the mean. Drivers loop until s.T reaches the
// duration instead of counting steps.
type VariableStep interface {
	VariableStep()
}

// New returns the stepper with the given name.
func New(name string) (Stepper, error) {
	mk, ok := steppers[name]
	if !ok {
		return nil, fmt.Errorf("unknown integrator %q (known: %s)", name, strings.Join(Names(), ", "))
	}
	return mk(), nil
}

// Names lists the integrator names.
func Names() []string {
	var n []string
	for k := range steppers {
		n = append(n, k)
	}
	sort.Strings(n)
	return n
}
