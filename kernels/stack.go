package kernels

import (
	"fmt"
	"math"
	"strings"

	"mgorbit/kernels/vec"
)

// Stack is a base law of gravity plus corrections, each correction giving
// only its difference from Newton.
type Stack struct {
	Base        Kernel
	Corrections []Kernel

	central  []Central // corrections with a Radial fast path
	other    []Kernel  // corrections without one
	baseNewt bool      // base is plain Newton: use the inline formula
	velDep   bool
}

// NewStack checks the roles and prepares the fast paths.
func NewStack(base Kernel, corrections ...Kernel) (*Stack, error) {
	if base == nil {
		return nil, fmt.Errorf("a kernel stack needs a base law (one of %s)", strings.Join(baseNames(), ", "))
	}
	if base.Info().Role != Base {
		return nil, fmt.Errorf("kernel %s is a correction; the stack must start with a base law (one of %s)",
			base.Info().Name, strings.Join(baseNames(), ", "))
	}
	s := &Stack{Base: base, Corrections: corrections}
	_, s.baseNewt = base.(Newton)
	s.velDep = base.Info().VelocityDependent
	for _, c := range corrections {
		if c.Info().Role != Correction {
			return nil, fmt.Errorf("kernel %s is a base law and can only come first in the stack", c.Info().Name)
		}
		if c.Info().VelocityDependent {
			s.velDep = true
		}
		if cc, ok := c.(Central); ok {
			s.central = append(s.central, cc)
		} else {
			s.other = append(s.other, c)
		}
	}
	return s, nil
}

// MustStack is NewStack for stacks known to be valid (tests, references).
func MustStack(base Kernel, corrections ...Kernel) *Stack {
	s, err := NewStack(base, corrections...)
	if err != nil {
		panic(err)
	}
	return s
}

func baseNames() []string {
	var n []string
	for _, i := range All() {
		if i.Role == Base {
			n = append(n, i.Name)
		}
	}
	return n
}

// VelocityDependent reports whether any term needs the velocity.
func (s *Stack) VelocityDependent() bool { return s.velDep }

// IsCentral reports whether the whole stack is a central potential
// (velocity-independent, spherically symmetric).
func (s *Stack) IsCentral() bool {
	_, ok := s.Base.(Central)
	return ok && !s.velDep && len(s.other) == 0
}

// Accel returns the stack's acceleration on a body at x, velocity v,
// relative to a source of parameter mu.
func (s *Stack) Accel(mu float64, x, v vec.V) vec.V {
	var a vec.V
	if s.baseNewt {
		r2 := x.Dot(x)
		k := -mu / (r2 * math.Sqrt(r2))
		a = x.Scale(k)
	} else {
		a = s.Base.Accel(mu, x, v)
	}
	if len(s.central) > 0 {
		r := x.Norm()
		var ar float64
		for _, c := range s.central {
			dar, _ := c.Radial(mu, r)
			ar += dar
		}
		a = a.AddScaled(ar/r, x)
	}
	for _, c := range s.other {
		a = a.Add(c.Accel(mu, x, v))
	}
	return a
}

// Energy returns the conserved specific energy of the relative orbit:
// v^2/2 plus every term's part.
func (s *Stack) Energy(mu float64, x, v vec.V) float64 {
	e := 0.5*v.Dot(v) + s.Base.Energy(mu, x, v)
	for _, c := range s.Corrections {
		e += c.Energy(mu, x, v)
	}
	return e
}

// AngularMomentum returns the conserved specific angular momentum of the
// relative orbit (|x x v| times the base's factor for velocity-dependent laws).
func (s *Stack) AngularMomentum(mu float64, x, v vec.V) float64 {
	j := x.Cross(v).Norm()
	if f, ok := s.Base.(AngularMomentumFactor); ok {
		j *= f.JFactor(mu, x, v)
	}
	return j
}

// CorrectionRadial sums the central corrections' a_r and Phi at r: the part
// of a central stack beyond its base.
func (s *Stack) CorrectionRadial(mu, r float64) (ar, phi float64) {
	for _, c := range s.central {
		a, p := c.Radial(mu, r)
		ar += a
		phi += p
	}
	return ar, phi
}

// Reference returns the stack without its corrections (the comparison for
// an anomaly). A base with no corrections is compared against Newton.
func (s *Stack) Reference() *Stack {
	if len(s.Corrections) == 0 {
		return MustStack(Newton{})
	}
	return MustStack(s.Base)
}

// NewtonOnly reports whether the stack is plain Newtonian gravity.
func (s *Stack) NewtonOnly() bool { return s.baseNewt && len(s.Corrections) == 0 }

// String names the stack, e.g. "gr1pn + yukawa".
func (s *Stack) String() string {
	parts := []string{s.Base.Info().Name}
	for _, c := range s.Corrections {
		parts = append(parts, c.Info().Name)
	}
	return strings.Join(parts, " + ")
}
