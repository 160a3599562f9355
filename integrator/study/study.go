package study

import (
	"context"
	"fmt"
	"math"
	"sync"

	"mgorbit/integrator"
	"mgorbit/integrator/kepler"
	"mgorbit/integrator/reference"
	"mgorbit/kernels"
	"mgorbit/kernels/vec"
	"mgorbit/scenarios"
	"mgorbit/scenarios/units"
)

// Options adjust a study beyond what the scenario says.
type Options struct {
	KeepGoing bool
	// Progress, if set, receives the total steps done across all runs and
	// the total planned.
	Progress func(done, total int64)
	// Checkpoint, if set, saves the state as the study goes and when it is
	// interrupted, or resumes one (see Checkpointing).
	Checkpoint *Checkpointing
}

// Study is the outcome of a scenario: per-body summaries and the main
// run's trajectory.
type Study struct {
	Scenario   *scenarios.Scenario
	Setup      Setup
	OrbitOf    int
	Period     float64 // initial Keplerian period of OrbitOf, s
	Order      int
	Summaries  []Summary
	Trajectory []Row
	Main       *Result
	Warnings   []string
}

// PlanSetup converts a scenario into the main run's setup.
func PlanSetup(sc *scenarios.Scenario) (Setup, int, float64, error) {
	n := len(sc.Bodies)
	su := Setup{Names: make([]string, n), GM: make([]float64, n), Primary: make([]int, n),
		X0: make([]vec.V, n), V0: make([]vec.V, n), Radius: make([]float64, n), Stack: sc.Stack,
		Method: sc.Integrator.Method, Tolerance: sc.Integrator.Tolerance,
		EnergyTol: sc.Integrator.EnergyTolerance, AngMomTol: sc.Integrator.AngularMomentumTolerance}
	index := map[string]int{}
	for i, b := range sc.Bodies {
		index[b.Name] = i
	}
	for i, b := range sc.Bodies {
		su.Names[i], su.GM[i], su.X0[i], su.V0[i] = b.Name, b.GM, b.X, b.V
		su.Radius[i] = b.Radius
		su.Primary[i] = -1
		if b.Primary != "" {
			su.Primary[i] = index[b.Primary]
		}
	}
	ref := -1
	if sc.Integrator.OrbitOf != "" {
		ref = index[sc.Integrator.OrbitOf]
	} else {
		for i := range sc.Bodies {
			if su.Primary[i] >= 0 {
				ref = i
				break
			}
		}
	}
	if ref < 0 {
		return su, -1, 0, fmt.Errorf("%s: no body has a primary, so no orbit defines the step", sc.Source)
	}
	p := su.Primary[ref]
	mu := su.GM[p] + su.GM[ref]
	x, v := su.X0[ref].Sub(su.X0[p]), su.V0[ref].Sub(su.V0[p])
	inv := 2/x.Norm() - v.Norm2()/mu
	if inv <= 0 {
		return su, ref, 0, fmt.Errorf("%s: body %s is not bound to %s, so it has no orbital period to set the step", sc.Source, su.Names[ref], su.Names[p])
	}
	period := kepler.Period(mu, 1/inv)
	is := sc.Integrator
	su.H = is.Step
	if is.StepsPerOrbit > 0 {
		su.H = period / is.StepsPerOrbit
	}
	dur := is.Duration
	if is.Orbits > 0 {
		dur = is.Orbits * period
	}
	su.Steps = int64(math.Ceil(dur/su.H - 1e-9))
	su.OutputEvery = is.OutputEvery
	if su.OutputEvery <= 0 {
		su.OutputEvery = int(math.Max(1, math.Floor(period/su.H/200)))
	}
	return su, ref, period, nil
}

type job struct {
	name   string
	setup  Setup
	record bool
	res    *Result
	err    error
}

