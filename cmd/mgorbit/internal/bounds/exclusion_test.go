package bounds

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"

	"mgorbit/cmd/mgorbit/internal/scan"
	"mgorbit/integrator/study"
	"mgorbit/scenarios"
	"mgorbit/scenarios/units"
)

// gaussSlope is d(varpi)/d(alpha) per orbit at alpha -> 0 for the Yukawa
// term on a Kepler ellipse: Gauss's first-order equation (PHYSICS.md,
// Observables) with the radial perturbing acceleration
// R = -(alpha mu/r^2)(1 + r/lambda) e^(-r/lambda) and T = 0 gives
// Delta varpi / alpha = (1/e) Int_0^2pi (1 + r/lambda) e^(-r/lambda) cos f df,
// r = a (1 - e^2)/(1 + e cos f). The integrand is smooth and periodic, so a
// 400-point Gauss-Legendre rule is converged far below the 1% tested.
func gaussSlope(a, e, lambda float64) float64 {
	p := a * (1 - e*e)
	f := func(f float64) float64 {
		r := p / (1 + e*math.Cos(f))
		return (1 + r/lambda) * math.Exp(-r/lambda) * math.Cos(f)
	}
	return quad.Fixed(f, 0, 2*math.Pi, 400, quad.Legendre{}, 0) / e
}

// semiSlope is the same derivative from the semi-analytic path (the exact
// apsidal quadrature) at a small alpha: logged beside the check, not
// checked against (it is this project's own number).
func semiSlope(t *testing.T, lambda float64) float64 {
	t.Helper()
	const alpha = 1e-7
	text := strings.Replace(ellipseText, `lambda = "0.35 au"`, fmt.Sprintf(`lambda = "%.17g m"`, lambda), 1)
	text = strings.Replace(text, "alpha = 1e-6", fmt.Sprintf("alpha = %g", alpha), 1)
	sc, err := scenarios.Parse("slope.toml", []byte(text))
	if err != nil {
		t.Fatal(err)
	}
	s, err := study.SemiAnalyticOnly(sc)
	if err != nil {
		t.Fatal(err)
	}
	return s[0].SemiAnomalyPerOrbit / alpha
}

// The boundary alpha_max(lambda) of a precession-residual bound
// (0 ± sigma rad/orbit at 95%) matches k sigma / (d varpi/d alpha), the
// derivative from Gauss's first-order equation, to 1% at every lambda of
// the scan. The semi-analytic advance is the exact quadrature, so this
// tests the boundary search on a grid (alpha log-spaced, a factor 1.47
// between points) and that the observable is linear in alpha at the
// boundary; k = 1.959964 (A&S Table 26.5, memory; gonum's quantile).
func TestBoundaryMatchesFirstOrderSlope(t *testing.T) {
	const a, e, sigma = 0.35 * units.AU, 0.21, 1e-7
	tab, _ := runScan(t, ellipseText, scan.SemiAnalytic,
		"kernel.yukawa.lambda=list:0.05 au,0.2 au,0.35 au,1 au,5 au",
		"kernel.yukawa.alpha=log:1e-8:1e-2:37")
	set := parseSet(t, `
[[bound]]
name = "residual"
observable = "anomaly_rad_per_orbit"
value = 0
sigma = 1e-7
confidence = 0.95
`)
	ap := apply(t, tab, set)
	if j := ap.Used[0]; j.Column != "semi_analytic_anomaly_rad_per_orbit" || j.ErrorColumn != "" {
		t.Errorf("read %s (error %q); a semi-analytic scan should fall back to the semi-analytic column, which has no error estimate", j.Column, j.ErrorColumn)
	}
	bd, err := Boundary(ap.Table, 1, 0)
	if err != nil {
		t.Fatal(err)
	}
	k := TwoSidedK(0.95)
	if len(bd.Overall) != 5 {
		t.Fatalf("%d crossings, want one per lambda (5): %+v", len(bd.Overall), bd.Overall)
	}
	for _, c := range bd.Overall {
		lambda := c.Across * units.AU
		want := k * sigma / gaussSlope(a, e, lambda)
		rel := c.At/want - 1
		t.Logf("lambda = %5.3g au: alpha_max %.6e (interpolation error %.1e), k sigma/(d varpi/d alpha) %.6e (Gauss), relative %+.2e; semi-analytic slope gives %.6e",
			c.Across, c.At, c.InterpErr, want, rel, k*sigma/semiSlope(t, lambda))
		if math.Abs(rel) > 0.01 || !c.AllowedBelow || c.Bound != "residual" {
			t.Errorf("lambda = %g au: boundary %+v, want alpha_max = %.6e to 1%% with the allowed side below", c.Across, c, want)
		}
		if !(c.Lo <= c.At && c.At <= c.Hi) {
			t.Errorf("lambda = %g au: boundary %g outside its bracket [%g, %g]", c.Across, c.At, c.Lo, c.Hi)
		}
	}
}

