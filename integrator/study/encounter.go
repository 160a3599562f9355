package study

import (
	"fmt"
	"math"

	"mgorbit/integrator"
	"mgorbit/integrator/observe"
)

// ResolveSteps is how many steps a pair's encounter time scale
// min(r/v, sqrt(r^3/mu)) must hold at every step of a fixed-step run: with
// fewer, one step moves the pair by more than half its separation and no
// fixed-step method follows the pass (common practice). The scenario check
// asks for 20 per pericentre passage at the start; the sixth-order method
// stays accurate down to about 3, so the guard sits below that and catches
// orbits that shrink or plunge during the run, as r^(3/2) falls fast.
const ResolveSteps = 2

// CollisionError reports two bodies whose centres came closer than the sum
// of their radii: point masses are not integrated through a collision.
type CollisionError struct {
	A, B      string
	T         float64 // s
	Step      int64
	Distance  float64 // m, centre to centre
	RadiusSum float64 // m
	// AtPericentre is set when the contact was found at the refined
	// pericentre between two steps rather than at a step.
	AtPericentre bool
}

func (e *CollisionError) Error() string {
	where := "at"
	if e.AtPericentre {
		where = "at the refined pericentre passage (between steps) at"
	}
	return fmt.Sprintf("collision: %s and %s touch %s t = %.6g s (step %d): their centres are %.4g m apart, within the sum of their radii %.4g m; point masses are not integrated through a collision (change the orbits, or drop the radii if the bodies are meant to be points)",
		e.A, e.B, where, e.T, e.Step, e.Distance, e.RadiusSum)
}

// pairGuard watches every pair of bodies that can meet (massive with
// massive, test with massive) for collisions and, for fixed-step methods,
// for encounters the step no longer resolves.
type pairGuard struct {
	names []string
	pairs []guardPair
	hn    float64 // h * ResolveSteps
	// seenPeri counts the pericentres of each body's tracker already checked
	// against its primary's radius.
	seenPeri []int
	radius   []float64
	primary  []int
}

type guardPair struct {
	i, j   int
	touch2 float64 // (R_i + R_j)^2, 0 when neither has a radius
	mu     float64
	// resolve: check that the step resolves this pair's passes.
	resolve bool
}

// newPairGuard prepares the checks. The resolution check applies to
// fixed-step methods; rk45 and the time-transformed steppers shorten their
// steps in an encounter themselves, and the Wisdom-Holman map follows the
// orbits about its dominant body with exact Kepler drifts, so there only
// the pairs without that body are checked.
func newPairGuard(su Setup, massive []int, st integrator.Stepper) *pairGuard {
	n := len(su.GM)
	g := &pairGuard{names: su.Names, hn: su.H * ResolveSteps,
		seenPeri: make([]int, n), radius: make([]float64, n), primary: su.Primary}
	_, variable := st.(integrator.VariableStep)
	_, adaptive := st.(*integrator.RK45)
	_, kepler := st.(*integrator.WisdomHolman)
	dominant := -1
	if kepler {
		for _, j := range massive {
			if dominant < 0 || su.GM[j] > su.GM[dominant] {
				dominant = j
			}
		}
	}
	copy(g.radius, su.Radius)
	isMassive := make([]bool, n)
	for _, j := range massive {
		isMassive[j] = true
	}
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			if !isMassive[i] && !isMassive[j] {
				continue // test bodies pass through each other unfelt
			}
			rs := g.radius[i] + g.radius[j]
			resolve := !variable && !adaptive && i != dominant && j != dominant
			g.pairs = append(g.pairs, guardPair{i: i, j: j, touch2: rs * rs, mu: su.GM[i] + su.GM[j], resolve: resolve})
		}
	}
	return g
}

// check looks at the state after step k. trackers (per body, nil without a
// primary) give the refined pericentres found during the step.
func (g *pairGuard) check(sys *integrator.System, trackers []*observe.Tracker, k int64) error {
	for _, p := range g.pairs {
		d := sys.X[p.i].Sub(sys.X[p.j])
		r2 := d.Norm2()
		if r2 <= p.touch2 {
			return &CollisionError{A: g.names[p.i], B: g.names[p.j], T: sys.T, Step: k,
				Distance: math.Sqrt(r2), RadiusSum: g.radius[p.i] + g.radius[p.j]}
		}
		if !p.resolve {
			continue
		}
		v2 := sys.V[p.i].Sub(sys.V[p.j]).Norm2()
		hn2 := g.hn * g.hn
		// h N > r/v or h N > sqrt(r^3/mu), squared to spare the roots
		if hn2*v2 > r2 || hn2*hn2*p.mu*p.mu > r2*r2*r2 {
			return g.unresolved(p, math.Sqrt(r2), math.Sqrt(v2), sys.T, k)
		}
	}
	for i, tr := range trackers {
		if tr == nil || len(tr.Peri) == g.seenPeri[i] {
			continue
		}
		g.seenPeri[i] = len(tr.Peri)
		pr := g.primary[i]
		rs := g.radius[i] + g.radius[pr]
		if last := tr.Peri[len(tr.Peri)-1]; rs > 0 && last.R <= rs {
			return &CollisionError{A: g.names[i], B: g.names[pr], T: last.T, Step: k,
				Distance: last.R, RadiusSum: rs, AtPericentre: true}
		}
	}
	return nil
}

func (g *pairGuard) unresolved(p guardPair, r, v, t float64, k int64) error {
	scale := r / v
	if p.mu > 0 {
		scale = math.Min(scale, math.Sqrt(r*r*r/p.mu))
	}
	return &EncounterError{A: g.names[p.i], B: g.names[p.j], T: t, Step: k,
		Separation: r, Speed: v, TimeScale: scale, H: g.hn / ResolveSteps}
}

// EncounterError reports a pass too close for the fixed step: the pair's
// encounter time scale holds fewer than ResolveSteps steps. It unwraps to
// an *AccuracyError (exit code 3).
type EncounterError struct {
	A, B              string
	T                 float64 // s
	Step              int64
	Separation, Speed float64 // m, m/s
	TimeScale         float64 // min(r/v, sqrt(r^3/mu)), s
	H                 float64 // the step, s
}

func (e *EncounterError) Error() string {
	// what the scenario check asks at the start: 20 steps per time scale
	factor := math.Ceil(e.H/(e.TimeScale/20)*10) / 10
	return fmt.Sprintf(
		"accuracy lost: close encounter of %s and %s at t = %.6g s (step %d): separation %.4g m, relative speed %.4g m/s; the encounter time scale min(r/v, sqrt(r^3/mu)) = %.4g s holds only %.3g steps of %.4g s (at least %d are needed), so the fixed step does not follow the pass: take a step %.3g times smaller (multiply steps_per_orbit by that), or method = \"rk45\", whose error control shortens the step in the encounter",
		e.A, e.B, e.T, e.Step, e.Separation, e.Speed, e.TimeScale, e.TimeScale/e.H, e.H, ResolveSteps, factor)
}

// Unwrap makes errors.As find an *AccuracyError.
func (e *EncounterError) Unwrap() error { return &AccuracyError{Msg: e.Error()} }
