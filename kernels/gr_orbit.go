package kernels

import (
	"math"

	"mgorbit/kernels/vec"
)

// GROrbit is the relativistic orbit in its position-only (Binet) form: the
// Schwarzschild orbit equation d^2u/dphi^2 + u = mu/h^2 + 3 mu u^2/c^2 (u = 1/r,
// h the specific angular momentum) is the Newtonian one plus the radial
// force -3 mu h^2/(c^2 r^4), i.e. the potential
//
//	Phi = -mu/r - mu h^2/(c^2 r^3),   a = -(mu/r^3) (1 + 3 h^2/(c^2 r^2)) x
//
// with h held at its conserved value (common textbook result; Gauss's
// equation gives 6 pi mu/(c^2 a (1 - e^2)) per orbit from it). It
// reproduces the orbit's shape and perihelion advance, not the
// harmonic-gauge timing of gr1pn (periods differ at order mu/(c^2 a)).
//
// h is computed from the current relative state, h = |x x v|. That is
// exactly the fixed-h law along every sub-flow the integrators use: a
// radial kick, a drift x += tau v and the exact Kepler flow all leave
// x x v unchanged. So the kicks need no implicit solve (Info reports the
// kernel as velocity-independent) and the Wisdom-Holman kick stays
// position-only and symplectic. With several massive bodies each pair uses
// its own relative h: an approximation that holds when one body dominates.
type GROrbit struct{}

// FixedAngularMomentumCentral is implemented by laws that are central once
// the specific angular momentum h = |x x v| is held at its conserved value
// (GROrbit). The semi-analytic references use it where Central does not
// apply.
type FixedAngularMomentumCentral interface {
	Kernel
	// RadialAtH returns the parts of a_r and Phi beyond Newton at distance
	// r from a source of parameter mu, for specific angular momentum h.
	RadialAtH(mu, h, r float64) (ar, phi float64)
}

func init() {
	Register(GROrbit{}.Info(), func(Values) (Kernel, error) { return GROrbit{}, nil })
}

// Info implements Kernel.
func (GROrbit) Info() Info {
	return Info{
		Name: "gr-orbit",
		Role: Base,
		Summary: "general relativity, orbit shape only: Newton plus the Binet-form term -mu h^2/(c^2 r^3) " +
			"(h = |x x v| conserved); reproduces the orbit shape and perihelion advance, not the harmonic-gauge timing",
		Mu: "G M, the same at every distance",
	}
}

// Values implements Kernel.
func (GROrbit) Values() Values { return Values{} }

// Accel implements Kernel.
func (GROrbit) Accel(mu float64, x, v vec.V) vec.V {
	r2 := x.Dot(x)
	h := x.Cross(v)
	k := -mu / (r2 * math.Sqrt(r2)) * (1 + 3*invC2*h.Dot(h)/r2)
	return x.Scale(k)
}

// Energy implements Kernel: -mu/r - mu h^2/(c^2 r^3), conserved with
// v^2/2 along the orbit.
func (GROrbit) Energy(mu float64, x, v vec.V) float64 {
	r2 := x.Dot(x)
	r := math.Sqrt(r2)
	h := x.Cross(v)
	return -mu / r * (1 + invC2*h.Dot(h)/r2)
}

// RadialAtH implements FixedAngularMomentumCentral.
func (GROrbit) RadialAtH(mu, h, r float64) (ar, phi float64) {
	k := mu * h * h * invC2 / (r * r * r)
	return -3 * k / r, -k
}
