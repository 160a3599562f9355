package main

import (
	"bytes"
	"context"
	"errors"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"

	"mgorbit/cmd/mgorbit/internal/bounds"
	"mgorbit/cmd/mgorbit/internal/scan"
	"mgorbit/cmd/mgorbit/internal/table"
	"mgorbit/scenarios/units"
	"mgorbit/testdata/external"
)

const probeBounds = `
# the probe's advance residual (invented), and the Cassini gamma bound
# (Bertotti, Iess & Tortora, Nature 425, 374 (2003))
[[bound]]
name = "probe-residual"
observable = "anomaly_rad_per_orbit"
body = "Probe"
value = 0
sigma = 1e-8
confidence = 0.95

[[bound]]
name = "cassini-gamma"
observable = "gamma_deflection_minus_1"
value = 2.1e-5
sigma = 2.3e-5
impact = "1.6 Rsun"
`

// cliErr runs the command in-process and returns stdout, the error's text
// and the exit code the error maps to.
func cliErr(t *testing.T, args ...string) (string, string, int) {
	t.Helper()
	root := newRoot()
	var out bytes.Buffer
	root.SetOut(&out)
	root.SetErr(&out)
	root.SetArgs(args)
	err := root.ExecuteContext(context.Background())
	if err == nil {
		return out.String(), "", exitOK
	}
	// exitCode's mapping for the errors these tests meet (without its
	// message on stderr).
	code := exitFailure
	var in inputError
	if errors.As(err, &in) {
		code = exitBadInput
	}
	return out.String(), err.Error(), code
}

