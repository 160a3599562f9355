package scenarios

import (
	"fmt"
	"math"
	"path/filepath"
	"strings"

	"mgorbit/integrator"
	"mgorbit/integrator/kepler"
	"mgorbit/kernels"
	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

// Defaults of the [integrator] table (see doc.go). The step defaults to a
// non-integer count per orbit on purpose: with a whole number the
// pericentres fall at the same step phase every orbit and integration bias
// hides from the precession fit.
const (
	DefaultMethod        = "yoshida6"
	DefaultStepsPerOrbit = 400.3
	DefaultOrbits        = 50.0
	DefaultTolerance     = 1e-12
	DefaultDriftLimit    = 1e-6
	// RowsPerOrbit is the trajectory cadence output_every defaults to.
	RowsPerOrbit = 200
)

var (
	topKeys        = []string{"name", "description", "integrator", "kernel", "body"}
	integratorKeys = []string{"method", "steps_per_orbit", "step", "orbits", "duration", "orbit_of",
		"output_every", "tolerance", "energy_tolerance", "angular_momentum_tolerance", "frame"}
	elementKeys = []string{"a", "e", "i", "node", "peri", "mean_anomaly"}
	stateKeys   = []string{"position", "velocity"}
	bodyKeys    = append(append([]string{"name", "mass", "test", "primary", "radius"}, elementKeys...), stateKeys...)
	frames      = []string{"barycentric", "primary"}
)

type builder struct {
	r  *report
	sc *Scenario

	integ *table
	// which of the alternatives the file wrote
	gaveStep, gaveDuration bool

	bodies []*bodySpec
	byName map[string]*bodySpec
}

type bodySpec struct {
	t       *table
	name    string
	gm      float64
	test    bool
	primary string
	radius  float64

	elements bool
	el       kepler.Elements
	state    bool
	x, v     vec.V // as given: relative to the primary if there is one

	done   bool
	X, V   vec.V // absolute (then in the output frame)
	relX   vec.V // relative to the primary
	relV   vec.V
	mu     float64 // G (M_primary + m) of the relative orbit
	parent *bodySpec
}

func (b *builder) build(top *table) {
	top.checkKeys(topKeys)
	if !top.has("name") {
		b.r.add("name", nil, `missing: every scenario needs a name, for example name = "Vesper"`)
	} else if n, ok := top.str("name"); ok {
		if strings.TrimSpace(n) == "" {
			b.r.add("name", n, "must not be empty")
		}
		b.sc.Name = n
	}
	if d, ok := top.str("description"); ok {
		b.sc.Description = d
	}
	b.readIntegrator(top)
	b.readKernels(top)
	b.readBodies(top)
	if b.r.failed() {
		return
	}
	b.resolveStates()
	if b.r.failed() {
		return
	}
	b.chooseMethod()
	if b.r.failed() {
		return
	}
	b.checkTiming()
	if b.r.failed() {
		return
	}
	for _, bs := range b.bodies {
		b.sc.Bodies = append(b.sc.Bodies, Body{Name: bs.name, GM: bs.gm, Test: bs.test,
			Primary: bs.primary, X: bs.X, V: bs.V, Radius: bs.radius})
	}
}

// chooseMethod picks the default integrator when the file names none (the
// Wisdom-Holman map where one mass dominates and the stack is
// position-only, else yoshida6), and checks that a named one applies.
func (b *builder) chooseMethod() {
	is := &b.sc.Integrator
	gm := make([]float64, len(b.bodies))
	for k, bs := range b.bodies {
		gm[k] = bs.gm
	}
	if !b.integ.has("method") {
		is.Method = integrator.Recommend(b.sc.Stack, gm)
		return
	}
	st, err := integrator.New(is.Method)
	if err != nil {
		return
	}
	if ap, ok := st.(integrator.Applicability); ok {
		if err := ap.Applies(b.sc.Stack, gm); err != nil {
			b.r.add(b.integ.field("method"), is.Method, "%v", err)
		}
	}
}

// ---- [integrator] ----

func (b *builder) readIntegrator(top *table) {
	is := &b.sc.Integrator
	*is = IntegratorSpec{Method: DefaultMethod, Tolerance: DefaultTolerance,
		EnergyTolerance: DefaultDriftLimit, AngularMomentumTolerance: DefaultDriftLimit, Frame: "barycentric"}
	t, ok := top.subTable("integrator")
	if !ok {
		t = &table{path: "integrator", m: map[string]any{}, r: b.r}
	}
	b.integ = t
	t.checkKeys(integratorKeys)

	if m, ok := t.str("method"); ok {
		if !contains(integrator.Names(), m) {
			b.r.add(t.field("method"), m, "unknown integrator (allowed: %s)", strings.Join(integrator.Names(), ", "))
		} else {
			is.Method = m
		}
	}

	b.gaveStep = t.has("step")
	if t.has("steps_per_orbit") && b.gaveStep {
		b.r.add(t.field("step"), t.m["step"], "steps_per_orbit and step are both set; give exactly one")
	}
	if n, ok := t.number("steps_per_orbit"); ok {
		if n <= 0 {
			b.r.add(t.field("steps_per_orbit"), t.m["steps_per_orbit"], "must be positive")
		}
		is.StepsPerOrbit = n
	}
	if h, ok := t.quantity("step", units.Time); ok {
		if h <= 0 {
			b.r.add(t.field("step"), t.m["step"], "must be a positive time")
		}
		is.Step = h
	}
	if !t.has("steps_per_orbit") && !b.gaveStep {
		is.StepsPerOrbit = DefaultStepsPerOrbit
	}

	b.gaveDuration = t.has("duration")
	if t.has("orbits") && b.gaveDuration {
		b.r.add(t.field("duration"), t.m["duration"], "orbits and duration are both set; give exactly one")
	}
	if n, ok := t.number("orbits"); ok {
		if n <= 0 {
			b.r.add(t.field("orbits"), t.m["orbits"], "must be positive")
		}
		is.Orbits = n
	}
	if d, ok := t.quantity("duration", units.Time); ok {
		if d <= 0 {
			b.r.add(t.field("duration"), t.m["duration"], "must be a positive time")
		}
		is.Duration = d
	}
	if !t.has("orbits") && !b.gaveDuration {
		is.Orbits = DefaultOrbits
	}

	if s, ok := t.str("orbit_of"); ok {
		is.OrbitOf = s
	}
	if n, ok := t.integer("output_every"); ok {
		if n < 1 || n > math.MaxInt32 {
			b.r.add(t.field("output_every"), t.m["output_every"], "must be a whole number of steps, at least 1")
		} else {
			is.OutputEvery = int(n)
		}
	}
	if x, ok := t.number("tolerance"); ok {
		switch {
		case is.Method != "rk45":
			b.r.add(t.field("tolerance"), t.m["tolerance"],
				`applies to method = "rk45" only (method is %q): remove it, or set method = "rk45"`, is.Method)
		case !(x > 0 && x < 1):
			b.r.add(t.field("tolerance"), t.m["tolerance"], "must be a relative error per step in (0, 1), for example 1e-12")
		default:
			is.Tolerance = x
		}
	}
	for _, k := range []string{"energy_tolerance", "angular_momentum_tolerance"} {
		if x, ok := t.number(k); ok {
			if !(x > 0 && x < 1) {
				b.r.add(t.field(k), t.m[k], "must be a relative drift in (0, 1), for example 1e-6")
				continue
			}
			if k == "energy_tolerance" {
				is.EnergyTolerance = x
			} else {
				is.AngularMomentumTolerance = x
			}
		}
	}
	if f, ok := t.str("frame"); ok {
		if !contains(frames, f) {
			b.r.add(t.field("frame"), f, "unknown frame (allowed: %s)", strings.Join(frames, ", "))
		} else {
			is.Frame = f
		}
	}
}

// ---- [[kernel]] ----

func (b *builder) readKernels(top *table) {
	if !top.has("kernel") {
		k, err := kernels.New("newton", kernels.Values{})
		if err != nil {
			b.r.add("kernel", nil, "default kernel: %v", err)
			return
		}
		b.sc.Kernels = []KernelSpec{{Name: "newton", Values: k.Values(), Kernel: k}}
		b.sc.Stack = kernels.MustStack(k)
		return
	}
	list := top.tableList("kernel")
	if b.r.failed() && list == nil {
		return
	}
	if len(list) == 0 {
		b.r.add("kernel", top.m["kernel"], "is empty; leave [[kernel]] out for plain newton, or give a base law (%s)", strings.Join(baseNames(), ", "))
		return
	}
	specs := make([]KernelSpec, 0, len(list))
	good := true
	for _, t := range list {
		spec, ok := b.readKernel(t)
		good = good && ok
		specs = append(specs, spec)
	}
	if !good {
		return
	}
	for i, s := range specs {
		role := s.Kernel.Info().Role
		field := list[i].field("name")
		switch {
		case i == 0 && role != kernels.Base:
			b.r.add(field, s.Name, "is a correction; the first [[kernel]] must be a base law (%s), the corrections follow it",
				strings.Join(baseNames(), ", "))
			good = false
		case i > 0 && role == kernels.Base:
			b.r.add(field, s.Name, "is a base law; only the first [[kernel]] may be one (a stack is one base law plus corrections)")
			good = false
		}
	}
	if !good {
		return
	}
	corr := make([]kernels.Kernel, 0, len(specs)-1)
	for _, s := range specs[1:] {
		corr = append(corr, s.Kernel)
	}
	st, err := kernels.NewStack(specs[0].Kernel, corr...)
	if err != nil {
		b.r.add("kernel", nil, "%v", err)
		return
	}
	b.sc.Kernels, b.sc.Stack = specs, st
}

func baseNames() []string {
	var n []string
	for _, i := range kernels.All() {
		if i.Role == kernels.Base {
			n = append(n, i.Name)
		}
	}
	return n
}

func (b *builder) readKernel(t *table) (KernelSpec, bool) {
	if !t.has("name") {
		b.r.add(t.field("name"), nil, "missing: each [[kernel]] needs a name (one of %s)", strings.Join(kernels.Names(), ", "))
		return KernelSpec{}, false
	}
	name, ok := t.str("name")
	if !ok {
		return KernelSpec{}, false
	}
	info, found := kernels.Lookup(name)
	if !found {
		b.r.add(t.field("name"), name, "unknown kernel (known: %s)", strings.Join(kernels.Names(), ", "))
		return KernelSpec{}, false
	}
	allowed := []string{"name"}
	for _, p := range info.Params {
		allowed = append(allowed, p.Name)
	}
	before := len(b.r.list)
	t.checkKeys(allowed)
	vals := kernels.Values{Num: map[string]float64{}, Str: map[string]string{}}
	for _, p := range info.Params {
		v, has := t.m[p.Name]
		field := t.field(p.Name)
		if !has {
			if p.Required {
				msg := describeParam(p)
				if p.Kind == kernels.Number && p.Dim != units.Dimensionless {
					msg += ", written with a unit, for example " + units.Example(p.Dim)
				}
				b.r.add(field, nil, "missing: kernel %s needs %s (%s)", name, p.Name, msg)
			}
			continue
		}
		if p.Kind == kernels.Text {
			text, ok := v.(string)
			if !ok || strings.TrimSpace(text) == "" {
				b.r.add(field, v, "must be a non-empty string (%s)", p.Doc)
				continue
			}
			if p.Unit == "path" && !filepath.IsAbs(text) && !strings.HasPrefix(b.sc.Source, "builtin:") && b.sc.Source != "" {
				// a relative path means relative to the scenario file
				text = filepath.Join(filepath.Dir(b.sc.Source), text)
			}
			vals.Str[p.Name] = text
			continue
		}
		if p.Kind == kernels.Choice {
			s, err := choiceValue(v, p)
			if err != nil {
				b.r.add(field, v, "%v", err)
				continue
			}
			vals.Str[p.Name] = s
			continue
		}
		x, err := numberParam(v, p)
		if err == nil {
			err = checkRange(p, x)
		}
		if err != nil {
			b.r.add(field, v, "%v", err)
			continue
		}
		vals.Num[p.Name] = x
	}
	if len(b.r.list) > before {
		return KernelSpec{}, false
	}
	k, err := kernels.New(name, vals)
	if err != nil {
		b.r.add(t.path, nil, "%v", err)
		return KernelSpec{}, false
	}
	return KernelSpec{Name: name, Values: vals, Kernel: k}, true
}

// describeParam says what a parameter takes, for messages.
func describeParam(p kernels.Param) string {
	switch {
	case p.Kind == kernels.Choice, p.Kind == kernels.Text:
		return p.Range()
	case p.Dim == units.Dimensionless && p.Integer:
		return "a " + p.Range()
	case p.Dim == units.Dimensionless:
		return "a number in " + p.Range()
	}
	return fmt.Sprintf("%s %s in %s %s (SI)", article(p.Dim.String()), p.Dim, p.Range(), siUnit(p.Dim))
}

// siUnit names the SI unit kernel ranges are given in ("" if dimensionless).
func siUnit(d units.Dim) string {
	if d == units.Dimensionless {
		return ""
	}
	s := units.Format(units.Quantity{Value: 1, Dim: d})
	return strings.TrimPrefix(s, "1 ")
}

// numberParam reads a Number parameter: a TOML number when dimensionless,
// else a string with a unit; "inf" (or TOML inf) where the parameter allows it.
func numberParam(v any, p kernels.Param) (float64, error) {
	if p.AllowInf {
		if s, ok := v.(string); ok && strings.EqualFold(strings.TrimSpace(s), "inf") {
			return math.Inf(1), nil
		}
		if f, ok := v.(float64); ok && math.IsInf(f, 1) {
			return f, nil
		}
	}
	x, err := parseQuantity(v, p.Dim)
	if err != nil {
		return 0, fmt.Errorf("%v (allowed: %s)", err, describeParam(p))
	}
	return x, nil
}

// checkRange applies the parameter's declared bounds (as kernels.New does)
// so that the message can name the field.
func checkRange(p kernels.Param, x float64) error {
	bad := func(what string) error {
		return fmt.Errorf("%s (allowed: %s)", what, describeParam(p))
	}
	switch {
	case math.IsNaN(x):
		return bad("not a number")
	case math.IsInf(x, 0):
		if p.AllowInf && x > 0 {
			return nil
		}
		return bad("not finite")
	case p.Integer && x != math.Trunc(x):
		return bad("not a whole number")
	case x < p.Min || (p.MinOpen && x == p.Min) || x > p.Max || (p.MaxOpen && x == p.Max):
		if p.Dim == units.Dimensionless {
			return bad("out of range")
		}
		return bad(fmt.Sprintf("out of range (%g %s in SI)", x, siUnit(p.Dim)))
	}
	return nil
}

// choiceValue reads a Choice parameter: a word, or a TOML integer for
// choices written as signed numbers ("+1", "-1").
func choiceValue(v any, p kernels.Param) (string, error) {
	var s string
	switch x := v.(type) {
	case string:
		s = x
	case int64:
		for _, cand := range []string{fmt.Sprintf("%+d", x), fmt.Sprintf("%d", x)} {
			if contains(p.Choices, cand) {
				return cand, nil
			}
		}
		return "", fmt.Errorf("not allowed (%s, as a string in quotes)", p.Range())
	default:
		return "", fmt.Errorf("must be a string (%s)", p.Range())
	}
	if !contains(p.Choices, s) {
		return "", fmt.Errorf("not allowed (%s)", p.Range())
	}
	return s, nil
}

// ---- [[body]] ----

func (b *builder) readBodies(top *table) {
	list := top.tableList("body")
	b.byName = map[string]*bodySpec{}
	for _, t := range list {
		bs := b.readBody(t)
		b.bodies = append(b.bodies, bs)
		if bs.name == "" {
			continue
		}
		if prev, dup := b.byName[bs.name]; dup {
			b.r.add(t.field("name"), bs.name, "duplicate body name (also %s); names must be unique", prev.t.path)
			continue
		}
		b.byName[bs.name] = bs
	}
	if len(list) < 2 {
		if !top.has("body") || len(list) > 0 {
			b.r.add("body", nil, "a scenario needs at least 2 bodies ([[body]] tables), found %d", len(list))
		}
		return
	}
	massive := false
	for _, bs := range b.bodies {
		massive = massive || !bs.test
	}
	if !massive {
		b.r.add("body", nil, "no massive body: every body is test = true, so nothing pulls; give at least one a mass")
	}
	var names []string
	for _, bs := range b.bodies {
		names = append(names, bs.name)
	}
	for _, bs := range b.bodies {
		if bs.primary == "" {
			continue
		}
		if p, ok := b.byName[bs.primary]; ok && p == bs {
			b.r.add(bs.t.field("primary"), bs.primary, "a body cannot be its own primary")
		} else if !ok {
			b.r.add(bs.t.field("primary"), bs.primary, "unknown primary (bodies: %s)", strings.Join(names, ", "))
		}
	}
	if is := b.sc.Integrator; is.OrbitOf != "" {
		if _, ok := b.byName[is.OrbitOf]; !ok {
			b.r.add(b.integ.field("orbit_of"), is.OrbitOf, "no body has this name (bodies: %s)", strings.Join(names, ", "))
		}
	}
}

func (b *builder) readBody(t *table) *bodySpec {
	bs := &bodySpec{t: t}
	t.checkKeys(bodyKeys)
	if !t.has("name") {
		b.r.add(t.field("name"), nil, "missing: every [[body]] needs a name")
	} else if n, ok := t.str("name"); ok {
		if strings.TrimSpace(n) == "" {
			b.r.add(t.field("name"), n, "must not be empty")
		}
		bs.name = n
	}
	bs.test, _ = t.boolean("test")
	switch {
	case bs.test && t.has("mass"):
		b.r.add(t.field("mass"), t.m["mass"], "a test body (test = true) has no mass: remove one of mass and test")
	case !bs.test && !t.has("mass"):
		b.r.add(t.field("mass"), nil, `missing: give mass (for example "1.2 Msun" or "6e24 kg"), or test = true for a massless test body`)
	case !bs.test:
		if gm, ok := t.quantity("mass", units.Mass); ok {
			if !(gm > 0) {
				b.r.add(t.field("mass"), t.m["mass"], "must be positive (a massless body is written test = true)")
			}
			bs.gm = gm
		}
	}
	if p, ok := t.str("primary"); ok {
		if p == "" {
			b.r.add(t.field("primary"), p, "must name a body")
		}
		bs.primary = p
	}
	if rad, ok := t.quantity("radius", units.Length); ok {
		if !(rad > 0) {
			b.r.add(t.field("radius"), t.m["radius"], "must be a positive length")
		}
		bs.radius = rad
	}

	var gaveEl, gaveState []string
	for _, k := range elementKeys {
		if t.has(k) {
			gaveEl = append(gaveEl, k)
		}
	}
	for _, k := range stateKeys {
		if t.has(k) {
			gaveState = append(gaveState, k)
		}
	}
	switch {
	case len(gaveEl) > 0 && len(gaveState) > 0:
		b.r.add(t.field(gaveState[0]), nil, "both orbital elements (%s) and a state vector (%s) are given; give one of them",
			strings.Join(gaveEl, ", "), strings.Join(gaveState, ", "))
	case len(gaveEl) > 0:
		bs.elements = true
		b.readElements(t, bs)
	case len(gaveState) > 0:
		bs.state = true
		for _, k := range stateKeys {
			if !t.has(k) {
				b.r.add(t.field(k), nil, "missing: a state vector needs both position and velocity")
			}
		}
		bs.x, _ = t.vector("position", units.Length)
		bs.v, _ = t.vector("velocity", units.Speed)
	case bs.primary != "":
		b.r.add(t.path, nil, "has primary = %q but no orbit: give elements (a, e, and optionally i, node, peri, mean_anomaly) or position and velocity", bs.primary)
	}
	return bs
}

func (b *builder) readElements(t *table, bs *bodySpec) {
	if bs.primary == "" && !t.has("primary") {
		b.r.add(t.field("primary"), nil, `missing: orbital elements are about a primary; add primary = "NAME", or give position and velocity instead`)
	}
	for _, k := range []string{"a", "e"} {
		if !t.has(k) {
			b.r.add(t.field(k), nil, "missing: orbital elements need both a (semi-major axis) and e (eccentricity)")
		}
	}
	if a, ok := t.quantity("a", units.Length); ok {
		if !(a > 0) {
			b.r.add(t.field("a"), t.m["a"], "the semi-major axis must be a positive length (bound orbits only)")
		}
		bs.el.A = a
	}
	if e, ok := t.number("e"); ok {
		if !(e >= 0 && e < 1) {
			b.r.add(t.field("e"), t.m["e"], "the eccentricity must be in [0, 1): at least 0, and below 1 for a bound ellipse")
		}
		bs.el.E = e
	}
	if i, ok := t.quantity("i", units.Angle); ok {
		if !(i >= 0 && i <= math.Pi) {
			b.r.add(t.field("i"), t.m["i"], "the inclination must be in [0, 180] deg")
		}
		bs.el.I = i
	}
	bs.el.Node, _ = t.quantity("node", units.Angle)
	bs.el.Peri, _ = t.quantity("peri", units.Angle)
	bs.el.M, _ = t.quantity("mean_anomaly", units.Angle)
}

// ---- states and frame ----

// resolveStates turns every body's elements or relative state into an
// absolute state, primaries first, then shifts to the output frame.
func (b *builder) resolveStates() {
	if b.findCycles() {
		return
	}
	for _, bs := range b.bodies {
		b.resolve(bs)
	}
	if b.r.failed() {
		return
	}
	var origin, drift vec.V
	switch b.sc.Integrator.Frame {
	case "barycentric":
		var m float64
		for _, bs := range b.bodies {
			if bs.test {
				continue
			}
			m += bs.gm
			origin = origin.AddScaled(bs.gm, bs.X)
			drift = drift.AddScaled(bs.gm, bs.V)
		}
		origin, drift = origin.Scale(1/m), drift.Scale(1/m)
	case "primary":
		for _, bs := range b.bodies {
			if !bs.test {
				origin, drift = bs.X, bs.V
				break
			}
		}
	}
	for _, bs := range b.bodies {
		bs.X, bs.V = bs.X.Sub(origin), bs.V.Sub(drift)
	}
	b.checkOverlaps()
}

// findCycles reports primary chains that loop (A orbits B orbits A).
func (b *builder) findCycles() bool {
	found := false
	for i, bs := range b.bodies {
		chain := []string{bs.name}
		seen := map[*bodySpec]bool{bs: true}
		for cur := bs; cur.primary != ""; {
			next := b.byName[cur.primary]
			if next == bs {
				// report once, at the cycle's first body in file order
				first := true
				for _, other := range b.bodies[:i] {
					if seen[other] {
						first = false
					}
				}
				if first {
					b.r.add(bs.t.field("primary"), bs.primary, "primaries form a loop: %s -> %s", strings.Join(chain, " -> "), bs.name)
					found = true
				}
				break
			}
			if seen[next] { // loops further up; reported at its own body
				break
			}
			seen[next] = true
			chain = append(chain, next.name)
			cur = next
		}
	}
	return found
}

func (b *builder) resolve(bs *bodySpec) {
	if bs.done {
		return
	}
	bs.done = true
	if bs.primary == "" {
		bs.X, bs.V = bs.x, bs.v // absolute, or at rest at the origin
		return
	}
	p := b.byName[bs.primary]
	b.resolve(p)
	bs.parent = p
	bs.mu = p.gm + bs.gm
	switch {
	case bs.elements:
		if !(bs.mu > 0) {
			b.r.add(bs.t.field("primary"), bs.primary,
				"is a test body, and %s is one too: orbital elements need a massive primary or body (mu = G (M_primary + m) is 0)", bs.name)
			return
		}
		x, v, err := kepler.ToState(bs.mu, bs.el)
		if err != nil {
			b.r.add(bs.t.path, nil, "%v", err)
			return
		}
		bs.relX, bs.relV = x, v
	default:
		bs.relX, bs.relV = bs.x, bs.v
	}
	bs.X, bs.V = p.X.Add(bs.relX), p.V.Add(bs.relV)
}

// checkOverlaps refuses bodies that start on top of (or inside) a massive
// body: the force there is infinite or the model does not apply.
func (b *builder) checkOverlaps() {
	for j, bj := range b.bodies {
		for _, bi := range b.bodies[:j] {
			if bi.test && bj.test {
				continue
			}
			d := bj.X.Sub(bi.X).Norm()
			switch {
			case d == 0:
				b.r.add(bj.t.path, nil, "starts at the same position as %s (%s); give one of them a position or an orbit", bi.t.path, bi.name)
			case d <= bi.radius+bj.radius:
				b.r.add(bj.t.path, nil, "starts %s from %s, inside the sum of their radii (%s)",
					fmtLength(d), bi.name, fmtLength(bi.radius+bj.radius))
			}
		}
	}
}
