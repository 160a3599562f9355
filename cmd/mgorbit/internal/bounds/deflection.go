package bounds

import (
	"fmt"
	"math"
	"reflect"
	"runtime"
	"strconv"
	"strings"
	"sync"

	"mgorbit/cmd/mgorbit/internal/report"
	"mgorbit/cmd/mgorbit/internal/scan"
	"mgorbit/integrator/lensing"
	"mgorbit/scenarios"
)

// Metadata of the deflection columns.
const (
	MetaImpact     = "mgorbit.deflection.impact_parameter_m"
	MetaImpactText = "mgorbit.deflection.impact_parameter"
	MetaSource     = "mgorbit.deflection.source"
)

// deflectionField is one column of report.DeflectionRow a scan takes.
type deflectionField struct {
	name  string
	field int
	text  bool
}

// deflectionFields are DeflectionRow's columns less those the scan row
// has already (scenario, kernel stack) and with its notes renamed.
var deflectionFields = func() []deflectionField {
	var out []deflectionField
	t := reflect.TypeOf(report.DeflectionRow{})
	for k := 0; k < t.NumField(); k++ {
		name, _, _ := strings.Cut(t.Field(k).Tag.Get("parquet"), ",")
		switch name {
		case "scenario", "kernel_stack", "deflection_mu_meaning":
			continue
		case "notes":
			name = "deflection_notes"
		}
		out = append(out, deflectionField{name: name, field: k, text: t.Field(k).Type.Kind() == reflect.String})
	}
	return out
}()

// DeflectionColumns lists the light-deflection columns a scan can carry.
func DeflectionColumns() []string {
	var out []string
	for _, f := range deflectionFields {
		out = append(out, f.name)
	}
	return out
}

// IsDeflectionColumn tells whether name is one of them.
func IsDeflectionColumn(name string) bool { return contains(DeflectionColumns(), name) }

// SpecFromTable rebuilds the scan that made t from its metadata (the
// scenario's text, the grids, the method), so that values that depend on
// a point's scenario alone can be added without recomputing the scan.
func SpecFromTable(t *scan.Table) (*scan.Spec, error) {
	text, src := t.Meta["mgorbit.scenario.toml"], t.Meta["mgorbit.scenario.source"]
	if text == "" || t.Meta[scan.MetaHash] == "" {
		return nil, fmt.Errorf("not a scan table: its metadata has no scenario text or scan hash")
	}
	sc, err := scenarios.Parse(src, []byte(text))
	if err != nil {
		return nil, fmt.Errorf("the scenario stored in the table: %w", err)
	}
	n, err := strconv.Atoi(t.Meta["mgorbit.scan.axes"])
	if err != nil {
		return nil, fmt.Errorf("the table's metadata has no axis count")
	}
	var axes []scan.Axis
	for k := 0; k < n; k++ {
		p := fmt.Sprintf("mgorbit.scan.axis.%d.", k)
		ax, err := scan.ParseSweep(t.Meta[p+"path"] + "=" + t.Meta[p+"spec"])
		if err != nil {
			return nil, fmt.Errorf("the table's axis %d: %w", k, err)
		}
		axes = append(axes, ax)
	}
	method, err := scan.ParseMethod(t.Meta["mgorbit.scan.method"])
	if err != nil {
		return nil, err
	}
	spec, err := scan.NewSpec(sc, axes, method, t.Meta["mgorbit.scan.keep_going"] == "true")
	if err != nil {
		return nil, err
	}
	if spec.Hash() != t.Meta[scan.MetaHash] {
		return nil, fmt.Errorf("the table's metadata does not rebuild its scan (written by mgorbit %s, this is %s): rerun the scan with --deflection-at",
			t.Meta["mgorbit.version"], report.Version)
	}
	return spec, nil
}

