package bounds

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"github.com/parquet-go/parquet-go"

	"mgorbit/cmd/mgorbit/internal/scan"
	"mgorbit/scenarios"
)

// Columns every judged table gets.
const (
	AllowedColumn    = "allowed"
	ExcludedByColumn = "excluded_by"
	ChiSquareColumn  = "bounds_chi_square"
	ChiSquareDoF     = "bounds_chi_square_dof"
	ChiSquarePColumn = "bounds_chi_square_p_value"
	ChiSquareAllowed = "bounds_chi_square_allowed"
	NotesColumn      = "bounds_notes"
	// ChiSquareName stands for the combined test in excluded_by.
	ChiSquareName = "chi-square"
)

// PullColumn holds a measurement's (observable - value)/sigma_eff.
func PullColumn(name string) string { return "bound_" + ColumnStem(name) + "_pull" }

// BeyondColumn holds how far a limit's observable lies beyond it, in the
// observable's unit (negative inside).
func BeyondColumn(name string) string { return "bound_" + ColumnStem(name) + "_beyond" }

// ExcludedColumn holds one bound's own verdict.
func ExcludedColumn(name string) string { return "bound_" + ColumnStem(name) + "_excluded" }

// isBoundColumn tells the columns an earlier judgement added.
func isBoundColumn(name string) bool {
	return name == AllowedColumn || name == ExcludedByColumn ||
		strings.HasPrefix(name, "bound_") || strings.HasPrefix(name, "bounds_")
}

// Judged is a bound as it was applied to one table.
type Judged struct {
	*Bound
	// Column is the column read: the observable, or its semi-analytic
	// counterpart when the scan has no integrated values.
	Column string
	// ErrorColumn is the integration-error estimate added in quadrature
	// ("" when the table has none for Column).
	ErrorColumn string
	// Excluded counts the points this bound excludes by itself.
	Excluded int
	Note     string

	col, errCol int
}

// Applied is a judged table and what the judgement found.
type Applied struct {
	Table *scan.Table
	Set   *Set
	Used  []*Judged
	// Skipped says which bounds are for another scenario.
	Skipped []string
	// Points counts grid points; each is Allowed, Excluded or Undetermined
	// (an observable missing, e.g. a failed point).
	Points, Allowed, Excluded, Undetermined int
	// ChiSquareThreshold is the combined test's limit for all measurements
	// (NaN without measurements).
	ChiSquareThreshold float64
	Measurements       int
}

