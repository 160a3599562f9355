package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"math"
	"path/filepath"
	"strings"
	"testing"

	"mgorbit/cmd/mgorbit/internal/report"
	"mgorbit/cmd/mgorbit/internal/table"
	"mgorbit/scenarios/units"
)

func deflectionJSON(t *testing.T, args ...string) []report.DeflectionRow {
	t.Helper()
	root := newRoot()
	var out bytes.Buffer
	root.SetOut(&out)
	root.SetErr(&out)
	root.SetArgs(append([]string{"deflection", "--json"}, args...))
	if err := root.Execute(); err != nil {
		t.Fatalf("mgorbit deflection %v: %v\n%s", args, err, out.String())
	}
	var rows []report.DeflectionRow
	if err := json.Unmarshal(out.Bytes(), &rows); err != nil {
		t.Fatalf("JSON: %v\n%s", err, out.String())
	}
	return rows
}

// The command on the built-ins: general relativity's 4 mu/(c^2 b) for
// aster-gr (Aster: 1 Msun through the nominal solar GM), and for the
// screened scalar of lumen-lens light bending as GR's with the deflection
// gamma - 1 = -2 s/(1 + s), s = 2 beta^2 xi(b/r_V) (PHYSICS.md, kernel 5).
func TestDeflectionCommand(t *testing.T) {
	rows := deflectionJSON(t, "aster-gr", "--impact", "1.5 Rsun", "--impact", "2 au")
	if len(rows) != 2 {
		t.Fatalf("%d rows", len(rows))
	}
	for _, r := range rows {
		want := 4 * units.GMSun / (units.C * units.C * r.B)
		if math.Abs(r.Angle/want-1) > 1e-12 || r.Source != "Aster" || r.Notes != "" {
			t.Errorf("aster-gr, b = %g: deflection %.15g, want %.15g (source %s, notes %q)", r.B, r.Angle, want, r.Source, r.Notes)
		}
		if r.Emitter != 1000*r.B || r.Receiver != 1000*r.B {
			t.Errorf("default path %g, %g, want 1000 b", r.Emitter, r.Receiver)
		}
	}
	rows = deflectionJSON(t, "lumen-lens", "--impact", "1 Rsun,1 au", "--emitter", "8 au", "--receiver", "1 au")
	for _, r := range rows {
		x := r.B / (10 * units.AU)
		xi := 2 * x * x * x * (math.Sqrt(1+1/(x*x*x)) - 1)
		s := xi / 3
		if want := -2 * s / (1 + s); math.Abs(r.GammaDeflectionMinusOne/want-1) > 1e-6 || math.Abs(r.RatioToGR-1) > 1e-12 {
			t.Errorf("lumen-lens, b = %g: gamma - 1 from deflection %.8g, want %.8g; ratio to GR %.15g", r.B, r.GammaDeflectionMinusOne, want, r.RatioToGR)
		}
		if r.Emitter != 8*units.AU || r.Receiver != units.AU || !strings.Contains(r.MuMeaning, "bare") {
			t.Errorf("path %g, %g; mu meaning %q", r.Emitter, r.Receiver, r.MuMeaning)
		}
	}
	// a grazing ray of a compact body gets its notes
	rows = deflectionJSON(t, "ferrow-binary", "--impact", "10 km")
	if !strings.Contains(rows[0].Notes, "weak field") || !strings.Contains(rows[0].Notes, "inside") {
		t.Errorf("notes for b = 10 km at a neutron star: %q", rows[0].Notes)
	}
	// Parquet output reads back
	path := filepath.Join(t.TempDir(), "d.parquet")
	deflectionJSON(t, "aster-gr", "--impact", "1 au", "--out", path)
	back, meta, err := table.Read[report.DeflectionRow](path)
	if err != nil || len(back) != 1 || back[0].Angle == 0 || meta["mgorbit.scenario.name"] != "aster-gr" {
		t.Errorf("parquet: %v, %d rows, meta %v", err, len(back), meta["mgorbit.scenario.name"])
	}
}

func TestDeflectionCommandInput(t *testing.T) {
	for _, args := range [][]string{
		{"deflection", "aster-gr"},
		{"deflection", "aster-gr", "--impact", "3 kg"},
		{"deflection", "aster-gr", "--impact", "-1 au"},
		{"deflection", "aster-gr", "--impact", "1 au", "--source", "Nobody"},
		{"deflection", "aster-gr", "--impact", "1 au", "--emitter", "0 m"},
	} {
		root := newRoot()
		var out bytes.Buffer
		root.SetOut(&out)
		root.SetErr(&out)
		root.SetArgs(args)
		err := root.Execute()
		var in inputError
		if err == nil || !errors.As(err, &in) {
			t.Errorf("%v: error %v, want an input error", args, err)
		}
	}
}
