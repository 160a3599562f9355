package kernels

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

// Role says where a kernel sits in a Stack.
type Role int

const (
	// Base kernels are a whole law of gravity; a stack has exactly one.
	Base Role = iota
	// Correction kernels return only their difference from Newton.
	Correction
)

func (r Role) String() string {
	if r == Base {
		return "base"
	}
	return "correction"
}

// Kernel is one force law between a source and a body.
type Kernel interface {
	// Info describes the kernel and its parameters.
	Info() Info
	// Values returns the parameters this instance was built with, in SI.
	Values() Values
	// Accel returns the acceleration on a body at position x relative to a
	// source of gravitational parameter mu, moving with velocity v relative
	// to it. A Correction returns only the part beyond Newton.
	Accel(mu float64, x, v vec.V) vec.V
	// Energy returns the kernel's part of the conserved specific energy of
	// the relative orbit, without the kinetic term v^2/2: the potential, or
	// for a velocity-dependent law its conserved energy minus v^2/2. A
	// Correction returns only its difference from Newton.
	Energy(mu float64, x, v vec.V) float64
}

// Central kernels are spherically symmetric and do not depend on velocity.
// The semi-analytic references and the fast force paths use Radial.
type Central interface {
	Kernel
	// Radial returns a_r = -dPhi/dr and Phi at distance r from a source of
	// parameter mu (for a Correction, the parts beyond Newton). a_r < 0
	// attracts.
	Radial(mu, r float64) (ar, phi float64)
}

// AngularMomentumFactor is implemented by kernels whose conserved angular
// momentum is not |x x v| (velocity-dependent laws): J = |x x v| * factor.
type AngularMomentumFactor interface {
	JFactor(mu float64, x, v vec.V) float64
}

// Kind tells a parameter's type.
type Kind int

const (
	// Number parameters are float64 in SI (or dimensionless).
	Number Kind = iota
	// Choice parameters take one of a fixed set of words.
	Choice
	// Text parameters take any non-empty string, such as a file path; like
	// choices they travel in Values.Str.
	Text
)

// Param declares one parameter of a kernel.
type Param struct {
	Name string
	Kind Kind
	Dim  units.Dim
	// Unit is the unit shown in listings (the SI value is what Values holds).
	Unit string
	Doc  string
	// Required parameters have no default. Optional ones without a default
	// (Default NaN) may be left out, for alternatives such as lambda or mass.
	Required bool
	Default  float64
	// Min and Max bound the value; MinOpen and MaxOpen exclude the bound.
	Min, Max         float64
	MinOpen, MaxOpen bool
	// Integer parameters must be whole numbers; AllowInf admits "inf".
	Integer  bool
	AllowInf bool
	Choices  []string
	// DefaultChoice is the default word of a Choice parameter.
	DefaultChoice string
}

// Range describes the allowed values, for listings and errors.
func (p Param) Range() string {
	if p.Kind == Choice {
		return "one of " + strings.Join(p.Choices, ", ")
	}
	if p.Kind == Text {
		return "a non-empty text"
	}
	lo, hi := "[", "]"
	if p.MinOpen {
		lo = "("
	}
	if p.MaxOpen {
		hi = ")"
	}
	s := fmt.Sprintf("%s%s, %s%s", lo, fmtBound(p.Min), fmtBound(p.Max), hi)
	if p.Integer {
		s = "whole number in " + s
	}
	if p.AllowInf {
		s += " or inf"
	}
	return s
}

func fmtBound(v float64) string {
	switch {
	case math.IsInf(v, 1):
		return "inf"
	case math.IsInf(v, -1):
		return "-inf"
	}
	return fmt.Sprintf("%g", v)
}

// Info describes a kernel.
type Info struct {
	Name string
	Role Role
	// Summary is one line for listings.
	Summary string
	// Mu says which gravitational parameter the kernel takes: where its mu
	// equals Newton's constant times the mass (large-distance, short-distance
	// or bare value).
	Mu string
	// VelocityDependent kernels need the velocity in Accel; integrators then
	// solve their kicks implicitly.
	VelocityDependent bool
	Params            []Param
}

// Values are a kernel's parameter values: numbers in SI, choices as words,
// texts as given.
type Values struct {
	Num map[string]float64
	Str map[string]string
}

// Constructor builds a kernel from checked values (defaults filled in).
type Constructor func(v Values) (Kernel, error)

type entry struct {
	info Info
	make Constructor
}

var registry = map[string]entry{}

