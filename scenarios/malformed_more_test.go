package scenarios

import (
	"strings"
	"testing"
)

// withStar returns starBody with extra lines after its mass.
func withStar(extra string) string {
	return strings.Replace(starBody, `mass = "1 Msun"`, "mass = \"1 Msun\"\n"+extra, 1)
}

// TestMalformedMore: more refused scenarios, each message naming the file,
// the field path and the problem: radii, NaN and infinity written in
// every way a scenario can hold a number, and the shapes of values.
func TestMalformedMore(t *testing.T) {
	moonOfTestBody := strings.NewReplacer(`"Tiber"`, `"Moon"`, `"Aster"`, `"Tiber"`, `"0.35 au"`, `"0.001 au"`, `mass = "1.7e-7 Msun"`, "test = true").Replace(planetBody)
	cases := []malformedCase{
		{"radius negative", scenario(withStar(`radius = "-5 km"`), planetBody),
			[]string{`body[1].radius = "-5 km"`, "must be a positive length"}, 6},
		{"radius without unit", scenario(withStar("radius = 5"), planetBody),
			[]string{"body[1].radius = 5", "a length needs a unit"}, 6},
		{"radius with a mass unit", scenario(withStar(`radius = "5 Msun"`), planetBody),
			[]string{`body[1].radius = "5 Msun"`, "dimension of mass", "length is needed"}, 6},
		{"radii overlap at the start", scenario(withStar(`radius = "0.3 au"`), planetBody),
			[]string{"body[2]: starts", "from Aster, inside the sum of their radii (0.3 au)"}, 0},
		{"eccentricity infinite", scenario(starBody, planet("e = 0.21", "e = inf")),
			[]string{"body[2].e = +Inf", "must be a finite number"}, 13},
		{"mass NaN in a string", scenario(strings.Replace(starBody, `"1 Msun"`, `"nan Msun"`, 1), planetBody),
			[]string{`body[1].mass = "nan Msun"`, "not finite"}, 5},
		{"velocity component infinite", scenario(starBody, planetBody, strings.Replace(wandererBody, `"30 km/s"`, `"-Inf km/s"`, 1)),
			[]string{"body[3].velocity", "the y component", "not finite"}, 0},
		{"kernel parameter NaN", scenario(fakeStack+"strength = nan", starBody, planetBody),
			[]string{"kernel[2].strength = NaN", "must be a finite number", "[-1, 1]"}, 0},
		{"steps per orbit infinite", scenario("[integrator]\nsteps_per_orbit = inf", starBody, planetBody),
			[]string{"integrator.steps_per_orbit = +Inf", "finite"}, 3},
		{"mass out of range", scenario(strings.Replace(starBody, `"1 Msun"`, `"1e400 Msun"`, 1), planetBody),
			[]string{`body[1].mass = "1e400 Msun"`, "out of the float64 range"}, 5},
		{"orbits zero", scenario("[integrator]\norbits = 0", starBody, planetBody),
			[]string{"integrator.orbits = 0", "must be positive"}, 3},
		{"duration negative", scenario("[integrator]\nduration = \"-3 yr\"", starBody, planetBody),
			[]string{`integrator.duration = "-3 yr"`, "must be a positive time"}, 3},
		{"step with a speed unit", scenario("[integrator]\nstep = \"3 km/s\"", starBody, planetBody),
			[]string{`integrator.step = "3 km/s"`, "dimension of speed", "time is needed"}, 3},
		{"angular momentum tolerance above 1", scenario("[integrator]\nangular_momentum_tolerance = 1.5", starBody, planetBody),
			[]string{"integrator.angular_momentum_tolerance = 1.5", "(0, 1)"}, 3},
		{"output_every not whole", scenario("[integrator]\noutput_every = 2.5", starBody, planetBody),
			[]string{"integrator.output_every = 2.5", "whole number"}, 3},
		{"method not a string", scenario("[integrator]\nmethod = 6", starBody, planetBody),
			[]string{"integrator.method = 6", "must be a string"}, 3},
		{"test not a boolean", scenario(starBody, planet(`mass = "1.7e-7 Msun"`, `test = "yes"`)),
			[]string{`body[2].test = "yes"`, "must be true or false"}, 0},
		{"swapped letters in a kernel key", scenario(strings.Replace(fakeStack, "range =", "rnage =", 1), starBody, planetBody),
			[]string{"kernel[2].rnage", `unknown key "rnage"`, `did you mean "range"`}, 0},
		{"inclination negative", scenario(starBody, planetBody+`i = "-5 deg"`),
			[]string{`body[2].i = "-5 deg"`, "[0, 180] deg"}, 0},
		{"mean anomaly as a length", scenario(starBody, planetBody+`mean_anomaly = "5 km"`),
			[]string{`body[2].mean_anomaly = "5 km"`, "dimension of length", "angle is needed"}, 0},
		{"position not a list", scenario(starBody, planetBody, strings.Replace(wandererBody, `["1 au", "0 m", "0 m"]`, `"1 au"`, 1)),
			[]string{`body[3].position = "1 au"`, "list of three length values"}, 0},
		{"kernel not an array of tables", scenario("kernel = \"newton\"", starBody, planetBody),
			[]string{`kernel = "newton"`, "[[kernel]]"}, 2},
		{"elements about a test body", scenario(starBody, planet(`mass = "1.7e-7 Msun"`, "test = true"), moonOfTestBody),
			[]string{`body[3].primary = "Tiber"`, "is a test body", "massive primary"}, 0},
		{"pericentre too fast for the default step", scenario("[integrator]\nmethod = \"yoshida6\"", starBody, planet("e = 0.21", "e = 0.99")),
			[]string{"integrator.steps_per_orbit = 400.3 (default)", "too coarse for Tiber", "set steps_per_orbit >= "}, 0},
	}
	checkMalformed(t, cases)
}

// TestEditDistanceSwaps: a swap of neighbours is one edit (optimal string
// alignment; "ca" -> "abc" is 3 under it, 2 under unrestricted Damerau,
// the textbook example of the difference).
func TestEditDistanceSwaps(t *testing.T) {
	for _, c := range []struct {
		a, b string
		d    int
	}{{"rnage", "range", 1}, {"nmae", "name", 1}, {"ca", "abc", 3}, {"kitten", "sitting", 3}, {"", "abc", 3}, {"same", "same", 0}} {
		if d := editDistance(c.a, c.b); d != c.d {
			t.Errorf("editDistance(%q, %q) = %d, want %d", c.a, c.b, d, c.d)
		}
	}
}
