package plot

import (
	"image/color"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"testing"

	"gonum.org/v1/plot/plotter"

	"mgorbit/cmd/mgorbit/internal/bounds"
	"mgorbit/cmd/mgorbit/internal/scan"
)

// judged is a 2-axis scan judged by two limits on its own grid: "upper"
// excludes alpha above 1e-5, "lower" lambda below 1 au.
func judged(t *testing.T) *scan.Table {
	t.Helper()
	tab := scanTable(t, scan.SemiAnalytic, "kernel.yukawa.lambda=log:0.1 au:10 au:5", "kernel.yukawa.alpha=log:1e-7:1e-3:5")
	set, err := bounds.Parse("b.toml", []byte(`
[[bound]]
name = "upper"
observable = "sweep_kernel_yukawa_alpha"
upper = 1e-5

[[bound]]
name = "lower"
observable = "sweep_kernel_yukawa_lambda_au"
lower = 1
`))
	if err != nil {
		t.Fatal(err)
	}
	ap, err := bounds.Apply(tab, set)
	if err != nil {
		t.Fatal(err)
	}
	return ap.Table
}

// pixels counts each colour of a PNG.
func pixels(t *testing.T, path string) map[color.RGBA]int {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	img, err := png.Decode(f)
	if err != nil {
		t.Fatal(err)
	}
	out := map[color.RGBA]int{}
	b := img.Bounds()
	for x := b.Min.X; x < b.Max.X; x++ {
		for y := b.Min.Y; y < b.Max.Y; y++ {
			r, g, bl, a := img.At(x, y).RGBA()
			out[color.RGBA{uint8(r >> 8), uint8(g >> 8), uint8(bl >> 8), uint8(a >> 8)}]++
		}
	}
	return out
}

// The map shades each set of excluding bounds in its own colour, by cells
// and by an interpolated verdict; the boundary lines go on top.
func TestDrawExclusionMap(t *testing.T) {
	tab := judged(t)
	dir := t.TempDir()
	m := ExclusionMap{X: "sweep_kernel_yukawa_lambda_au", Y: "sweep_kernel_yukawa_alpha", Bounds: []string{"upper", "lower"},
		Boundaries: []Curve{{Bound: "upper", Points: plotter.XYs{{X: 0.1, Y: 1e-5}, {X: 10, Y: 1e-5}}}}, Title: "test", Note: "each bound at CL 0.95"}
	index := map[string]int{"upper": 0, "lower": 1}
	d, err := DrawExclusion(tab, m, filepath.Join(dir, "cells.png"))
	if err != nil {
		t.Fatal(err)
	}
	if !d.LogX || !d.LogY || d.Points != 25 || d.Curves != 1 {
		t.Errorf("drew %+v", d)
	}
	px := pixels(t, filepath.Join(dir, "cells.png"))
	for _, names := range [][]string{{"upper"}, {"lower"}, {"upper", "lower"}} {
		if c := setColour(names, index); px[c] < 100 {
			t.Errorf("cells: %d pixels of %v's colour %v", px[c], names, c)
		}
	}
	m.Verdict = func(i, y float64) ([]string, bool) {
		var names []string
		if y > 1e-5 {
			names = append(names, "upper")
		}
		if i < 2 { // lambda below 1 au: the first two of five log-spaced values
			names = append(names, "lower")
		}
		return names, true
	}
	if _, err := DrawExclusion(tab, m, filepath.Join(dir, "raster.png")); err != nil {
		t.Fatal(err)
	}
	px = pixels(t, filepath.Join(dir, "raster.png"))
	for _, names := range [][]string{{"upper"}, {"lower"}} {
		if c := setColour(names, index); px[c] < 1000 {
			t.Errorf("raster: %d pixels of %v's colour", px[c], names)
		}
	}
	// The overlap is striped in both tints, not mixed.
	if c := setColour([]string{"upper", "lower"}, index); px[c] > 0 {
		t.Errorf("raster: %d pixels of the mixed overlap colour; want stripes", px[c])
	}
	if _, err := DrawExclusion(tab, ExclusionMap{X: "no_such", Y: m.Y}, filepath.Join(dir, "x.png")); err == nil {
		t.Error("unknown column accepted")
	}
}

// A 1-axis figure shades its excluded spans from edge to edge in y.
func TestShadedSpans(t *testing.T) {
	tab := scanTable(t, scan.SemiAnalytic, "kernel.yukawa.lambda=log:0.3 au:30 au:9")
	path := filepath.Join(t.TempDir(), "band.png")
	fig := Figure{Y: "semi_analytic_anomaly_rad_per_orbit", Shade: []Span{{From: math.Inf(-1), To: 1}, {From: 10, To: math.Inf(1)}},
		Bounds: []Bound{{Value: 1e-5, Label: "edges", Group: "g"}, {Value: 2e-5, Group: "g"}}}
	if _, err := Draw(tab, fig, path); err != nil {
		t.Fatal(err)
	}
	if c := tint(boundColours[0], 0.3); pixels(t, path)[c] < 1000 {
		t.Errorf("no shading of colour %v", c)
	}
}
