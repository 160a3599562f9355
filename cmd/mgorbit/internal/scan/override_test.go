package scan

import (
	"bytes"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/BurntSushi/toml"

	"mgorbit/integrator/kepler"
	"mgorbit/scenarios"
	"mgorbit/scenarios/units"
)

// Each swept value reaches the scenario as the loader reads it.
func TestPointScenarioSetsValues(t *testing.T) {
	spec := newSpec(t, yukawaText, SemiAnalytic,
		"kernel.yukawa.lambda=list:2 au", "body.Probe.e=list:0.01,0.03", "body.Star.mass=list:2 Msun",
		"integrator.orbits=list:12")
	sc, err := spec.Scenario(1)
	if err != nil {
		t.Fatal(err)
	}
	// au exact (IAU 2012 B2); 2 Msun is twice the nominal solar GM (IAU 2015 B3).
	if got := sc.Kernels[1].Values.Num["lambda"]; got != 2*units.AU {
		t.Errorf("lambda = %v m, want 2 au = %v m", got, 2*units.AU)
	}
	star, probe := sc.Bodies[sc.BodyIndex("Star")], sc.Bodies[sc.BodyIndex("Probe")]
	if star.GM != 2*units.GMSun {
		t.Errorf("star GM = %v, want %v", star.GM, 2*units.GMSun)
	}
	el, err := kepler.FromState(star.GM, probe.X.Sub(star.X), probe.V.Sub(star.V))
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(el.E-0.03) > 1e-12 || math.Abs(el.A/units.AU-1) > 1e-12 {
		t.Errorf("probe elements a = %v au, e = %v; want 1 au and 0.03", el.A/units.AU, el.E)
	}
	if sc.Integrator.Orbits != 12 {
		t.Errorf("orbits = %v, want 12", sc.Integrator.Orbits)
	}
}

// The template shortcut gives the scenario that setting the value in the
// decoded document and encoding it whole gives.
func TestTemplateMatchesDirectEncoding(t *testing.T) {
	sweeps := []string{"kernel.yukawa.lambda=log:0.3 au:30 au:3", "body.Probe.e=lin:0.001:0.04:3", "body.Star.mass=list:0.7 Msun,3e30 kg"}
	spec := newSpec(t, yukawaText, SemiAnalytic, sweeps...)
	for p := 0; p < spec.Points(); p++ {
		got, err := spec.Scenario(p)
		if err != nil {
			t.Fatal(err)
		}
		doc, err := decodeDocument(yukawaText)
		if err != nil {
			t.Fatal(err)
		}
		idx := spec.Indices(p)
		for k, ax := range spec.Axes {
			tab, key, err := doc.target(ax.Path)
			if err != nil {
				t.Fatal(err)
			}
			tab[key] = tomlValue(tab, key, ax.Values[idx[k]].Text)
		}
		var buf bytes.Buffer
		if err := toml.NewEncoder(&buf).Encode(map[string]any(doc)); err != nil {
			t.Fatal(err)
		}
		want, err := scenarios.Parse("direct", buf.Bytes())
		if err != nil {
			t.Fatal(err)
		}
		for i := range want.Bodies {
			if got.Bodies[i].GM != want.Bodies[i].GM || got.Bodies[i].X != want.Bodies[i].X || got.Bodies[i].V != want.Bodies[i].V {
				t.Errorf("point %d body %d: %+v, direct encoding gives %+v", p, i, got.Bodies[i], want.Bodies[i])
			}
		}
		if g, w := got.Kernels[1].Values.Num["lambda"], want.Kernels[1].Values.Num["lambda"]; g != w {
			t.Errorf("point %d: lambda %v, direct %v", p, g, w)
		}
	}
}

func TestChoiceParameterSweep(t *testing.T) {
	spec := newSpec(t, vainshteinText, SemiAnalytic, "kernel.vainshtein.sigma=list:+1,-1")
	for p, want := range []string{"+1", "-1"} {
		sc, err := spec.Scenario(p)
		if err != nil {
			t.Fatal(err)
		}
		if got := sc.Kernels[1].Values.Str["sigma"]; got != want {
			t.Errorf("point %d: sigma %q, want %q", p, got, want)
		}
	}
}

func TestSpecRejects(t *testing.T) {
	sc := parseScenario(t, yukawaText)
	for sweep, want := range map[string]string{
		"body.Nobody.e=list:0.1":             `no [[body]] named "Nobody"`,
		"kernel.gr1pn.x=list:1":              `no [[kernel]] named "gr1pn"`,
		"kernel.3.alpha=list:1":              "has 2 [[kernel]] tables",
		"body.Probe.e=list:1.5":              "e",
		"kernel.yukawa.lambda=list:-1 au":    "lambda",
		"body.Probe.colour=list:red":         "unknown key",
		"integrator.method=list:runge,kutta": "method",
		"kernel.yukawa.lambda=list:1 s":      "lambda",
	} {
		ax, err := ParseSweep(sweep)
		if err != nil {
			t.Fatalf("%s: %v", sweep, err)
		}
		_, err = NewSpec(sc, []Axis{ax}, SemiAnalytic, false)
		var in InputError
		if err == nil || !errors.As(err, &in) || !strings.Contains(err.Error(), want) {
			t.Errorf("%s: error %v, want an input error mentioning %q", sweep, err, want)
		}
	}
	ax, _ := ParseSweep("body.Probe.e=list:0.1")
	if _, err := NewSpec(sc, []Axis{ax, ax}, SemiAnalytic, false); err == nil || !strings.Contains(err.Error(), "swept twice") {
		t.Errorf("the same path twice: error %v", err)
	}
}

// A value that only some points get wrong is found before anything runs.
func TestInvalidPointStopsBeforeComputing(t *testing.T) {
	spec := newSpec(t, yukawaText, Integrate, "body.Probe.e=list:0.01,0.05,1.2,1.3")
	computed := 0
	_, err := Run(t.Context(), spec, Options{Out: t.TempDir() + "/scan.parquet", Workers: 2,
		AfterPoint: func(int) { computed++ }})
	var in InputError
	if !errors.As(err, &in) || !strings.Contains(err.Error(), "2 of 4 points") {
		t.Fatalf("error %v, want an input error for 2 of 4 points", err)
	}
	if computed != 0 {
		t.Errorf("%d points computed before the check failed", computed)
	}
}
