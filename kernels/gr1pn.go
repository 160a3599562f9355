package kernels

import (
	"math"

	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

// GR1PN is general relativity at first post-Newtonian order for a test body
// about a mass with parameter mu, in harmonic gauge:
//
//	a = -(mu/r^3) x + (mu/(c^2 r^3)) [(4 mu/r - v^2) x + 4 (x.v) v]
//
// (the test-body limit of the Einstein-Infeld-Hoffmann equations; e.g. Will,
// Living Rev. Relativ. 17, 4 (2014)). Its perihelion advance per orbit is
// 6 pi mu / (c^2 a (1 - e^2)). The conserved energy and angular momentum
// used by the accuracy guards are
//
//	E = v^2/2 - mu/r + (3 v^4/8 + 3 mu v^2/(2 r) + mu^2/(2 r^2)) / c^2
//	J = |x x v| (1 + (v^2/2 + 3 mu/r) / c^2)
//
// For massive pairs the test-body form is applied to each pair's relative
// motion with the source's mu: good when one body dominates.
type GR1PN struct{}

func init() {
	Register(GR1PN{}.Info(), func(Values) (Kernel, error) { return GR1PN{}, nil })
}

// Info implements Kernel.
func (GR1PN) Info() Info {
	return Info{
		Name:              "gr1pn",
		Role:              Base,
		Summary:           "general relativity, first post-Newtonian test-body equations (harmonic gauge)",
		Mu:                "G M, the same at every distance",
		VelocityDependent: true,
	}
}

// Values implements Kernel.
func (GR1PN) Values() Values { return Values{} }

const invC2 = 1 / (units.C * units.C)

// Accel implements Kernel.
func (GR1PN) Accel(mu float64, x, v vec.V) vec.V {
	r2 := x.Dot(x)
	r := math.Sqrt(r2)
	k := mu / (r2 * r)
	v2 := v.Dot(v)
	xv := x.Dot(v)
	cx := -k + k*invC2*(4*mu/r-v2)
	cv := k * invC2 * 4 * xv
	return vec.V{cx*x[0] + cv*v[0], cx*x[1] + cv*v[1], cx*x[2] + cv*v[2]}
}

// Energy implements Kernel: the 1PN conserved energy minus v^2/2.
func (GR1PN) Energy(mu float64, x, v vec.V) float64 {
	r := x.Norm()
	v2 := v.Dot(v)
	return -mu/r + (3*v2*v2/8+3*mu*v2/(2*r)+mu*mu/(2*r*r))*invC2
}

// JFactor implements AngularMomentumFactor.
func (GR1PN) JFactor(mu float64, x, v vec.V) float64 {
	return 1 + (0.5*v.Dot(v)+3*mu/x.Norm())*invC2
}