func writeFile(t *testing.T, name, text string) string {
	t.Helper()
	p := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// scan --bounds: the table carries the verdicts and the deflection columns
// the gamma bound needs, the boundary table sits beside it, and scan.png
// is the exclusion map.
func TestScanWithBounds(t *testing.T) {
	scenario, file, dir := writeProbe(t), writeFile(t, "bounds.toml", probeBounds), t.TempDir()
	out, code := scanCLI(t, "scan", scenario, "--method", "semi", "--out", dir, "--bounds", file,
		"--sweep", "kernel.yukawa.lambda=log:0.01 au:100 au:9", "--sweep", "kernel.yukawa.alpha=log:1e-9:1e-3:13")
	if code != exitOK {
		t.Fatalf("scan --bounds: exit %d\n%s", code, out)
	}
	for _, want := range []string{"added light-deflection columns at b = 1.6 Rsun past Star (as the bounds state)", "judged 117 points against 2 bounds",
		"semi_analytic_anomaly_rad_per_orbit used", "boundary along kernel.yukawa.alpha", "drew " + filepath.Join(dir, "scan.png")} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
	}
	tab, err := scan.ReadTable(filepath.Join(dir, "scan.parquet"))
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []string{bounds.AllowedColumn, bounds.ExcludedByColumn, "bound_probe_residual_pull", "bound_cassini_gamma_pull", "gamma_deflection_minus_1"} {
		if tab.Column(c) < 0 {
			t.Errorf("scan.parquet has no %s", c)
		}
	}
	// The deflection columns: a scalar Yukawa bends no light, so with
	// theta = 2 (1 + gamma) mu_dyn/(c^2 b) and mu_dyn = mu (1 + A),
	// A = alpha (1 + u) e^-u, gamma - 1 = -2A/(1 + A) (PHYSICS.md).
	b := 1.6 * 6.957e8 // nominal solar radius, IAU 2015 Resolution B3
	cl, ca, cg := tab.Column("sweep_kernel_yukawa_lambda_m"), tab.Column("sweep_kernel_yukawa_alpha"), tab.Column("gamma_deflection_minus_1")
	for r := range tab.Rows {
		u := b / tab.Float(r, cl)
		A := tab.Float(r, ca) * (1 + u) * math.Exp(-u)
		if got, want := tab.Float(r, cg), -2*A/(1+A); math.Abs(got-want) > 1e-12+1e-9*math.Abs(want) {
			t.Errorf("row %d: gamma - 1 = %.10g, closed form %.10g", r, got, want)
		}
	}
	rows, _, err := table.Read[boundaryRow](filepath.Join(dir, "scan.boundary.parquet"))
	if err != nil || len(rows) == 0 {
		t.Fatalf("boundary table: %d rows, %v", len(rows), err)
	}
	f, err := os.Open(filepath.Join(dir, "scan.png"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if cfg, err := png.DecodeConfig(f); err != nil || cfg.Width < 400 {
		t.Errorf("scan.png: %+v %v", cfg, err)
	}
}

// bounds apply judges an existing table into a new one, leaving the input
// as it was; a 1-axis scan's figure shades the excluded band.
func TestBoundsApplyCommand(t *testing.T) {
	scenario, dir := writeProbe(t), t.TempDir()
	if out, code := scanCLI(t, "scan", scenario, "--method", "semi", "--out", dir, "--no-plot",
		"--sweep", "kernel.yukawa.lambda=log:0.05 au:50 au:15"); code != exitOK {
		t.Fatalf("scan: exit %d\n%s", code, out)
	}
	in := filepath.Join(dir, "scan.parquet")
	file := writeFile(t, "bounds.toml", "[[bound]]\nname = \"r\"\nobservable = \"semi_analytic_anomaly_rad_per_orbit\"\nvalue = 0\nsigma = 1e-6\n")
	out, code := scanCLI(t, "bounds", "apply", in, "--bounds", file)
	if code != exitOK {
		t.Fatalf("bounds apply: exit %d\n%s", code, out)
	}
	judged := filepath.Join(dir, "scan.bounded.parquet")
	for _, p := range []string{judged, filepath.Join(dir, "scan.bounded.png"), filepath.Join(dir, "scan.bounded.boundary.parquet")} {
		if _, err := os.Stat(p); err != nil {
			t.Errorf("bounds apply wrote no %s:\n%s", p, out)
		}
	}
	if !strings.Contains(out, "excluded part shaded") || !strings.Contains(out, "boundary along kernel.yukawa.lambda, 2 crossings") {
		t.Errorf("output:\n%s", out)
	}
	orig, err := scan.ReadTable(in)
	if err != nil {
		t.Fatal(err)
	}
	if orig.Column(bounds.AllowedColumn) >= 0 {
		t.Error("bounds apply changed its input")
	}
	// Again into the same file: refused without --force.
	if out, code := scanCLI(t, "bounds", "apply", in, "--bounds", file); code != exitBadInput {
		t.Errorf("second apply without --force: exit %d\n%s", code, out)
	}
	if _, msg, code := cliErr(t, "bounds", "apply", in, "--bounds", file, "--out", in); code != exitBadInput || !strings.Contains(msg, "is the input") {
		t.Errorf("--out onto the input: exit %d, %s", code, msg)
	}
	// The light columns alone, from the scenario and grid the table records.
	out, code = scanCLI(t, "bounds", "apply", in, "--bounds", file, "--deflection-at", "2 au", "--out", filepath.Join(dir, "light.parquet"), "--no-plot")
	if code != exitOK || !strings.Contains(out, "added light-deflection columns at b = 2 au past Star") {
		t.Errorf("--deflection-at: exit %d\n%s", code, out)
	}
}

func TestBoundsRefusals(t *testing.T) {
	scenario := writeProbe(t)
	good := writeFile(t, "good.toml", "[[bound]]\nname = \"r\"\nobservable = \"semi_analytic_anomaly_rad_per_orbit\"\nupper = 1\n")
	bad := writeFile(t, "bad.toml", "[[bound]]\nname = \"r\"\nobservable = \"x\"\nvalue = 0\nsigma = 0\n")
	sweep := "kernel.yukawa.lambda=list:1 au"
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"scan", scenario, "--sweep", sweep, "--bounds", bad, "--out", t.TempDir()}, "bad.toml:5: bound[1].sigma = 0: must be positive"},
		{[]string{"scan", scenario, "--sweep", sweep, "--bounds", good, "--shard", "1/2", "--out", t.TempDir()}, "merge the shards first"},
		{[]string{"scan", scenario, "--sweep", sweep, "--deflection-at", "3 s", "--out", t.TempDir()}, `--deflection-at "3 s"`},
		{[]string{"bounds", "apply", filepath.Join(t.TempDir(), "none.parquet"), "--bounds", good}, "none.parquet"},
		{[]string{"bounds", "apply", "x.parquet"}, "give the bounds file"},
		{[]string{"bounds", "check", bad}, "must be positive"},
	} {
		_, msg, code := cliErr(t, c.args...)
		if code != exitBadInput || !strings.Contains(msg, c.want) {
			t.Errorf("%v: exit %d, want %d and %q in\n%s", c.args, code, exitBadInput, c.want, msg)
		}
	}
	out, code := scanCLI(t, "bounds", "check", good)
	if code != exitOK || !strings.Contains(out, "1 bound, rule each") {
		t.Errorf("bounds check: exit %d\n%s", code, out)
	}
}