// Register adds a kernel to the registry; kernels call it from init.
func Register(info Info, c Constructor) {
	if _, dup := registry[info.Name]; dup {
		panic("kernels: duplicate kernel " + info.Name)
	}
	registry[info.Name] = entry{info, c}
}

// All returns every registered kernel's Info, bases first, then by name.
func All() []Info {
	out := make([]Info, 0, len(registry))
	for _, e := range registry {
		out = append(out, e.info)
	}
	sort.Slice(out, func(i, j int) bool {
		if out[i].Role != out[j].Role {
			return out[i].Role < out[j].Role
		}
		return out[i].Name < out[j].Name
	})
	return out
}

// Lookup returns a kernel's Info by name.
func Lookup(name string) (Info, bool) {
	e, ok := registry[name]
	return e.info, ok
}

// Names lists the registered kernel names, sorted.
func Names() []string {
	var n []string
	for _, i := range All() {
		n = append(n, i.Name)
	}
	sort.Strings(n)
	return n
}

// New builds kernel name from the given values, filling defaults and
// checking every value against its declared range. Unknown parameter names
// are errors: a misspelt parameter never falls back to a default.
func New(name string, v Values) (Kernel, error) {
	e, ok := registry[name]
	if !ok {
		return nil, fmt.Errorf("unknown kernel %q (known: %s)", name, strings.Join(Names(), ", "))
	}
	full := Values{Num: map[string]float64{}, Str: map[string]string{}}
	known := map[string]Param{}
	for _, p := range e.info.Params {
		known[p.Name] = p
	}
	for k := range v.Num {
		if p, ok := known[k]; !ok || p.Kind != Number {
			return nil, unknownParam(e.info, k)
		}
	}
	for k := range v.Str {
		if p, ok := known[k]; !ok || (p.Kind != Choice && p.Kind != Text) {
			return nil, unknownParam(e.info, k)
		}
	}
	for _, p := range e.info.Params {
		if p.Kind == Text {
			s, ok := v.Str[p.Name]
			if !ok {
				if p.Required {
					return nil, fmt.Errorf("kernel %s: parameter %s is required (%s)", name, p.Name, p.Doc)
				}
				continue
			}
			if strings.TrimSpace(s) == "" || strings.ContainsRune(s, 0) {
				return nil, fmt.Errorf("kernel %s: parameter %s = %q must be a non-empty text without NUL bytes", name, p.Name, s)
			}
			full.Str[p.Name] = s
			continue
		}
		if p.Kind == Choice {
			s, ok := v.Str[p.Name]
			if !ok {
				if p.Required {
					return nil, fmt.Errorf("kernel %s: parameter %s is required (%s)", name, p.Name, p.Range())
				}
				s = p.DefaultChoice
			}
			if !contains(p.Choices, s) {
				return nil, fmt.Errorf("kernel %s: parameter %s = %q is not allowed (%s)", name, p.Name, s, p.Range())
			}
			full.Str[p.Name] = s
			continue
		}
		x, ok := v.Num[p.Name]
		if !ok {
			if p.Required {
				return nil, fmt.Errorf("kernel %s: parameter %s is required (%s, %s)", name, p.Name, p.Range(), p.Dim)
			}
			if math.IsNaN(p.Default) {
				continue
			}
			x = p.Default
		}
		if err := p.check(x); err != nil {
			return nil, fmt.Errorf("kernel %s: parameter %s = %g: %v", name, p.Name, x, err)
		}
		full.Num[p.Name] = x
	}
	return e.make(full)
}

func unknownParam(info Info, k string) error {
	var names []string
	for _, p := range info.Params {
		names = append(names, p.Name)
	}
	return fmt.Errorf("kernel %s: unknown parameter %q (allowed: %s)", info.Name, k, strings.Join(names, ", "))
}

func (p Param) check(x float64) error {
	if math.IsNaN(x) {
		return fmt.Errorf("not a number")
	}
	if math.IsInf(x, 0) {
		if p.AllowInf && x > 0 {
			return nil
		}
		return fmt.Errorf("not finite (allowed: %s)", p.Range())
	}
	if p.Integer && x != math.Trunc(x) {
		return fmt.Errorf("not a whole number (allowed: %s)", p.Range())
	}
	if x < p.Min || (p.MinOpen && x == p.Min) || x > p.Max || (p.MaxOpen && x == p.Max) {
		return fmt.Errorf("out of range (allowed: %s)", p.Range())
	}
	return nil
}

func contains(list []string, s string) bool {
	for _, c := range list {
		if c == s {
			return true
		}
	}
	return false
}
