package scan

import (
	"math"
	"strconv"
	"testing"

	"gonum.org/v1/gonum/stat"

	"mgorbit/scenarios/units"
)

// nearCircularYukawa is the full near-circular apsidal formula for the
// Yukawa force (PHYSICS.md, from Goldstein's psi = pi / sqrt(3 + r F'/F)):
// advance 2 pi [(1 - eps)^(-1/2) - 1] per orbit with
// eps = alpha u^2 e^-u / (1 + alpha (1 + u) e^-u), u = r/lambda.
func nearCircularYukawa(alpha, r, lambda float64) (advance, eps float64) {
	u := r / lambda
	eps = alpha * u * u * math.Exp(-u) / (1 + alpha*(1+u)*math.Exp(-u))
	return 2 * math.Pi * (1/math.Sqrt(1-eps) - 1), eps
}

// A dense semi-analytic curve over the Yukawa range matches the full
// near-circular formula at every point within 3 (e^2 + eps) relative (the
// formula is the e -> 0 limit). The range keeps u = a/lambda <= 5: the
// expansion is in the radial excursion over the range, e u, as well as in
// e, and at u = 10 the O((e u)^2) term alone exceeds 3 e^2 (checked below).
func TestYukawaNearCircularCurve(t *testing.T) {
	const alpha, e = 1e-4, 0.005
	spec := newSpec(t, yukawaText, SemiAnalytic, "kernel.yukawa.lambda=log:0.2 au:100 au:400")
	tab, _ := runScan(t, spec, Options{})
	lambda := column(t, tab, "sweep_kernel_yukawa_lambda_m")
	adv := column(t, tab, "semi_analytic_anomaly_rad_per_orbit")
	size := column(t, tab, "semi_analytic_orbit_size_a_m")
	worst := 0.0
	for r := range tab.Rows {
		// The formula at the orbit's mean radius (r_min + r_max)/2: the
		// initial state is Keplerian, so under the extra force the orbit's
		// size differs from a by about alpha.
		want, eps := nearCircularYukawa(alpha, size[r], lambda[r])
		rel := math.Abs(adv[r]/want - 1)
		worst = math.Max(worst, rel/(3*(e*e+eps)))
		if rel > 3*(e*e+eps) {
			t.Errorf("lambda = %.4g au: advance %.8g rad/orbit, near-circular formula %.8g: relative %.2g > 3(e^2 + eps) = %.2g",
				lambda[r]/units.AU, adv[r], want, rel, 3*(e*e+eps))
		}
	}
	t.Logf("%d points: worst deviation %.2f of the allowed 3(e^2 + eps)", len(tab.Rows), worst)

	// Integrated points (the same grid, sparse) agree with the formula too.
	spec = newSpec(t, yukawaText, Both, "kernel.yukawa.lambda=log:0.2 au:100 au:4")
	tab, _ = runScan(t, spec, Options{})
	lambda = column(t, tab, "sweep_kernel_yukawa_lambda_m")
	anom := column(t, tab, "anomaly_rad_per_orbit")
	anomErr := column(t, tab, "anomaly_integration_error_rad_per_orbit")
	size = column(t, tab, "semi_analytic_orbit_size_a_m")
	for r := range tab.Rows {
		want, eps := nearCircularYukawa(alpha, size[r], lambda[r])
		tol := 3*(e*e+eps) + 3*anomErr[r]/math.Abs(want)
		if rel := math.Abs(anom[r]/want - 1); rel > tol {
			t.Errorf("integrated, lambda = %.4g au: anomaly %.8g ± %.2g rad/orbit, formula %.8g: relative %.2g > %.2g",
				lambda[r]/units.AU, anom[r], anomErr[r], want, rel, tol)
		} else {
			t.Logf("integrated, lambda = %.4g au: relative deviation %.2g (allowed %.2g)", lambda[r]/units.AU, rel, tol)
		}
	}
}