// The shipped example (testdata/bounds): the Tiber residual's boundary at
// lambda = a matches (value + k sigma)/(d varpi/d alpha per century) to 1%,
// with the derivative from Gauss's first-order equation (PHYSICS.md) for
// the Yukawa radial force, Delta varpi/alpha = (1/e) Int (1 + r/lambda)
// e^(-r/lambda) cos f df over the Kepler ellipse, per century over the
// Kepler period 2 pi sqrt(a^3/mu), mu = G (M + m) (the semi-analytic path
// of a 1PN base is this first-order average; the period is the osculating
// one, PHYSICS.md, Constants and units).
func TestShippedBoundsExample(t *testing.T) {
	root := external.RepoRoot(t)
	dir := t.TempDir()
	_, msg, code := cliErr(t, "scan", filepath.Join(root, "testdata", "bounds", "tiber-yukawa.toml"), "--method", "semi", "--out", dir, "--no-plot",
		"--sweep", "kernel.yukawa.lambda=list:0.1 au,0.35 au,3 au", "--sweep", "kernel.yukawa.alpha=log:1e-12:1e-6:25",
		"--bounds", filepath.Join(root, "testdata", "bounds", "example.toml"))
	if code != exitOK {
		t.Fatalf("scan of the shipped example: exit %d: %s", code, msg)
	}
	rows, _, err := table.Read[boundaryRow](filepath.Join(dir, "scan.boundary.parquet"))
	if err != nil {
		t.Fatal(err)
	}
	const a, e = 0.35 * units.AU, 0.21
	mu := units.GMSun * (1 + 1.7e-7)
	period := 2 * math.Pi * math.Sqrt(a*a*a/mu)
	perCentury := 36525 * 86400 / period * units.ArcsecPerRad
	k := bounds.TwoSidedK(0.95)
	found := 0
	for _, r := range rows {
		if r.Verdict != "combined" || r.DecidedBy != "tiber-perihelion" || !(*r.Across == 0.35 || *r.Across == 0.1 || *r.Across == 3) {
			continue
		}
		lambda := *r.Across * units.AU
		slope := quad.Fixed(func(f float64) float64 {
			rr := a * (1 - e*e) / (1 + e*math.Cos(f))
			return (1 + rr/lambda) * math.Exp(-rr/lambda) * math.Cos(f)
		}, 0, 2*math.Pi, 400, quad.Legendre{}, 0) / e * perCentury
		want := (0.0012 + k*0.0030) / slope
		t.Logf("lambda = %g au: alpha_max %.6e, (value + k sigma)/slope %.6e, relative %+.2e", *r.Across, r.At, want, r.At/want-1)
		if math.Abs(r.At/want-1) > 0.01 || r.AllowedSide != "below" {
			t.Errorf("lambda = %g au: boundary %+v, want %.6e", *r.Across, r, want)
		}
		found++
	}
	if found != 3 {
		t.Errorf("%d Tiber boundaries, want one per lambda: %+v", found, rows)
	}
}
