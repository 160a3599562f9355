package main

import (
	"bytes"
	"encoding/json"
	"math"
	"path/filepath"
	"strconv"
	"testing"

	"mgorbit/testdata/external"
)

// runCLI runs the command tree in-process and returns stdout.
func runCLI(t *testing.T, args ...string) []byte {
	t.Helper()
	root := newRoot()
	var out bytes.Buffer
	root.SetOut(&out)
	root.SetErr(&out)
	root.SetArgs(args)
	if err := root.Execute(); err != nil {
		t.Fatalf("mgorbit %v: %v\n%s", args, err, out.String())
	}
	return out.Bytes()
}

// TestExternalDuckDBReadsRunOutput: the default scenario's Parquet files,
// read by DuckDB (an independent reader), have the rows and columns the run
// wrote, and the precession DuckDB reads equals the --json value bit for bit.
func TestExternalDuckDBReadsRunOutput(t *testing.T) {
	dir := t.TempDir()
	js := runCLI(t, "run", "--out", dir, "--json")
	var rows []map[string]any
	if err := json.Unmarshal(js, &rows); err != nil {
		t.Fatalf("--json output: %v\n%s", err, js)
	}
	if len(rows) != 1 {
		t.Fatalf("%d summary rows in JSON, want 1 (one orbiting body)", len(rows))
	}
	sum := external.ReadDuckDB(t, filepath.Join(dir, "summary.parquet"))
	if sum.RowCount != 1 {
		t.Errorf("DuckDB sees %d summary rows, want 1", sum.RowCount)
	}
	col := sum.ColumnIndex()
	for _, name := range []string{"body", "precession_rad_per_orbit", "precession_arcsec_per_century",
		"semi_analytic_precession_arcsec_per_century", "anomaly_arcsec_per_century", "semi_analytic_path",
		"period_shift_radial_vs_kepler", "period_shift_radial_vs_newton_run", "energy_rel_error_max"} {
		if _, ok := col[name]; !ok {
			t.Errorf("column %s missing in DuckDB's view", name)
		}
	}
	if len(sum.Columns) != len(rows[0]) {
		t.Errorf("DuckDB sees %d columns, JSON has %d fields", len(sum.Columns), len(rows[0]))
	}
	for _, name := range []string{"precession_arcsec_per_century", "precession_rad_per_orbit", "anomaly_arcsec_per_century"} {
		want := rows[0][name].(float64)
		got, err := strconv.ParseFloat(string(sum.Rows[0][col[name]]), 64)
		if err != nil {
			t.Fatalf("%s: DuckDB cell %s: %v", name, sum.Rows[0][col[name]], err)
		}
		if math.Float64bits(got) != math.Float64bits(want) {
			t.Errorf("%s: DuckDB %s, --json %s", name, strconv.FormatFloat(got, 'g', -1, 64), strconv.FormatFloat(want, 'g', -1, 64))
		}
	}
	if got := string(sum.Rows[0][col["body"]]); got != `"Tiber"` {
		t.Errorf("body %v, want Tiber", got)
	}
	if kv := sum.Files[0].KV; kv["mgorbit.scenario.name"] != "aster-gr" || kv["mgorbit.version"] == "" || len(kv["mgorbit.scenario.sha256"]) != 64 {
		t.Errorf("metadata: %v", kv)
	}
	traj := external.ReadDuckDB(t, filepath.Join(dir, "trajectory.parquet"))
	// two bodies, one row each at t = 0, every output_every steps, and the
	// last step (steps is a multiple of the cadence here or not)
	kv := traj.Files[0].KV
	steps, _ := strconv.Atoi(kv["mgorbit.steps"])
	every, _ := strconv.Atoi(kv["mgorbit.output_every"])
	times := 1 + steps/every
	if steps%every != 0 {
		times++
	}
	if traj.RowCount != 2*times {
		t.Errorf("trajectory rows %d, want 2 bodies x %d output times", traj.RowCount, times)
	}
	t.Logf("DuckDB read %d summary row(s) with %d columns and %d trajectory rows", sum.RowCount, len(sum.Columns), traj.RowCount)
}
