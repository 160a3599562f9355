package scenarios

import (
	"bytes"
	"fmt"
	"math"
	"sort"
	"strings"
	"testing"

	"github.com/BurntSushi/toml"
)

// roundTrip writes an accepted scenario's TOML document out again (the
// TOML encoder, keys sorted, values in their shortest exact form) and
// parses that: the result must be the same scenario, every float to the
// bit. Only where the text came from may differ (hash, text, lines).
func roundTrip(t *testing.T, text string, sc *Scenario) {
	t.Helper()
	var doc map[string]any
	if _, err := toml.Decode(text, &doc); err != nil {
		t.Fatalf("Parse accepted what the TOML decoder refuses: %v", err)
	}
	var b bytes.Buffer
	if err := toml.NewEncoder(&b).Encode(doc); err != nil {
		t.Fatalf("the TOML encoder cannot write an accepted scenario back: %v", err)
	}
	again, err := Parse("fuzz.toml", b.Bytes())
	if err != nil {
		t.Fatalf("the scenario, written out again, is refused: %v\n--- written:\n%s", err, b.String())
	}
	if x, y := describe(sc), describe(again); x != y {
		t.Fatalf("written out and parsed again, the scenario changed:\n%s\n--- versus ---\n%s", x, y)
	}
}

// describe renders everything a run uses, floats as their bits.
func describe(sc *Scenario) string {
	var w strings.Builder
	bits := func(x float64) string { return fmt.Sprintf("%016x", math.Float64bits(x)) }
	fmt.Fprintf(&w, "name %q description %q stack %s\n", sc.Name, sc.Description, sc.Stack)
	for _, b := range sc.Bodies {
		fmt.Fprintf(&w, "body %q gm %s test %v primary %q radius %s", b.Name, bits(b.GM), b.Test, b.Primary, bits(b.Radius))
		for k := 0; k < 3; k++ {
			fmt.Fprintf(&w, " x%d %s v%d %s", k, bits(b.X[k]), k, bits(b.V[k]))
		}
		w.WriteString("\n")
	}
	for _, k := range sc.Kernels {
		fmt.Fprintf(&w, "kernel %q", k.Name)
		var keys []string
		for n := range k.Values.Num {
			keys = append(keys, n)
		}
		sort.Strings(keys)
		for _, n := range keys {
			fmt.Fprintf(&w, " %s=%s", n, bits(k.Values.Num[n]))
		}
		keys = keys[:0]
		for n := range k.Values.Str {
			keys = append(keys, n)
		}
		sort.Strings(keys)
		for _, n := range keys {
			fmt.Fprintf(&w, " %s=%q", n, k.Values.Str[n])
		}
		w.WriteString("\n")
	}
	is := sc.Integrator
	fmt.Fprintf(&w, "integrator %q spo %s step %s orbits %s duration %s of %q every %d tol %s etol %s jtol %s frame %q\n",
		is.Method, bits(is.StepsPerOrbit), bits(is.Step), bits(is.Orbits), bits(is.Duration), is.OrbitOf, is.OutputEvery,
		bits(is.Tolerance), bits(is.EnergyTolerance), bits(is.AngularMomentumTolerance), is.Frame)
	return w.String()
}

// TestRoundTripBuiltins: every built-in scenario survives being written
// out and parsed again (the same check the fuzzer makes on its inputs).
func TestRoundTripBuiltins(t *testing.T) {
	for _, n := range BuiltinNames() {
		text, _ := BuiltinText(n)
		sc, err := Parse("fuzz.toml", []byte(text))
		if err != nil {
			t.Fatal(err)
		}
		roundTrip(t, text, sc)
	}
}
