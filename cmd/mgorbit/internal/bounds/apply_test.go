package bounds

import (
	"fmt"
	"math"
	"sort"
	"strings"
	"testing"

	"mgorbit/cmd/mgorbit/internal/scan"
)

// An integrated scan's error estimate enters sigma in quadrature: a point
// 2.5 sigma off is excluded by sigma alone but allowed once an error
// estimate equal to sigma is added (2.5/sqrt 2 = 1.77 < 1.96).
func TestIntegrationErrorInQuadrature(t *testing.T) {
	tab, _ := runScan(t, ellipseText, scan.Both, "kernel.yukawa.alpha=list:1e-5,3e-5,1e-4")
	anom, errs := floats(t, tab, "anomaly_rad_per_orbit"), floats(t, tab, "anomaly_integration_error_rad_per_orbit")
	t.Logf("anomalies %v rad/orbit, error estimates %v", anom, errs)
	if !(errs[1] > 0) {
		t.Fatalf("error estimate %g: the test needs a positive one", errs[1])
	}
	sigma := errs[1]
	set := parseSet(t, fmt.Sprintf(`
[[bound]]
name = "residual"
observable = "anomaly_rad_per_orbit"
value = %.17g
sigma = %.17g
`, anom[1]-2.5*sigma, sigma))
	ap := apply(t, tab, set)
	j := ap.Used[0]
	if j.Column != "anomaly_rad_per_orbit" || j.ErrorColumn != "anomaly_integration_error_rad_per_orbit" {
		t.Errorf("read %s with error %s", j.Column, j.ErrorColumn)
	}
	pull := floats(t, ap.Table, PullColumn("residual"))
	ok := strs(t, ap.Table, AllowedColumn)
	// 1e-7: value = x - 2.5 sigma is rounded to an ulp of x, 2e-8 of 2.5 sigma here.
	if want := 2.5 / math.Sqrt2; math.Abs(pull[1]-want) > 1e-7 || ok[1] != "true" {
		t.Errorf("pull %.12g (want 2.5/sqrt 2 = %.12g), allowed %s (want true)", pull[1], want, ok[1])
	}
	for r := range tab.Rows {
		want := (anom[r] - j.Value) / math.Hypot(sigma, errs[r])
		if math.Abs(pull[r]/want-1) > 1e-12 {
			t.Errorf("row %d: pull %.12g, want (x - value)/sqrt(sigma^2 + err^2) = %.12g", r, pull[r], want)
		}
	}
}

// A limit is passed only by more than z err (z = 1.645 at 95%, one-sided):
// a point half that far above an upper limit stays allowed.
func TestLimitAllowsIntegrationError(t *testing.T) {
	tab, _ := runScan(t, ellipseText, scan.Both, "kernel.yukawa.alpha=list:1e-5,3e-5,1e-4")
	anom, errs := floats(t, tab, "anomaly_rad_per_orbit"), floats(t, tab, "anomaly_integration_error_rad_per_orbit")
	z := OneSidedZ(0.95)
	upper := anom[1] - 0.5*z*errs[1]
	ap := apply(t, tab, parseSet(t, fmt.Sprintf(`
[[bound]]
name = "cap"
observable = "anomaly_rad_per_orbit"
upper = %.17g
`, upper)))
	beyond := floats(t, ap.Table, BeyondColumn("cap"))
	ok := strs(t, ap.Table, AllowedColumn)
	by := strs(t, ap.Table, ExcludedByColumn)
	for r, want := range []string{"true", "true", "false"} {
		if math.Abs(beyond[r]-(anom[r]-upper)) > 1e-12*math.Abs(anom[r]) || ok[r] != want {
			t.Errorf("row %d: beyond %g (want %g), allowed %s (want %s)", r, beyond[r], anom[r]-upper, ok[r], want)
		}
	}
	if by[2] != "cap" || by[0] != "" {
		t.Errorf("excluded_by %q", by)
	}
}

