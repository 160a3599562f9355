package scenarios

import (
	"errors"
	"strings"
	"testing"
)

const (
	starBody = `
[[body]]
name = "Aster"
mass = "1 Msun"
`
	planetBody = `
[[body]]
name = "Tiber"
mass = "1.7e-7 Msun"
primary = "Aster"
a = "0.35 au"
e = 0.21
`
	wandererBody = `
[[body]]
name = "Wanderer"
test = true
primary = "Aster"
position = ["1 au", "0 m", "0 m"]
velocity = ["0 m/s", "30 km/s", "0 m/s"]
`
	fakeStack = `
[[kernel]]
name = "newton"
[[kernel]]
name = "test-fake"
range = "2 au"
`
)

// scenario assembles a test file: a name line, then the given parts.
func scenario(parts ...string) string {
	return "name = \"case\"\n" + strings.Join(parts, "\n")
}

// planet returns planetBody with old replaced by new.
func planet(old, new string) string {
	if !strings.Contains(planetBody, old) {
		panic("planet: no " + old)
	}
	return strings.Replace(planetBody, old, new, 1)
}

// TestMalformed: every malformed scenario is refused with a message that
// names the file, the field path and the problem (the schema in doc.go is
// the specification each case checks).
func TestMalformed(t *testing.T) {
	cases := []malformedCase{
		{"missing name", starBody + planetBody, []string{"name: missing"}, 0},
		{"empty name", strings.Replace(scenario(starBody, planetBody), `"case"`, `"  "`, 1), []string{"name", "must not be empty"}, 1},
		{"name not a string", strings.Replace(scenario(starBody, planetBody), `"case"`, `5`, 1), []string{"name = 5", "must be a string"}, 1},
		{"unknown top-level key", scenario("nmae = 3", starBody, planetBody),
			[]string{"case.toml:2: nmae", `unknown key "nmae"`, `did you mean "name"`}, 2},
		{"unknown integrator key", scenario("[integrator]\nstep_per_orbit = 300", starBody, planetBody),
			[]string{"integrator.step_per_orbit", "unknown key", `did you mean "steps_per_orbit"`}, 3},
		{"unknown body key", scenario(starBody, planet(`mass =`, `mas =`)),
			[]string{"body[2].mas", `unknown key "mas"`, `did you mean "mass"`}, 0},
		{"unknown kernel", scenario("[[kernel]]\nname = \"gravy\"", starBody, planetBody),
			[]string{`kernel[1].name = "gravy"`, "unknown kernel", "newton", "gr1pn"}, 3},
		{"kernel without name", scenario("[[kernel]]", starBody, planetBody),
			[]string{"kernel[1].name", "missing"}, 2},
		{"unknown kernel parameter", scenario("[[kernel]]\nname = \"gr1pn\"\nalpha = 1e-6", starBody, planetBody),
			[]string{"kernel[1].alpha", `unknown key "alpha"`}, 4},
		{"base law second", scenario("[[kernel]]\nname = \"newton\"\n[[kernel]]\nname = \"gr1pn\"", starBody, planetBody),
			[]string{`kernel[2].name = "gr1pn"`, "base law", "only the first"}, 5},
		{"correction first", scenario("[[kernel]]\nname = \"test-fake\"\nrange = \"1 au\"", starBody, planetBody),
			[]string{`kernel[1].name = "test-fake"`, "correction", "must be a base law"}, 3},
		{"kernel length without unit", scenario(strings.Replace(fakeStack, `"2 au"`, `2`, 1), starBody, planetBody),
			[]string{"kernel[2].range = 2", "length needs a unit"}, 0},
		{"kernel length with a mass unit", scenario(strings.Replace(fakeStack, `"2 au"`, `"2 kg"`, 1), starBody, planetBody),
			[]string{`kernel[2].range = "2 kg"`, "dimension of mass", "length is needed"}, 0},
		{"kernel length out of range", scenario(strings.Replace(fakeStack, `"2 au"`, `"-2 au"`, 1), starBody, planetBody),
			[]string{"kernel[2].range", "out of range", "(0, inf]"}, 0},
		{"kernel required parameter missing", scenario(strings.Replace(fakeStack, "range = \"2 au\"\n", "", 1), starBody, planetBody),
			[]string{"kernel[2].range: missing", "length"}, 0},
		{"kernel choice not allowed", scenario(fakeStack+"branch = 2", starBody, planetBody),
			[]string{"kernel[2].branch = 2", "not allowed", "+1, -1"}, 0},
		{"kernel choice wrong word", scenario(fakeStack+`branch = "up"`, starBody, planetBody),
			[]string{`kernel[2].branch = "up"`, "one of +1, -1"}, 0},
		{"kernel integer not whole", scenario(fakeStack+"levels = 2.5", starBody, planetBody),
			[]string{"kernel[2].levels = 2.5", "not a whole number"}, 0},
		{"kernel integer below minimum", scenario(fakeStack+"levels = 0", starBody, planetBody),
			[]string{"kernel[2].levels = 0", "out of range", "or inf"}, 0},
		{"kernel number out of range", scenario(fakeStack+"strength = 3", starBody, planetBody),
			[]string{"kernel[2].strength = 3", "out of range", "[-1, 1]"}, 0},
		{"mass without unit", scenario(strings.Replace(starBody, `"1 Msun"`, `1.0`, 1), planetBody),
			[]string{"body[1].mass = 1", "mass needs a unit", "Msun"}, 5},
		{"mass with a length unit", scenario(strings.Replace(starBody, `"1 Msun"`, `"3 km"`, 1), planetBody),
			[]string{`body[1].mass = "3 km"`, "dimension of length", "mass is needed"}, 5},
		{"mass with unknown unit", scenario(strings.Replace(starBody, `"1 Msun"`, `"1 Mfoo"`, 1), planetBody),
			[]string{"body[1].mass", `unknown unit "Mfoo"`}, 5},
		{"zero mass", scenario(strings.Replace(starBody, `"1 Msun"`, `"0 Msun"`, 1), planetBody),
			[]string{`body[1].mass = "0 Msun"`, "must be positive", "test = true"}, 5},
		{"negative mass", scenario(starBody, planet(`"1.7e-7 Msun"`, `"-1.7e-7 Msun"`)),
			[]string{"body[2].mass", "must be positive"}, 0},
		{"missing mass", scenario(starBody, planet("mass = \"1.7e-7 Msun\"\n", "")),
			[]string{"body[2].mass: missing", "test = true"}, 0},
		{"test body with a mass", scenario(starBody, planet(`mass =`, "test = true\nmass =")),
			[]string{"body[2].mass", "test body", "has no mass"}, 0},
		{"eccentricity NaN", scenario(starBody, planet("e = 0.21", "e = nan")),
			[]string{"body[2].e = NaN", "finite"}, 0},
		{"semi-major axis infinite", scenario(starBody, planet(`"0.35 au"`, `"inf au"`)),
			[]string{"body[2].a", "not finite"}, 0},
		{"semi-major axis overflows", scenario(starBody, planet(`"0.35 au"`, `"1e308 au"`)),
			[]string{"body[2].a", "out of the float64 range"}, 0},
		{"eccentricity 1", scenario(starBody, planet("e = 0.21", "e = 1.0")),
			[]string{"body[2].e = 1", "[0, 1)", "bound"}, 13},
		{"eccentricity above 1", scenario(starBody, planet("e = 0.21", "e = 1.3")),
			[]string{"body[2].e = 1.3", "[0, 1)"}, 0},
		{"eccentricity negative", scenario(starBody, planet("e = 0.21", "e = -0.1")),
			[]string{"body[2].e = -0.1", "at least 0"}, 0},
		{"semi-major axis negative", scenario(starBody, planet(`"0.35 au"`, `"-0.35 au"`)),
			[]string{`body[2].a = "-0.35 au"`, "positive"}, 12},
		{"semi-major axis zero", scenario(starBody, planet(`"0.35 au"`, `"0 au"`)),
			[]string{`body[2].a = "0 au"`, "positive"}, 0},
		{"semi-major axis as angle", scenario(starBody, planet(`"0.35 au"`, `"0.35 deg"`)),
			[]string{"body[2].a", "dimension of angle", "length is needed"}, 0},
		{"inclination out of range", scenario(starBody, planetBody+`i = "200 deg"`),
			[]string{`body[2].i = "200 deg"`, "[0, 180] deg"}, 0},
		{"inclination without unit", scenario(starBody, planetBody+`i = 0.1`),
			[]string{"body[2].i = 0.1", "an angle needs a unit"}, 0},
		{"missing eccentricity", scenario(starBody, planet("e = 0.21", "")),
			[]string{"body[2].e: missing", "a (semi-major axis) and e"}, 0},
		{"missing semi-major axis", scenario(starBody, planet(`a = "0.35 au"`, `i = "1 deg"`)),
			[]string{"body[2].a: missing"}, 0},
		{"elements without primary", scenario(starBody, planet(`primary = "Aster"`, "")),
			[]string{"body[2].primary: missing", "orbital elements are about a primary"}, 0},
		{"unknown primary", scenario(starBody, planet(`"Aster"`, `"Astr"`)),
			[]string{`body[2].primary = "Astr"`, "unknown primary", "Aster, Tiber"}, 0},
		{"own primary", scenario(starBody, planet(`"Aster"`, `"Tiber"`)),
			[]string{`body[2].primary = "Tiber"`, "its own primary"}, 0},
		{"primary loop", scenario(starBody, planetBody, strings.NewReplacer(`"Tiber"`, `"Moon"`, `"Aster"`, `"Orb"`).Replace(planetBody),
			"[[body]]\nname = \"Orb\"\nmass = \"1e-6 Msun\"\nprimary = \"Moon\"\na = \"0.01 au\"\ne = 0"),
			[]string{"body[3].primary", "primaries form a loop: Moon -> Orb -> Moon"}, 0},
		{"duplicate body name", scenario(starBody, strings.Replace(planetBody, `"Tiber"`, `"Aster"`, 1)),
			[]string{`body[2].name = "Aster"`, "duplicate body name", "also body[1]"}, 0},
		{"body without name", scenario(starBody, planet("name = \"Tiber\"\n", "")),
			[]string{"body[2].name: missing"}, 0},
		{"elements and state both", scenario(starBody, planetBody+`position = ["1 au", "0 m", "0 m"]`),
			[]string{"body[2].position", "both orbital elements (a, e) and a state vector (position)"}, 0},
		{"state vector with two components", scenario(starBody, planetBody, strings.Replace(wandererBody, `"1 au", "0 m", "0 m"`, `"1 au", "0 m"`, 1)),
			[]string{"body[3].position", "three length values"}, 0},
		{"state vector component without unit", scenario(starBody, planetBody, strings.Replace(wandererBody, `"1 au", "0 m", "0 m"`, `1, "0 m", "0 m"`, 1)),
			[]string{"body[3].position", "the x component", "length needs a unit"}, 0},
		{"velocity with a length unit", scenario(starBody, planetBody, strings.Replace(wandererBody, `"30 km/s"`, `"30 km"`, 1)),
			[]string{"body[3].velocity", "the y component", "dimension of length", "speed is needed"}, 0},
		{"position without velocity", scenario(starBody, planetBody, strings.Replace(wandererBody, "velocity = [\"0 m/s\", \"30 km/s\", \"0 m/s\"]\n", "", 1)),
			[]string{"body[3].velocity: missing", "both position and velocity"}, 0},
		{"primary but no orbit", scenario(starBody, planet("a = \"0.35 au\"\ne = 0.21\n", "")),
			[]string{"body[2]: has primary", "no orbit"}, 0},
		{"bodies on top of each other", scenario(starBody, strings.Replace(starBody, `"Aster"`, `"Twin"`, 1), planetBody),
			[]string{"body[2]: starts at the same position as body[1]"}, 0},
		{"body as a single table", scenario("[body]\nname = \"Aster\"\nmass = \"1 Msun\""),
			[]string{"body", "array of tables", "[[body]]"}, 0},
		{"one body", scenario(starBody), []string{"body: a scenario needs at least 2 bodies", "found 1"}, 0},
		{"no bodies", scenario(), []string{"at least 2 bodies", "found 0"}, 0},
		{"no massive body", scenario(strings.Replace(starBody, `mass = "1 Msun"`, "test = true", 1), planet(`mass = "1.7e-7 Msun"`, "test = true")),
			[]string{"no massive body"}, 0},
		{"steps_per_orbit and step", scenario("[integrator]\nsteps_per_orbit = 300.5\nstep = \"0.5 d\"", starBody, planetBody),
			[]string{`integrator.step = "0.5 d"`, "steps_per_orbit and step are both set"}, 4},
		{"orbits and duration", scenario("[integrator]\norbits = 10\nduration = \"20 yr\"", starBody, planetBody),
			[]string{`integrator.duration = "20 yr"`, "orbits and duration are both set"}, 4},
		{"negative steps per orbit", scenario("[integrator]\nsteps_per_orbit = -5", starBody, planetBody),
			[]string{"integrator.steps_per_orbit = -5", "must be positive"}, 0},
		{"step without unit", scenario("[integrator]\nstep = 3600", starBody, planetBody),
			[]string{"integrator.step = 3600", "time needs a unit"}, 0},
		{"unknown method", scenario("[integrator]\nmethod = \"yoshida8\"", starBody, planetBody),
			[]string{`integrator.method = "yoshida8"`, "unknown integrator", "yoshida6", "rk45"}, 3},
		{"tolerance without rk45", scenario("[integrator]\ntolerance = 1e-10", starBody, planetBody),
			[]string{"integrator.tolerance = 1e-10", `method = "rk45" only`}, 0},
		{"tolerance out of range", scenario("[integrator]\nmethod = \"rk45\"\ntolerance = 2", starBody, planetBody),
			[]string{"integrator.tolerance = 2", "(0, 1)"}, 0},
		{"energy tolerance zero", scenario("[integrator]\nenergy_tolerance = 0", starBody, planetBody),
			[]string{"integrator.energy_tolerance = 0", "(0, 1)"}, 0},
		{"output_every zero", scenario("[integrator]\noutput_every = 0", starBody, planetBody),
			[]string{"integrator.output_every = 0", "at least 1"}, 0},
		{"unknown frame", scenario("[integrator]\nframe = \"heliocentric\"", starBody, planetBody),
			[]string{`integrator.frame = "heliocentric"`, "barycentric, primary"}, 0},
		{"integrator not a table", scenario(`integrator = "rk45"`, starBody, planetBody),
			[]string{`integrator = "rk45"`, "must be a table"}, 0},
		{"orbit_of unknown", scenario("[integrator]\norbit_of = \"Tibr\"", starBody, planetBody),
			[]string{`integrator.orbit_of = "Tibr"`, "no body has this name"}, 0},
		{"orbit_of without primary", scenario("[integrator]\norbit_of = \"Aster\"", starBody, planetBody),
			[]string{`integrator.orbit_of = "Aster"`, "has no primary"}, 0},
		{"no body with a primary", scenario(starBody, strings.Replace(starBody, `"Aster"`, `"Far"`, 1)+`position = ["100 au", "0 m", "0 m"]`+"\nvelocity = [\"0 m/s\", \"0 m/s\", \"0 m/s\"]"),
			[]string{"integrator.orbit_of", "no body has a primary"}, 0},
		{"orbit_of unbound", scenario("[integrator]\norbit_of = \"Wanderer\"", starBody, planetBody, strings.Replace(wandererBody, `"30 km/s"`, `"45 km/s"`, 1)),
			[]string{`integrator.orbit_of = "Wanderer"`, "not bound to Aster", "a precession needs a bound orbit"}, 0},
		{"default orbit_of unbound", scenario(starBody, strings.Replace(wandererBody, `"30 km/s"`, `"45 km/s"`, 1)),
			[]string{`integrator.orbit_of = "Wanderer" (default: the first body with a primary)`, "not bound"}, 0},
		{"radial orbit", scenario(starBody, planetBody, strings.Replace(wandererBody, `"0 m/s", "30 km/s", "0 m/s"`, `"-3 km/s", "0 m/s", "0 m/s"`, 1)),
			[]string{"body[3]", "zero angular momentum"}, 0},
		{"steps too coarse", scenario("[integrator]\nsteps_per_orbit = 150.5\nmethod = \"yoshida6\"", starBody, planetBody),
			[]string{"integrator.steps_per_orbit = 150.5", "too coarse for Tiber", "r_p/v_p", "1/20", "set steps_per_orbit >= "}, 3},
		{"default step too coarse", scenario("[integrator]\nmethod = \"yoshida6\"", starBody, planet("e = 0.21", "e = 0.6")),
			[]string{"integrator.steps_per_orbit = 400.3 (default)", "too coarse"}, 0},
		{"step too coarse", scenario("[integrator]\nstep = \"1 d\"\nmethod = \"yoshida6\"", starBody, planetBody),
			[]string{`integrator.step = "1 d"`, "too coarse for Tiber", "step <= "}, 3},
		{"too few orbits", scenario("[integrator]\norbits = 2.5", starBody, planetBody),
			[]string{"integrator.orbits = 2.5", "2.5 radial periods of Tiber", "at least 3", "orbits >= 3"}, 3},
		{"duration too short", scenario("[integrator]\nduration = \"100 d\"", starBody, planetBody),
			[]string{`integrator.duration = "100 d"`, "radial periods of Tiber", "duration >= "}, 3},
		{"TOML syntax", scenario(starBody, "[[body]]\nname = \"Tiber\nmass = 3"),
			[]string{"case.toml:8:", "TOML syntax"}, 8},
		{"duplicate key", scenario(starBody, planetBody+"e = 0.3"),
			[]string{"TOML syntax", "e"}, 0},
	}
	checkMalformed(t, cases)
	if len(cases) < 30 {
		t.Errorf("only %d cases", len(cases))
	}
}

// malformedCase is a scenario that must be refused, with the substrings its
// message must hold and the line of its first problem (0 = not checked).
type malformedCase struct {
	name string
	text string
	want []string
	line int
}

// checkMalformed parses each case and checks that it is refused with a
// message that starts with the file name, holds every wanted substring, and
// places its first problem on the stated line.
func checkMalformed(t *testing.T, cases []malformedCase) {
	t.Helper()
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := Parse("case.toml", []byte(c.text))
			if err == nil {
				t.Fatalf("accepted:\n%s", c.text)
			}
			msg := err.Error()
			if !strings.HasPrefix(msg, "case.toml") {
				t.Errorf("message does not start with the file name: %s", msg)
			}
			for _, w := range c.want {
				if !strings.Contains(msg, w) {
					t.Errorf("message lacks %q:\n%s", w, msg)
				}
			}
			var ps Problems
			if !errors.As(err, &ps) || len(ps) == 0 {
				t.Fatalf("error is not Problems: %T", err)
			}
			if c.line != 0 && ps[0].Line != c.line {
				t.Errorf("line %d, want %d:\n%s", ps[0].Line, c.line, msg)
			}
		})
	}
}
