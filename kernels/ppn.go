package kernels

import (
	"math"

	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

// PPN is the parameterised post-Newtonian law for a test body about a mass
// of parameter mu, with the Eddington parameters beta (non-linearity of the
// time-time metric) and gamma (space curvature per unit mass), in the
// standard PPN gauge (isotropic coordinates, which agree with harmonic ones
// at this order):
//
//	a = -(mu/r^3) x + (mu/(c^2 r^3)) [(2 (beta + gamma) mu/r - gamma v^2) x + 2 (1 + gamma) (x.v) v]
//
// (Will, Living Rev. Relativ. 17, 4 (2014), the test-body limit of the PPN
// equations of motion). At beta = gamma = 1 it is gr1pn term by term. The
// perihelion advance per orbit is (2 + 2 gamma - beta)/3 of general
// relativity's 6 pi mu/(c^2 a (1 - e^2)), and light is deflected by
// 2 (1 + gamma) mu/(c^2 b): a precession and a light-bending bound on gamma
// meet in one parameter space.
//
// The equations are the Euler-Lagrange equations, truncated at 1/c^2, of
// the test-body Lagrangian of the PPN metric g00 = -(1 - 2U + 2 beta U^2),
// gij = (1 + 2 gamma U) delta_ij, U = mu/(c^2 r):
//
//	L = v^2/2 + mu/r + (v^4/8 + (gamma + 1/2) mu v^2/r + (1/2 - beta) mu^2/r^2) / c^2
//
// so the energy and angular momentum the guards use are conserved to
// O(1/c^4):
//
//	E = v^2/2 - mu/r + (3 v^4/8 + (gamma + 1/2) mu v^2/r + (beta - 1/2) mu^2/r^2) / c^2
//	J = |x x v| (1 + (v^2/2 + (2 gamma + 1) mu/r) / c^2)
//
// (both equal gr1pn's at beta = gamma = 1). mu is G M at every distance.
type PPN struct {
	beta, gamma float64
}

func init() {
	Register(ppnInfo(), newPPN)
}

func ppnInfo() Info {
	eddington := func(name, doc string) Param {
		return Param{Name: name, Kind: Number, Dim: units.Dimensionless, Doc: doc,
			Default: 1, Min: math.Inf(-1), Max: math.Inf(1)}
	}
	return Info{
		Name: "ppn",
		Role: Base,
		Summary: "parameterised post-Newtonian test-body law with beta and gamma (general relativity at beta = gamma = 1); " +
			"perihelion advance (2 + 2 gamma - beta)/3 of relativity's",
		Mu:                "G M, the same at every distance",
		VelocityDependent: true,
		Params: []Param{
			eddington("beta", "Eddington beta: non-linearity of the time-time metric (1 in general relativity)"),
			eddington("gamma", "Eddington gamma: space curvature per unit mass (1 in general relativity; light bending (1 + gamma)/2 of relativity's)"),
		},
	}
}

func newPPN(v Values) (Kernel, error) {
	return PPN{beta: v.Num["beta"], gamma: v.Num["gamma"]}, nil
}

// Info implements Kernel.
func (PPN) Info() Info { return ppnInfo() }

// Values implements Kernel.
func (k PPN) Values() Values {
	return Values{Num: map[string]float64{"beta": k.beta, "gamma": k.gamma}, Str: map[string]string{}}
}

// Beta returns the Eddington parameter beta.
func (k PPN) Beta() float64 { return k.beta }

// Gamma returns the Eddington parameter gamma.
func (k PPN) Gamma() float64 { return k.gamma }

// PrecessionFactor is (2 + 2 gamma - beta)/3: the perihelion advance in
// units of general relativity's.
func (k PPN) PrecessionFactor() float64 { return (2 + 2*k.gamma - k.beta) / 3 }

// DeflectionFactor is (1 + gamma)/2: the light deflection in units of
// general relativity's 4 mu/(c^2 b).
func (k PPN) DeflectionFactor() float64 { return (1 + k.gamma) / 2 }

// Accel implements Kernel.
func (k PPN) Accel(mu float64, x, v vec.V) vec.V {
	r2 := x.Dot(x)
	if r2 == 0 {
		return vec.V{} // no direction at the centre
	}
	r := math.Sqrt(r2)
	q := mu / (r2 * r)
	v2 := v.Dot(v)
	cx := -q + q*invC2*(2*(k.beta+k.gamma)*mu/r-k.gamma*v2)
	cv := q * invC2 * 2 * (1 + k.gamma) * x.Dot(v)
	return vec.V{cx*x[0] + cv*v[0], cx*x[1] + cv*v[1], cx*x[2] + cv*v[2]}
}

// Energy implements Kernel: the conserved energy minus v^2/2.
func (k PPN) Energy(mu float64, x, v vec.V) float64 {
	r := x.Norm()
	v2 := v.Dot(v)
	return -mu/r + (3*v2*v2/8+(k.gamma+0.5)*mu*v2/r+(k.beta-0.5)*mu*mu/(r*r))*invC2
}

// JFactor implements AngularMomentumFactor.
func (k PPN) JFactor(mu float64, x, v vec.V) float64 {
	return 1 + (0.5*v.Dot(v)+(2*k.gamma+1)*mu/x.Norm())*invC2
}