// Two measurements with different confidence levels: under "each" a point
// is excluded by exactly the bounds whose |pull| passes their own k (the
// gamma pull from the closed form -2A/(1 + A), the residual's from the
// observable); under "chi-square" by pull1^2 + pull2^2 > -2 ln(1 - CL),
// the exact two-degree-of-freedom quantile (A&S 26.4.1, nu = 2).
func TestSeveralBoundsCombine(t *testing.T) {
	tab, spec := runScan(t, ellipseText, scan.SemiAnalytic,
		"kernel.yukawa.lambda=log:0.003 au:30 au:9",
		"kernel.yukawa.alpha=log:1e-8:1e-3:16")
	b := 1.6 * 6.957e8
	tab, err := AddDeflection(tab, spec, "Star", b, "1.6 Rsun")
	if err != nil {
		t.Fatal(err)
	}
	const sigmaP = 1e-8
	text := `
[[bound]]
name = "gamma"
observable = "gamma_deflection_minus_1"
value = 2.1e-5
sigma = 2.3e-5
confidence = 0.68
impact = "1.6 Rsun"
source = "Star"

[[bound]]
name = "residual"
observable = "semi_analytic_anomaly_rad_per_orbit"
value = 0
sigma = 1e-8
confidence = 0.95
`
	each := apply(t, tab, parseSet(t, text))
	chi := apply(t, tab, parseSet(t, text+"\n[combine]\nrule = \"chi-square\"\nconfidence = 0.95\n"))
	if want := -2 * math.Log(0.05); math.Abs(chi.ChiSquareThreshold/want-1) > 1e-10 {
		t.Errorf("chi-square threshold %.12g, want %.12g", chi.ChiSquareThreshold, want)
	}
	lam, al := floats(t, tab, "sweep_kernel_yukawa_lambda_m"), floats(t, tab, "sweep_kernel_yukawa_alpha")
	anom := floats(t, tab, "semi_analytic_anomaly_rad_per_orbit")
	byEach, okEach := strs(t, each.Table, ExcludedByColumn), strs(t, each.Table, AllowedColumn)
	byChi, okChi := strs(t, chi.Table, ExcludedByColumn), strs(t, chi.Table, AllowedColumn)
	kG, kP := TwoSidedK(0.68), TwoSidedK(0.95)
	count := map[string]int{}
	for r := range tab.Rows {
		pg := (scalarYukawaGamma(al[r], b, lam[r]) - 2.1e-5) / 2.3e-5
		pp := anom[r] / sigmaP
		var names []string
		if math.Abs(pg) > kG {
			names = append(names, "gamma")
		}
		if math.Abs(pp) > kP {
			names = append(names, "residual")
		}
		if math.Abs(math.Abs(pg)-kG) < 1e-6 || math.Abs(math.Abs(pp)-kP) < 1e-6 {
			continue
		}
		want := strings.Join(names, ",")
		count[want]++
		if byEach[r] != want || okEach[r] != fmt.Sprint(want == "") {
			t.Errorf("each, alpha %g, lambda %g m: excluded by %q (allowed %s), want %q", al[r], lam[r], byEach[r], okEach[r], want)
		}
		excluded := pg*pg+pp*pp > -2*math.Log(0.05)
		if okChi[r] != fmt.Sprint(!excluded) || (byChi[r] == ChiSquareName) != excluded {
			t.Errorf("chi-square, alpha %g, lambda %g m: allowed %s, excluded by %q; pulls %g, %g", al[r], lam[r], okChi[r], byChi[r], pg, pp)
		}
	}
	// The grid must test every combination.
	for _, c := range []string{"", "gamma", "residual", "gamma,residual"} {
		if count[c] == 0 {
			t.Errorf("no point excluded by exactly %q: %v", c, count)
		}
	}
	t.Logf("points by excluding set: %v", count)
	if each.Allowed+each.Excluded+each.Undetermined != each.Points || each.Points != 9*16 {
		t.Errorf("counts %d + %d + %d of %d", each.Allowed, each.Excluded, each.Undetermined, each.Points)
	}

	// One measurement: the two rules agree point by point (the one-degree
	// quantile is k^2).
	one := text[:strings.Index(text, "[[bound]]\nname = \"residual\"")]
	e1 := apply(t, tab, parseSet(t, one))
	c1 := apply(t, tab, parseSet(t, one+"\n[combine]\nrule = \"chi-square\"\nconfidence = 0.68\n"))
	a1, b1 := strs(t, e1.Table, AllowedColumn), strs(t, c1.Table, AllowedColumn)
	for r := range a1 {
		if a1[r] != b1[r] {
			t.Errorf("row %d: each says %s, chi-square with one measurement %s", r, a1[r], b1[r])
		}
	}
}

