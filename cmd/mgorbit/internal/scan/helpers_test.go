package scan

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"mgorbit/scenarios"
)

// The test scenarios, in testdata/ (also read by the plot and command tests).
var (
	yukawaText     = strings.Replace(readTestdata("yukawa-probe.toml"), "orbits = 10", "orbits = 30", 1)
	vainshteinText = readTestdata("vainshtein-probe.toml")
)

func readTestdata(name string) string {
	b, err := os.ReadFile(filepath.Join("testdata", name))
	if err != nil {
		panic(err)
	}
	return string(b)
}

func parseScenario(t testing.TB, text string) *scenarios.Scenario {
	t.Helper()
	sc, err := scenarios.Parse("test.toml", []byte(text))
	if err != nil {
		t.Fatal(err)
	}
	return sc
}

func newSpec(t testing.TB, text string, method Method, sweeps ...string) *Spec {
	t.Helper()
	axes, err := ParseSweeps(sweeps)
	if err != nil {
		t.Fatal(err)
	}
	spec, err := NewSpec(parseScenario(t, text), axes, method, false)
	if err != nil {
		t.Fatal(err)
	}
	return spec
}

// runScan runs a spec into a fresh directory and reads the table back.
func runScan(t testing.TB, spec *Spec, opt Options) (*Table, *Result) {
	t.Helper()
	if opt.Out == "" {
		opt.Out = filepath.Join(t.TempDir(), "scan.parquet")
	}
	res, err := Run(context.Background(), spec, opt)
	if err != nil {
		t.Fatal(err)
	}
	tab, err := ReadTable(opt.Out)
	if err != nil {
		t.Fatal(err)
	}
	return tab, res
}

// column returns a column's values as float64 (NaN for NULL).
func column(t testing.TB, tab *Table, name string) []float64 {
	t.Helper()
	out, err := tab.Floats(name)
	if err != nil {
		t.Fatal(err)
	}
	return out
}

// sameMetaExcept reports the first metadata key that differs, other than skip.
func sameMetaExcept(a, b map[string]string, skip ...string) string {
	ignore := map[string]bool{}
	for _, k := range skip {
		ignore[k] = true
	}
	for k, v := range a {
		if !ignore[k] && b[k] != v {
			return k
		}
	}
	for k := range b {
		if _, ok := a[k]; !ok && !ignore[k] {
			return k
		}
	}
	return ""
}
