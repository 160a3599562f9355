package study

import (
	"math"
	"strings"

	"mgorbit/integrator"
	"mgorbit/kernels"
	"mgorbit/scenarios"
)

// SemiReference is one body's semi-analytic reference, computed from the
// initial state without integrating.
type SemiReference struct {
	// Summary has Body, Primary, Mu, the Semi* fields, Notes and, for a
	// stack of two or more terms beyond Newton, the per-term first-order
	// shares (Terms); every integrated quantity is NaN (Passages 0,
	// Circular false).
	Summary
	// RMin and RMax are the apsides of the exact central-potential reference
	// (Newton plus the central corrections), m; NaN when the path made no
	// quadrature (a velocity-dependent base law alone, a perturbed orbit).
	RMin, RMax float64
}

// SemiAnalyticOnly returns each orbiting body's semi-analytic summary
// without integrating: the fast path for dense parameter scans.
func SemiAnalyticOnly(sc *scenarios.Scenario) ([]Summary, error) {
	refs, err := SemiAnalyticReferences(sc)
	if err != nil {
		return nil, err
	}
	out := make([]Summary, len(refs))
	for k, r := range refs {
		out[k] = r.Summary
	}
	return out, nil
}

// SemiAnalyticReferences is SemiAnalyticOnly with the reference apsides.
// Bodies come in scenario order, as in Run.
func SemiAnalyticReferences(sc *scenarios.Scenario) ([]SemiReference, error) {
	su, _, _, err := PlanSetup(sc)
	if err != nil {
		return nil, err
	}
	// The same isolation rule as an integration: only the primary and the
	// body itself may be massive.
	massive := integrator.NewField(su.Stack, su.GM).Massive()
	var out []SemiReference
	for i := range su.Names {
		p := su.Primary[i]
		if p < 0 {
			continue
		}
		alone := isolated(massive, i, p)
		abs, anom, pr, path, note, exact := semiAnalyticFor(su, alone, i)
		s := unintegrated(su.Names[i], su.Names[p], su.GM[p]+su.GM[i])
		s.SemiPrecessionPerOrbit, s.SemiAnomalyPerOrbit, s.SemiRadialPeriod, s.SemiPath = abs, anom, pr, path
		var notes []string
		if note != "" {
			notes = append(notes, "semi-analytic: "+note)
		}
		// The per-term shares are first-order (Gauss) results themselves.
		// With a single term beyond Newton the share is 1 and the advance
		// is the reference above to first order: skipped, as dense scans of
		// one kernel would otherwise spend a fifth of their time on it.
		if alone && termCount(su.Stack) > 1 {
			terms, err := TermShares(su.Stack, s.Mu, su.X0[i].Sub(su.X0[p]), su.V0[i].Sub(su.V0[p]), pr)
			if err != nil {
				notes = append(notes, "term shares: "+err.Error())
			}
			s.Terms = terms
		}
		s.Notes = strings.Join(notes, "; ")
		r := SemiReference{Summary: s, RMin: math.NaN(), RMax: math.NaN()}
		if exact != nil {
			r.RMin, r.RMax = exact.RMin, exact.RMax
		}
		out = append(out, r)
	}
	return out, nil
}

// termCount counts the stack's terms beyond Newton.
func termCount(st *kernels.Stack) int {
	n := len(st.Corrections)
	if _, newton := st.Base.(kernels.Newton); !newton {
		n++
	}
	return n
}

// unintegrated is a summary with every integrated quantity undefined.
func unintegrated(body, primary string, mu float64) Summary {
	nan := math.NaN()
	return Summary{Body: body, Primary: primary, Mu: mu,
		PrecessionPerOrbit: nan, PrecessionStdErr: nan, PrecessionIntErr: nan,
		PrecessionPerCentury: nan, PrecessionPerCenturyErr: nan,
		AnomalyPerOrbit: nan, AnomalyIntErr: nan, AnomalyPerCentury: nan, AnomalyPerCentErr: nan,
		SemiPrecessionPerOrbit: nan, SemiAnomalyPerOrbit: nan, SemiRadialPeriod: nan,
		PrecessionMinusSemi: nan, AnomalyMinusSemi: nan,
		RadialPeriod: nan, RadialPeriodErr: nan, AzimuthalPeriod: nan, AzimuthalPeriodErr: nan,
		RPeri: nan, RApo: nan, SizeA: nan, Eccentricity: nan, KeplerPeriod: nan,
		RadialShiftKepler: nan, AzimuthalShiftKepler: nan, RadialShiftKeplerErr: nan,
		RadialShiftNewton: nan, EnergyErr: nan, AngMomErr: nan}
}