// A point whose observable is missing is undetermined (NULL) unless
// another bound excludes it; applying again replaces the earlier columns.
func TestUndeterminedAndReapplied(t *testing.T) {
	tab, _ := runScan(t, ellipseText, scan.SemiAnalytic, "kernel.yukawa.alpha=list:1e-7,1e-5,1e-3")
	probe := column{name: "probe_value", kind: optFloat, f: []float64{math.NaN(), 1, 5}}
	tab, err := rebuild(tab, nil, []column{probe})
	if err != nil {
		t.Fatal(err)
	}
	set := parseSet(t, `
[[bound]]
name = "probe"
observable = "probe_value"
value = 1
sigma = 1

[[bound]]
name = "residual"
observable = "semi_analytic_anomaly_rad_per_orbit"
upper = 1e-4
`)
	ap := apply(t, tab, set)
	ok, notes := strs(t, ap.Table, AllowedColumn), strs(t, ap.Table, NotesColumn)
	if ok[0] != "" || !strings.Contains(notes[0], "probe") || ap.Undetermined != 1 {
		t.Errorf("point 0: allowed %q, notes %q; %d undetermined", ok[0], notes[0], ap.Undetermined)
	}
	if ok[1] != "true" || ok[2] != "false" {
		t.Errorf("allowed %q", ok)
	}
	// The third point: the residual limit excludes it whatever the probe.
	if by := strs(t, ap.Table, ExcludedByColumn); by[2] != "probe,residual" {
		t.Errorf("excluded_by %q", by)
	}
	again := apply(t, ap.Table, parseSet(t, "[[bound]]\nname = \"other\"\nobservable = \"probe_value\"\nupper = 2\n"))
	names := strings.Join(again.Table.ColumnNames(), " ")
	if strings.Contains(names, "bound_probe") || strings.Contains(names, "bound_residual") || !strings.Contains(names, "bound_other_beyond") {
		t.Errorf("columns after a second judgement: %s", names)
	}
	if again.Table.Meta[MetaCount] != "1" || again.Table.Meta[MetaPrefix+"1.name"] != "" {
		t.Errorf("metadata of the second judgement: %v", again.Table.Meta[MetaCount])
	}
}