// The difference from the near-circular formula is of second order in the
// eccentricity: halving e quarters it (checked where it is largest, u = 10
// and 20, so the quadrature's own error is far below it).
func TestYukawaNearCircularDeviationIsSecondOrder(t *testing.T) {
	const alpha = 1e-4
	dev := map[float64][]float64{}
	for _, e := range []float64{0.005, 0.0025} {
		spec := newSpec(t, yukawaText, SemiAnalytic, "kernel.yukawa.lambda=list:0.1 au,0.05 au", "body.Probe.e=list:"+ftoa(e))
		tab, _ := runScan(t, spec, Options{})
		lambda := column(t, tab, "sweep_kernel_yukawa_lambda_m")
		adv := column(t, tab, "semi_analytic_anomaly_rad_per_orbit")
		size := column(t, tab, "semi_analytic_orbit_size_a_m")
		for r := range tab.Rows {
			want, _ := nearCircularYukawa(alpha, size[r], lambda[r])
			dev[e] = append(dev[e], adv[r]/want-1)
		}
	}
	for k, u := range []float64{10, 20} {
		ratio := dev[0.005][k] / dev[0.0025][k]
		t.Logf("u = %g: relative deviation %.3g at e = 0.005, %.3g at e = 0.0025: ratio %.3f", u, dev[0.005][k], dev[0.0025][k], ratio)
		if math.Abs(ratio-4) > 0.2 {
			t.Errorf("u = %g: halving e divides the deviation by %.3f, want 4 (second order)", u, ratio)
		}
	}
}

// hyp2f1 sums the hypergeometric series (Abramowitz & Stegun 15.1.1),
// convergent for |z| < 1.
func hyp2f1(a, b, c, z float64) float64 {
	sum, term := 1.0, 1.0
	for n := 0; n < 500; n++ {
		term *= (a + float64(n)) * (b + float64(n)) / ((c + float64(n)) * float64(n+1)) * z
		sum += term
		if math.Abs(term) < 1e-17*math.Abs(sum) {
			break
		}
	}
	return sum
}

// vainshteinRate is the deep-screening anomalous advance rate of the
// induced-gravity parameterisation, independent of the orbit's size and
// the central mass (PHYSICS.md): -sigma (3c/(8 r_c)) sqrt(1 - e^2)
// 2F1(1/4, 3/4; 2; e^2), in rad/s, sigma = +1.
func vainshteinRate(rc, e float64) float64 {
	return -3 * units.C / (8 * rc) * math.Sqrt(1-e*e) * hyp2f1(0.25, 0.75, 2, e*e)
}

// deepness returns, at the apocentre, x^(3/2) with x = r/r_V and the
// fractional force change sqrt(r^3/(2 r_g r_c^2)) (PHYSICS.md): the
// relative sizes of the terms the deep-screening first-order rate leaves
// out (the next term of xi = 2 x^(3/2) (1 - x^(3/2) + ...), and second
// order in the perturbation).
func deepness(gm, a, e, rc float64) float64 {
	rg := 2 * gm / (units.C * units.C)
	rv := math.Cbrt(8.0 / 9 * rg * rc * rc)
	r := a * (1 + e)
	return math.Pow(r/rv, 1.5) + math.Sqrt(r*r*r/(2*rg*rc*rc))
}

// checkVainshteinFlat: integrated rates match the deep-screening formula
// point by point, and do not depend on the swept quantity (log-log slope 0).
func checkVainshteinFlat(t *testing.T, sweep string, xcol string, gm, a func(r int) float64) {
	const e, rc = 0.2, 1e19
	tab, _ := runScan(t, newSpec(t, vainshteinText, Both, sweep), Options{})
	anom := column(t, tab, "anomaly_rad_per_orbit")
	anomErr := column(t, tab, "anomaly_integration_error_rad_per_orbit")
	period := column(t, tab, "radial_period_s")
	x := column(t, tab, xcol)
	want := vainshteinRate(rc, e)
	var lx, ly []float64
	for r := range tab.Rows {
		rate := anom[r] / period[r]
		deep := deepness(gm(r), a(r), e, rc)
		if deep > 0.01 {
			t.Fatalf("%s = %g: not deep inside r_V (neglected terms %.2g)", xcol, x[r], deep)
		}
		// Twice the neglected terms' size, plus three error estimates.
		tol := 2*deep + 3*anomErr[r]/math.Abs(anom[r])
		rel := math.Abs(rate/want - 1)
		t.Logf("%s = %g: rate %.8g rad/s, deep-screening formula %.8g: relative %.2g (allowed %.2g)", xcol, x[r], rate, want, rel, tol)
		if rel > tol {
			t.Errorf("%s = %g: rate %.8g rad/s against %.8g: relative %.2g > %.2g", xcol, x[r], rate, want, rel, tol)
		}
		lx, ly = append(lx, math.Log10(x[r])), append(ly, math.Log10(-rate))
	}
	if span := lx[len(lx)-1] - lx[0]; span < 3 {
		t.Fatalf("%s spans %.2g decades, want at least 3", xcol, span)
	}
	_, slope := stat.LinearRegression(lx, ly, nil, false)
	t.Logf("%s: fitted log-log slope %.2g", xcol, slope)
	if math.Abs(slope) > 0.01 {
		t.Errorf("%s: the rate is not flat: log-log slope %.3g", xcol, slope)
	}
}