// Run performs the study.
func Run(ctx context.Context, sc *scenarios.Scenario, opt Options) (*Study, error) {
	su, ref, period, err := PlanSetup(sc)
	if err != nil {
		return nil, err
	}
	su.KeepGoing = opt.KeepGoing
	st := &Study{Scenario: sc, Setup: su, OrbitOf: ref, Period: period}
	stepper, err := integrator.New(su.Method)
	if err != nil {
		return nil, err
	}
	st.Order = stepper.Order()

	fine := refine(su)
	refStack := sc.Stack.Reference()
	jobs := []*job{{name: "main", setup: su, record: true}, {name: "main-fine", setup: fine}}
	anomaly := !sc.Stack.NewtonOnly()
	if anomaly {
		r := su
		r.Stack = refStack
		rf := fine
		rf.Stack = refStack
		jobs = append(jobs, &job{name: "reference", setup: r}, &job{name: "reference-fine", setup: rf})
	}
	newtonSeparate := anomaly && !refStack.NewtonOnly()
	if newtonSeparate {
		nw := su
		nw.Stack = kernels.MustStack(kernels.Newton{})
		nw.KeepGoing = true // a Newtonian comparison may be unbound; it only informs
		jobs = append(jobs, &job{name: "newton", setup: nw})
	}

	var total int64
	for _, j := range jobs {
		total += j.setup.Steps
	}
	var mu sync.Mutex
	done := make([]int64, len(jobs))
	report := func(k int) func(int64) {
		return func(d int64) {
			if opt.Progress == nil {
				return
			}
			mu.Lock()
			done[k] = d
			var s int64
			for _, x := range done {
				s += x
			}
			mu.Unlock()
			opt.Progress(s, total)
		}
	}
	co, err := newCoordinator(opt.Checkpoint, sc, opt.KeepGoing, jobs)
	if err != nil {
		return nil, err
	}
	var wg sync.WaitGroup
	for k, j := range jobs {
		wg.Add(1)
		go func(k int, j *job) {
			defer wg.Done()
			j.res, j.err = integrate(ctx, j.setup, j.record, report(k), co.hook(k))
			if j.err != nil {
				co.ended(k)
			}
		}(k, j)
	}
	wg.Wait()
	if err := co.settle(jobs); err != nil {
		return nil, err
	}
	if cp := opt.Checkpoint; cp != nil && cp.SaveErr != nil {
		st.Warnings = append(st.Warnings, "a checkpoint could not be written: "+cp.SaveErr.Error())
	}
	byName := map[string]*job{}
	for _, j := range jobs {
		if j.err != nil && j.name != "newton" {
			return nil, fmt.Errorf("%s run: %w", j.name, j.err)
		}
		byName[j.name] = j
	}
	st.Main = byName["main"].res
	st.Trajectory = st.Main.Trajectory
	for _, b := range st.Main.Breaches {
		st.Warnings = append(st.Warnings, b)
	}
	var newtonRes *Result
	switch {
	case !anomaly:
		newtonRes = st.Main
	case newtonSeparate:
		if j := byName["newton"]; j.err == nil {
			newtonRes = j.res
		}
	default:
		newtonRes = byName["reference"].res
	}
	var refRes, refFine *Result
	if anomaly {
		refRes, refFine = byName["reference"].res, byName["reference-fine"].res
	}
	for i := range su.Names {
		if su.Primary[i] < 0 {
			continue
		}
		s := summarize(st, i, byName["main-fine"].res, refRes, refFine, newtonRes)
		st.Summaries = append(st.Summaries, s)
	}
	return st, nil
}

// refine returns the setup for the error estimate: half the step (twice
// the steps, same duration and cadence in time), or for rk45 a tolerance
// 64 times tighter at the same observation step.
func refine(su Setup) Setup {
	f := su
	if su.Method == "rk45" {
		tol := su.Tolerance
		if tol <= 0 {
			tol = 1e-12
		}
		f.Tolerance = tol / 64
		return f
	}
	f.H = su.H / 2
	f.Steps = 2 * su.Steps
	f.OutputEvery = 2 * su.OutputEvery
	return f
}

// errorScale turns |v(h) - v(h/2)| into an estimate of the error of v(h)
// for a method of order p: the difference is (1 - 2^-p) of the error. The
// bare Richardson value is asymptotically exact, so it falls short about
// half the time; the factor of safety 1.25 is Roache's grid convergence
// index for a verified order (J. Fluids Eng. 116, 405 (1994); memory),
// which makes the estimate a bound (the property test checks it).
func errorScale(method string, order int) float64 {
	if method == "rk45" {
		return 1
	}
	p := math.Pow(2, float64(order))
	return safetyFactor * p / (p - 1)
}

// safetyFactor is the grid-convergence-index factor for a verified order.
const safetyFactor = 1.25

// PerCentury converts a precession per orbit and a radial period into
// arcseconds per Julian century.
func PerCentury(perOrbit, radialPeriod float64) float64 {
	return perOrbit / radialPeriod * units.JulianCentury * units.ArcsecPerRad
}

func semiAnalytic(st *Study, i int) (abs, anom, pr float64, path, note string) {
	abs, anom, pr, path, note, _ = semiAnalyticFor(st.Setup, st.Main.Isolated[i], i)
	return
}

