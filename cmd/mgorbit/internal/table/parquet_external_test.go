package table

import (
	"encoding/json"
	"math"
	"path/filepath"
	"strconv"
	"testing"

	"mgorbit/testdata/external"
)

// unquote accepts the script's two spellings of a value: a bare JSON number
// or a string for what JSON numbers cannot hold (-0, NaN, infinities, int64).
func unquote(t *testing.T, raw json.RawMessage) string {
	t.Helper()
	var s string
	if json.Unmarshal(raw, &s) == nil {
		return s
	}
	return string(raw)
}

func duckdbFloat(t *testing.T, raw json.RawMessage) *float64 {
	t.Helper()
	if string(raw) == "null" {
		return nil
	}
	// ParseFloat of a shortest round-trip decimal gives back the exact double.
	x, err := strconv.ParseFloat(unquote(t, raw), 64)
	if err != nil {
		t.Fatalf("DuckDB double %s: %v", raw, err)
	}
	return &x
}

func TestExternalDuckDBReadsTable(t *testing.T) {
	path := filepath.Join(t.TempDir(), "orbits.parquet")
	// NaN outside an optional column stays NaN (not NULL) for other readers;
	// JavaScript keeps no NaN payload, so only NaN-ness is compared there.
	rows := append(sampleRows(), orbitRow{Label: "nan", Precession: quietNaN})
	if err := Write(path, rows, sampleMeta(), false); err != nil {
		t.Fatal(err)
	}
	view := external.ReadDuckDB(t, path)

	if view.RowCount != len(rows) || len(view.Rows) != len(rows) {
		t.Fatalf("DuckDB counts %d rows (%d listed), wrote %d", view.RowCount, len(view.Rows), len(rows))
	}
	// DuckDB's names for Parquet's INT64, DOUBLE and UTF-8 BYTE_ARRAY.
	wantColumns := []struct{ name, duckType, repetition string }{
		{"label", "VARCHAR", "REQUIRED"},
		{"steps", "BIGINT", "REQUIRED"},
		{"semi_major_axis_au", "DOUBLE", "REQUIRED"},
		{"precession_arcsec_per_century", "DOUBLE", "REQUIRED"},
		{"period_shift_s", "DOUBLE", "OPTIONAL"},
	}
	if len(view.Columns) != len(wantColumns) || len(view.Files) != 1 || len(view.Files[0].Columns) != len(wantColumns) {
		t.Fatalf("DuckDB sees columns %+v in files %+v, want %v", view.Columns, view.Files, wantColumns)
	}
	for i, want := range wantColumns {
		got, leaf := view.Columns[i], view.Files[0].Columns[i]
		if got.Name != want.name || got.Type != want.duckType || leaf.Repetition != want.repetition {
			t.Errorf("column %d: DuckDB sees %s %s %s, want %s %s %s",
				i, got.Name, got.Type, leaf.Repetition, want.name, want.duckType, want.repetition)
		}
		if len(leaf.Compression) != 1 || leaf.Compression[0] != "ZSTD" {
			t.Errorf("column %s compressed with %v, want ZSTD", leaf.Name, leaf.Compression)
		}
	}

	for i, want := range rows {
		cells := view.Rows[i]
		if len(cells) != len(wantColumns) {
			t.Fatalf("row %d has %d cells", i, len(cells))
		}
		label := unquote(t, cells[0])
		steps, err := strconv.ParseInt(unquote(t, cells[1]), 10, 64)
		if err != nil {
			t.Fatalf("row %d steps %s: %v", i, cells[1], err)
		}
		got := orbitRow{Label: label, Steps: steps, PeriodShift: duckdbFloat(t, cells[4])}
		for j, dst := range []*float64{&got.SemiMajorAU, &got.Precession} {
			x := duckdbFloat(t, cells[2+j])
			if x == nil {
				t.Fatalf("row %d: DuckDB reads NULL in required column %d", i, 2+j)
			}
			*dst = *x
		}
		if math.IsNaN(want.Precession) {
			if !math.IsNaN(got.Precession) {
				t.Errorf("row %d: DuckDB reads %v for NaN", i, got.Precession)
			}
			got.Precession, want.Precession = 0, 0
		}
		checkRow(t, i, got, want)
	}

	if kv, want := view.Files[0].KV, sampleMeta(); len(kv) != len(want) {
		t.Errorf("DuckDB metadata %v, want %v", kv, want)
	} else {
		for k, v := range want {
			if got, ok := kv[k]; !ok || got != v {
				t.Errorf("DuckDB metadata[%q] = %q (present %v), want %q", k, got, ok, v)
			}
		}
	}
}

// Part files of one table, as several runs would write them, read as one.
func TestExternalDuckDBReadsGlob(t *testing.T) {
	dir := t.TempDir()
	rows := sampleRows()
	parts := [][]orbitRow{rows[:1], rows[1:]}
	for i, part := range parts {
		path := filepath.Join(dir, "part-"+strconv.Itoa(i)+".parquet")
		if err := Write(path, part, map[string]string{"part": strconv.Itoa(i)}, false); err != nil {
			t.Fatal(err)
		}
	}
	view := external.ReadDuckDB(t, filepath.Join(dir, "part-*.parquet"))
	if view.RowCount != len(rows) {
		t.Errorf("DuckDB counts %d rows over the parts, wrote %d", view.RowCount, len(rows))
	}
	if len(view.Files) != len(parts) {
		t.Fatalf("DuckDB lists %d files, wrote %d", len(view.Files), len(parts))
	}
	for i, f := range view.Files {
		if filepath.Base(f.File) != "part-"+strconv.Itoa(i)+".parquet" || f.KV["part"] != strconv.Itoa(i) {
			t.Errorf("file %d: %s with metadata %v", i, f.File, f.KV)
		}
	}
	// Labels are unique in sampleRows, so each must be read exactly once.
	seen := map[string]int{}
	for _, cells := range view.Rows {
		seen[unquote(t, cells[0])]++
	}
	for _, r := range rows {
		if seen[r.Label] != 1 {
			t.Errorf("label %q read %d times, want once", r.Label, seen[r.Label])
		}
	}
}
