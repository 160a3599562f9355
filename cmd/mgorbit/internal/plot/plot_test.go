package plot

import (
	"context"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"gonum.org/v1/plot/vg"

	"mgorbit/cmd/mgorbit/internal/scan"
	"mgorbit/scenarios"
)

// yukawa-probe.toml: a near-circular test body under a weak Yukawa term.
func yukawaText(t *testing.T) []byte {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "scan", "testdata", "yukawa-probe.toml"))
	if err != nil {
		t.Fatal(err)
	}
	return b
}

func scanTable(t *testing.T, method scan.Method, sweeps ...string) *scan.Table {
	t.Helper()
	sc, err := scenarios.Parse("test.toml", yukawaText(t))
	if err != nil {
		t.Fatal(err)
	}
	axes, err := scan.ParseSweeps(sweeps)
	if err != nil {
		t.Fatal(err)
	}
	spec, err := scan.NewSpec(sc, axes, method, false)
	if err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(t.TempDir(), "scan.parquet")
	if _, err := scan.Run(context.Background(), spec, scan.Options{Out: out}); err != nil {
		t.Fatal(err)
	}
	tab, err := scan.ReadTable(out)
	if err != nil {
		t.Fatal(err)
	}
	return tab
}

func TestDrawPNGAndSVG(t *testing.T) {
	tab := scanTable(t, scan.Both, "kernel.yukawa.lambda=log:0.3 au:30 au:3")
	dir := t.TempDir()
	y := DefaultY(tab)
	if y != "anomaly_arcsec_per_century" {
		t.Errorf("default y %s, want the anomaly per century", y)
	}
	fig := Figure{Y: y, Reference: DefaultReference(tab, y), Bounds: []Bound{{Value: 50, Label: "limit"}}}
	if fig.Reference != "semi_analytic_anomaly_arcsec_per_century" {
		t.Errorf("reference %q", fig.Reference)
	}
	d, err := Draw(tab, fig, filepath.Join(dir, "fig.png"))
	if err != nil {
		t.Fatal(err)
	}
	if !d.LogX || !d.LogY || d.Curves != 1 || d.Points != 3 || d.ErrorColumn != "anomaly_integration_error_arcsec_per_century" {
		t.Errorf("drew %+v; want log axes, 1 curve of 3 points with the anomaly's error bars", d)
	}
	f, err := os.Open(filepath.Join(dir, "fig.png"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	cfg, err := png.DecodeConfig(f)
	if err != nil {
		t.Fatal(err)
	}
	// 16 cm x 11 cm at gonum's 96 dpi, 1 in = 2.54 cm (exact).
	if w, h := int(math.Round(16/2.54*96)), int(math.Round(11/2.54*96)); abs(cfg.Width-w) > 1 || abs(cfg.Height-h) > 1 {
		t.Errorf("PNG %d x %d px, want %d x %d", cfg.Width, cfg.Height, w, h)
	}

	if _, err := Draw(tab, fig, filepath.Join(dir, "fig.svg")); err != nil {
		t.Fatal(err)
	}
	svg, err := os.ReadFile(filepath.Join(dir, "fig.svg"))
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"<svg", "kernel.yukawa.lambda (au)", "anomaly (arcsec/century)", "limit", "semi-analytic"} {
		if !strings.Contains(string(svg), want) {
			t.Errorf("SVG lacks %q", want)
		}
	}
}

func TestLinearGridAndGroups(t *testing.T) {
	tab := scanTable(t, scan.SemiAnalytic, "body.Probe.e=lin:0.001:0.01:4", "kernel.yukawa.lambda=list:0.5 au,2 au,8 au")
	fig := Figure{Group: "sweep_kernel_yukawa_lambda_au", Width: 8 * vg.Centimeter, Height: 6 * vg.Centimeter}
	d, err := Draw(tab, fig, filepath.Join(t.TempDir(), "groups.png"))
	if err != nil {
		t.Fatal(err)
	}
	if d.LogX || d.Curves != 3 || d.Points != 12 || d.ErrorColumn != "" {
		t.Errorf("drew %+v; want a linear x axis, 3 curves of 4 points, no error bars (semi-analytic)", d)
	}
	if _, err := Draw(tab, Figure{X: "no_such_column"}, filepath.Join(t.TempDir(), "x.png")); err == nil {
		t.Error("an unknown column was accepted")
	}
	if _, err := Draw(tab, Figure{LogY: On, Y: "sweep_body_probe_e"}, filepath.Join(t.TempDir(), "x.png")); err != nil {
		t.Errorf("log y of positive values: %v", err)
	}
}

func TestErrorColumnAndLabels(t *testing.T) {
	tab := scanTable(t, scan.SemiAnalytic, "kernel.yukawa.lambda=log:0.3 au:30 au:2")
	for y, want := range map[string]string{
		"precession_rad_per_orbit":      "precession_integration_error_rad_per_orbit",
		"anomaly_arcsec_per_century":    "anomaly_integration_error_arcsec_per_century",
		"period_shift_radial_vs_kepler": "period_shift_radial_vs_kepler_integration_error",
		"radial_period_s":               "radial_period_integration_error_s",
		"semi_analytic_radial_period_s": "",
	} {
		if got := ErrorColumn(tab, y); got != want {
			t.Errorf("ErrorColumn(%s) = %q, want %q", y, got, want)
		}
	}
	for col, want := range map[string]string{
		"sweep_kernel_yukawa_lambda_au":            "kernel.yukawa.lambda (au)",
		"sweep_kernel_yukawa_lambda_m":             "kernel.yukawa.lambda (m)",
		"semi_analytic_anomaly_arcsec_per_century": "semi-analytic anomaly (arcsec/century)",
		"radial_period_s":                          "radial period (s)",
	} {
		if got := Label(tab, col); got != want {
			t.Errorf("Label(%s) = %q, want %q", col, got, want)
		}
	}
}

// Log ticks stay within the data: labels at the powers of ten inside the
// range, none outside; a range within one decade labels its multiples.
func TestDecadeTicks(t *testing.T) {
	ticks := decadeTicks{}.Ticks(math.Log10(0.2), math.Log10(100))
	var labels []string
	for _, tk := range ticks {
		if tk.Value < math.Log10(0.2)-1e-9 || tk.Value > 2+1e-9 {
			t.Errorf("tick at %g outside the range", tk.Value)
		}
		if tk.Label != "" {
			labels = append(labels, tk.Label)
		}
	}
	if strings.Join(labels, " ") != "1 10 100" {
		t.Errorf("labels %q, want 1 10 100", labels)
	}
	ticks = decadeTicks{}.Ticks(math.Log10(2), math.Log10(8))
	if len(ticks) != 7 || ticks[0].Label != "2" || ticks[6].Label != "8" {
		t.Errorf("ticks within a decade: %+v, want 2..8 labelled", ticks)
	}
}

func abs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}
