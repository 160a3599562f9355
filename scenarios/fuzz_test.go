package scenarios

import "testing"

// FuzzParse: no input makes Parse panic, a failure always says where, and
// an accepted scenario written out again parses to the same scenario
// (roundTrip). go test runs the seeds and the corpus kept in
// testdata/fuzz/FuzzParse; go test -fuzz FuzzParse explores further.
func FuzzParse(f *testing.F) {
	for _, n := range BuiltinNames() {
		text, _ := BuiltinText(n)
		f.Add(text)
	}
	f.Add(scenario(starBody, planetBody, wandererBody))
	f.Add(scenario(fakeStack+"levels = \"inf\"\nbranch = -1", starBody, planetBody))
	f.Fuzz(func(t *testing.T, text string) {
		sc, err := Parse("fuzz.toml", []byte(text))
		if err == nil && (sc == nil || len(sc.Bodies) < 2 || sc.Stack == nil) {
			t.Fatalf("accepted an incomplete scenario: %+v", sc)
		}
		if err != nil && len(err.Error()) < len("fuzz.toml: ") {
			t.Fatalf("empty message: %q", err)
		}
		if err == nil {
			roundTrip(t, text, sc)
		}
	})
}
