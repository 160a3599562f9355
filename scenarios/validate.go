package scenarios

import (
	"fmt"
	"math"
	"strconv"

	"mgorbit/integrator"
	"mgorbit/integrator/kepler"
	"mgorbit/kernels"
	"mgorbit/scenarios/units"
)

// Limits of the timing checks.
const (
	// PericentreSteps is how many steps the pericentre passage time scale
	// r_p / v_p must hold at least (common practice: a fixed-step method
	// resolves the fastest part of the orbit with some 20 steps there).
	PericentreSteps = 20
	// MinPeriods is the shortest run, in radial periods of orbit_of, from
	// which a precession can be fitted (three pericentre passages).
	MinPeriods = 3
)

// checkTiming finds the reference orbit, then checks that the step resolves
// every pericentre and that the run is long enough to measure a precession.
func (b *builder) checkTiming() {
	is := &b.sc.Integrator
	ref := b.orbitOf()
	if ref == nil {
		return
	}
	field := b.integ.field("orbit_of")
	var shown any = rawText(fmt.Sprintf("%q (default: the first body with a primary)", ref.name))
	if b.integ.has("orbit_of") {
		shown = ref.name
	}
	if !(ref.mu > 0) {
		b.r.add(field, shown, "%s and its primary %s are both test bodies: there is no orbit to time the run by", ref.name, ref.primary)
		return
	}
	energy := 0.5*ref.relV.Norm2() - ref.mu/ref.relX.Norm()
	if !(energy < 0) {
		b.r.add(field, shown, "%s is not bound to %s (Keplerian energy %.4g J/kg >= 0): a precession needs a bound orbit; choose another orbit_of or slow the body down",
			ref.name, ref.primary, energy)
		return
	}
	period := kepler.Period(ref.mu, -ref.mu/(2*energy))

	step := is.Step
	stepField, stepValue := b.integ.field("step"), any(b.integ.m["step"])
	if is.StepsPerOrbit > 0 {
		step = period / is.StepsPerOrbit
		stepField, stepValue = b.integ.field("steps_per_orbit"), b.integ.m["steps_per_orbit"]
		if stepValue == nil {
			stepValue = rawText(strconv.FormatFloat(is.StepsPerOrbit, 'g', -1, 64) + " (default)")
		}
	}
	total := is.Duration
	durField, durValue := b.integ.field("duration"), any(b.integ.m["duration"])
	if is.Orbits > 0 {
		total = is.Orbits * period
		durField, durValue = b.integ.field("orbits"), b.integ.m["orbits"]
	}

	if total < MinPeriods*period {
		b.r.add(durField, durValue,
			"the run covers %.3g radial periods of %s (period %s); a precession needs at least %d pericentre passages: set orbits >= %d or duration >= %q",
			total/period, ref.name, fmtTime(period), MinPeriods, MinPeriods, fmtTimeRounded(MinPeriods*period, math.Ceil))
	}

	// rk45 chooses its own steps by error control, the time-transformed
	// steppers shorten theirs at pericentre by construction, and the
	// Wisdom-Holman drift is the exact Kepler flow through it
	if st, err := integrator.New(is.Method); err == nil {
		_, variable := st.(integrator.VariableStep)
		_, kepler := st.(integrator.KeplerSplit)
		if !variable && !kepler && is.Method != "rk45" {
			b.checkPericentreStep(step, period, ref, stepField, stepValue)
		}
	}

	if is.OutputEvery == 0 {
		is.OutputEvery = max(1, int(math.Floor(period/step/RowsPerOrbit)))
	}
	b.checkRadialOrbits()
	b.checkKernelDomains()
}

// checkRadialOrbits refuses bodies that start moving straight at or away
// from their primary: whatever the integrator, they fall in.
func (b *builder) checkRadialOrbits() {
	for _, bs := range b.bodies {
		if bs.parent == nil || !(bs.mu > 0) {
			continue
		}
		if bs.relX.Cross(bs.relV).Norm() == 0 {
			b.r.add(bs.t.path, nil, "moves straight towards or away from its primary %s (zero angular momentum): it would fall in", bs.primary)
		}
	}
}

// checkKernelDomains refuses orbits that start outside a kernel's domain
// (a tabulated model's range of r), judged on the osculating apsides.
func (b *builder) checkKernelDomains() {
	if b.sc.Stack == nil {
		return
	}
	for _, bs := range b.bodies {
		if bs.parent == nil || !(bs.mu > 0) {
			continue
		}
		energy := 0.5*bs.relV.Norm2() - bs.mu/bs.relX.Norm()
		if !(energy < 0) {
			continue
		}
		a := -bs.mu / (2 * energy)
		h := bs.relX.Cross(bs.relV).Norm()
		e := math.Sqrt(math.Max(0, 1-h*h/(bs.mu*a)))
		if err := kernels.DomainError(b.sc.Stack, a*(1-e), a*(1+e)); err != nil {
			b.r.add(bs.t.path, nil, "orbit about %s (r from %.4g to %.4g m): %v", bs.primary, a*(1-e), a*(1+e), err)
		}
	}
}

