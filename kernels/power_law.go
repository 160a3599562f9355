package kernels

import (
	"math"

	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

// PowerLaw is a fractional force change that goes as a power of distance:
//
//	a_r = -(mu/r^2) k (r/r0)^n
//	Phi = (mu k / ((n - 1) r)) (r/r0)^n           n != 1
//	Phi = (mu k / r0) ln(r/r0)                     n = 1
//
// (Phi = -Int a_r dr.) The potential is zero at infinity for n < 1 and at
// r = 0 for n > 1; for n = 1 it is zero at r0. Within 1e-4 of n = 1 the
// form (mu k/r0) [(r/r0)^(n-1) - 1]/(n - 1), zero at r0, keeps the digits
// that the large constant mu k/((n - 1) r0) would cost. Examples: n = 0 is
// a change of Newton's constant by k (no precession); n = -1 a 1/r^3 force
// (an exact apsidal angle, Goldstein's inverse-cube problem); n = 3 a
// harmonic term (the cosmological constant is k = -Lambda c^2 r0^3/(3 mu)).
// mu is the Newtonian G M the fraction refers to.
type PowerLaw struct {
	k, n, r0 float64
}

// powerLawNearLog is where the potential switches to the form zero at r0.
const powerLawNearLog = 1e-4

func init() {
	Register(powerLawInfo(), newPowerLaw)
}

func powerLawInfo() Info {
	return Info{
		Name:    "power-law",
		Role:    Correction,
		Summary: "power-law force change, a_r = -(mu/r^2) k (r/r0)^n; returns that term",
		Mu:      "the Newtonian G M the fraction k (r/r0)^n refers to",
		Params: []Param{
			{Name: "k", Kind: Number, Dim: units.Dimensionless,
				Doc:      "fractional force change at r0 (positive: extra attraction)",
				Required: true, Min: math.Inf(-1), Max: math.Inf(1)},
			{Name: "n", Kind: Number, Dim: units.Dimensionless,
				Doc:      "power of r/r0 (0: a rescaled Newton constant; -1: a 1/r^3 force)",
				Required: true, Min: -20, Max: 20},
			{Name: "r0", Kind: Number, Dim: units.Length, Unit: "m",
				Doc:      "reference distance where the fraction is k",
				Required: true, Min: 0, MinOpen: true, Max: math.Inf(1)},
		},
	}
}

func newPowerLaw(v Values) (Kernel, error) {
	return &PowerLaw{k: v.Num["k"], n: v.Num["n"], r0: v.Num["r0"]}, nil
}

// Info implements Kernel.
func (*PowerLaw) Info() Info { return powerLawInfo() }

// Values implements Kernel.
func (p *PowerLaw) Values() Values {
	return Values{Num: map[string]float64{"k": p.k, "n": p.n, "r0": p.r0}, Str: map[string]string{}}
}

// Radial implements Central.
func (p *PowerLaw) Radial(mu, r float64) (ar, phi float64) {
	if r == 0 || p.k == 0 {
		return 0, 0 // no direction at the centre
	}
	s := r / p.r0
	frac := p.k * math.Pow(s, p.n)
	ar = -mu / (r * r) * frac
	m := p.n - 1
	switch {
	case m == 0:
		phi = mu * p.k / p.r0 * math.Log(s)
	case math.Abs(m) < powerLawNearLog:
		phi = mu * p.k / p.r0 * math.Expm1(m*math.Log(s)) / m
	default:
		phi = mu / (m * r) * frac
	}
	return ar, phi
}

// Accel implements Kernel.
func (p *PowerLaw) Accel(mu float64, x, _ vec.V) vec.V {
	r := x.Norm()
	if r == 0 {
		return vec.V{}
	}
	ar, _ := p.Radial(mu, r)
	return x.Scale(ar / r)
}

// Energy implements Kernel.
func (p *PowerLaw) Energy(mu float64, x, _ vec.V) float64 {
	_, phi := p.Radial(mu, x.Norm())
	return phi
}
