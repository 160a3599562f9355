package table

import (
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"testing"
)

// orbitRow stands in for a result table: every column kind the tool writes.
type orbitRow struct {
	Label       string   `parquet:"label"`
	Steps       int64    `parquet:"steps"`
	SemiMajorAU float64  `parquet:"semi_major_axis_au"`
	Precession  float64  `parquet:"precession_arcsec_per_century"`
	PeriodShift *float64 `parquet:"period_shift_s,optional"`
}

func ptr(x float64) *float64 { return &x }

// quietNaN carries a payload so that a bit-exact round trip is visible;
// exponent all ones and a nonzero fraction make a NaN (IEEE 754-2008 §3.4).
var quietNaN = math.Float64frombits(0x7ff8_0000_0000_0001)

// sampleRows covers float64 values whose decimal forms are long or odd:
// 0.1 and 1/3 are inexact in binary, 1e-300 is near the bottom of the normal
// range, 5e-324 is the smallest subnormal and MaxFloat64 the largest finite
// double (IEEE 754-2008 binary64), -0 differs from +0 only in the sign bit.
func sampleRows() []orbitRow {
	return []orbitRow{
		{Label: "mercury", Steps: 1_000_000, SemiMajorAU: 0.387098, Precession: 0.1, PeriodShift: ptr(1.0 / 3)},
		{Label: "", Steps: 0, SemiMajorAU: 1e-300, Precession: math.Copysign(0, -1), PeriodShift: nil},
		{Label: "Δω 'quoted' \"both\"", Steps: math.MaxInt64, SemiMajorAU: 5e-324, Precession: math.MaxFloat64, PeriodShift: ptr(math.Copysign(0, -1))},
		{Label: "extremes", Steps: math.MinInt64, SemiMajorAU: math.Inf(1), Precession: -1.0 / 3, PeriodShift: ptr(-5e-324)},
	}
}

func sampleMeta() map[string]string {
	return map[string]string{
		"mgorbit.kernel":   "newton+gr1pn",
		"mgorbit.scenario": "mercury",
		"mgorbit.units":    "arcsec/century, AU, s",
		"empty":            "",
	}
}

func sameBits(a, b float64) bool { return math.Float64bits(a) == math.Float64bits(b) }

func samePtrBits(a, b *float64) bool {
	if a == nil || b == nil {
		return a == nil && b == nil
	}
	return sameBits(*a, *b)
}

// describe prints a row with every double in shortest round-trip form, so
// that a mismatch in the last bit shows in the message.
func describe(r orbitRow) string {
	shift := "NULL"
	if r.PeriodShift != nil {
		shift = strconv.FormatFloat(*r.PeriodShift, 'g', -1, 64)
	}
	return fmt.Sprintf("{%q %d %s %s %s}", r.Label, r.Steps,
		strconv.FormatFloat(r.SemiMajorAU, 'g', -1, 64),
		strconv.FormatFloat(r.Precession, 'g', -1, 64), shift)
}

func checkRow(t *testing.T, i int, got, want orbitRow) {
	t.Helper()
	if got.Label != want.Label || got.Steps != want.Steps ||
		!sameBits(got.SemiMajorAU, want.SemiMajorAU) || !sameBits(got.Precession, want.Precession) ||
		!samePtrBits(got.PeriodShift, want.PeriodShift) {
		t.Errorf("row %d: read %s, wrote %s", i, describe(got), describe(want))
	}
}

func checkRows(t *testing.T, got, want []orbitRow) {
	t.Helper()
	if len(got) != len(want) {
		t.Fatalf("read %d rows, wrote %d", len(got), len(want))
	}
	for i := range want {
		checkRow(t, i, got[i], want[i])
	}
}

func TestRoundTripIsBitExact(t *testing.T) {
	path := filepath.Join(t.TempDir(), "orbits.parquet")
	rows := sampleRows()
	// NaN in a non-optional column must keep its payload too.
	rows = append(rows, orbitRow{Label: "nan", SemiMajorAU: quietNaN, Precession: math.NaN()})
	if err := Write(path, rows, sampleMeta(), false); err != nil {
		t.Fatal(err)
	}
	got, meta, err := Read[orbitRow](path)
	if err != nil {
		t.Fatal(err)
	}
	checkRows(t, got, rows)
	want := sampleMeta()
	if len(meta) != len(want) {
		t.Errorf("metadata %v, want %v", meta, want)
	}
	for k, v := range want {
		if got, ok := meta[k]; !ok || got != v {
			t.Errorf("metadata[%q] = %q (present %v), want %q", k, got, ok, v)
		}
	}
}

