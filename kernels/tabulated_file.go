package kernels

import (
	"bytes"
	"crypto/sha256"
	"encoding/csv"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"strconv"
	"strings"

	"github.com/parquet-go/parquet-go"

	"mgorbit/scenarios/units"
)

// Table is a tabulated correction as read from a file: distances R in
// metres, strictly increasing, and the fraction at each.
type Table struct {
	Source string // the file path
	// SHA256 is the hex digest of the file's bytes, for provenance.
	SHA256 string
	R      []float64
	Value  []float64
	// Potential is true for potential_ratio tables (Phi = -(mu/r) psi),
	// false for force_ratio tables (a_r = -(mu/r^2) delta).
	Potential bool
}

// Column names of a table file.
const (
	ColumnRMetres        = "r_m"
	ColumnRAU            = "r_au"
	ColumnForceRatio     = "force_ratio"
	ColumnPotentialRatio = "potential_ratio"
)

// minTableRows: a cubic through the rows needs at least four.
const minTableRows = 4

// ReadTable reads a table file. Parquet files (recognised by their "PAR1"
// magic bytes) need a distance column r_m (metres) or r_au (astronomical
// units) and a value column force_ratio or potential_ratio, numeric and not
// null; other columns are ignored. Anything else is read as CSV:
//
//	# lines starting with '#' are comments
//	r_m,force_ratio
//	1.0e11,2.5e-9
//	...
//
// with the same column names in a header row and one row per distance.
// Distances must be positive, finite and strictly increasing, values
// finite, and there must be at least four rows.
func ReadTable(path string) (*Table, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("reading the table: %w", err)
	}
	sum := sha256.Sum256(data)
	var t *Table
	if bytes.HasPrefix(data, []byte("PAR1")) {
		t, err = parseTableParquet(data, path)
	} else {
		t, err = ParseTableCSV(bytes.NewReader(data), path)
	}
	if err != nil {
		return nil, err
	}
	t.SHA256 = hex.EncodeToString(sum[:])
	return t, nil
}

// ParseTableCSV reads the CSV form of a table (see ReadTable); source names
// it in errors.
func ParseTableCSV(r io.Reader, source string) (*Table, error) {
	cr := csv.NewReader(r)
	cr.Comment = '#'
	cr.TrimLeadingSpace = true
	cr.FieldsPerRecord = 2
	header, err := cr.Read()
	if err == io.EOF {
		return nil, fmt.Errorf("%s: empty table: the first row must be a header such as %s,%s", source, ColumnRMetres, ColumnForceRatio)
	}
	if err != nil {
		return nil, fmt.Errorf("%s: %v (a table has two columns, e.g. %s,%s)", source, err, ColumnRMetres, ColumnForceRatio)
	}
	scale, potential, err := tableColumns(strings.TrimSpace(header[0]), strings.TrimSpace(header[1]), source)
	if err != nil {
		return nil, err
	}
	t := &Table{Source: source, Potential: potential}
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, fmt.Errorf("%s: %v", source, err)
		}
		line, _ := cr.FieldPos(0)
		var x [2]float64
		for j, f := range rec {
			x[j], err = strconv.ParseFloat(strings.TrimSpace(f), 64)
			if err != nil {
				return nil, fmt.Errorf("%s: line %d: %q is not a number", source, line, f)
			}
		}
		t.R = append(t.R, x[0]*scale)
		t.Value = append(t.Value, x[1])
	}
	return t, t.check()
}

// tableColumns checks the two column names: the distance's scale to metres
// and whether the values are potential ratios.
func tableColumns(rName, vName, source string) (scale float64, potential bool, err error) {
	switch rName {
	case ColumnRMetres:
		scale = 1
	case ColumnRAU:
		scale = units.AU
	default:
		return 0, false, fmt.Errorf("%s: the distance column is %q; name it %s (metres) or %s (astronomical units)", source, rName, ColumnRMetres, ColumnRAU)
	}
	switch vName {
	case ColumnForceRatio:
	case ColumnPotentialRatio:
		potential = true
	default:
		return 0, false, fmt.Errorf("%s: the value column is %q; name it %s (a_corr = -(mu/r^2) delta) or %s (Phi_corr = -(mu/r) psi)",
			source, vName, ColumnForceRatio, ColumnPotentialRatio)
	}
	return scale, potential, nil
}

