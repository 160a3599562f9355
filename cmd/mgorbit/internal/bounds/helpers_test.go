package bounds

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"mgorbit/cmd/mgorbit/internal/scan"
	"mgorbit/scenarios"
)

// ellipseText is testdata/yukawa-ellipse.toml: Newton plus a Yukawa term,
// a test body at a = 0.35 au, e = 0.21.
var ellipseText = func() string {
	b, err := os.ReadFile(filepath.Join("testdata", "yukawa-ellipse.toml"))
	if err != nil {
		panic(err)
	}
	return string(b)
}()

// runScan scans the scenario text and reads the table back.
func runScan(t testing.TB, text string, method scan.Method, sweeps ...string) (*scan.Table, *scan.Spec) {
	t.Helper()
	sc, err := scenarios.Parse("test.toml", []byte(text))
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
	if _, err := scan.Run(context.Background(), spec, scan.Options{Out: out, Workers: 2}); err != nil {
		t.Fatal(err)
	}
	tab, err := scan.ReadTable(out)
	if err != nil {
		t.Fatal(err)
	}
	return tab, spec
}

func parseSet(t testing.TB, text string) *Set {
	t.Helper()
	set, err := Parse("bounds.toml", []byte(strings.TrimSpace(text)+"\n"))
	if err != nil {
		t.Fatal(err)
	}
	return set
}

func apply(t testing.TB, tab *scan.Table, set *Set) *Applied {
	t.Helper()
	a, err := Apply(tab, set)
	if err != nil {
		t.Fatal(err)
	}
	return a
}

// floats reads a column as float64 (NaN for NULL).
func floats(t testing.TB, tab *scan.Table, name string) []float64 {
	t.Helper()
	out, err := tab.Floats(name)
	if err != nil {
		t.Fatal(err)
	}
	return out
}

// strs reads a column as text ("true"/"false" for booleans, "" for NULL).
func strs(t testing.TB, tab *scan.Table, name string) []string {
	t.Helper()
	c := tab.Column(name)
	if c < 0 {
		t.Fatalf("no column %s in %v", name, tab.ColumnNames())
	}
	out := make([]string, len(tab.Rows))
	for r := range tab.Rows {
		out[r] = tab.String(r, c)
	}
	return out
}