func TestEmptyTableRoundTrips(t *testing.T) {
	path := filepath.Join(t.TempDir(), "empty.parquet")
	if err := Write[orbitRow](path, nil, map[string]string{"k": "v"}, false); err != nil {
		t.Fatal(err)
	}
	got, meta, err := Read[orbitRow](path)
	if err != nil {
		t.Fatal(err)
	}
	if len(got) != 0 || meta["k"] != "v" {
		t.Errorf("read %d rows and metadata %v, want 0 rows and k=v", len(got), meta)
	}
}

func TestOutputIsDeterministic(t *testing.T) {
	dir := t.TempDir()
	write := func(name string, meta map[string]string) []byte {
		t.Helper()
		path := filepath.Join(dir, name)
		if err := Write(path, sampleRows(), meta, false); err != nil {
			t.Fatal(err)
		}
		b, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		return b
	}
	// Many keys, so that map order differing between runs would show.
	meta := map[string]string{}
	for _, k := range []string{"a", "b", "c", "d", "e", "f", "g", "h", "i", "j", "k", "l"} {
		meta[k] = k + k
	}
	first := write("first.parquet", meta)
	for i := range 5 {
		if again := write("again"+string(rune('0'+i))+".parquet", meta); !bytes.Equal(first, again) {
			t.Fatalf("write %d differs from the first (%d vs %d bytes)", i+2, len(again), len(first))
		}
	}
	// Guard against a comparison that cannot fail: other metadata, other bytes.
	meta["a"] = "changed"
	if other := write("other.parquet", meta); bytes.Equal(first, other) {
		t.Error("changed metadata gave identical bytes")
	}
}

func TestWriteRefusesExistingWithoutForce(t *testing.T) {
	path := filepath.Join(t.TempDir(), "orbits.parquet")
	if err := Write(path, sampleRows()[:1], nil, false); err != nil {
		t.Fatal(err)
	}
	err := Write(path, sampleRows(), nil, false)
	if !errors.Is(err, fs.ErrExist) {
		t.Fatalf("second write without force: err = %v, want fs.ErrExist", err)
	}
	if got, _, err := Read[orbitRow](path); err != nil || len(got) != 1 {
		t.Errorf("existing table changed: %d rows, err %v", len(got), err)
	}
	if err := Write(path, sampleRows(), nil, true); err != nil {
		t.Fatalf("write with force: %v", err)
	}
	if got, _, err := Read[orbitRow](path); err != nil || len(got) != len(sampleRows()) {
		t.Errorf("forced write not in place: %d rows, err %v", len(got), err)
	}
}

func TestReadRejectsOtherColumns(t *testing.T) {
	path := filepath.Join(t.TempDir(), "orbits.parquet")
	if err := Write(path, sampleRows(), nil, false); err != nil {
		t.Fatal(err)
	}
	type renamed struct {
		Label       string   `parquet:"label"`
		Steps       int64    `parquet:"steps"`
		SemiMajorAU float64  `parquet:"semi_major_axis_m"`
		Precession  float64  `parquet:"precession_arcsec_per_century"`
		PeriodShift *float64 `parquet:"period_shift_s,optional"`
	}
	if _, _, err := Read[renamed](path); err == nil {
		t.Error("read a table with a renamed column without error")
	}
	type required struct {
		Label       string  `parquet:"label"`
		Steps       int64   `parquet:"steps"`
		SemiMajorAU float64 `parquet:"semi_major_axis_au"`
		Precession  float64 `parquet:"precession_arcsec_per_century"`
		PeriodShift float64 `parquet:"period_shift_s"`
	}
	if _, _, err := Read[required](path); err == nil {
		t.Error("read an optional column as required without error")
	}
}

func TestNullable(t *testing.T) {
	if p := Nullable(math.NaN()); p != nil {
		t.Errorf("Nullable(NaN) = %v, want nil", *p)
	}
	negZero := math.Copysign(0, -1)
	if p := Nullable(negZero); p == nil || !sameBits(*p, negZero) {
		t.Errorf("Nullable(-0) = %v, want -0", p)
	}
	if x := OrNaN(nil); !math.IsNaN(x) {
		t.Errorf("OrNaN(nil) = %v, want NaN", x)
	}
	if x := OrNaN(ptr(0.1)); x != 0.1 {
		t.Errorf("OrNaN(&0.1) = %v", x)
	}
}
