package scan

import (
	"encoding/json"
	"math"
	"path/filepath"
	"strconv"
	"testing"

	"mgorbit/testdata/external"
)

// DuckDB reads the part files of a sharded scan through one glob as the
// merged table: the same rows and values.
func TestExternalDuckDBReadsScanParts(t *testing.T) {
	spec := newSpec(t, yukawaText, SemiAnalytic, "kernel.yukawa.lambda=log:0.2 au:100 au:7", "body.Probe.e=list:0.005,0.01")
	dir := t.TempDir()
	table := filepath.Join(dir, "scan.parquet")
	var parts []string
	for k := 1; k <= 3; k++ {
		p := PartPath(table, Shard{k, 3})
		runScan(t, spec, Options{Out: p, Shard: Shard{k, 3}})
		parts = append(parts, p)
	}
	merged, err := Merge(parts)
	if err != nil {
		t.Fatal(err)
	}
	view := external.ReadDuckDB(t, PartGlob(table))
	if view.RowCount != len(merged.Rows) || len(view.Files) != 3 {
		t.Fatalf("DuckDB reads %d rows from %d files; the merged table has %d rows from 3", view.RowCount, len(view.Files), len(merged.Rows))
	}
	names := merged.FieldNames()
	if len(view.Columns) != len(names) {
		t.Fatalf("DuckDB sees %d columns, the table has %d", len(view.Columns), len(names))
	}
	for k, c := range view.Columns {
		if c.Name != names[k] {
			t.Errorf("column %d: DuckDB %s, table %s", k, c.Name, names[k])
		}
	}
	// DuckDB's cells are the top-level columns.
	field := func(name string) int {
		for k, n := range names {
			if n == name {
				return k
			}
		}
		t.Fatalf("no column %s", name)
		return -1
	}
	// Rows come file by file; index the merged table by point.
	cp := field(PointColumn)
	byPoint := map[int]int{}
	for r := range merged.Rows {
		byPoint[merged.Point(r)] = r
	}
	check := []string{"sweep_kernel_yukawa_lambda_m", "sweep_body_probe_e", "semi_analytic_anomaly_rad_per_orbit", "semi_analytic_radial_period_s"}
	seen := map[int]bool{}
	for _, cells := range view.Rows {
		var s string
		if json.Unmarshal(cells[cp], &s) != nil {
			s = string(cells[cp])
		}
		p, err := strconv.Atoi(s)
		if err != nil {
			t.Fatalf("point_index %s: %v", cells[cp], err)
		}
		r, ok := byPoint[p]
		if !ok || seen[p] {
			t.Fatalf("DuckDB row for point %d: in merged table %v, seen before %v", p, ok, seen[p])
		}
		seen[p] = true
		for _, name := range check {
			c := merged.Column(name)
			cell := cells[field(name)]
			got, err := strconv.ParseFloat(string(cell), 64)
			if err != nil {
				t.Fatalf("%s: %s", name, cell)
			}
			// DuckDB prints shortest round-trip decimals: the exact doubles.
			if want := merged.Float(r, c); math.Float64bits(got) != math.Float64bits(want) {
				t.Errorf("point %d %s: DuckDB %v, merged %v", p, name, got, want)
			}
		}
	}
	for _, f := range view.Files {
		if f.KV[MetaHash] != merged.Meta[MetaHash] {
			t.Errorf("%s: spec hash %q, merged %q", f.File, f.KV[MetaHash], merged.Meta[MetaHash])
		}
	}
}
