package bounds

import (
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"mgorbit/scenarios"
	"mgorbit/testdata/external"
)

// The shipped example: the Cassini gamma bound as published (Bertotti,
// Iess & Tortora, Nature 425, 374 (2003): gamma - 1 = (2.1 ± 2.3)e-5) and
// the invented Tiber residual, each at 95%.
func TestExampleFileParses(t *testing.T) {
	set, err := Load(filepath.Join(external.RepoRoot(t), "testdata", "bounds", "example.toml"))
	if err != nil {
		t.Fatal(err)
	}
	if len(set.Bounds) != 2 || set.Rule != Each || set.Confidence != 0.95 || set.ConfidenceDefault {
		t.Fatalf("set %+v", set)
	}
	g, p := set.Bounds[0], set.Bounds[1]
	if g.Name != "cassini-gamma" || g.Kind != Measurement || g.Value != 2.1e-5 || g.Sigma != 2.3e-5 ||
		g.Observable != "gamma_deflection_minus_1" || math.Abs(g.Impact-1.6*6.957e8) > 1 { // nominal solar radius (IAU 2015 B3)
		t.Errorf("gamma bound %+v", g)
	}
	if p.Name != "tiber-perihelion" || p.Body != "Tiber" || p.Value != 0.0012 || p.Sigma != 0.003 || p.Confidence != 0.95 {
		t.Errorf("perihelion bound %+v", p)
	}
	if !strings.Contains(g.Describe(), "1.96 sigma") {
		t.Errorf("description %q", g.Describe())
	}
}

func TestLimitsAndDefaults(t *testing.T) {
	set := parseSet(t, `
[[bound]]
name = "up"
observable = "x"
upper = 3

[[bound]]
name = "both_ways"
observable = "x"
lower = -1
upper = 2
confidence = 0.9
`)
	up, both := set.Bounds[0], set.Bounds[1]
	if up.Kind != Limit || up.Upper != 3 || !math.IsNaN(up.Lower) || !up.ConfidenceDefault || up.Confidence != DefaultConfidence {
		t.Errorf("upper limit %+v", up)
	}
	if both.Kind != Limit || both.Lower != -1 || both.Upper != 2 || both.Confidence != 0.9 {
		t.Errorf("two-sided limit %+v", both)
	}
	if set.Rule != Each || !set.ConfidenceDefault {
		t.Errorf("rule %s, confidence default %v", set.Rule, set.ConfidenceDefault)
	}
}

