package bounds

import (
	"fmt"
	"math"
	"reflect"

	"github.com/parquet-go/parquet-go"
	"github.com/parquet-go/parquet-go/format"

	"mgorbit/cmd/mgorbit/internal/scan"
)

// colKind is the type of an added column.
type colKind int

const (
	optFloat  colKind = iota // double, NULL for NaN
	optBool                  // boolean, NULL where unknown
	reqString                // text
	reqInt                   // int64
)

// tri is a boolean that may be unknown.
type tri int8

const (
	unknown tri = iota
	no
	yes
)

func triOf(b bool) tri {
	if b {
		return yes
	}
	return no
}

// column is a column to add, one value per table row.
type column struct {
	name string
	kind colKind
	f    []float64
	b    []tri
	s    []string
	i    []int64
}

// rebuild returns t without the columns drop selects and with add
// appended, in that order. Only flat tables (every column a leaf, as scan
// tables are) can be rebuilt.
func rebuild(t *scan.Table, drop func(name string) bool, add []column) (*scan.Table, error) {
	var fields []reflect.StructField
	var keep []int // old leaf index of each kept column
	seen := map[string]bool{}
	for k, f := range t.Schema.Fields() {
		if !f.Leaf() || f.Repeated() {
			return nil, fmt.Errorf("column %s is nested or repeated: only flat scan tables can take bound columns", f.Name())
		}
		if drop != nil && drop(f.Name()) {
			continue
		}
		typ, err := goType(f)
		if err != nil {
			return nil, err
		}
		tag := f.Name()
		if f.Optional() {
			typ, tag = reflect.PointerTo(typ), tag+",optional"
		}
		fields = append(fields, structField(len(fields), typ, tag))
		keep = append(keep, k)
		seen[f.Name()] = true
	}
	for _, c := range add {
		if seen[c.name] {
			return nil, fmt.Errorf("the table already has a column %s", c.name)
		}
		seen[c.name] = true
		var typ reflect.Type
		tag := c.name
		switch c.kind {
		case optFloat:
			typ, tag = reflect.TypeOf((*float64)(nil)), tag+",optional"
		case optBool:
			typ, tag = reflect.TypeOf((*bool)(nil)), tag+",optional"
		case reqString:
			typ = reflect.TypeOf("")
		case reqInt:
			typ = reflect.TypeOf(int64(0))
		}
		fields = append(fields, structField(len(fields), typ, tag))
	}
	schema := parquet.NewSchema("scan", parquet.SchemaOf(reflect.New(reflect.StructOf(fields)).Interface()))

	n := len(t.Schema.Fields())
	rows := make([]parquet.Row, len(t.Rows))
	for r, old := range t.Rows {
		at := make([]int, n)
		for k := range at {
			at[k] = -1
		}
		for j, v := range old {
			at[v.Column()] = j
		}
		row := make(parquet.Row, 0, len(fields))
		for newIdx, oldIdx := range keep {
			if at[oldIdx] < 0 {
				row = append(row, parquet.NullValue().Level(0, 0, newIdx))
				continue
			}
			v := old[at[oldIdx]]
			row = append(row, v.Level(0, v.DefinitionLevel(), newIdx))
		}
		for k, c := range add {
			row = append(row, c.value(r, len(keep)+k))
		}
		rows[r] = row
	}
	return &scan.Table{Schema: schema, Rows: rows, Meta: t.Meta}, nil
}

func (c *column) value(r, idx int) parquet.Value {
	switch c.kind {
	case optFloat:
		if math.IsNaN(c.f[r]) {
			return parquet.NullValue().Level(0, 0, idx)
		}
		return parquet.DoubleValue(c.f[r]).Level(0, 1, idx)
	case optBool:
		if c.b[r] == unknown {
			return parquet.NullValue().Level(0, 0, idx)
		}
		return parquet.BooleanValue(c.b[r] == yes).Level(0, 1, idx)
	case reqString:
		return parquet.ByteArrayValue([]byte(c.s[r])).Level(0, 0, idx)
	default:
		return parquet.Int64Value(c.i[r]).Level(0, 0, idx)
	}
}

func structField(k int, typ reflect.Type, tag string) reflect.StructField {
	return reflect.StructField{Name: fmt.Sprintf("F%d", k), Type: typ, Tag: reflect.StructTag(fmt.Sprintf(`parquet:"%s"`, tag))}
}

// goType is the Go type that makes parquet-go write the leaf as it is.
func goType(f parquet.Field) (reflect.Type, error) {
	switch f.Type().Kind() {
	case parquet.Boolean:
		return reflect.TypeOf(false), nil
	case parquet.Int32:
		return reflect.TypeOf(int32(0)), nil
	case parquet.Int64:
		return reflect.TypeOf(int64(0)), nil
	case parquet.Float:
		return reflect.TypeOf(float32(0)), nil
	case parquet.Double:
		return reflect.TypeOf(0.0), nil
	case parquet.ByteArray:
		if lt := f.Type().LogicalType(); lt != nil {
			if _, text := lt.Value.(*format.StringType); text {
				return reflect.TypeOf(""), nil
			}
		}
		return reflect.TypeOf([]byte(nil)), nil
	}
	return nil, fmt.Errorf("column %s has type %s, which bound columns cannot be added beside", f.Name(), f.Type())
}
