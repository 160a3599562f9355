package kernels

import (
	"fmt"
	"strings"
)

// MetricPotentials are the two potentials of a static weak-field metric,
//
//	ds^2 = -(1 + 2 Phi/c^2) c^2 dt^2 + (1 - 2 Psi/c^2) dx^2,
//
// at one distance r from a source, with their radial derivatives. Phi
// (time-time) moves slow bodies, a_r = -dPhi/dr; light feels Phi + Psi. In
// general relativity's weak field Phi = Psi = -mu/r, and the PPN parameter
// is gamma = Psi/Phi.
//
// Light and DLightDr are Phi + Psi and its derivative, given apart because
// for some corrections the sum is a small difference of Newton-sized parts
// (a coupling-fixed massive graviton at r << lambda bends light almost as
// general relativity does): the kernel computes it without that cancellation.
type MetricPotentials struct {
	Phi, Psi        float64 // m^2 s^-2
	DPhiDr, DPsiDr  float64 // m s^-2
	Light, DLightDr float64 // Phi + Psi and d(Phi + Psi)/dr
}

// Add returns the sum of two kernels' parts.
func (m MetricPotentials) Add(o MetricPotentials) MetricPotentials {
	return MetricPotentials{m.Phi + o.Phi, m.Psi + o.Psi, m.DPhiDr + o.DPhiDr, m.DPsiDr + o.DPsiDr,
		m.Light + o.Light, m.DLightDr + o.DLightDr}
}

// split returns the potentials with Light = Phi + Psi.
func split(phi, psi, dphi, dpsi float64) MetricPotentials {
	return MetricPotentials{Phi: phi, Psi: psi, DPhiDr: dphi, DPsiDr: dpsi, Light: phi + psi, DLightDr: dphi + dpsi}
}

// Lensing is implemented by kernels that say how their field enters the
// metric, so that light deflection and the Shapiro delay follow from them.
//
// What a kernel exchanges fixes the split of its potential phi(r) between
// Phi and Psi:
//
//   - the massless spin-2 field of general relativity: Phi = Psi = phi;
//   - a conformally coupled scalar: it adds phi to Phi and subtracts it from
//     Psi, so Phi + Psi and with it light are unchanged;
//   - a massive spin-2 field: Psi = Phi/2 (the exchange amplitude goes as
//     T.T - (1/3) T T instead of T.T - (1/2) T T), so with the coupling fixed
//     Phi = (4/3) phi, Psi = (2/3) phi and Phi + Psi = 2 phi.
//
// Both base laws, newton and gr1pn, give the weak field of general
// relativity, Phi = Psi = -mu/r: for light, "newton" is the Newtonian limit
// of the metric theory, not a corpuscular theory (which would bend light by
// half, Soldner's 2 mu/(c^2 b)). This keeps corrections independent of the
// base: a Correction returns its part beyond Phi = Psi = -mu/r whatever base
// it is stacked on.
type Lensing interface {
	// Metric returns the kernel's part of the potentials at distance r > 0
	// from a source of parameter mu (a Correction: the part beyond
	// Phi = Psi = -mu/r).
	Metric(mu, r float64) MetricPotentials
	// Carrier says what the kernel exchanges (which fixes its split).
	Carrier() string
}

// newtonMetric is general relativity's weak field, Phi = Psi = -mu/r.
func newtonMetric(mu, r float64) MetricPotentials {
	p, d := -mu/r, mu/(r*r)
	return split(p, p, d, d)
}

// scalarSplit is a conformally coupled scalar's part: phi in Phi, -phi in Psi.
// ar = -dphi/dr, as Central.Radial returns it.
func scalarSplit(ar, phi float64) MetricPotentials {
	return MetricPotentials{Phi: phi, Psi: -phi, DPhiDr: -ar, DPsiDr: ar} // Light = 0 exactly
}

// tensorSplit is a massless spin-2 part: phi in both potentials.
func tensorSplit(ar, phi float64) MetricPotentials {
	return split(phi, phi, -ar, -ar)
}

// massiveSpin2Replacing is the correction of a law whose whole field is
// massive spin-2 and replaces the base's: total Phi = N + phi (N = -mu/r the
// base's), total Psi = (N + phi)/2, so the correction's Psi is (phi - N)/2.
// light and dlight are the correction's Phi + Psi = (3/2)(N + phi) - 2 N and
// its derivative, which the kernel computes without cancellation.
func massiveSpin2Replacing(mu, r, ar, phi, light, dlight float64) MetricPotentials {
	n, dn := -mu/r, mu/(r*r)
	return MetricPotentials{Phi: phi, Psi: 0.5 * (phi - n), DPhiDr: -ar, DPsiDr: 0.5 * (-ar - dn),
		Light: light, DLightDr: dlight}
}

// massiveSpin2Added is the correction of massive spin-2 modes added to the
// base's massless field: Psi = phi/2.
func massiveSpin2Added(ar, phi float64) MetricPotentials {
	return split(phi, 0.5*phi, -ar, -0.5*ar)
}

// LensingReady reports, as an error, the first term of the stack that does
// not say how it enters the metric (nil when all do).
func (s *Stack) LensingReady() error {
	var missing []string
	if _, ok := s.Base.(Lensing); !ok {
		missing = append(missing, s.Base.Info().Name)
	}
	for _, c := range s.Corrections {
		if _, ok := c.(Lensing); !ok {
			missing = append(missing, c.Info().Name)
		}
	}
	if len(missing) > 0 {
		return fmt.Errorf("no light deflection for the stack %s: %s do(es) not declare a split of the metric potentials (only spherically symmetric static fields do)",
			s, strings.Join(missing, ", "))
	}
	return nil
}

// Metric returns the stack's potentials at distance r from a source of
// parameter mu: the base's, and the corrections' sum apart, so that small
// corrections keep their own digits.
func (s *Stack) Metric(mu, r float64) (base, corrections MetricPotentials, err error) {
	if err := s.LensingReady(); err != nil {
		return base, corrections, err
	}
	base = s.Base.(Lensing).Metric(mu, r)
	for _, c := range s.Corrections {
		corrections = corrections.Add(c.(Lensing).Metric(mu, r))
	}
	return base, corrections, nil
}

// Carriers lists what each term exchanges, "name: carrier", base first.
func (s *Stack) Carriers() []string {
	var out []string
	for _, k := range append([]Kernel{s.Base}, s.Corrections...) {
		c := "not declared"
		if l, ok := k.(Lensing); ok {
			c = l.Carrier()
		}
		out = append(out, k.Info().Name+": "+c)
	}
	return out
}
