package study

import (
	"math"
	"testing"

	"mgorbit/integrator/reference"
	"mgorbit/kernels"
	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

func mustKernel(t *testing.T, name string, num map[string]float64, str map[string]string) kernels.Kernel {
	t.Helper()
	k, err := kernels.New(name, kernels.Values{Num: num, Str: str})
	if err != nil {
		t.Fatal(err)
	}
	return k
}

// TestKernelsIntegratedMatchSemiAnalytic: for every alternative kernel, the
// precession measured from the integrated orbit (anomaly against Newton,
// same integrator and step) equals the exact apsidal quadrature of the same
// central potential (PHYSICS.md, "Exact reference for a central potential")
// at e = 0.1 and 0.6. The allowed difference is the run's own
// integration-error estimate (from the half-step run) plus the fit's
// standard error plus the quadrature's stated tolerance, with a safety factor
// of 2 on the estimates (common practice for Richardson-type estimates).
func TestKernelsIntegratedMatchSemiAnalytic(t *testing.T) {
	au := units.AU
	cases := []struct {
		name string
		k    kernels.Kernel
	}{
		{"yukawa", mustKernel(t, "yukawa", map[string]float64{"alpha": 1e-3, "lambda": 1.3 * au}, nil)},
		{"massive-graviton", mustKernel(t, "massive-graviton", map[string]float64{"lambda": 30 * au}, map[string]string{"normalisation": "static"})},
		{"tower", mustKernel(t, "tower", map[string]float64{"sites": 7, "circumference": 0.6 * au}, nil)},
		{"tower-continuum", mustKernel(t, "tower", map[string]float64{"sites": math.Inf(1), "circumference": 0.4 * au}, nil)},
		{"crossover", mustKernel(t, "crossover", map[string]float64{"r_c": 400 * au}, nil)},
		{"vainshtein", mustKernel(t, "vainshtein", map[string]float64{"r_v": 2 * au, "coupling": 1e-3}, nil)},
	}
	mu := units.GMSun
	for _, c := range cases {
		for _, e := range []float64{0.1, 0.6} {
			stack := kernels.MustStack(kernels.Newton{}, c.k)
			steps := 400.3
			if e == 0.6 {
				steps = 900.3
			}
			s := run(t, testScenario(t, stack, mu, au, e, "yoshida6", steps, 15))
			if s.SemiPath != reference.PathExact {
				t.Fatalf("%s e=%.1f: semi-analytic path %q (%s)", c.name, e, s.SemiPath, s.Notes)
			}
			// the quadrature's own tolerance, recomputed from the same state
			sc := testScenario(t, stack, mu, au, e, "yoshida6", steps, 15)
			x, v := sc.Bodies[1].X.Sub(sc.Bodies[0].X), sc.Bodies[1].V.Sub(sc.Bodies[0].V)
			ex, err := reference.FromState(mu, x, v, stack.CorrectionRadial)
			if err != nil {
				t.Fatal(err)
			}
			allowed := 2*(s.AnomalyIntErr+s.PrecessionStdErr) + ex.Tolerance*math.Abs(ex.AdvancePerOrbit)
			diff := math.Abs(s.AnomalyPerOrbit - s.SemiAnomalyPerOrbit)
			t.Logf("%-16s e=%.1f: integrated %.10g, exact %.10g rad/orbit, diff %.2g, allowed %.2g (integration %.2g, fit %.2g, quadrature %.2g)",
				c.name, e, s.AnomalyPerOrbit, s.SemiAnomalyPerOrbit, diff, allowed, s.AnomalyIntErr, s.PrecessionStdErr, ex.Tolerance)
			if diff > allowed {
				t.Errorf("%s e=%.1f: integrated anomaly %.10g differs from the exact quadrature %.10g by %.2g > %.2g",
					c.name, e, s.AnomalyPerOrbit, s.SemiAnomalyPerOrbit, diff, allowed)
			}
			// the radial period too
			if d := math.Abs(s.RadialPeriod - s.SemiRadialPeriod); d > 2*s.RadialPeriodErr+1e-12*s.RadialPeriod {
				t.Errorf("%s e=%.1f: radial period %.15g vs exact %.15g (diff %.2g, estimate %.2g)", c.name, e, s.RadialPeriod, s.SemiRadialPeriod, d, s.RadialPeriodErr)
			}
		}
	}
}

// TestYukawaNearCircular: at e <= 0.01 the integrated Yukawa precession
// follows the full near-circular apsidal formula 2 pi [(1 - eps)^(-1/2) - 1],
// eps = alpha u^2 e^-u / (1 + alpha (1 + u) e^-u), u = r/lambda
// (PHYSICS.md; Goldstein's apsidal angle pi / sqrt(3 + r F'/F)), to about
// 3 (e^2 + eps) relative. And the circular-orbit period shift against
// Kepler: P_phi/P_K = (1 + A)^(-1/2), A = alpha (1 + u) e^-u (PHYSICS.md).
func TestYukawaNearCircular(t *testing.T) {
	au := units.AU
	mu := units.GMSun
	for _, lam := range []float64{0.5 * au, 1 * au, 3 * au} {
		alpha := 1e-3
		yk := mustKernel(t, "yukawa", map[string]float64{"alpha": alpha, "lambda": lam}, nil)
		stack := kernels.MustStack(kernels.Newton{}, yk)
		e := 0.01
		s := run(t, testScenario(t, stack, mu, au, e, "yoshida6", 200.3, 20))
		r := s.SizeA
		u := r / lam
		eps := alpha * u * u * math.Exp(-u) / (1 + alpha*(1+u)*math.Exp(-u))
		want := 2 * math.Pi * (1/math.Sqrt(1-eps) - 1)
		tol := 3 * (e*e + eps)
		rel := s.AnomalyPerOrbit/want - 1
		t.Logf("lambda = %.2g au: integrated %.8g, near-circular formula %.8g, relative %.2g (tolerance %.2g)", lam/au, s.AnomalyPerOrbit, want, rel, tol)
		if math.Abs(rel) > tol {
			t.Errorf("lambda = %.2g au: relative difference %.3g > %.3g", lam/au, rel, tol)
		}
		// periods against Kepler at the measured size: P_phi/P_K = (1 + A)^(-1/2),
		// P_r = P_phi / sqrt(3 + r F'/F) = P_phi / sqrt(1 - eps) (PHYSICS.md)
		A := alpha * (1 + u) * math.Exp(-u)
		wantPhi := 1/math.Sqrt(1+A) - 1
		wantR := 1/math.Sqrt((1+A)*(1-eps)) - 1
		t.Logf("  period shifts vs Kepler: azimuthal %.6g (formula %.6g), radial %.6g (formula %.6g)", s.AzimuthalShiftKepler, wantPhi, s.RadialShiftKepler, wantR)
		if math.Abs(s.AzimuthalShiftKepler-wantPhi) > tol*math.Abs(wantPhi) || math.Abs(s.RadialShiftKepler-wantR) > tol*math.Abs(wantR) {
			t.Errorf("lambda = %.2g au: period shifts %.6g, %.6g; formulas %.6g, %.6g (tolerance %.2g relative)", lam/au, s.AzimuthalShiftKepler, s.RadialShiftKepler, wantPhi, wantR, tol)
		}
	}
}

// TestYukawaCircularPeriods: for an exactly circular orbit of radius r in the
// Yukawa force, v^2 = r |F|, and the azimuthal period against Kepler's
// P_K = 2 pi sqrt(r^3/mu) is (1 + A)^(-1/2), A = alpha (1 + u) e^-u
// (PHYSICS.md). The orbit has no pericentre: the precession is reported
// as not measurable.
func TestYukawaCircularPeriods(t *testing.T) {
	au := units.AU
	mu := units.GMSun
	alpha, lam := 1e-2, 2*au
	yk := mustKernel(t, "yukawa", map[string]float64{"alpha": alpha, "lambda": lam}, nil)
	stack := kernels.MustStack(kernels.Newton{}, yk)
	r := au
	u := r / lam
	A := alpha * (1 + u) * math.Exp(-u)
	vc := math.Sqrt(mu * (1 + A) / r)
	sc := testScenario(t, stack, mu, au, 0, "yoshida6", 300.3, 10)
	sc.Bodies[1].X, sc.Bodies[1].V = vec.V{r, 0, 0}, vec.V{0, vc, 0}
	s := run(t, sc)
	pk := 2 * math.Pi * math.Sqrt(r*r*r/mu)
	want := 1/math.Sqrt(1+A) - 1
	got := s.AzimuthalPeriod/pk - 1
	t.Logf("circular Yukawa orbit: azimuthal period shift %.10g, formula %.10g; circular=%v, precession %v (%s)", got, want, s.Circular, s.PrecessionPerOrbit, s.Notes)
	if !s.Circular || !math.IsNaN(s.PrecessionPerOrbit) {
		t.Errorf("circular orbit: want circular=true and no precession, got %v, %v", s.Circular, s.PrecessionPerOrbit)
	}
	if math.Abs(got-want) > 1e-9 {
		t.Errorf("azimuthal period shift %.10g, want %.10g", got, want)
	}
}

// hyp2f1 sums the Gauss hypergeometric series 2F1(a, b; c; z) for |z| < 1
// (A&S 15.1.1).
func hyp2f1(a, b, c, z float64) float64 {
	sum, term := 1.0, 1.0
	for n := 0; n < 2000; n++ {
		term *= (a + float64(n)) * (b + float64(n)) / ((c + float64(n)) * float64(n+1)) * z
		sum += term
		if math.Abs(term) < 1e-17*math.Abs(sum) {
			break
		}
	}
	return sum
}

// vainshteinRate is the deep-screening anomalous pericentre rate of the
// induced-gravity parameterisation (PHYSICS.md, after Lue & Starkman 2003 and
// Dvali, Gruzinov & Zaldarriaga 2003; eccentricity factor derived there):
// -sigma (3 c/(8 r_c)) sqrt(1 - e^2) 2F1(1/4, 3/4; 2; e^2).
func vainshteinRate(sigma, rc, e float64) float64 {
	return -sigma * 3 * units.C / (8 * rc) * math.Sqrt(1-e*e) * hyp2f1(0.25, 0.75, 2, e*e)
}

// TestVainshteinDeepScreeningRate: inside the Vainshtein radius the
// anomalous rate does not depend on the orbit's size or the central mass.
// Integrated, with 1/r_c exaggerated (r_c = 1e5 au puts r_V near 5.6 au for
// a solar mass, so orbits of 1e-4 to 0.1 au stay deep inside), over three
// decades of orbit size and of mass, to 1% (the tolerance); and by
// Gauss's first-order average at the real scale (r_c = 5 Gpc, 1 au), where
// the formula is exact to first order, to 1e-4.
func TestVainshteinDeepScreeningRate(t *testing.T) {
	au := units.AU
	rc := 1e5 * au
	e := 0.3
	want := vainshteinRate(1, rc, e)
	for _, c := range []struct{ a, m float64 }{{1e-4, 1}, {1e-3, 1}, {1e-2, 1}, {1e-1, 1}, {1e-2, 0.1}, {1e-2, 10}, {1e-2, 100}} {
		mu := c.m * units.GMSun
		vk := mustKernel(t, "vainshtein", map[string]float64{"r_c": rc}, nil)
		stack := kernels.MustStack(kernels.Newton{}, vk)
		s := run(t, testScenario(t, stack, mu, c.a*au, e, "yoshida6", 300.3, 8))
		rate := s.AnomalyPerOrbit / s.RadialPeriod
		t.Logf("a = %g au, M = %g Msun: integrated rate %.6g rad/s, formula %.6g, ratio %.5f", c.a, c.m, rate, want, rate/want)
		if math.Abs(rate/want-1) > 0.01 {
			t.Errorf("a = %g au, M = %g Msun: rate %.5g rad/s, want %.5g within 1%%", c.a, c.m, rate, want)
		}
	}
	// Real scale, Gauss's first-order average.
	rcReal := 5e9 * units.Parsec
	for _, ee := range []float64{0.0167, 0.3, 0.8} {
		mu := units.GMSun
		vk := mustKernel(t, "vainshtein", map[string]float64{"r_c": rcReal}, map[string]string{"sigma": "-1"})
		adv, err := reference.GaussAdvance(mu, au, ee, func(x, v vec.V) vec.V { return vk.Accel(mu, x, v) })
		if err != nil {
			t.Fatal(err)
		}
		rate := adv / (2 * math.Pi * math.Sqrt(au*au*au/mu))
		w := vainshteinRate(-1, rcReal, ee)
		t.Logf("real scale e = %.4f: Gauss rate %.8g rad/s = %.6g microarcsec/yr, formula %.8g", ee, rate, rate*units.JulianYear*units.ArcsecPerRad*1e6, w)
		if math.Abs(rate/w-1) > 1e-4 {
			t.Errorf("real scale e = %.4f: Gauss rate %.8g, formula %.8g", ee, rate, w)
		}
	}
	// PHYSICS.md: 3c/(8 r_c) = 4.743 microarcsec/yr at r_c = 5 Gpc.
	if v := 3 * units.C / (8 * rcReal) * units.JulianYear * units.ArcsecPerRad * 1e6; math.Abs(v-4.743) > 0.001 {
		t.Errorf("3c/(8 r_c) at 5 Gpc = %.4f microarcsec/yr, want 4.743", v)
	}
}
