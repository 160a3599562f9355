package study

import (
	"math"
	"testing"

	"mgorbit/integrator/kepler"
	"mgorbit/kernels"
	"mgorbit/scenarios"
	"mgorbit/scenarios/units"
)

// TestEccentricBinaryTimeTransformed: an e = 0.9 compact binary through the
// time-transformed logh-yoshida4 with the position-only gr-orbit law (the
// time-transformed steppers take no velocity-dependent forces). The
// integrated periastron advance must equal the exact apsidal quadrature of
// the same equations (Binet form, PHYSICS.md) within the integration-error
// estimate; the first-order Damour-Deruelle rate 3 (2 pi/P_b)^(5/3)
// (G M/c^3)^(2/3)/(1 - e^2) (Damour & Deruelle 1985) is logged beside it,
// where the difference is of order GM/(c^2 a (1 - e^2)).
func TestEccentricBinaryTimeTransformed(t *testing.T) {
	m1, m2 := 1.42*units.GMSun, 1.31*units.GMSun
	mu := m1 + m2
	a, e := 4e8, 0.9
	x, v, err := kepler.ToState(mu, kepler.Elements{A: a, E: e, M: 0.17})
	if err != nil {
		t.Fatal(err)
	}
	f1, f2 := m2/mu, m1/mu
	grOrbit, err := kernels.New("gr-orbit", kernels.Values{})
	if err != nil {
		t.Fatal(err)
	}
	sc := &scenarios.Scenario{Name: "eccentric-binary", Source: "test", Stack: kernels.MustStack(grOrbit),
		Bodies: []scenarios.Body{{Name: "A", GM: m1, X: x.Scale(-f1), V: v.Scale(-f1)},
			{Name: "B", GM: m2, Primary: "A", X: x.Scale(f2), V: v.Scale(f2)}},
		Integrator: scenarios.IntegratorSpec{Method: "logh-yoshida4", StepsPerOrbit: 400.3, Orbits: 12,
			EnergyTolerance: 1e-6, AngularMomentumTolerance: 1e-6}}
	s := run(t, sc)
	P := 2 * math.Pi * math.Sqrt(a*a*a/mu)
	dd := 3 * math.Pow(2*math.Pi/P, 5.0/3) * math.Pow(mu/(units.C*units.C*units.C), 2.0/3) / (1 - e*e) * P
	epsP := mu / (units.C * units.C * a * (1 - e*e))
	t.Logf("e = 0.9 binary: integrated %.9g rad/orbit (± %.2g), exact quadrature %.9g (%s), Damour-Deruelle %.9g (relative %.2g = %.1f eps_p)",
		s.AnomalyPerOrbit, s.AnomalyIntErr, s.SemiAnomalyPerOrbit, s.SemiPath, dd, s.AnomalyPerOrbit/dd-1, (s.AnomalyPerOrbit/dd-1)/epsP)
	if d := math.Abs(s.AnomalyPerOrbit - s.SemiAnomalyPerOrbit); d > 2*s.AnomalyIntErr+1e-9*math.Abs(s.SemiAnomalyPerOrbit) {
		t.Errorf("integrated %.10g vs exact quadrature %.10g: difference %.2g beyond the estimate %.2g", s.AnomalyPerOrbit, s.SemiAnomalyPerOrbit, d, s.AnomalyIntErr)
	}
	if s.EnergyErr > 1e-6 {
		t.Errorf("energy error %.2g", s.EnergyErr)
	}
}