// Every mistake is reported with the file, the line, the field and what is
// allowed; all of a file's mistakes at once.
func TestMalformedBoundsFiles(t *testing.T) {
	for _, c := range []struct{ name, text, want string }{
		{"syntax", "[[bound]\nname = 1", "TOML syntax: expected end of table array name"},
		{"no bounds", "[combine]\nrule = \"each\"", "no [[bound]] tables"},
		{"unknown top key", "colour = 1\n[[bound]]\nname = \"a\"\nobservable = \"x\"\nupper = 1", "bounds.toml:1: colour: unknown key"},
		{"unknown bound key", "[[bound]]\nname = \"a\"\nobservable = \"x\"\nupper = 1\nsigmma = 2", "bounds.toml:5: bound[1].sigmma: unknown key (allowed: name, observable"},
		{"no name", "[[bound]]\nobservable = \"x\"\nupper = 1", "bounds.toml:1: bound[1]: has no name"},
		{"bad name", "[[bound]]\nname = \"2 words\"\nobservable = \"x\"\nupper = 1", `bounds.toml:2: bound[1].name = "2 words": letters, digits`},
		{"duplicate", "[[bound]]\nname = \"a-b\"\nobservable = \"x\"\nupper = 1\n[[bound]]\nname = \"a_b\"\nobservable = \"x\"\nupper = 1", "bounds.toml:6: bound[2].name = \"a_b\": bound[1] already has this name"},
		{"no observable", "[[bound]]\nname = \"a\"\nupper = 1", "bound[1]: has no observable"},
		{"value without sigma", "[[bound]]\nname = \"a\"\nobservable = \"x\"\nvalue = 1", "bounds.toml:4: bound[1].value = 1: needs sigma"},
		{"sigma without value", "[[bound]]\nname = \"a\"\nobservable = \"x\"\nsigma = 1", "bound[1].sigma = 1: needs value"},
		{"negative sigma", "[[bound]]\nname = \"a\"\nobservable = \"x\"\nvalue = 0\nsigma = -1", "bounds.toml:5: bound[1].sigma = -1: must be positive"},
		{"text sigma", "[[bound]]\nname = \"a\"\nobservable = \"x\"\nvalue = 0\nsigma = \"1 mas\"", `bound[1].sigma = "1 mas": must be a number (a plain number in the observable's unit`},
		{"mixed", "[[bound]]\nname = \"a\"\nobservable = \"x\"\nvalue = 0\nsigma = 1\nupper = 2", "give either value and sigma (a measurement) or upper and/or lower (a limit), not both"},
		{"neither", "[[bound]]\nname = \"a\"\nobservable = \"x\"", "has neither value and sigma"},
		{"limits crossed", "[[bound]]\nname = \"a\"\nobservable = \"x\"\nupper = 1\nlower = 2", "bound[1].lower = 2: must be below upper = 1"},
		{"confidence 1", "[[bound]]\nname = \"a\"\nobservable = \"x\"\nupper = 1\nconfidence = 1", "bounds.toml:5: bound[1].confidence = 1: must lie strictly between 0 and 1"},
		{"confidence percent", "[[bound]]\nname = \"a\"\nobservable = \"x\"\nupper = 1\nconfidence = 95", "bound[1].confidence = 95: must lie strictly between 0 and 1"},
		{"impact no unit", "[[bound]]\nname = \"a\"\nobservable = \"x\"\nupper = 1\nimpact = 3", "bound[1].impact = 3: must be a length with a unit"},
		{"impact not length", "[[bound]]\nname = \"a\"\nobservable = \"x\"\nupper = 1\nimpact = \"3 s\"", `bound[1].impact = "3 s":`},
		{"rule", "[combine]\nrule = \"any\"\n[[bound]]\nname = \"a\"\nobservable = \"x\"\nupper = 1", `bounds.toml:2: combine.rule = "any": allowed: "each"`},
		{"combine key", "[combine]\nlevel = 0.9\n[[bound]]\nname = \"a\"\nobservable = \"x\"\nupper = 1", "bounds.toml:2: combine.level: unknown key (allowed in [combine]: rule, confidence)"},
	} {
		_, err := Parse("bounds.toml", []byte(c.text))
		if err == nil {
			t.Errorf("%s: accepted", c.name)
			continue
		}
		var ps scenarios.Problems
		if !errors.As(err, &ps) {
			t.Errorf("%s: error %T, want scenarios.Problems", c.name, err)
		}
		if !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: message\n  %s\nwant it to contain\n  %s", c.name, err, c.want)
		}
	}
	// Several mistakes: all reported, in line order.
	_, err := Parse("bounds.toml", []byte("[[bound]]\nname = \"a\"\nobservable = \"x\"\nvalue = 0\nsigma = 0\nconfidence = 2\n"))
	if err == nil || !strings.Contains(err.Error(), "bounds.toml:5: bound[1].sigma = 0") || !strings.Contains(err.Error(), "bounds.toml:6: bound[1].confidence = 2") ||
		strings.Index(err.Error(), ":5:") > strings.Index(err.Error(), ":6:") {
		t.Errorf("two mistakes: %v", err)
	}
	if _, err := Load(filepath.Join(t.TempDir(), "none.toml")); err == nil || !errors.Is(err, os.ErrNotExist) {
		t.Errorf("missing file: %v", err)
	}
}