// semiAnalyticFor is the semi-analytic reference of body i from the initial
// state alone; exact is the central-potential quadrature when one was made.
func semiAnalyticFor(su Setup, isolated bool, i int) (abs, anom, pr float64, path, note string, exact *reference.Exact) {
	abs, anom, pr = math.NaN(), math.NaN(), math.NaN()
	p := su.Primary[i]
	if !isolated {
		return abs, anom, pr, "none", "other massive bodies perturb this orbit: no single-centre reference", nil
	}
	mu := su.GM[p] + su.GM[i]
	x, v := su.X0[i].Sub(su.X0[p]), su.V0[i].Sub(su.V0[p])
	stack := su.Stack
	hasCorr := len(stack.Corrections) > 0
	if fh, ok := stack.Base.(kernels.FixedAngularMomentumCentral); ok && allCentral(stack) {
		return fixedHReference(fh, stack, mu, x, v)
	}
	var ex reference.Exact
	var exactErr error
	if hasCorr || stack.IsCentral() {
		ex, exactErr = reference.FromState(mu, x, v, stack.CorrectionRadial)
		if exactErr == nil {
			exact = &ex
		}
	}
	switch {
	case stack.IsCentral():
		if exactErr != nil {
			return abs, anom, pr, "none", "exact quadrature: " + exactErr.Error(), nil
		}
		// Newton precesses not at all, so the anomaly is the whole advance.
		abs, anom, pr = ex.AdvancePerOrbit, ex.AdvancePerOrbit, ex.RadialPeriod
		if stack.NewtonOnly() {
			anom = math.NaN()
		}
		return abs, anom, pr, ex.Path, "", exact
	default:
		el, err := kepler.FromState(mu, x, v)
		if err != nil {
			return abs, anom, pr, "none", "osculating elements: " + err.Error(), nil
		}
		base := stack.Base
		// A pairwise law acts on the relative orbit twice, once with each
		// body's mu: K(mu_p) + K(mu_i) (for gr1pn the mu^2 term then carries
		// mu_p^2 + mu_i^2, not mu^2). An N-body law (eih) is already the
		// two-body equation with mu = G (M + m).
		perturb := func(x, v vec.V) vec.V {
			return base.Accel(su.GM[p], x, v).Add(base.Accel(su.GM[i], x, v)).Sub(kernels.Newton{}.Accel(mu, x, v))
		}
		if _, nbody := base.(kernels.NBody); nbody {
			perturb = func(x, v vec.V) vec.V {
				return base.Accel(mu, x, v).Sub(kernels.Newton{}.Accel(mu, x, v))
			}
		}
		g, err := reference.GaussAdvance(mu, el.A, el.E, perturb)
		if err != nil {
			return abs, anom, pr, "none", "Gauss average: " + err.Error(), nil
		}
		if !hasCorr {
			return g, g, pr, "gauss-first-order", "", nil
		}
		if exactErr != nil || !allCentral(stack) {
			return abs, anom, pr, "none", "corrections are not central: no semi-analytic reference", nil
		}
		return g + ex.AdvancePerOrbit, ex.AdvancePerOrbit, pr, "gauss-first-order+" + ex.Path, "", exact
	}
}

func allCentral(s *kernels.Stack) bool {
	for _, c := range s.Corrections {
		if _, ok := c.(kernels.Central); !ok || c.Info().VelocityDependent {
			return false
		}
	}
	return true
}

// fixedHReference is the exact quadrature for a base law that is central at
// the orbit's fixed angular momentum (gr-orbit), with any central
// corrections on top. Its reference stack is the base alone (against
// Newton, which does not precess, when there are no corrections).
func fixedHReference(fh kernels.FixedAngularMomentumCentral, stack *kernels.Stack, mu float64, x, v vec.V) (abs, anom, pr float64, path, note string, exact *reference.Exact) {
	abs, anom, pr = math.NaN(), math.NaN(), math.NaN()
	h := x.Cross(v).Norm()
	full := func(mu, r float64) (float64, float64) {
		a1, p1 := fh.RadialAtH(mu, h, r)
		a2, p2 := stack.CorrectionRadial(mu, r)
		return a1 + a2, p1 + p2
	}
	ex, err := reference.FromState(mu, x, v, full)
	if err != nil {
		return abs, anom, pr, "none", "exact quadrature at fixed h: " + err.Error(), nil
	}
	abs, anom, pr = ex.AdvancePerOrbit, ex.AdvancePerOrbit, ex.RadialPeriod
	if len(stack.Corrections) > 0 {
		base, err := reference.FromState(mu, x, v, func(mu, r float64) (float64, float64) { return fh.RadialAtH(mu, h, r) })
		if err != nil {
			return abs, math.NaN(), pr, ex.Path, "exact quadrature of the reference stack: " + err.Error(), &ex
		}
		anom = abs - base.AdvancePerOrbit
	}
	return abs, anom, pr, ex.Path, "", &ex
}
