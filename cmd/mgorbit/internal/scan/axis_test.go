package scan

import (
	"math"
	"strings"
	"testing"

	"mgorbit/scenarios/units"
)

func texts(ax Axis) []string {
	var out []string
	for _, v := range ax.Values {
		out = append(out, v.Text)
	}
	return out
}

func TestParseSweepGrids(t *testing.T) {
	cases := []struct {
		spec string
		want []string
		// SI of the first value, from the published constants.
		si0 float64
	}{
		// A log grid of 4 points over 3 decades is one point per decade
		// (as numpy.geomspace(0.1, 100, 4); common practice).
		{"kernel.yukawa.lambda=log:0.1 au:100 au:4", []string{"0.1 au", "1 au", "10 au", "100 au"}, 0.1 * units.AU},
		// numpy.linspace(0, 0.9, 10) (common practice): steps of 0.1.
		{"body.Tiber.e=lin:0:0.9:10", []string{"0", "0.1", "0.2", "0.3", "0.4", "0.5", "0.6", "0.7", "0.8", "0.9"}, 0},
		// A unit on one end holds for both.
		{"body.Tiber.a=lin:1:3 au:3", []string{"1 au", "2 au", "3 au"}, units.AU},
		// Stop in another unit: the grid is made in the start's unit;
		// 1 pc = 648000/pi au (IAU 2015 B2), so 2 pc = 412529.612494 au.
		{"body.Tiber.a=lin:1 au:2 pc:2", []string{"1 au", "412529.612494 au"}, units.AU},
		// Masses are GM: 1 Msun is the nominal solar GM (IAU 2015 B3).
		{"body.Aster.mass=list:0.5 Msun, 1 Msun,2 Msun", []string{"0.5 Msun", "1 Msun", "2 Msun"}, 0.5 * units.GMSun},
		{"kernel.tower.modes=list:scalar,spin2", []string{"scalar", "spin2"}, math.NaN()},
		{"integrator.steps_per_orbit=list:200.3", []string{"200.3"}, 200.3},
	}
	for _, c := range cases {
		ax, err := ParseSweep(c.spec)
		if err != nil {
			t.Errorf("%s: %v", c.spec, err)
			continue
		}
		if got := texts(ax); strings.Join(got, "|") != strings.Join(c.want, "|") {
			t.Errorf("%s: values %q, want %q", c.spec, got, c.want)
		}
		if si := ax.Values[0].SI; !(si == c.si0 || math.IsNaN(si) && math.IsNaN(c.si0)) {
			t.Errorf("%s: first SI value %v, want %v", c.spec, si, c.si0)
		}
	}
}

func TestSweepColumns(t *testing.T) {
	cases := []struct {
		spec                         string
		index, si, unit, text, plotc string
	}{
		{"kernel.yukawa.lambda=log:0.1 au:100 au:4", "sweep_kernel_yukawa_lambda_index", "sweep_kernel_yukawa_lambda_m",
			"sweep_kernel_yukawa_lambda_au", "sweep_kernel_yukawa_lambda_text", "sweep_kernel_yukawa_lambda_au"},
		{"body.Tiber.e=lin:0:0.9:10", "sweep_body_tiber_e_index", "sweep_body_tiber_e", "", "sweep_body_tiber_e_text", "sweep_body_tiber_e"},
		{"body.Aster.mass=list:0.5 Msun,1 Msun", "sweep_body_aster_mass_index", "sweep_body_aster_mass_gm_m3_per_s2",
			"sweep_body_aster_mass_Msun", "sweep_body_aster_mass_text", "sweep_body_aster_mass_Msun"},
		{"kernel.vainshtein.r_c=log:1e17 m:1e20 m:4", "sweep_kernel_vainshtein_r_c_index", "sweep_kernel_vainshtein_r_c_m",
			"", "sweep_kernel_vainshtein_r_c_text", "sweep_kernel_vainshtein_r_c_m"},
		{"kernel.yukawa.mediator_mass=log:1e-23 eV:1e-21 eV:3", "sweep_kernel_yukawa_mediator_mass_index",
			"sweep_kernel_yukawa_mediator_mass_eV", "", "sweep_kernel_yukawa_mediator_mass_text", "sweep_kernel_yukawa_mediator_mass_eV"},
		{"body.Mote-2.v=list:30 km/s", "sweep_body_mote_2_v_index", "sweep_body_mote_2_v_m_per_s", "sweep_body_mote_2_v_km_per_s",
			"sweep_body_mote_2_v_text", "sweep_body_mote_2_v_km_per_s"},
		{"kernel.tower.modes=list:scalar,spin2", "sweep_kernel_tower_modes_index", "", "", "sweep_kernel_tower_modes_text", "sweep_kernel_tower_modes_index"},
	}
	for _, c := range cases {
		ax, err := ParseSweep(c.spec)
		if err != nil {
			t.Fatalf("%s: %v", c.spec, err)
		}
		got := []string{ax.IndexColumn(), ax.SIColumn(), ax.UnitColumn(), ax.TextColumn(), ax.PlotColumn()}
		want := []string{c.index, c.si, c.unit, c.text, c.plotc}
		if strings.Join(got, " ") != strings.Join(want, " ") {
			t.Errorf("%s: columns %q, want %q", c.spec, got, want)
		}
	}
}