// Apply judges every grid point of t against the set and returns a new
// table with the verdict columns (replacing any an earlier judgement
// added). t is not changed.
func Apply(t *scan.Table, set *Set) (*Applied, error) {
	out := &Applied{Set: set, ChiSquareThreshold: math.NaN()}
	scenario := t.Meta["mgorbit.scenario.name"]
	var probs scenarios.Problems
	for _, b := range set.Bounds {
		if b.Scenario != "" && b.Scenario != scenario {
			out.Skipped = append(out.Skipped, fmt.Sprintf("%s (for scenario %s; this scan is of %s)", b.Name, b.Scenario, scenario))
			continue
		}
		j, p := resolve(t, b)
		if p != nil {
			probs = append(probs, p)
			continue
		}
		out.Used = append(out.Used, j)
	}
	if len(probs) > 0 {
		return nil, probs
	}
	if len(out.Used) == 0 {
		return nil, fmt.Errorf("%s: no bound applies to this scan of %s (%s)", set.File, scenario, strings.Join(out.Skipped, "; "))
	}

	// Rows by point, in table order.
	byPoint := map[int][]int{}
	var points []int
	for r := range t.Rows {
		p := t.Point(r)
		if _, ok := byPoint[p]; !ok {
			points = append(points, p)
		}
		byPoint[p] = append(byPoint[p], r)
	}
	sort.Ints(points)
	out.Points = len(points)
	for _, j := range out.Used {
		if j.Kind == Measurement {
			out.Measurements++
		}
	}
	if out.Measurements > 0 {
		out.ChiSquareThreshold = ChiSquareThreshold(out.Measurements, set.Confidence)
	}

	nb, nr := len(out.Used), len(t.Rows)
	stat := make([][]float64, nb) // pull or distance beyond, per bound per row
	excl := make([][]tri, nb)
	for k := range out.Used {
		stat[k], excl[k] = make([]float64, nr), make([]tri, nr)
	}
	allowed := make([]tri, nr)
	by := make([]string, nr)
	notes := make([]string, nr)
	chi2, pval := make([]float64, nr), make([]float64, nr)
	dof := make([]int64, nr)
	chiOK := make([]tri, nr)
	cb := t.Column(scan.BodyColumn)
	for _, p := range points {
		rows := byPoint[p]
		var names, missing []string
		sum, n, measMissing := 0.0, 0, false
		pointStat := make([]float64, nb)
		pointExcl := make([]tri, nb)
		for k, j := range out.Used {
			obs, err := math.NaN(), 0.0
			for _, r := range rows {
				if j.Body != "" && t.String(r, cb) != j.Body {
					continue
				}
				obs = t.Float(r, j.col)
				if j.errCol >= 0 {
					if e := t.Float(r, j.errCol); !math.IsNaN(e) {
						err = math.Abs(e)
					}
				}
				break
			}
			pointStat[k] = math.NaN()
			if math.IsNaN(obs) {
				missing = append(missing, j.Name)
				if j.Kind == Measurement {
					measMissing = true
				}
				continue
			}
			if j.Kind == Measurement {
				pull := (obs - j.Value) / math.Hypot(j.Sigma, err)
				pointStat[k] = pull
				pointExcl[k] = triOf(math.Abs(pull) > j.K())
				sum += pull * pull
				n++
			} else {
				beyond := math.Inf(-1)
				if !math.IsNaN(j.Upper) {
					beyond = obs - j.Upper
				}
				if !math.IsNaN(j.Lower) {
					beyond = math.Max(beyond, j.Lower-obs)
				}
				pointStat[k] = beyond
				pointExcl[k] = triOf(beyond > j.Z()*err)
			}
			if pointExcl[k] == yes {
				j.Excluded++
			}
		}
		c2, cdof, cp, cok := math.NaN(), int64(n), math.NaN(), unknown
		if out.Measurements > 0 && !measMissing {
			c2 = sum
			cp = ChiSquarePValue(n, sum)
			cok = triOf(!(sum > out.ChiSquareThreshold))
		}
		verdict := yes
		for k, j := range out.Used {
			e := pointExcl[k]
			if set.Rule == ChiSquare && j.Kind == Measurement {
				continue
			}
			switch {
			case e == yes:
				verdict = no
				names = append(names, j.Name)
			case e == unknown && verdict == yes:
				verdict = unknown
			}
		}
		if set.Rule == ChiSquare && out.Measurements > 0 {
			switch {
			case cok == no:
				names = append([]string{ChiSquareName}, names...)
				verdict = no
			case cok == unknown && verdict == yes:
				verdict = unknown
			}
		}
		switch verdict {
		case yes:
			out.Allowed++
		case no:
			out.Excluded++
		default:
			out.Undetermined++
		}
		note := ""
		if len(missing) > 0 {
			note = "no value of the observable for " + strings.Join(missing, ", ")
		}
		for _, r := range rows {
			for k := range out.Used {
				stat[k][r], excl[k][r] = pointStat[k], pointExcl[k]
			}
			allowed[r], by[r], notes[r] = verdict, strings.Join(names, ","), note
			chi2[r], dof[r], pval[r], chiOK[r] = c2, cdof, cp, cok
		}
	}

	cols := []column{
		{name: AllowedColumn, kind: optBool, b: allowed},
		{name: ExcludedByColumn, kind: reqString, s: by},
	}
	for k, j := range out.Used {
		name := PullColumn(j.Name)
		if j.Kind == Limit {
			name = BeyondColumn(j.Name)
		}
		cols = append(cols, column{name: name, kind: optFloat, f: stat[k]},
			column{name: ExcludedColumn(j.Name), kind: optBool, b: excl[k]})
	}
	if out.Measurements > 0 {
		cols = append(cols,
			column{name: ChiSquareColumn, kind: optFloat, f: chi2},
			column{name: ChiSquareDoF, kind: reqInt, i: dof},
			column{name: ChiSquarePColumn, kind: optFloat, f: pval},
			column{name: ChiSquareAllowed, kind: optBool, b: chiOK})
	}
	cols = append(cols, column{name: NotesColumn, kind: reqString, s: notes})
	nt, err := rebuild(t, isBoundColumn, cols)
	if err != nil {
		return nil, err
	}
	nt.Meta = out.metadata(t.Meta)
	out.Table = nt
	return out, nil
}

