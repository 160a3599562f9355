package reference

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/integrate/quad"

	"mgorbit/kernels/vec"
)

// Perturbation is an acceleration beyond Newton at relative position x and
// velocity v.
type Perturbation = func(x, v vec.V) vec.V

// Gauss is a first-order orbit average with its quadrature record.
type Gauss struct {
	Advance float64 // Delta varpi per orbit (rad)
	Nodes   int     // Gauss-Legendre nodes of the last quadrature
	// Tolerance is the relative change between the last two node counts.
	// A perturbation formed as a difference of two full laws (1PN minus
	// Newton) carries rounding of 1e-16 of Newton, which stalls the change
	// above the 1e-12 target; a stall below 1e-6 is accepted and reported.
	Tolerance float64
}

// gaussPlateau: a stalled change below this is accepted (see Gauss).
const gaussPlateau = 1e-6

// GaussAdvance returns the first-order apsidal advance per orbit (rad) that
// the perturbing acceleration perturb causes on the Kepler ellipse with
// semi-major axis a and eccentricity e about mu (see GaussAverage).
func GaussAdvance(mu, a, e float64, perturb Perturbation) (float64, error) {
	g, err := GaussAverage(mu, a, e, perturb)
	return g.Advance, err
}

// GaussAverage is the first-order apsidal advance per orbit of perturb on
// the Kepler ellipse (a, e) about mu:
//
//	Delta varpi = (1/(mu e)) Int_0^2pi [-R cos f + T (1 + r/p) sin f] r^2 df,
//
// R, T the radial and transverse components of perturb at the ellipse's
// position and Keplerian velocity, r = p/(1 + e cos f), p = a(1 - e^2).
// This is Gauss's equation d omega/dt = sqrt(p/mu)/e [-R cos f +
// T (1 + r/p) sin f] (planar, so no node term) with dt = r^2 df/h,
// h = sqrt(mu p). The orbit lies in the x-y plane with pericentre on +x,
// moving counter-clockwise.
//
// The advance is first order: relative error O(perturbation/Newton). Small
// e costs relative precision ~1e-16/e (the integral is O(e) before the 1/e).
func GaussAverage(mu, a, e float64, perturb Perturbation) (Gauss, error) {
	if !(mu > 0) || math.IsInf(mu, 0) || !(a > 0) || math.IsInf(a, 0) {
		return Gauss{}, fmt.Errorf("reference: Gauss average needs positive finite mu and a, got mu=%g a=%g", mu, a)
	}
	if !(e > 0 && e < 1) {
		return Gauss{}, fmt.Errorf("reference: Gauss average needs 0 < e < 1 (the pericentre of a circle is undefined), got e=%g", e)
	}
	p := a * (1 - e*e)
	vk := math.Sqrt(mu / p)
	integrand := func(f float64) float64 {
		c, s := math.Cos(f), math.Sin(f)
		r := p / (1 + e*c)
		rhat := vec.V{c, s, 0}
		that := vec.V{-s, c, 0}
		x := rhat.Scale(r)
		v := rhat.Scale(vk*e*s).AddScaled(vk*(1+e*c), that)
		acc := perturb(x, v)
		return (-acc.Dot(rhat)*c + acc.Dot(that)*(1+r/p)*s) * r * r
	}
	prev := quad.Fixed(integrand, 0, 2*math.Pi, minNodes, quad.Legendre{}, 0)
	lastChange := math.Inf(1)
	for n := 2 * minNodes; n <= maxNodes; n *= 2 {
		now := quad.Fixed(integrand, 0, 2*math.Pi, n, quad.Legendre{}, 0)
		if math.IsNaN(now) || math.IsInf(now, 0) {
			return Gauss{}, fmt.Errorf("reference: the perturbation is not finite on the orbit a=%g e=%g", a, e)
		}
		change := relChange(now, prev)
		if change <= quadTol || (change <= gaussPlateau && change >= lastChange/2) {
			return Gauss{Advance: now / (mu * e), Nodes: n, Tolerance: change}, nil
		}
		prev, lastChange = now, change
	}
	return Gauss{}, fmt.Errorf("reference: Gauss average not converged at %d nodes (a=%g e=%g)", maxNodes, a, e)
}
