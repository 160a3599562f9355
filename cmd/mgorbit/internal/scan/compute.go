package scan

import (
	"context"
	"math"
	"strings"

	"github.com/parquet-go/parquet-go"

	"mgorbit/cmd/mgorbit/internal/report"
	"mgorbit/cmd/mgorbit/internal/table"
	"mgorbit/integrator/kepler"
	"mgorbit/integrator/study"
	"mgorbit/scenarios"
)

var nz = table.Nullable

// computePoint runs one point and returns its rows, one per orbiting body
// in scenario order. err is a failure of the point itself (integration
// lost accuracy, interrupted); with KeepGoing the caller records it.
func (s *Spec) computePoint(ctx context.Context, point int, sc *scenarios.Scenario) ([]parquet.Row, error) {
	idx := s.Indices(point)
	var rows []report.SummaryRow
	var extras []Extra
	var warnings []string
	switch s.Method {
	case SemiAnalytic:
		refs, err := study.SemiAnalyticReferences(sc)
		if err != nil {
			return nil, err
		}
		su, ref, period, err := study.PlanSetup(sc)
		if err != nil {
			return nil, err
		}
		st := &study.Study{Scenario: sc, Setup: su, OrbitOf: ref, Period: period}
		for _, r := range refs {
			st.Summaries = append(st.Summaries, r.Summary)
		}
		rows = report.Summaries(st)
		for k, r := range refs {
			x := semiExtra(sc, r)
			// Semi-analytic only: the per-century value may have to use the
			// osculating Kepler period (the Gauss path has no radial period).
			if rows[k].SemiPrecArcsecPerCent == nil {
				rows[k].SemiPrecArcsecPerCent = nz(study.PerCentury(r.SemiPrecessionPerOrbit, semiPeriod(sc, r.Summary)))
			}
			rows[k].Notes = joinNotes(rows[k].Notes, "no integration (--method semi-analytic)")
			extras = append(extras, x)
		}
	default:
		st, err := study.Run(ctx, sc, study.Options{KeepGoing: s.KeepGoing})
		if err != nil {
			return nil, err
		}
		rows = report.Summaries(st)
		warnings = st.Warnings
		var refs []study.SemiReference
		if s.Method == Both {
			if refs, err = study.SemiAnalyticReferences(sc); err != nil {
				return nil, err
			}
		}
		for k, sum := range st.Summaries {
			x := Extra{SemiAnomArcsecPerCentury: nz(study.PerCentury(sum.SemiAnomalyPerOrbit, semiPeriod(sc, sum)))}
			if s.Method == Both {
				if k < len(refs) && refs[k].Body == sum.Body {
					r := refs[k]
					x.SemiRPeriM, x.SemiRApoM = nz(r.RMin), nz(r.RMax)
					x.SemiSizeAM = nz((r.RMin + r.RMax) / 2)
				}
				x.PrecRelDiff = nz((sum.PrecessionPerOrbit - sum.SemiPrecessionPerOrbit) / math.Abs(sum.SemiPrecessionPerOrbit))
				x.AnomRelDiff = nz((sum.AnomalyPerOrbit - sum.SemiAnomalyPerOrbit) / math.Abs(sum.SemiAnomalyPerOrbit))
				x.AnomDiffOverErr = nz((sum.AnomalyPerOrbit - sum.SemiAnomalyPerOrbit) / sum.AnomalyIntErr)
			}
			extras = append(extras, x)
		}
	}
	out := make([]parquet.Row, len(rows))
	warn := strings.Join(warnings, "; ")
	for k := range rows {
		out[k] = s.layout.row(point, idx, string(s.Method), "", warn, rows[k], extras[k])
	}
	return out, nil
}

// failedRows are the rows of a point that could not be computed: every
// observable NULL (NaN where the column is not nullable), the error kept.
func (s *Spec) failedRows(point int, sc *scenarios.Scenario, failure error) []parquet.Row {
	idx := s.Indices(point)
	nan := math.NaN()
	var out []parquet.Row
	for _, b := range sc.Bodies {
		if b.Primary == "" {
			continue
		}
		r := report.SummaryRow{Scenario: sc.Name, Body: b.Name, Primary: b.Primary,
			Kernels: sc.Stack.String(), Method: sc.Integrator.Method,
			StepS: nan, StepsPerOrbit: nan, DurationS: nan, MuM3PerS2: nan, Eccentricity: nan,
			Notes: "point failed: " + failure.Error()}
		out = append(out, s.layout.row(point, idx, string(s.Method), failure.Error(), "", r, Extra{}))
	}
	return out
}

func semiExtra(sc *scenarios.Scenario, r study.SemiReference) Extra {
	return Extra{
		SemiAnomArcsecPerCentury: nz(study.PerCentury(r.SemiAnomalyPerOrbit, semiPeriod(sc, r.Summary))),
		SemiRPeriM:               nz(r.RMin), SemiRApoM: nz(r.RMax), SemiSizeAM: nz((r.RMin + r.RMax) / 2),
	}
}

// semiPeriod is the radial period a semi-analytic advance per orbit is
// turned into a rate with: the reference's own, else the integrated one,
// else the osculating Kepler period of the initial state (first order, as
// the Gauss average itself).
func semiPeriod(sc *scenarios.Scenario, s study.Summary) float64 {
	if !math.IsNaN(s.SemiRadialPeriod) {
		return s.SemiRadialPeriod
	}
	if !math.IsNaN(s.RadialPeriod) {
		return s.RadialPeriod
	}
	i, p := sc.BodyIndex(s.Body), sc.BodyIndex(s.Primary)
	if i < 0 || p < 0 {
		return math.NaN()
	}
	b, c := sc.Bodies[i], sc.Bodies[p]
	el, err := kepler.FromState(s.Mu, b.X.Sub(c.X), b.V.Sub(c.V))
	if err != nil {
		return math.NaN()
	}
	return kepler.Period(s.Mu, el.A)
}

func joinNotes(a, b string) string {
	if a == "" {
		return b
	}
	return a + "; " + b
}