// AddDeflection returns t with the light-deflection columns of every point's
// scenario at impact parameter b past source ("" the first massive body),
// replacing any it had. text is b as the user wrote it, for the metadata.
func AddDeflection(t *scan.Table, spec *scan.Spec, source string, b float64, text string) (*scan.Table, error) {
	if !(b > 0) {
		return nil, fmt.Errorf("impact parameter %g m: must be positive", b)
	}
	var points []int
	seen := map[int]bool{}
	for r := range t.Rows {
		if p := t.Point(r); !seen[p] {
			seen[p] = true
			points = append(points, p)
		}
	}
	rows := make(map[int]report.DeflectionRow, len(points))
	errs := make([]error, len(points))
	vals := make([]report.DeflectionRow, len(points))
	var wg sync.WaitGroup
	next := make(chan int)
	for w := 0; w < runtime.NumCPU(); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for k := range next {
				sc, err := spec.Scenario(points[k])
				if err == nil {
					vals[k], err = report.Deflection(sc, source, lensing.Ray{B: b})
				}
				errs[k] = err
			}
		}()
	}
	for k := range points {
		next <- k
	}
	close(next)
	wg.Wait()
	for k, p := range points {
		if errs[k] != nil {
			return nil, fmt.Errorf("light deflection at point %d: %w", p, errs[k])
		}
		rows[p] = vals[k]
	}
	cols := make([]column, len(deflectionFields))
	for k, f := range deflectionFields {
		cols[k] = column{name: f.name, kind: optFloat, f: make([]float64, len(t.Rows))}
		if f.text {
			cols[k] = column{name: f.name, kind: reqString, s: make([]string, len(t.Rows))}
		}
	}
	for r := range t.Rows {
		v := reflect.ValueOf(rows[t.Point(r)])
		for k, f := range deflectionFields {
			if f.text {
				cols[k].s[r] = v.Field(f.field).String()
			} else {
				cols[k].f[r] = v.Field(f.field).Float()
			}
		}
	}
	nt, err := rebuild(t, IsDeflectionColumn, cols)
	if err != nil {
		return nil, err
	}
	meta := map[string]string{}
	for k, v := range t.Meta {
		meta[k] = v
	}
	meta[MetaImpact] = strconv.FormatFloat(b, 'g', -1, 64)
	meta[MetaImpactText] = text
	if len(points) > 0 {
		meta[MetaSource] = rows[points[0]].Source
	}
	nt.Meta = meta
	return nt, nil
}

// DeflectionNeed is where the set's light bounds were measured.
type DeflectionNeed struct {
	// Impact (m) and its text, and the source body ("" the first massive
	// one), as the bounds state them.
	Impact     float64
	ImpactText string
	Source     string
	// Missing is set when t has no deflection columns at that impact
	// parameter and source, so they must be computed before Apply.
	Missing bool
}

// NeedsDeflection tells whether the bounds that apply to t (by scenario)
// read light-deflection columns at a stated impact parameter; ok is false
// when none does. Bounds that state different impact parameters or sources
// are an error: the table holds one set of deflection columns.
func NeedsDeflection(t *scan.Table, set *Set) (need DeflectionNeed, ok bool, err error) {
	scenario := t.Meta["mgorbit.scenario.name"]
	var first *Bound
	for _, b := range set.Bounds {
		if b.Scenario != "" && b.Scenario != scenario || !IsDeflectionColumn(b.Observable) || b.Impact == 0 {
			continue
		}
		if first == nil {
			first = b
			continue
		}
		if b.Impact != first.Impact || b.Source != first.Source {
			return need, false, b.Problem("impact", b.ImpactText, "bound %s states b = %s past %q: one scan holds the deflection columns of one impact parameter and source; apply these bounds in two passes",
				first.Name, first.ImpactText, first.Source)
		}
	}
	if first == nil {
		return need, false, nil
	}
	need = DeflectionNeed{Impact: first.Impact, ImpactText: first.ImpactText, Source: first.Source}
	have, _ := strconv.ParseFloat(t.Meta[MetaImpact], 64)
	need.Missing = t.Column("gamma_deflection_minus_1") < 0 || math.Abs(have/need.Impact-1) > 1e-9 ||
		need.Source != "" && t.Meta[MetaSource] != need.Source
	return need, true, nil
}
