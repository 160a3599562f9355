package scenarios

import (
	"crypto/sha256"
	"encoding/hex"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"mgorbit/integrator/kepler"
	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

func mustParse(t *testing.T, text string) *Scenario {
	t.Helper()
	sc, err := Parse("test.toml", []byte(text))
	if err != nil {
		t.Fatalf("%v\n--- text:\n%s", err, text)
	}
	return sc
}

func body(t *testing.T, sc *Scenario, name string) Body {
	t.Helper()
	i := sc.BodyIndex(name)
	if i < 0 {
		t.Fatalf("no body %s", name)
	}
	return sc.Bodies[i]
}

func TestBuiltinsLoad(t *testing.T) {
	names := BuiltinNames()
	if len(names) < 3 || !contains(names, DefaultName) {
		t.Fatalf("built-ins %v lack the default %q or the three required ones", names, DefaultName)
	}
	for _, n := range names {
		sc, err := Builtin(n)
		if err != nil {
			t.Fatalf("%s: %v", n, err)
		}
		text, _ := BuiltinText(n)
		sum := sha256.Sum256([]byte(text))
		if sc.Source != "builtin:"+n || sc.Text != text || sc.Hash != hex.EncodeToString(sum[:]) {
			t.Errorf("%s: Source %q, Hash %s, text kept %v", n, sc.Source, sc.Hash, sc.Text == text)
		}
		if sc.Name != n {
			t.Errorf("built-in %s calls itself %q", n, sc.Name)
		}
		if sc.Stack == nil || len(sc.Bodies) < 2 || sc.OrbitPeriod() <= 0 {
			t.Errorf("%s: incomplete scenario", n)
		}
	}
	if _, err := Builtin("no-such"); err == nil || !strings.Contains(err.Error(), DefaultName) {
		t.Errorf("unknown built-in: %v", err)
	}
	if _, err := BuiltinText("../builtin/aster-gr"); err == nil {
		t.Error("BuiltinText accepted a path")
	}
}

// TestDefaultScenario: the default built-in is the relativistic one, and its
// period follows Kepler's third law for a = 0.35 au about 1 Msun + planet.
func TestDefaultScenario(t *testing.T) {
	sc, err := Builtin(DefaultName)
	if err != nil {
		t.Fatal(err)
	}
	if got := sc.Stack.String(); got != "gr1pn" {
		t.Errorf("stack %s, want gr1pn", got)
	}
	is := sc.Integrator
	if is.Method != "yoshida6" || is.StepsPerOrbit != 500.7 || is.Orbits != 40 {
		t.Errorf("integrator %+v", is)
	}
	mu := units.GMSun * (1 + 1.7e-7)
	a := 0.35 * units.AU
	want := 2 * math.Pi * math.Sqrt(a*a*a/mu) // Kepler's third law
	if d := math.Abs(sc.OrbitPeriod()-want) / want; d > 1e-12 {
		t.Errorf("period off by %.2g relative", d)
	}
	if d := math.Abs(sc.TimeStep()-want/500.7) / want; d > 1e-12 {
		t.Errorf("step off by %.2g", d)
	}
}

// TestLoadFile reads a file from disk: Source is the path.
func TestLoadFile(t *testing.T) {
	text, _ := BuiltinText("halden-pair")
	path := filepath.Join(t.TempDir(), "pair.toml")
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	sc, err := Load(path)
	if err != nil {
		t.Fatal(err)
	}
	if sc.Source != path {
		t.Errorf("Source %q", sc.Source)
	}
	if _, err := Load(filepath.Join(t.TempDir(), "missing.toml")); err == nil {
		t.Error("missing file accepted")
	}
	bad := filepath.Join(t.TempDir(), "bad.toml")
	os.WriteFile(bad, []byte(strings.Replace(text, "e = 0.06", "e = 1.5", 1)), 0o644)
	if _, err := Load(bad); err == nil || !strings.Contains(err.Error(), bad+":") || !strings.Contains(err.Error(), "body[2].e") {
		t.Errorf("bad file: %v", err)
	}
}

// TestDefaults: what an [integrator]-less file gets (doc.go's schema): a
// Newtonian star and planet has one dominant mass and a position-only
// stack, so the default method is the Wisdom-Holman map.
func TestDefaults(t *testing.T) {
	sc := mustParse(t, scenario(starBody, planetBody))
	is := sc.Integrator
	if is.Method != "wisdom-holman-4" || is.StepsPerOrbit != 400.3 || is.Step != 0 || is.Orbits != 50 || is.Duration != 0 ||
		is.Tolerance != 1e-12 || is.EnergyTolerance != 1e-6 || is.AngularMomentumTolerance != 1e-6 ||
		is.Frame != "barycentric" || is.OrbitOf != "" {
		t.Errorf("defaults %+v", is)
	}
	// about 200 rows per orbit: 400.3 steps per orbit -> every 2nd step
	if is.OutputEvery != 2 {
		t.Errorf("output_every %d, want 2", is.OutputEvery)
	}
	if sc.Stack.String() != "newton" || len(sc.Kernels) != 1 {
		t.Errorf("default stack %s", sc.Stack)
	}
	if sc.OrbitOf() != 1 {
		t.Errorf("orbit_of defaults to %d, want the first body with a primary (1)", sc.OrbitOf())
	}
}

// TestExplicitIntegrator: units of step and duration (Julian year, day).
func TestExplicitIntegrator(t *testing.T) {
	sc := mustParse(t, scenario(`
description = "all keys"
[integrator]
method = "rk45"
step = "0.5 d"
duration = "20 yr"
orbit_of = "Tiber"
output_every = 10
tolerance = 1e-10
energy_tolerance = 1e-8
angular_momentum_tolerance = 1e-9
frame = "primary"
`, starBody, planetBody))
	is := sc.Integrator
	if is.Method != "rk45" || is.Step != 43200 || is.StepsPerOrbit != 0 || is.Duration != 20*365.25*86400 || is.Orbits != 0 ||
		is.OutputEvery != 10 || is.Tolerance != 1e-10 || is.EnergyTolerance != 1e-8 || is.AngularMomentumTolerance != 1e-9 ||
		is.Frame != "primary" || is.OrbitOf != "Tiber" {
		t.Errorf("integrator %+v", is)
	}
	if sc.Description != "all keys" || sc.TimeStep() != 43200 || sc.EndTime() != 20*365.25*86400 {
		t.Errorf("description %q, step %g, end %g", sc.Description, sc.TimeStep(), sc.EndTime())
	}
}

// TestElementsReproduceState: elements in the file give the state of the
// two-body formulas. At pericentre on the x axis (all angles 0) the relative
// state is r_p = a (1 - e) along x and v_p = sqrt(mu (1 + e)/(a (1 - e)))
// along y (vis-viva), with mu = G (M_primary + m) (PHYSICS.md: the relative
// two-body orbit). The companion is heavy so that leaving out m would show.
func TestElementsReproduceState(t *testing.T) {
	for _, frame := range []string{"primary", "barycentric"} {
		sc := mustParse(t, scenario(`
[integrator]
frame = "`+frame+`"
`, starBody, `
[[body]]
name = "Companion"
mass = "0.3 Msun"
primary = "Aster"
a = "2 au"
e = 0.4
`))
		mu := 1.3 * units.GMSun
		a, e := 2*units.AU, 0.4
		star, comp := body(t, sc, "Aster"), body(t, sc, "Companion")
		x, v := comp.X.Sub(star.X), comp.V.Sub(star.V)
		wantX := vec.V{a * (1 - e), 0, 0}
		wantV := vec.V{0, math.Sqrt(mu * (1 + e) / (a * (1 - e))), 0}
		if d := x.Sub(wantX).Norm() / wantX.Norm(); d > 1e-14 {
			t.Errorf("%s: relative position %v, want %v", frame, x, wantX)
		}
		if d := v.Sub(wantV).Norm() / wantV.Norm(); d > 1e-14 {
			t.Errorf("%s: relative velocity %v, want %v", frame, v, wantV)
		}
		if frame == "primary" && (star.X != vec.V{} || star.V != vec.V{}) {
			t.Errorf("primary frame: star at %v moving %v", star.X, star.V)
		}
	}

	// General angles: the state converts back to the written elements.
	sc := mustParse(t, scenario(starBody, `
[[body]]
name = "Tiber"
mass = "1.7e-7 Msun"
primary = "Aster"
a = "0.35 au"
e = 0.21
i = "7 deg"
node = "48 deg"
peri = "0.5 rad"
mean_anomaly = "3000 arcmin"
`))
	star, pl := body(t, sc, "Aster"), body(t, sc, "Tiber")
	el, err := kepler.FromState(star.GM+pl.GM, pl.X.Sub(star.X), pl.V.Sub(star.V))
	if err != nil {
		t.Fatal(err)
	}
	deg := math.Pi / 180
	want := kepler.Elements{A: 0.35 * units.AU, E: 0.21, I: 7 * deg, Node: 48 * deg, Peri: 0.5, M: 50 * deg}
	if math.Abs(el.A-want.A)/want.A > 1e-12 || math.Abs(el.E-want.E) > 1e-12 || math.Abs(el.I-want.I) > 1e-12 ||
		math.Abs(el.Node-want.Node) > 1e-12 || math.Abs(el.Peri-want.Peri) > 1e-12 || math.Abs(el.M-want.M) > 1e-12 {
		t.Errorf("elements back %+v, want %+v", el, want)
	}
	gmSun, mPl := units.GMSun, 1.7e-7
	if pl.GM != mPl*gmSun || star.GM != gmSun {
		t.Errorf("GM: star %g planet %g (masses in Msun go through the nominal GM)", star.GM, pl.GM)
	}
}

// TestHierarchy: a moon's elements refer to its planet, the planet's to the
// star, whatever the file order; mu is the pair's G (M + m) each time.
func TestHierarchy(t *testing.T) {
	sc := mustParse(t, scenario(`
[integrator]
steps_per_orbit = 2000.3
orbit_of = "Pale"
`, `
[[body]]
name = "Pale"
mass = "7e22 kg"
primary = "Gorm"
a = "4e5 km"
e = 0.05
`, starBody, `
[[body]]
name = "Gorm"
mass = "6e24 kg"
primary = "Aster"
a = "1 au"
e = 0.0
`))
	moon, planet, star := body(t, sc, "Pale"), body(t, sc, "Gorm"), body(t, sc, "Aster")
	// float64 products (a constant expression would be rounded only once)
	g, mMoon, mPlanet := units.G, 7e22, 6e24
	if moon.GM != mMoon*g || planet.GM != mPlanet*g {
		t.Errorf("GM in kg must go through G: %g %g", moon.GM, planet.GM)
	}
	// pericentre on the x axis about the planet (vis-viva)
	mu := moon.GM + planet.GM
	rp := 4e8 * 0.95
	// differences of absolute states lose about 400x (1 au over 4e5 km) and
	// 30x (30 km/s over 1 km/s) of float64 round-off
	if d := moon.X.Sub(planet.X).Sub(vec.V{rp, 0, 0}).Norm() / rp; d > 1e-13 {
		t.Errorf("moon position about planet off by %.2g", d)
	}
	vp := math.Sqrt(mu * 1.05 / rp)
	if d := moon.V.Sub(planet.V).Sub(vec.V{0, vp, 0}).Norm() / vp; d > 1e-13 {
		t.Errorf("moon velocity about planet off by %.2g", d)
	}
	// circular orbit of the planet: speed sqrt(mu/a) (standard)
	vc := math.Sqrt((star.GM + planet.GM) / units.AU)
	if d := math.Abs(planet.V.Sub(star.V).Norm()-vc) / vc; d > 1e-12 {
		t.Errorf("planet circular speed off by %.2g", d)
	}
	if sc.Bodies[0].Name != "Pale" {
		t.Errorf("bodies not in file order: %s first", sc.Bodies[0].Name)
	}
}

// TestStateVectors: a state relative to a primary, and an absolute one.
func TestStateVectors(t *testing.T) {
	sc := mustParse(t, scenario(`
[integrator]
frame = "primary"
`, starBody, planetBody, wandererBody, `
[[body]]
name = "Drifter"
test = true
position = ["3 au", "1 au", "0.5 au"]
velocity = ["0 m/s", "-20 km/s", "1 km/s"]
`))
	star, w, d := body(t, sc, "Aster"), body(t, sc, "Wanderer"), body(t, sc, "Drifter")
	if w.X.Sub(star.X) != (vec.V{units.AU, 0, 0}) || w.V.Sub(star.V) != (vec.V{0, 3e4, 0}) || !w.Test || w.GM != 0 {
		t.Errorf("wanderer %+v", w)
	}
	// absolute input, and the star sits at the origin of the primary frame
	// at rest: the absolute state is unchanged only if the star's state was
	// zero before the shift, which it is (no primary, no state).
	if d.X != (vec.V{3 * units.AU, units.AU, 0.5 * units.AU}) || d.V != (vec.V{0, -2e4, 1e3}) {
		t.Errorf("drifter %+v", d)
	}
}

// TestBarycentricFrame: massive bodies' centre of mass at rest at the origin:
// sum GM v = 0 and sum GM x = 0, to 1e-12 of sum GM |v| (|x|).
func TestBarycentricFrame(t *testing.T) {
	for _, n := range BuiltinNames() {
		sc, err := Builtin(n)
		if err != nil {
			t.Fatal(err)
		}
		var p, c vec.V
		var pScale, cScale, moving float64
		for _, b := range sc.Bodies {
			moving += b.V.Norm()
			p = p.AddScaled(b.GM, b.V)
			c = c.AddScaled(b.GM, b.X)
			pScale += b.GM * b.V.Norm()
			cScale += b.GM * b.X.Norm()
		}
		if p.Norm() > 1e-12*pScale || c.Norm() > 1e-12*cScale {
			t.Errorf("%s: total momentum %.2g, centre of mass %.2g (relative)", n, p.Norm()/pScale, c.Norm()/cScale)
		}
		if moving == 0 {
			t.Errorf("%s: nothing moves", n)
		}
	}
}

// TestKernelParameters: values are parsed by each parameter's kind and
// dimension (au exact, IAU 2012 B2), and "inf" where allowed.
func TestKernelParameters(t *testing.T) {
	cases := []struct {
		extra  string
		levels float64
		branch string
		str    float64
	}{
		{"", math.NaN(), "", math.NaN()}, // defaults come from the kernel
		{"levels = \"inf\"\nbranch = -1\nstrength = 0.5", math.Inf(1), "-1", 0.5},
		{"levels = inf\nbranch = +1\nstrength = -1", math.Inf(1), "+1", -1},
		{"levels = 12\nbranch = \"-1\"\nstrength = \"0.25\"", 12, "-1", 0.25},
	}
	for _, c := range cases {
		sc := mustParse(t, scenario(fakeStack+c.extra, starBody, planetBody))
		if sc.Stack.String() != "newton + test-fake" || len(sc.Kernels) != 2 {
			t.Fatalf("stack %s", sc.Stack)
		}
		spec := sc.Kernels[1]
		if spec.Values.Num["range"] != 2*149597870700.0 {
			t.Errorf("range %g", spec.Values.Num["range"])
		}
		if got, ok := spec.Values.Num["levels"]; ok != !math.IsNaN(c.levels) || ok && got != c.levels {
			t.Errorf("%q: levels %g (%v)", c.extra, got, ok)
		}
		if got := spec.Values.Str["branch"]; got != c.branch {
			t.Errorf("%q: branch %q", c.extra, got)
		}
		if got, ok := spec.Values.Num["strength"]; ok != !math.IsNaN(c.str) || ok && got != c.str {
			t.Errorf("%q: strength %g", c.extra, got)
		}
		// the kernel was built by the registry with the defaults filled in
		full := spec.Kernel.Values()
		if full.Str["branch"] == "" || full.Num["levels"] == 0 {
			t.Errorf("kernel values %+v lack defaults", full)
		}
	}
}

// TestStepLimitSkippedForKeplerDrift: the Wisdom-Holman drift is the exact
// Kepler flow, so 30 steps per orbit of an e = 0.6 orbit, far coarser than
// the fixed-step limit, is accepted there and refused for yoshida6.
func TestStepLimitSkippedForKeplerDrift(t *testing.T) {
	body := planet("e = 0.21", "e = 0.6")
	if _, err := Parse("wh.toml", []byte(scenario("[integrator]\nmethod = \"wisdom-holman-4\"\nsteps_per_orbit = 30.3", starBody, body))); err != nil {
		t.Errorf("wisdom-holman-4 at 30.3 steps per orbit refused: %v", err)
	}
	if _, err := Parse("y6.toml", []byte(scenario("[integrator]\nmethod = \"yoshida6\"\nsteps_per_orbit = 30.3", starBody, body))); err == nil {
		t.Error("yoshida6 at 30.3 steps per orbit of an e = 0.6 orbit accepted")
	}
}

// TestStepLimit: the step check's threshold is r_p/v_p / 20, which for a
// Kepler ellipse is P/(2 pi) (1 - e)^(3/2) / (1 + e)^(1/2) / 20 (from r_p =
// a (1 - e) and vis-viva); 1% either side of it passes and fails, and the
// suggestion in the message passes.
func TestStepLimit(t *testing.T) {
	for _, e := range []float64{0, 0.21, 0.5, 0.8} {
		need := 20 * 2 * math.Pi * math.Sqrt(1+e) / math.Pow(1-e, 1.5)
		text := func(steps float64) string {
			return scenario("[integrator]\nmethod = \"yoshida6\"\nsteps_per_orbit = "+strconv.FormatFloat(steps, 'g', -1, 64),
				starBody, planet("e = 0.21", "e = "+strconv.FormatFloat(e, 'g', -1, 64)))
		}
		if _, err := Parse("ok.toml", []byte(text(need*1.01))); err != nil {
			t.Errorf("e=%g: %.1f steps refused: %v", e, need*1.01, err)
		}
		_, err := Parse("coarse.toml", []byte(text(need*0.99)))
		if err == nil {
			t.Errorf("e=%g: %.1f steps accepted, limit %.1f", e, need*0.99, need)
			continue
		}
		m := regexp.MustCompile(`steps_per_orbit >= ([0-9.]+)`).FindStringSubmatch(err.Error())
		if m == nil {
			t.Fatalf("no suggestion in %v", err)
		}
		s, _ := strconv.ParseFloat(m[1], 64)
		if math.Abs(s-need)/need > 1e-3 {
			t.Errorf("e=%g: suggested %g steps, formula %g", e, s, need)
		}
		if _, err := Parse("suggested.toml", []byte(text(s))); err != nil {
			t.Errorf("e=%g: the suggested %g steps are refused: %v", e, s, err)
		}
		m = regexp.MustCompile(`step <= "([^"]+)"`).FindStringSubmatch(err.Error())
		if m == nil {
			t.Fatalf("no step suggestion in %v", err)
		}
		stepText := scenario("[integrator]\nstep = \""+m[1]+"\"", starBody, planet("e = 0.21", "e = "+strconv.FormatFloat(e, 'g', -1, 64)))
		if _, err := Parse("suggested.toml", []byte(stepText)); err != nil {
			t.Errorf("e=%g: the suggested step %s is refused: %v", e, m[1], err)
		}
	}
	// rk45 sets its own steps: no step check
	if _, err := Parse("rk.toml", []byte(scenario("[integrator]\nmethod = \"rk45\"\nsteps_per_orbit = 10.5", starBody, planetBody))); err != nil {
		t.Errorf("rk45 with a coarse initial step refused: %v", err)
	}
}

// TestDurationLimit: at least 3 radial periods; the suggested duration passes.
func TestDurationLimit(t *testing.T) {
	if _, err := Parse("ok.toml", []byte(scenario("[integrator]\norbits = 3", starBody, planetBody))); err != nil {
		t.Errorf("3 orbits refused: %v", err)
	}
	_, err := Parse("short.toml", []byte(scenario("[integrator]\nduration = \"200 d\"", starBody, planetBody)))
	if err == nil {
		t.Fatal("200 d (2.6 periods of 75.6 d) accepted")
	}
	m := regexp.MustCompile(`duration >= "([^"]+)"`).FindStringSubmatch(err.Error())
	if m == nil {
		t.Fatalf("no suggestion in %v", err)
	}
	if _, err := Parse("ok.toml", []byte(scenario("[integrator]\nduration = \""+m[1]+"\"", starBody, planetBody))); err != nil {
		t.Errorf("suggested duration %s refused: %v", m[1], err)
	}
}

// TestLineLocator: field paths map to the lines that write them.
func TestLineLocator(t *testing.T) {
	text := `name = "x"
description = """
a = 1
"""
[integrator]
method = "rk45"   # comment
[[body]]
name = "A"
[[body]]
"name" = "B"
e = 0.1
[[kernel]]
name = "newton"
`
	got := locateKeys(text)
	want := map[string]int{"name": 1, "description": 2, "integrator": 5, "integrator.method": 6,
		"body[1]": 7, "body[1].name": 8, "body[2]": 9, "body[2].name": 10, "body[2].e": 11, "kernel[1].name": 13}
	for k, v := range want {
		if got[k] != v {
			t.Errorf("%s at line %d, want %d", k, got[k], v)
		}
	}
	if _, bad := got["a"]; bad {
		t.Error("a key inside a multi-line string was located")
	}
}
