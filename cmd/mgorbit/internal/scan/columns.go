package scan

import (
	"fmt"
	"reflect"
	"strings"

	"github.com/parquet-go/parquet-go"

	"mgorbit/cmd/mgorbit/internal/report"
)

// Extra holds the columns a scan adds to the summary's.
type Extra struct {
	// The semi-analytic anomaly per century (over the semi-analytic radial
	// period where there is one) and the reference orbit's apsides.
	SemiAnomArcsecPerCentury *float64 `parquet:"semi_analytic_anomaly_arcsec_per_century,optional"`
	SemiRPeriM               *float64 `parquet:"semi_analytic_r_pericentre_m,optional"`
	SemiRApoM                *float64 `parquet:"semi_analytic_r_apocentre_m,optional"`
	SemiSizeAM               *float64 `parquet:"semi_analytic_orbit_size_a_m,optional"`
	// With --method both: integrated minus semi-analytic, relative to the
	// semi-analytic value, and in units of the integration-error estimate.
	PrecRelDiff     *float64 `parquet:"precession_minus_semi_analytic_relative,optional"`
	AnomRelDiff     *float64 `parquet:"anomaly_minus_semi_analytic_relative,optional"`
	AnomDiffOverErr *float64 `parquet:"anomaly_minus_semi_analytic_over_integration_error,optional"`
}

// Fixed columns of every scan table.
const (
	PointColumn    = "point_index"
	MethodColumn   = "scan_method"
	ErrorColumn    = "point_error"
	WarningsColumn = "point_warnings"
	BodyColumn     = "body"
)

// layout is a scan table's row type: the point index, each axis's columns,
// the point's status, the summary's columns and the scan's extras. It is
// built at run time because the sweep columns depend on the axes.
type layout struct {
	axes    []Axis
	typ     reflect.Type
	schema  *parquet.Schema
	summary int // index of the first report.SummaryRow field
	extra   int // index of the first Extra field
}

func newLayout(axes []Axis) (*layout, error) {
	type column struct {
		name string
		typ  reflect.Type
	}
	i64, f64, str := reflect.TypeOf(int64(0)), reflect.TypeOf(0.0), reflect.TypeOf("")
	cols := []column{{PointColumn, i64}}
	for k := range axes {
		ax := &axes[k]
		cols = append(cols, column{ax.IndexColumn(), i64})
		if c := ax.SIColumn(); c != "" {
			cols = append(cols, column{c, f64})
		}
		if c := ax.UnitColumn(); c != "" {
			cols = append(cols, column{c, f64})
		}
		cols = append(cols, column{ax.TextColumn(), str})
	}
	cols = append(cols, column{MethodColumn, str}, column{ErrorColumn, str}, column{WarningsColumn, str})
	l := &layout{axes: axes, summary: len(cols)}
	var tags []string
	for _, c := range cols {
		tags = append(tags, c.name)
	}
	types := make([]reflect.Type, len(cols))
	for k, c := range cols {
		types[k] = c.typ
	}
	// The summary's and the extras' fields keep their own tags (",optional"
	// for the nullable ones).
	for _, t := range []reflect.Type{reflect.TypeOf(report.SummaryRow{}), reflect.TypeOf(Extra{})} {
		if t == reflect.TypeOf(Extra{}) {
			l.extra = len(tags)
		}
		for j := 0; j < t.NumField(); j++ {
			tags = append(tags, t.Field(j).Tag.Get("parquet"))
			types = append(types, t.Field(j).Type)
		}
	}
	seen := map[string]bool{}
	fields := make([]reflect.StructField, len(tags))
	for k, tag := range tags {
		name, _, _ := strings.Cut(tag, ",")
		if seen[name] {
			return nil, fmt.Errorf("two columns would be named %s; sweep another path or rename a body", name)
		}
		seen[name] = true
		fields[k] = reflect.StructField{Name: fmt.Sprintf("F%d", k), Type: types[k],
			Tag: reflect.StructTag(fmt.Sprintf(`parquet:"%s"`, tag))}
	}
	l.typ = reflect.StructOf(fields)
	l.schema = parquet.NewSchema("scan", parquet.SchemaOf(reflect.New(l.typ).Interface()))
	return l, nil
}

// row builds one table row.
func (l *layout) row(point int, idx []int, method, perr, warnings string, s report.SummaryRow, x Extra) parquet.Row {
	v := reflect.New(l.typ).Elem()
	f := 0
	next := func() reflect.Value { f++; return v.Field(f - 1) }
	next().SetInt(int64(point))
	for k := range l.axes {
		ax := &l.axes[k]
		val := ax.Values[idx[k]]
		next().SetInt(int64(idx[k]))
		if ax.SIColumn() != "" {
			next().SetFloat(val.SI)
		}
		if ax.UnitColumn() != "" {
			next().SetFloat(val.InUnit)
		}
		next().SetString(val.Text)
	}
	next().SetString(method)
	next().SetString(perr)
	next().SetString(warnings)
	sv := reflect.ValueOf(s)
	for j := 0; j < sv.NumField(); j++ {
		v.Field(l.summary + j).Set(sv.Field(j))
	}
	xv := reflect.ValueOf(x)
	for j := 0; j < xv.NumField(); j++ {
		v.Field(l.extra + j).Set(xv.Field(j))
	}
	return l.schema.Deconstruct(nil, v.Addr().Interface())
}
