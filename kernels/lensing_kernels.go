package kernels

import (
	"math"

	"mgorbit/kernels/special"
)

// Each kernel's split of its field between the metric potentials Phi and
// Psi (see Lensing). The potentials come from the kernel's own Radial, so
// light sees exactly the field the orbits do.

const (
	carrierGR      = "massless spin-2 (general relativity's weak field, Phi = Psi = -mu/r)"
	carrierScalar  = "conformally coupled scalar (adds to Phi, subtracts from Psi: light does not see it)"
	carrierTensor  = "massless-spin-2-like tensor (adds to Phi and Psi alike)"
	carrierMassive = "massive spin-2 (Psi = Phi/2)"
)

// Metric implements Lensing: the Newtonian limit of general relativity.
func (Newton) Metric(mu, r float64) MetricPotentials { return newtonMetric(mu, r) }

// Carrier implements Lensing.
func (Newton) Carrier() string { return carrierGR }

// Metric implements Lensing: Phi = Psi = -mu/r, the weak field of the
// metric whose geodesics the 1PN equations are.
func (GR1PN) Metric(mu, r float64) MetricPotentials { return newtonMetric(mu, r) }

// Carrier implements Lensing.
func (GR1PN) Carrier() string { return carrierGR }

// Metric implements Lensing: a scalar Yukawa term is invisible to light, a
// tensor one adds its potential to both.
func (y *Yukawa) Metric(mu, r float64) MetricPotentials {
	ar, phi := y.Radial(mu, r)
	if y.exchange == "tensor" {
		return tensorSplit(ar, phi)
	}
	return scalarSplit(ar, phi)
}

// Carrier implements Lensing.
func (y *Yukawa) Carrier() string {
	if y.exchange == "tensor" {
		return carrierTensor
	}
	return carrierScalar
}

// Metric implements Lensing: the whole field is massive spin-2, Phi =
// k phi, Psi = (k/2) phi with phi = -mu e^(-r/lambda)/r; as a correction,
// minus the base's -mu/r in each.
//
// Light gets Phi + Psi = (3/2) k phi - 2 N (N = -mu/r) as
// -(2 mu/r) expm1(ln(3k/4) - u): for k = 4/3 it is 2 (phi - N), which
// vanishes as u at r << lambda, and stays exact there.
func (g *MassiveGraviton) Metric(mu, r float64) MetricPotentials {
	ar, phi := g.Radial(mu, r)
	u := r / g.lambda
	l := math.Log(0.75 * g.k)
	light := -2 * mu / r * math.Expm1(l-u)
	dlight := 2 * mu / (r * r) * math.Expm1(l+log1pMinusX(u))
	return massiveSpin2Replacing(mu, r, ar, phi, light, dlight)
}

// Carrier implements Lensing.
func (g *MassiveGraviton) Carrier() string { return carrierMassive }

// Metric implements Lensing: the zero mode is the base's massless field;
// the massive modes are spin-2 (modes = spin2, Psi = Phi/2 per mode) or
// scalars (modes = scalar, invisible to light).
func (tw *Tower) Metric(mu, r float64) MetricPotentials {
	ar, phi := tw.Radial(mu, r)
	if tw.t != 1 {
		return massiveSpin2Added(ar, phi)
	}
	return scalarSplit(ar, phi)
}

// Carrier implements Lensing.
func (tw *Tower) Carrier() string {
	if tw.t != 1 {
		return "massive spin-2 modes on the massless zero mode (Psi = Phi/2 per mode)"
	}
	return "scalar modes on the massless zero mode (invisible to light)"
}

// Metric implements Lensing: with modes = spin2 the whole brane field is a
// continuum of massive spin-2 modes (total Psi = total Phi/2, so gamma = 1/2
// at r << r_c); with modes = scalar the difference from Newton is carried
// by a scalar and light sees general relativity's field.
//
// With D_phi = 1 - (2/pi) f and D_F = 1 - (2/pi)(f + x g) the deficits of
// the potential and the force, the correction's Phi + Psi is
// -(mu/r) (3t/2 - 2 - (3t/2) D_phi), and its derivative
// (mu/r^2) (3t/2 - 2 - (3t/2) D_F): for t = 4/3 the constant vanishes and
// no cancellation is left at r << r_c.
func (k *Crossover) Metric(mu, r float64) MetricPotentials {
	ar, phi := k.Radial(mu, r)
	if k.t == 1 {
		return scalarSplit(ar, phi)
	}
	dPhi, dForce := special.CrossoverDeficits(r / k.rc)
	c := 1.5*k.t - 2
	light := -(mu / r) * (c - 1.5*k.t*dPhi)
	dlight := mu / (r * r) * (c - 1.5*k.t*dForce)
	return massiveSpin2Replacing(mu, r, ar, phi, light, dlight)
}

// Carrier implements Lensing.
func (k *Crossover) Carrier() string {
	if k.t != 1 {
		return "continuum of massive spin-2 modes replacing the massless field (Psi = Phi/2)"
	}
	return carrierScalar
}

// Metric implements Lensing: the galileon is conformally coupled, so
// gamma = (1 - s)/(1 + s) with s its potential over Newton's.
func (k *Vainshtein) Metric(mu, r float64) MetricPotentials {
	ar, phi := k.Radial(mu, r)
	return scalarSplit(ar, phi)
}

// Carrier implements Lensing.
func (k *Vainshtein) Carrier() string { return carrierScalar }