// orbitOf returns the body whose period times the run: orbit_of, or the
// first body with a primary.
func (b *builder) orbitOf() *bodySpec {
	is := &b.sc.Integrator
	field := b.integ.field("orbit_of")
	if is.OrbitOf != "" {
		bs := b.byName[is.OrbitOf]
		if bs.primary == "" {
			b.r.add(field, is.OrbitOf, "has no primary, so it has no orbit to time the run by; name a body with a primary")
			return nil
		}
		return bs
	}
	for _, bs := range b.bodies {
		if bs.primary != "" {
			return bs
		}
	}
	b.r.add(field, nil, `no body has a primary, so no orbit sets the step and the duration: give the orbiting body primary = "NAME"`)
	return nil
}

// checkPericentreStep demands that the step is at most 1/PericentreSteps of
// r_p / v_p for every orbit about a primary, reporting the most demanding.
func (b *builder) checkPericentreStep(step, period float64, ref *bodySpec, field string, value any) {
	var worst *bodySpec
	worstScale := math.Inf(1)
	for _, bs := range b.bodies {
		if bs.parent == nil || !(bs.mu > 0) {
			continue
		}
		h := bs.relX.Cross(bs.relV)
		hn := h.Norm()
		if hn == 0 {
			continue // refused by checkRadialOrbits
		}
		// pericentre of the osculating conic: p = h^2/mu, r_p = p/(1+e),
		// v_p = h/r_p, so r_p/v_p = r_p^2/h
		ev := bs.relV.Cross(h).Scale(1 / bs.mu).Sub(bs.relX.Scale(1 / bs.relX.Norm()))
		rp := hn * hn / bs.mu / (1 + ev.Norm())
		if scale := rp * rp / hn; scale < worstScale {
			worst, worstScale = bs, scale
		}
	}
	if worst == nil || step <= worstScale/PericentreSteps {
		return
	}
	maxStep := worstScale / PericentreSteps
	b.r.add(field, value,
		"the step %s is too coarse for %s: its pericentre passage time r_p/v_p = %s needs a step of at most 1/%d of it (common practice); set steps_per_orbit >= %s (orbits of %s) or step <= %q",
		fmtTime(step), worst.name, fmtTime(worstScale), PericentreSteps,
		strconv.FormatFloat(roundSig(period/maxStep, 4, math.Ceil), 'g', -1, 64), ref.name,
		fmtTimeRounded(maxStep, math.Floor))
}

// roundSig rounds x to n significant digits with round (math.Ceil or
// math.Floor), so a suggested limit still satisfies the check.
func roundSig(x float64, n int, round func(float64) float64) float64 {
	if x == 0 || math.IsInf(x, 0) || math.IsNaN(x) {
		return x
	}
	p := math.Pow(10, float64(n-1)-math.Floor(math.Log10(math.Abs(x))))
	return round(x*p) / p
}

// fmtTime writes a time in a readable unit that units.Parse reads back.
func fmtTime(s float64) string {
	unit, name := timeUnit(s)
	return fmtIn(s, unit, name)
}

// fmtTimeRounded writes a suggested limit, rounded to 4 digits in the shown
// unit by round (math.Ceil for a minimum, math.Floor for a maximum), so
// that the value as written still passes the check.
func fmtTimeRounded(s float64, round func(float64) float64) string {
	unit, name := timeUnit(s)
	return strconv.FormatFloat(roundSig(s/unit, 4, round), 'g', -1, 64) + " " + name
}

func timeUnit(s float64) (float64, string) {
	switch a := math.Abs(s); {
	case a < 120:
		return 1, "s"
	case a < 2*3600:
		return 60, "min"
	case a < 2*units.Day:
		return 3600, "h"
	case a < 2*units.JulianYear:
		return units.Day, "d"
	}
	return units.JulianYear, "yr"
}

// fmtLength writes a length in km or au.
func fmtLength(m float64) string {
	if math.Abs(m) < 0.01*units.AU {
		return fmtIn(m, 1e3, "km")
	}
	return fmtIn(m, units.AU, "au")
}

func fmtIn(v, unit float64, name string) string {
	return strconv.FormatFloat(v/unit, 'g', 4, 64) + " " + name
}
