package scenarios

import (
	"mgorbit/kernels"
	"mgorbit/kernels/vec"
)

// Scenario is a loaded, validated scenario: everything a run needs, in SI.
type Scenario struct {
	// Name and Description come from the file; Source is the file path or
	// "builtin:NAME".
	Name, Description, Source string
	// Hash is the SHA-256 of the scenario text, hex.
	Hash string
	// Text is the scenario file as written (kept in the output metadata).
	Text string

	Bodies []Body
	// Kernels are the stack's terms in the order written; Stack is built
	// from them (base first).
	Kernels []KernelSpec
	Stack   *kernels.Stack

	Integrator IntegratorSpec
}

// Body is one body with its initial state in the output frame.
type Body struct {
	Name string
	// GM is the gravitational parameter in m^3 s^-2 (0 for a test body).
	GM float64
	// Test bodies feel the massive ones and pull on nothing.
	Test bool
	// Primary names the body this one orbits ("" for none): elements,
	// observables and the relative orbit refer to it.
	Primary string
	// X and V are the initial position (m) and velocity (m/s) in the
	// output frame (barycentric unless the scenario asks otherwise).
	X, V vec.V
	// Radius in m (0 when not given).
	Radius float64
}

// KernelSpec is one term of the stack as the scenario gave it.
type KernelSpec struct {
	Name   string
	Values kernels.Values
	Kernel kernels.Kernel
}

// IntegratorSpec says how to integrate. Exactly one of StepsPerOrbit and
// Step is non-zero, and exactly one of Orbits and Duration.
type IntegratorSpec struct {
	// Method is an integrator name: leapfrog, yoshida4, yoshida6, rk45.
	Method string
	// StepsPerOrbit counts steps per initial Keplerian period of OrbitOf.
	StepsPerOrbit float64
	// Step is the time step in s.
	Step float64
	// Orbits counts initial Keplerian periods of OrbitOf.
	Orbits float64
	// Duration is the integration time in s.
	Duration float64
	// OrbitOf is the body whose initial Keplerian period (about its
	// primary) sets "orbit" above; default the first body with a primary.
	OrbitOf string
	// OutputEvery is the trajectory cadence in steps (default so that
	// about 200 rows per orbit are written, at least 1).
	OutputEvery int
	// Tolerance is the relative error per step for rk45 (default 1e-12).
	Tolerance float64
	// EnergyTolerance and AngularMomentumTolerance bound the relative
	// drift of the conserved quantities (defaults 1e-6).
	EnergyTolerance          float64
	AngularMomentumTolerance float64
	// Frame is "barycentric" (default) or "primary" (the first massive
	// body at rest at the origin initially).
	Frame string
}
