package study

import (
	"math"
	"strings"
)

// Summary is one body's result. Angles in rad, times in s, lengths in m.
// NaN marks a value that is undefined; Notes say why.
type Summary struct {
	Body, Primary string
	Mu            float64 // G (M_primary + m_body), m^3 s^-2

	Passages int
	Circular bool

	// Precession: integrated value at the scenario's step, its fit's
	// standard error (scatter), and the integration-error estimate.
	PrecessionPerOrbit, PrecessionStdErr, PrecessionIntErr float64
	PrecessionPerCentury, PrecessionPerCenturyErr          float64 // arcsec per Julian century
	// Anomaly: stack minus reference stack, same integrator and step.
	AnomalyPerOrbit, AnomalyIntErr       float64
	AnomalyPerCentury, AnomalyPerCentErr float64
	ReferenceStack                       string

	// Semi-analytic reference and the path that produced it.
	SemiPrecessionPerOrbit, SemiAnomalyPerOrbit, SemiRadialPeriod float64
	SemiPath                                                      string
	PrecessionMinusSemi, AnomalyMinusSemi                         float64

	RadialPeriod, RadialPeriodErr       float64
	AzimuthalPeriod, AzimuthalPeriodErr float64
	RPeri, RApo, SizeA, Eccentricity    float64
	KeplerPeriod                        float64 // 2 pi sqrt(a_g^3 / mu), a_g = (r_min + r_max)/2 measured
	// Period shifts against Kepler's third law at the measured size.
	RadialShiftKepler, AzimuthalShiftKepler float64
	RadialShiftKeplerErr                    float64
	// Period shift against a Newtonian run from the same initial state.
	RadialShiftNewton float64

	EnergyErr, AngMomErr float64
	// ToleranceExceeded is set when the energy or angular-momentum error
	// went past the tolerance in a KeepGoing run: the values are suspect.
	ToleranceExceeded bool
	// Terms is each stacked term's first-order share of the precession
	// (shares.go); nil for plain Newton or when it cannot be computed.
	Terms []TermShare
	Notes string
}

func summarize(st *Study, i int, fine, ref, refFine, newton *Result) Summary {
	su := st.Setup
	p := su.Primary[i]
	o, of := st.Main.Orbits[i], fine.Orbits[i]
	scale := errorScale(su.Method, st.Order)
	s := Summary{Body: su.Names[i], Primary: su.Names[p], Mu: su.GM[p] + su.GM[i],
		Passages: o.Passages, Circular: o.Circular,
		PrecessionPerOrbit: o.PrecessionPerOrbit, PrecessionStdErr: o.PrecessionStdErr,
		PrecessionIntErr: scale * math.Abs(o.PrecessionPerOrbit-of.PrecessionPerOrbit),
		RadialPeriod:     o.RadialPeriod, RadialPeriodErr: scale * math.Abs(o.RadialPeriod-of.RadialPeriod),
		AzimuthalPeriod: o.AzimuthalPeriod, AzimuthalPeriodErr: scale * math.Abs(o.AzimuthalPeriod-of.AzimuthalPeriod),
		RPeri: o.RPeri, RApo: o.RApo, SizeA: o.SizeA, Eccentricity: o.Eccentricity,
		EnergyErr: st.Main.MaxEnergyErr[i], AngMomErr: st.Main.MaxAngMomErr[i],
		ToleranceExceeded: st.Main.Exceeded[i],
		AnomalyPerOrbit:   math.NaN(), AnomalyIntErr: math.NaN(),
		AnomalyPerCentury: math.NaN(), AnomalyPerCentErr: math.NaN(),
		RadialShiftNewton: math.NaN(),
	}
	var notes []string
	if o.Reason != "" {
		notes = append(notes, o.Reason)
	}
	s.PrecessionPerCentury = PerCentury(s.PrecessionPerOrbit, s.RadialPeriod)
	s.PrecessionPerCenturyErr = PerCentury(s.PrecessionIntErr, s.RadialPeriod)
	if ref != nil {
		s.ReferenceStack = st.Scenario.Stack.Reference().String()
		r, rf := ref.Orbits[i], refFine.Orbits[i]
		s.AnomalyPerOrbit = o.PrecessionPerOrbit - r.PrecessionPerOrbit
		fineAnom := of.PrecessionPerOrbit - rf.PrecessionPerOrbit
		s.AnomalyIntErr = scale * math.Abs(s.AnomalyPerOrbit-fineAnom)
		s.AnomalyPerCentury = PerCentury(s.AnomalyPerOrbit, s.RadialPeriod)
		s.AnomalyPerCentErr = PerCentury(s.AnomalyIntErr, s.RadialPeriod)
	}
	s.KeplerPeriod = 2 * math.Pi * math.Sqrt(s.SizeA*s.SizeA*s.SizeA/s.Mu)
	s.RadialShiftKepler = (s.RadialPeriod - s.KeplerPeriod) / s.KeplerPeriod
	s.RadialShiftKeplerErr = s.RadialPeriodErr / s.KeplerPeriod
	s.AzimuthalShiftKepler = (s.AzimuthalPeriod - s.KeplerPeriod) / s.KeplerPeriod
	switch {
	case newton == nil:
		notes = append(notes, "period shift against Newton undefined: the Newtonian run from the same state failed")
	case newton.Orbits[i].Reason != "" && math.IsNaN(newton.Orbits[i].RadialPeriod):
		notes = append(notes, "period shift against Newton undefined: "+newton.Orbits[i].Reason+" in the Newtonian run")
	default:
		pn := newton.Orbits[i].RadialPeriod
		s.RadialShiftNewton = (s.RadialPeriod - pn) / pn
	}
	if unboundUnderNewton(st, i) {
		s.RadialShiftNewton = math.NaN()
		notes = append(notes, "period shift against Newton undefined: the initial state is unbound under Newtonian gravity")
	}

	abs, anom, pr, path, note := semiAnalytic(st, i)
	s.SemiPrecessionPerOrbit, s.SemiAnomalyPerOrbit, s.SemiRadialPeriod, s.SemiPath = abs, anom, pr, path
	if note != "" {
		notes = append(notes, "semi-analytic: "+note)
	}
	s.PrecessionMinusSemi = s.PrecessionPerOrbit - abs
	s.AnomalyMinusSemi = s.AnomalyPerOrbit - anom
	notes = append(notes, attachTerms(st, i, &s)...)
	s.Notes = strings.Join(notes, "; ")
	return s
}

func unboundUnderNewton(st *Study, i int) bool {
	su := st.Setup
	p := su.Primary[i]
	mu := su.GM[p] + su.GM[i]
	x, v := su.X0[i].Sub(su.X0[p]), su.V0[i].Sub(su.V0[p])
	return 0.5*v.Norm2()-mu/x.Norm() >= 0
}