func TestVainshteinRateFlatInCentralMass(t *testing.T) {
	gms := []float64{0.1, 1, 10, 100}
	checkVainshteinFlat(t, "body.Star.mass=log:0.1 Msun:100 Msun:4", "sweep_body_star_mass_Msun",
		func(r int) float64 { return gms[r] * units.GMSun }, func(int) float64 { return 0.1 * units.AU })
}

func TestVainshteinRateFlatInOrbitSize(t *testing.T) {
	as := []float64{0.001, 0.01, 0.1, 1}
	checkVainshteinFlat(t, "body.Probe.a=log:0.001 au:1 au:4", "sweep_body_probe_a_au",
		func(int) float64 { return units.GMSun }, func(r int) float64 { return as[r] * units.AU })
}

// Over three decades of r_c the integrated rate follows 1/r_c: fitted
// slope -1 on log axes within 1%, each point on the formula.
func TestVainshteinRateInverseCrossover(t *testing.T) {
	const e, a = 0.2, 0.1 * units.AU
	tab, _ := runScan(t, newSpec(t, vainshteinText, Both, "kernel.vainshtein.r_c=log:1e18 m:1e21 m:4"), Options{})
	anom := column(t, tab, "anomaly_rad_per_orbit")
	anomErr := column(t, tab, "anomaly_integration_error_rad_per_orbit")
	period := column(t, tab, "radial_period_s")
	rc := column(t, tab, "sweep_kernel_vainshtein_r_c_m")
	var lx, ly []float64
	for r := range tab.Rows {
		rate := anom[r] / period[r]
		deep := deepness(units.GMSun, a, e, rc[r])
		want := vainshteinRate(rc[r], e)
		tol := 2*deep + 3*anomErr[r]/math.Abs(anom[r])
		if rel := math.Abs(rate/want - 1); rel > tol || deep > 0.01 {
			t.Errorf("r_c = %g m: rate %.8g against %.8g: relative %.2g (allowed %.2g; deepness %.2g)", rc[r], rate, want, rel, tol, deep)
		}
		lx, ly = append(lx, math.Log10(rc[r])), append(ly, math.Log10(-rate))
	}
	_, slope := stat.LinearRegression(lx, ly, nil, false)
	t.Logf("fitted slope of log|rate| against log r_c: %.6f over %.0f decades", slope, lx[len(lx)-1]-lx[0])
	if math.Abs(slope+1) > 0.01 {
		t.Errorf("fitted slope %.5f, want -1 within 1%%", slope)
	}
}

func ftoa(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }

// The series against a closed form: 2F1(1/2, 1/2; 3/2; z^2) = arcsin(z)/z
// (Abramowitz & Stegun 15.1.6); and the eccentricity factor against its
// expansion 1 - 13 e^2/32 (PHYSICS.md) to O(e^4).
func TestHypergeometricSeries(t *testing.T) {
	for _, z := range []float64{0.1, 0.5, 0.9} {
		if got, want := hyp2f1(0.5, 0.5, 1.5, z*z), math.Asin(z)/z; math.Abs(got/want-1) > 1e-14 {
			t.Errorf("2F1(1/2,1/2;3/2;%g^2) = %.16g, arcsin(z)/z = %.16g", z, got, want)
		}
	}
	for _, e := range []float64{0.01, 0.05} {
		f := math.Sqrt(1-e*e) * hyp2f1(0.25, 0.75, 2, e*e)
		if d := math.Abs(f - (1 - 13*e*e/32)); d > 2*math.Pow(e, 4) {
			t.Errorf("e = %g: factor %.12g against 1 - 13 e^2/32 = %.12g", e, f, 1-13*e*e/32)
		}
	}
}