// A residual made from a known (alpha0, lambda0) (the observable computed
// there, taken as the measured value with a 5% sigma) leaves an allowed
// band at lambda0 that holds alpha0, with edges at alpha0 (1 ± k sigma /
// value) to first order in alpha (the advance is linear in alpha, Gauss's
// equation); points well off it are excluded.
func TestSyntheticResidualAllowsItsOrigin(t *testing.T) {
	const alpha0, relSigma = 3.03e-6, 0.05 // lambda0 = 0.35 au, the scenario's
	sc, err := scenarios.Parse("origin.toml", []byte(strings.Replace(ellipseText, "alpha = 1e-6", fmt.Sprintf("alpha = %g", alpha0), 1)))
	if err != nil {
		t.Fatal(err)
	}
	s, err := study.SemiAnalyticOnly(sc)
	if err != nil {
		t.Fatal(err)
	}
	value := s[0].SemiAnomalyPerOrbit
	tab, _ := runScan(t, ellipseText, scan.SemiAnalytic,
		"kernel.yukawa.lambda=list:0.1 au,0.35 au,2 au",
		"kernel.yukawa.alpha=lin:1e-6:5e-6:41")
	set := parseSet(t, fmt.Sprintf(`
[[bound]]
name = "synthetic"
observable = "semi_analytic_anomaly_rad_per_orbit"
body = "Planet"
value = %.17g
sigma = %.17g
`, value, relSigma*value))
	ap := apply(t, tab, set)
	if !set.Bounds[0].ConfidenceDefault || set.Bounds[0].Confidence != 0.95 {
		t.Errorf("confidence %v, want the default 0.95", set.Bounds[0].Confidence)
	}
	bd, err := Boundary(ap.Table, 1, 0)
	if err != nil {
		t.Fatal(err)
	}
	k := TwoSidedK(0.95)
	var lo, hi []Crossing
	for _, c := range bd.Overall {
		if c.Across != 0.35 {
			continue
		}
		if c.AllowedBelow {
			hi = append(hi, c)
		} else {
			lo = append(lo, c)
		}
	}
	if len(lo) != 1 || len(hi) != 1 {
		t.Fatalf("at lambda0: lower edges %+v, upper edges %+v; want one of each", lo, hi)
	}
	for _, edge := range []struct {
		c    Crossing
		want float64
	}{{lo[0], alpha0 * (1 - k*relSigma)}, {hi[0], alpha0 * (1 + k*relSigma)}} {
		rel := edge.c.At/edge.want - 1
		t.Logf("edge %.6e, alpha0 (1 ± k sigma/value) %.6e: relative %+.2e", edge.c.At, edge.want, rel)
		if math.Abs(rel) > 1e-3 {
			t.Errorf("band edge %.6e, want %.6e (relative %.2e > 1e-3)", edge.c.At, edge.want, rel)
		}
	}
	if !(lo[0].At < alpha0 && alpha0 < hi[0].At) {
		t.Errorf("alpha0 = %g outside the allowed band [%g, %g]", alpha0, lo[0].At, hi[0].At)
	}
	// Grid points: the nearest to alpha0 allowed, far ones excluded.
	lam, al, ok := floats(t, ap.Table, "sweep_kernel_yukawa_lambda_au"), floats(t, ap.Table, "sweep_kernel_yukawa_alpha"), strs(t, ap.Table, AllowedColumn)
	for r := range ap.Table.Rows {
		if lam[r] != 0.35 {
			continue
		}
		switch {
		case math.Abs(al[r]-alpha0) < 0.5e-7 && ok[r] != "true":
			t.Errorf("alpha = %g (next to alpha0) not allowed: %s", al[r], ok[r])
		case (al[r] < 0.5*alpha0 || al[r] > 1.5*alpha0) && ok[r] != "false":
			t.Errorf("alpha = %g, far from alpha0, not excluded: %s", al[r], ok[r])
		}
	}
}

// scalarYukawaGamma is gamma - 1 from light bending for a scalar Yukawa
// term: light sees Newton's potential alone, theta = 4 mu/(c^2 b), while
// the mu an orbit at b measures is mu (1 + A), A = alpha (1 + u) e^-u,
// u = b/lambda; theta = 2 (1 + gamma) mu_dyn/(c^2 b) (PHYSICS.md, light
// deflection) then gives gamma - 1 = -2A/(1 + A).
func scalarYukawaGamma(alpha, b, lambda float64) float64 {
	u := b / lambda
	A := alpha * (1 + u) * math.Exp(-u)
	return -2 * A / (1 + A)
}