func (t *Table) check() error {
	if len(t.R) < minTableRows {
		return fmt.Errorf("%s: %d rows; a table needs at least %d for a cubic interpolation", t.Source, len(t.R), minTableRows)
	}
	for i, r := range t.R {
		if !(r > 0) || math.IsInf(r, 0) {
			return fmt.Errorf("%s: row %d: distance %g must be positive and finite", t.Source, i+1, r)
		}
		if v := t.Value[i]; math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("%s: row %d: value %g is not finite", t.Source, i+1, v)
		}
		if i > 0 && !(r > t.R[i-1]) {
			return fmt.Errorf("%s: row %d: distance %g does not increase on the row before (%g); sort the table by r and remove repeats",
				t.Source, i+1, r, t.R[i-1])
		}
	}
	return nil
}

func parseTableParquet(data []byte, source string) (*Table, error) {
	f, err := parquet.OpenFile(bytes.NewReader(data), int64(len(data)))
	if err != nil {
		return nil, fmt.Errorf("%s: not a readable Parquet file: %v", source, err)
	}
	schema := f.Schema()
	find := func(names ...string) (string, parquet.LeafColumn, bool) {
		for _, n := range names {
			if c, ok := schema.Lookup(n); ok {
				return n, c, true
			}
		}
		return "", parquet.LeafColumn{}, false
	}
	rName, rCol, ok := find(ColumnRMetres, ColumnRAU)
	if !ok {
		return nil, fmt.Errorf("%s: no distance column: name it %s (metres) or %s (astronomical units)", source, ColumnRMetres, ColumnRAU)
	}
	vName, vCol, ok := find(ColumnForceRatio, ColumnPotentialRatio)
	if !ok {
		return nil, fmt.Errorf("%s: no value column: name it %s or %s", source, ColumnForceRatio, ColumnPotentialRatio)
	}
	scale, potential, err := tableColumns(rName, vName, source)
	if err != nil {
		return nil, err
	}
	for _, c := range []struct {
		name string
		col  parquet.LeafColumn
	}{{rName, rCol}, {vName, vCol}} {
		if c.col.MaxRepetitionLevel != 0 {
			return nil, fmt.Errorf("%s: column %s is a list; it must hold one number per row", source, c.name)
		}
		switch c.col.Node.Type().Kind() {
		case parquet.Double, parquet.Float, parquet.Int32, parquet.Int64:
		default:
			return nil, fmt.Errorf("%s: column %s has type %v; it must be numeric", source, c.name, c.col.Node.Type())
		}
	}
	t := &Table{Source: source, Potential: potential}
	rows := make([]parquet.Row, 256)
	reader := parquet.NewReader(f)
	defer reader.Close()
	for {
		n, err := reader.ReadRows(rows)
		for _, row := range rows[:n] {
			var r, v float64
			var haveR, haveV bool
			for _, val := range row {
				switch val.Column() {
				case rCol.ColumnIndex:
					r, haveR = parquetNumber(val)
				case vCol.ColumnIndex:
					v, haveV = parquetNumber(val)
				}
			}
			if !haveR || !haveV {
				return nil, fmt.Errorf("%s: row %d: %s or %s is null", source, len(t.R)+1, rName, vName)
			}
			t.R = append(t.R, r*scale)
			t.Value = append(t.Value, v)
		}
		if errors.Is(err, io.EOF) || (err == nil && n == 0) {
			break
		}
		if err != nil {
			return nil, fmt.Errorf("%s: reading rows: %v", source, err)
		}
	}
	return t, t.check()
}

// parquetNumber converts a numeric Parquet value; false for null.
func parquetNumber(v parquet.Value) (float64, bool) {
	if v.IsNull() {
		return 0, false
	}
	switch v.Kind() {
	case parquet.Double:
		return v.Double(), true
	case parquet.Float:
		return float64(v.Float()), true
	case parquet.Int32:
		return float64(v.Int32()), true
	case parquet.Int64:
		return float64(v.Int64()), true
	}
	return 0, false
}