func TestParseSweepRejects(t *testing.T) {
	for spec, want := range map[string]string{
		"kernel.yukawa.lambda":                   "PATH=GRID",
		"kernel.yukawa.lambda=0.1 au":            "no kind",
		"kernel.yukawa.lambda=geo:1:2:3":         "unknown grid kind",
		"kernel.yukawa.lambda=log:0 au:1 au:3":   "same sign",
		"kernel.yukawa.lambda=log:1 au:2 au:0":   "at least 1",
		"kernel.yukawa.lambda=lin:1 au:2 s:3":    "length but stop a time",
		"kernel.yukawa.lambda=lin:1 au:2 au":     "START:STOP:N",
		"kernel.yukawa.lambda=list:1 au,,2 au":   "empty item",
		"kernel.yukawa.lambda=list:1 au,scalar":  "mixes numbers and words",
		"kernel.yukawa.lambda=list:1 au,2 s":     "is a time",
		"yukawa.lambda=list:1 au":                "expected body.NAME.KEY",
		"body.Tiber=list:1":                      "expected body.NAME.KEY",
		"kernel.yukawa.lambda=lin:1 parsec:2:3":  "unknown unit",
		"kernel.yukawa.lambda=lin:x au:2 au:3":   "does not start with a finite number",
		"integrator.steps_per_orbit=lin:1:2:3.5": "whole number",
	} {
		_, err := ParseSweep(spec)
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("%s: error %v, want one mentioning %q", spec, err, want)
		}
	}
}

func TestParseShardAndPoints(t *testing.T) {
	sh, err := ParseShard("2/4")
	if err != nil || sh != (Shard{2, 4}) {
		t.Fatalf("ParseShard(2/4) = %v, %v", sh, err)
	}
	for _, bad := range []string{"0/4", "5/4", "1/0", "1", "a/b"} {
		if _, err := ParseShard(bad); err == nil {
			t.Errorf("ParseShard(%q) accepted", bad)
		}
	}
	// Points dealt by index: shard K of N takes i = K-1, K-1+N, ...
	var got []int
	for p := 0; p < 10; p++ {
		if sh.Has(p) {
			got = append(got, p)
		}
	}
	if len(got) != 3 || got[0] != 1 || got[1] != 5 || got[2] != 9 {
		t.Errorf("shard 2/4 of 10 points: %v, want [1 5 9]", got)
	}
}

func TestIndicesReadingOrder(t *testing.T) {
	spec := newSpec(t, yukawaText, SemiAnalytic, "kernel.yukawa.lambda=list:1 au,2 au", "body.Probe.e=list:0.01,0.02,0.03")
	if spec.Points() != 6 {
		t.Fatalf("%d points, want 2 x 3 = 6", spec.Points())
	}
	// The last axis runs fastest.
	want := [][]int{{0, 0}, {0, 1}, {0, 2}, {1, 0}, {1, 1}, {1, 2}}
	for p, w := range want {
		if got := spec.Indices(p); got[0] != w[0] || got[1] != w[1] {
			t.Errorf("point %d: indices %v, want %v", p, got, w)
		}
	}
}