// resolve finds the columns a bound reads and checks it fits the table.
func resolve(t *scan.Table, b *Bound) (*Judged, *scenarios.Problem) {
	j := &Judged{Bound: b, Column: b.Observable, col: t.Column(b.Observable), errCol: -1}
	if j.col < 0 {
		if IsDeflectionColumn(b.Observable) {
			return nil, b.Problem("observable", b.Observable, "the scan has no light-deflection columns: compute them with --deflection-at B (e.g. \"1.6 Rsun\"), or state the bound's impact = \"...\"")
		}
		return nil, b.Problem("observable", b.Observable, "no such column in the scan table; numeric columns: %s", strings.Join(numericColumns(t), ", "))
	}
	if !numeric(t, j.col) {
		return nil, b.Problem("observable", b.Observable, "is not a numeric column")
	}
	if !hasValues(t, j.col) {
		semi := "semi_analytic_" + b.Observable
		if c := t.Column(semi); c >= 0 && hasValues(t, c) {
			j.Column, j.col = semi, c
			j.Note = fmt.Sprintf("%s is empty (a semi-analytic scan): %s used", b.Observable, semi)
		} else {
			return nil, b.Problem("observable", b.Observable, "has no values in this scan (a semi-analytic scan fills only the semi_analytic_ columns; an integrated one the others)")
		}
	}
	if e := errorColumn(t, j.Column); e != "" {
		j.ErrorColumn, j.errCol = e, t.Column(e)
	}
	cb := t.Column(scan.BodyColumn)
	bodies := map[string]bool{}
	var names []string
	for r := range t.Rows {
		if cb >= 0 && !bodies[t.String(r, cb)] {
			bodies[t.String(r, cb)] = true
			names = append(names, t.String(r, cb))
		}
	}
	if b.Body != "" && !bodies[b.Body] {
		return nil, b.Problem("body", b.Body, "the scan has no rows for this body (bodies: %s)", strings.Join(names, ", "))
	}
	if b.Body == "" && len(names) > 1 && !samePerPoint(t, j.col) {
		return nil, b.Problem("", nil, "%s differs between the bodies of a point (%s): say which with body = \"...\"", j.Column, strings.Join(names, ", "))
	}
	if b.Impact > 0 || b.Source != "" {
		if !IsDeflectionColumn(b.Observable) {
			return nil, b.Problem("impact", nil, "impact and source belong to light-deflection observables (%s), not to %s", strings.Join(DeflectionColumns(), ", "), b.Observable)
		}
		if b.Impact > 0 {
			if have, _ := strconv.ParseFloat(t.Meta[MetaImpact], 64); math.Abs(have/b.Impact-1) > 1e-9 {
				return nil, b.Problem("impact", b.ImpactText, "the table's deflection columns are at b = %s (%s m), not at the bound's %.6g m: recompute them at the bound's impact parameter",
					t.Meta[MetaImpactText], t.Meta[MetaImpact], b.Impact)
			}
		}
		if b.Source != "" && t.Meta[MetaSource] != b.Source {
			return nil, b.Problem("source", b.Source, "the table's deflection columns are for light past %s", t.Meta[MetaSource])
		}
	}
	return j, nil
}

func numeric(t *scan.Table, c int) bool {
	leaf, ok := t.Schema.Lookup(t.Schema.Columns()[c]...)
	if !ok {
		return false
	}
	switch leaf.Node.Type().Kind() {
	case parquet.Double, parquet.Float, parquet.Int64, parquet.Int32:
		return true
	}
	return false
}

func numericColumns(t *scan.Table) []string {
	var out []string
	for k, path := range t.Schema.Columns() {
		if len(path) == 1 && numeric(t, k) && !strings.HasPrefix(path[0], "sweep_") && path[0] != scan.PointColumn {
			out = append(out, path[0])
		}
	}
	return out
}

func hasValues(t *scan.Table, c int) bool {
	for r := range t.Rows {
		if !math.IsNaN(t.Float(r, c)) {
			return true
		}
	}
	return false
}