// Rebuilding without changes gives back the same schema and every cell.
func TestRebuildKeepsTheTable(t *testing.T) {
	tab, _ := runScan(t, ellipseText, scan.SemiAnalytic, "kernel.yukawa.alpha=list:1e-7,1e-5")
	same, err := rebuild(tab, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	if d := scan.DiffRows(tab, same); d != "" {
		t.Errorf("rebuilt table differs: %s", d)
	}
}

// Per-body observables need a body when a point has several; the
// deflection columns do not (they are the same for every body).
func TestBodiesAndDeflectionPerPoint(t *testing.T) {
	text := ellipseText + `
[[body]]
name = "Outer"
test = true
primary = "Star"
a = "1.2 au"
e = 0.05
`
	tab, spec := runScan(t, text, scan.SemiAnalytic, "kernel.yukawa.alpha=list:1e-7,1e-5")
	set := parseSet(t, "[[bound]]\nname = \"p\"\nobservable = \"semi_analytic_anomaly_rad_per_orbit\"\nupper = 1e-6\n")
	if _, err := Apply(tab, set); err == nil || !strings.Contains(err.Error(), `differs between the bodies of a point (Planet, Outer): say which with body = "..."`) {
		t.Errorf("no body: %v", err)
	}
	set = parseSet(t, "[[bound]]\nname = \"p\"\nobservable = \"semi_analytic_anomaly_rad_per_orbit\"\nbody = \"Outer\"\nupper = 1e-6\n")
	ap := apply(t, tab, set)
	anom, body := floats(t, tab, "semi_analytic_anomaly_rad_per_orbit"), strs(t, tab, scan.BodyColumn)
	beyond := floats(t, ap.Table, BeyondColumn("p"))
	for r := range tab.Rows {
		// Every row of a point carries the verdict from Outer's row.
		o := r
		if body[r] == "Planet" {
			o = r + 1
		}
		if beyond[r] != anom[o]-1e-6 {
			t.Errorf("row %d (%s): beyond %g, want Outer's %g", r, body[r], beyond[r], anom[o]-1e-6)
		}
	}
	tab, err := AddDeflection(tab, spec, "", 1e10, "1e10 m")
	if err != nil {
		t.Fatal(err)
	}
	apply(t, tab, parseSet(t, "[[bound]]\nname = \"g\"\nobservable = \"gamma_deflection_minus_1\"\nvalue = 0\nsigma = 1e-5\n"))
}

// Mistakes found against the table name the file, the line and the field.
func TestApplyMistakes(t *testing.T) {
	tab, _ := runScan(t, ellipseText, scan.SemiAnalytic, "kernel.yukawa.alpha=list:1e-7,1e-5")
	for _, c := range []struct{ text, want string }{
		{"[[bound]]\nname = \"a\"\nobservable = \"anomaly_arcsec_per_centry\"\nupper = 1", "bounds.toml:3: bound[1].observable = \"anomaly_arcsec_per_centry\": no such column in the scan table; numeric columns: "},
		{"[[bound]]\nname = \"a\"\nobservable = \"gamma_deflection_minus_1\"\nupper = 1", "the scan has no light-deflection columns: compute them with --deflection-at"},
		{"[[bound]]\nname = \"a\"\nobservable = \"body\"\nupper = 1", "is not a numeric column"},
		{"[[bound]]\nname = \"a\"\nobservable = \"semi_analytic_anomaly_rad_per_orbit\"\nbody = \"Tiber\"\nupper = 1", `bounds.toml:4: bound[1].body = "Tiber": the scan has no rows for this body (bodies: Planet)`},
		{"[[bound]]\nname = \"a\"\nobservable = \"precession_fit_stderr_rad_per_orbit\"\nupper = 1", "has no values in this scan"},
		{"[[bound]]\nname = \"a\"\nobservable = \"semi_analytic_anomaly_rad_per_orbit\"\nupper = 1\nimpact = \"1 au\"", "impact and source belong to light-deflection observables"},
		{"[[bound]]\nname = \"a\"\nobservable = \"semi_analytic_anomaly_rad_per_orbit\"\nupper = 1\nscenario = \"elsewhere\"", "no bound applies to this scan of yukawa-ellipse (a (for scenario elsewhere"},
	} {
		set, err := Parse("bounds.toml", []byte(c.text))
		if err != nil {
			t.Fatalf("%q: %v", c.text, err)
		}
		if _, err := Apply(tab, set); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q:\n  %v\nwant\n  %s", c.text, err, c.want)
		}
	}
	spec, err := SpecFromTable(tab)
	if err != nil {
		t.Fatal(err)
	}
	tab, err = AddDeflection(tab, spec, "", 1e10, "1e10 m")
	if err != nil {
		t.Fatal(err)
	}
	set := parseSet(t, "[[bound]]\nname = \"a\"\nobservable = \"gamma_deflection_minus_1\"\nvalue = 0\nsigma = 1\nimpact = \"1.6 Rsun\"")
	if _, err := Apply(tab, set); err == nil || !strings.Contains(err.Error(), "the table's deflection columns are at b = 1e10 m") {
		t.Errorf("impact mismatch: %v", err)
	}
	need, ok, err := NeedsDeflection(tab, set)
	if err != nil || !ok || !need.Missing || need.Impact != 1.6*6.957e8 {
		t.Errorf("needs deflection: %+v %v %v", need, ok, err)
	}
}

// The columns a judgement adds, in order.
func TestJudgedColumns(t *testing.T) {
	tab, _ := runScan(t, ellipseText, scan.SemiAnalytic, "kernel.yukawa.alpha=list:1e-7,1e-5")
	ap := apply(t, tab, parseSet(t, "[[bound]]\nname = \"Res-1\"\nobservable = \"semi_analytic_anomaly_rad_per_orbit\"\nvalue = 0\nsigma = 1e-6\n[[bound]]\nname = \"cap\"\nobservable = \"semi_analytic_anomaly_rad_per_orbit\"\nupper = 1\n"))
	names := ap.Table.ColumnNames()
	got := names[len(tab.ColumnNames()):]
	want := []string{"allowed", "excluded_by", "bound_res_1_pull", "bound_res_1_excluded", "bound_cap_beyond", "bound_cap_excluded",
		"bounds_chi_square", "bounds_chi_square_dof", "bounds_chi_square_p_value", "bounds_chi_square_allowed", "bounds_notes"}
	if strings.Join(got, " ") != strings.Join(want, " ") {
		t.Errorf("added columns\n  %v\nwant\n  %v", got, want)
	}
	keys := []string{}
	for k := range ap.Table.Meta {
		if strings.HasPrefix(k, MetaPrefix+"0.") {
			keys = append(keys, strings.TrimPrefix(k, MetaPrefix+"0."))
		}
	}
	sort.Strings(keys)
	if !strings.Contains(strings.Join(keys, " "), "k ") || ap.Table.Meta[MetaPrefix+"0.k"] != fmt.Sprint(TwoSidedK(0.95)) {
		t.Errorf("metadata keys %v", keys)
	}
}