// The gamma bound of Bertotti, Iess & Tortora (Nature 425, 374 (2003)),
// gamma - 1 = (2.1 ± 2.3)e-5, on the deflection-based gamma at
// b = 1.6 Rsun: the deflection columns follow the closed form above, each
// point's verdict is the closed form's, and the boundary
// alpha_max(lambda) is the root of -2A/(1 + A) = 2.1e-5 - k 2.3e-5 to 1%.
func TestGammaBoundOnDeflection(t *testing.T) {
	tab, spec := runScan(t, ellipseText, scan.SemiAnalytic,
		"kernel.yukawa.lambda=log:0.001 au:1000 au:7",
		"kernel.yukawa.alpha=log:1e-7:1e-2:31")
	b := 1.6 * 6.957e8 // nominal solar radius, IAU 2015 Resolution B3
	tab, err := AddDeflection(tab, spec, "", b, "1.6 Rsun")
	if err != nil {
		t.Fatal(err)
	}
	lam, al := floats(t, tab, "sweep_kernel_yukawa_lambda_m"), floats(t, tab, "sweep_kernel_yukawa_alpha")
	g := floats(t, tab, "gamma_deflection_minus_1")
	worst := 0.0
	for r := range tab.Rows {
		want := scalarYukawaGamma(al[r], b, lam[r])
		d := math.Abs(g[r] - want)
		worst = math.Max(worst, d/math.Max(math.Abs(want), 1e-30))
		// Absolute 1e-12: far below the bound's 2.3e-5 (the line integral's
		// rounding is about 1e-16 of GR's angle).
		if d > 1e-12+1e-9*math.Abs(want) {
			t.Errorf("alpha = %g, lambda = %g m: gamma - 1 = %.10g, closed form %.10g", al[r], lam[r], g[r], want)
		}
	}
	t.Logf("gamma - 1 from the deflection columns against -2A/(1 + A): worst relative %.2g", worst)

	set := parseSet(t, `
[[bound]]
name = "cassini-gamma"
observable = "gamma_deflection_minus_1"
value = 2.1e-5
sigma = 2.3e-5
confidence = 0.95
impact = "1.6 Rsun"
`)
	ap := apply(t, tab, set)
	k := TwoSidedK(0.95)
	ok := strs(t, ap.Table, AllowedColumn)
	for r := range ap.Table.Rows {
		dev := math.Abs(scalarYukawaGamma(al[r], b, lam[r])-2.1e-5) / 2.3e-5
		if math.Abs(dev-k) < 1e-6 {
			continue // on the edge: rounding decides
		}
		if want := fmt.Sprint(dev <= k); ok[r] != want {
			t.Errorf("alpha = %g, lambda = %g m: allowed %s, the closed form says %s", al[r], lam[r], ok[r], want)
		}
	}
	bd, err := Boundary(ap.Table, 1, 0)
	if err != nil {
		t.Fatal(err)
	}
	// Between grid points the interpolated verdict (what the map shades)
	// follows the closed form too, on every lambda of the grid.
	lambdas := []float64{}
	for _, line := range bd.lines {
		lambdas = append(lambdas, line[0].across*units.AU)
	}
	checked := 0
	for i, lambda := range lambdas {
		for m := 0; m <= 200; m++ {
			alpha := 1e-7 * math.Pow(1e5, float64(m)/200)
			dev := math.Abs(scalarYukawaGamma(alpha, b, lambda)-2.1e-5) / 2.3e-5
			if math.Abs(dev/k-1) < 1e-3 {
				continue // the interpolation of a slightly curved pull may differ right at the edge
			}
			names, known := bd.ExcludedAt(float64(i), alpha)
			if !known || (len(names) == 1) != (dev > k) {
				t.Errorf("lambda %g m, alpha %g: interpolated verdict %v (known %v); closed form |pull| = %.4g against k = %.4g", lambda, alpha, names, known, dev, k)
			}
			checked++
		}
	}
	t.Logf("interpolated verdict matches the closed form at %d off-grid points", checked)
	level := 2.1e-5 - k*2.3e-5 // the lower edge: gamma - 1 < 0 for alpha > 0
	A := -level / (2 + level)
	if len(bd.Overall) == 0 {
		t.Fatal("no boundary")
	}
	for _, c := range bd.Overall {
		u := b / (c.Across * units.AU)
		want := A / ((1 + u) * math.Exp(-u))
		rel := c.At/want - 1
		t.Logf("lambda = %8.3g au: alpha_max %.6e, closed form %.6e, relative %+.2e", c.Across, c.At, want, rel)
		if math.Abs(rel) > 0.01 {
			t.Errorf("lambda = %g au: alpha_max %.6e, want %.6e", c.Across, c.At, want)
		}
	}
}