// samePerPoint reports whether every point's rows agree in column c.
func samePerPoint(t *scan.Table, c int) bool {
	first := map[int]float64{}
	for r := range t.Rows {
		p, v := t.Point(r), t.Float(r, c)
		if w, ok := first[p]; ok {
			if !(v == w || math.IsNaN(v) && math.IsNaN(w)) {
				return false
			}
			continue
		}
		first[p] = v
	}
	return true
}

// errorColumn is the integration-error column of an observable: for
// NAME_UNIT it is NAME_integration_error_UNIT, for NAME it is
// NAME_integration_error (the summary's naming).
func errorColumn(t *scan.Table, obs string) string {
	const mark = "_integration_error"
	for _, c := range t.ColumnNames() {
		if i := strings.Index(c, mark); i >= 0 && c[:i]+c[i+len(mark):] == obs {
			return c
		}
	}
	return ""
}

// Metadata keys of a judged table.
const (
	MetaPrefix = "mgorbit.bounds."
	MetaRule   = MetaPrefix + "rule"
	MetaCount  = MetaPrefix + "count"
)

func (a *Applied) metadata(old map[string]string) map[string]string {
	m := map[string]string{}
	for k, v := range old {
		if !strings.HasPrefix(k, MetaPrefix) {
			m[k] = v
		}
	}
	s := a.Set
	m[MetaPrefix+"file"] = s.File
	m[MetaPrefix+"sha256"] = s.Hash
	m[MetaPrefix+"toml"] = s.Text
	m[MetaRule] = string(s.Rule)
	m[MetaPrefix+"confidence"] = fmtFloat(s.Confidence)
	m[MetaCount] = strconv.Itoa(len(a.Used))
	m[MetaPrefix+"measurements"] = strconv.Itoa(a.Measurements)
	m[MetaPrefix+"chi_square_threshold"] = fmtFloat(a.ChiSquareThreshold)
	m[MetaPrefix+"rule_text"] = a.RuleText()
	if len(a.Skipped) > 0 {
		m[MetaPrefix+"skipped"] = strings.Join(a.Skipped, "; ")
	}
	for k, j := range a.Used {
		p := fmt.Sprintf("%s%d.", MetaPrefix, k)
		m[p+"name"] = j.Name
		m[p+"kind"] = string(j.Kind)
		m[p+"observable"] = j.Observable
		m[p+"column"] = j.Column
		m[p+"error_column"] = j.ErrorColumn
		m[p+"body"] = j.Body
		m[p+"confidence"] = fmtFloat(j.Confidence)
		m[p+"description"] = j.Describe()
		if j.Kind == Measurement {
			m[p+"value"], m[p+"sigma"], m[p+"k"] = fmtFloat(j.Value), fmtFloat(j.Sigma), fmtFloat(j.K())
			m[p+"statistic_column"] = PullColumn(j.Name)
		} else {
			m[p+"upper"], m[p+"lower"], m[p+"z"] = fmtFloat(j.Upper), fmtFloat(j.Lower), fmtFloat(j.Z())
			m[p+"statistic_column"] = BeyondColumn(j.Name)
		}
		m[p+"excluded_column"] = ExcludedColumn(j.Name)
		m[p+"excluded_points"] = strconv.Itoa(j.Excluded)
		if j.Impact > 0 {
			m[p+"impact_m"] = fmtFloat(j.Impact)
		}
		if j.Note != "" {
			m[p+"note"] = j.Note
		}
		if j.Bound.Note != "" {
			m[p+"file_note"] = j.Bound.Note
		}
	}
	return m
}

// RuleText says in words how the verdict was reached.
func (a *Applied) RuleText() string {
	if a.Set.Rule == ChiSquare {
		s := fmt.Sprintf("chi-square: excluded where the sum of the %d measurements' squared pulls exceeds %.4g (chi-square quantile of %d degrees of freedom at %s)",
			a.Measurements, a.ChiSquareThreshold, a.Measurements, fmtFloat(a.Set.Confidence))
		if a.Measurements < len(a.Used) {
			s += ", or a limit excludes"
		}
		return s
	}
	return "each: excluded where any bound excludes at its own confidence level"
}

func fmtFloat(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }
