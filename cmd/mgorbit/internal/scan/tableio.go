package scan

import (
	"bytes"
	"fmt"
	"io"
	"maps"
	"math"
	"os"
	"slices"
	"strings"

	"github.com/parquet-go/parquet-go"

	"mgorbit/cmd/mgorbit/internal/atomicfile"
)

// Table is a scan table in memory: its schema, rows in file order and the
// file's key-value metadata. Most columns are flat; a list column (the
// per-term precession shares) has several values per row, which Float and
// String do not read.
type Table struct {
	Schema *parquet.Schema
	Rows   []parquet.Row
	Meta   map[string]string

	at [][]int32 // at[r][c]: index in Rows[r] of column c's first value
}

// Column returns the leaf index of the named flat column, or -1.
func (t *Table) Column(name string) int {
	for k, path := range t.Schema.Columns() {
		if len(path) == 1 && path[0] == name {
			return k
		}
	}
	return -1
}

// ColumnNames lists the leaf columns in order, nested ones as dotted paths.
func (t *Table) ColumnNames() []string {
	var out []string
	for _, path := range t.Schema.Columns() {
		out = append(out, strings.Join(path, "."))
	}
	return out
}

// FieldNames lists the top-level columns, as other readers show them.
func (t *Table) FieldNames() []string {
	var out []string
	for _, f := range t.Schema.Fields() {
		out = append(out, f.Name())
	}
	return out
}

// value is row r's (first) value in leaf column c.
func (t *Table) value(r, c int) parquet.Value {
	if len(t.at) != len(t.Rows) {
		n := len(t.Schema.Columns())
		t.at = make([][]int32, len(t.Rows))
		for i, row := range t.Rows {
			idx := make([]int32, n)
			for k := range idx {
				idx[k] = -1
			}
			for j := len(row) - 1; j >= 0; j-- {
				idx[row[j].Column()] = int32(j)
			}
			t.at[i] = idx
		}
	}
	j := t.at[r][c]
	if j < 0 {
		return parquet.Value{}
	}
	return t.Rows[r][j]
}

// Float returns row r's value in column c as a float64: NaN for NULL,
// integers converted.
func (t *Table) Float(r, c int) float64 {
	v := t.value(r, c)
	switch v.Kind() {
	case parquet.Double:
		return v.Double()
	case parquet.Float:
		return float64(v.Float())
	case parquet.Int64:
		return float64(v.Int64())
	case parquet.Int32:
		return float64(v.Int32())
	}
	return math.NaN()
}

// Floats returns a whole column as float64 (NaN for NULL).
func (t *Table) Floats(name string) ([]float64, error) {
	c := t.Column(name)
	if c < 0 {
		return nil, fmt.Errorf("no column %s in %v", name, t.ColumnNames())
	}
	out := make([]float64, len(t.Rows))
	for r := range t.Rows {
		out[r] = t.Float(r, c)
	}
	return out, nil
}

// String returns row r's value in column c as text ("" for NULL).
func (t *Table) String(r, c int) string {
	v := t.value(r, c)
	switch v.Kind() {
	case parquet.ByteArray, parquet.FixedLenByteArray:
		return string(v.ByteArray())
	case parquet.Double, parquet.Int64, parquet.Int32, parquet.Boolean:
		return v.String()
	}
	return ""
}

// Point returns row r's point index.
func (t *Table) Point(r int) int {
	return int(t.value(r, t.Column(PointColumn)).Int64())
}

// writeTable stores a table atomically, zstd-compressed with the metadata
// sorted, as the project's other tables are.
func writeTable(path string, schema *parquet.Schema, rows []parquet.Row, meta map[string]string, force bool) error {
	return atomicfile.Write(path, force, func(w io.Writer) error {
		options := []parquet.WriterOption{schema, parquet.Compression(&parquet.Zstd)}
		for _, key := range slices.Sorted(maps.Keys(meta)) {
			options = append(options, parquet.KeyValueMetadata(key, meta[key]))
		}
		writer := parquet.NewWriter(w, options...)
		if _, err := writer.WriteRows(rows); err != nil {
			return fmt.Errorf("writing rows: %w", err)
		}
		return writer.Close()
	})
}

// ReadTable loads a scan table (or any Parquet file of flat columns).
func ReadTable(path string) (*Table, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	info, err := f.Stat()
	if err != nil {
		return nil, err
	}
	file, err := parquet.OpenFile(f, info.Size())
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	t := &Table{Schema: file.Schema(), Meta: map[string]string{}}
	for _, kv := range file.Metadata().KeyValueMetadata {
		t.Meta[kv.Key] = kv.Value
	}
	for _, rg := range file.RowGroups() {
		rr := rg.Rows()
		buf := make([]parquet.Row, 256)
		for {
			n, err := rr.ReadRows(buf)
			for _, r := range buf[:n] {
				t.Rows = append(t.Rows, r.Clone())
			}
			if err == io.EOF {
				break
			}
			if err != nil {
				rr.Close()
				return nil, fmt.Errorf("%s: reading rows: %w", path, err)
			}
		}
		rr.Close()
	}
	if int64(len(t.Rows)) != file.NumRows() {
		return nil, fmt.Errorf("%s: footer promises %d rows, read %d", path, file.NumRows(), len(t.Rows))
	}
	return t, nil
}

// SameValue reports whether two cells are identical: same kind, same
// nullness and the same bits (so NaN equals NaN and -0 differs from +0).
func SameValue(a, b parquet.Value) bool {
	if a.Kind() != b.Kind() || a.IsNull() != b.IsNull() || a.Column() != b.Column() ||
		a.RepetitionLevel() != b.RepetitionLevel() || a.DefinitionLevel() != b.DefinitionLevel() {
		return false
	}
	if a.IsNull() {
		return true
	}
	switch a.Kind() {
	case parquet.Double:
		return math.Float64bits(a.Double()) == math.Float64bits(b.Double())
	case parquet.Int64:
		return a.Int64() == b.Int64()
	case parquet.Boolean:
		return a.Boolean() == b.Boolean()
	}
	return bytes.Equal(a.Bytes(), b.Bytes())
}

// DiffRows describes the first difference between two tables' rows, or
// returns "" when every cell is identical.
func DiffRows(a, b *Table) string {
	if !parquet.SameNodes(a.Schema, b.Schema) {
		return fmt.Sprintf("columns differ: %v against %v", a.ColumnNames(), b.ColumnNames())
	}
	if len(a.Rows) != len(b.Rows) {
		return fmt.Sprintf("%d rows against %d", len(a.Rows), len(b.Rows))
	}
	names := a.ColumnNames()
	for r := range a.Rows {
		if len(a.Rows[r]) != len(b.Rows[r]) {
			return fmt.Sprintf("row %d: %d cells against %d", r, len(a.Rows[r]), len(b.Rows[r]))
		}
		for j := range a.Rows[r] {
			if !SameValue(a.Rows[r][j], b.Rows[r][j]) {
				return fmt.Sprintf("row %d column %s: %v against %v", r, names[a.Rows[r][j].Column()], a.Rows[r][j], b.Rows[r][j])
			}
		}
	}
	return ""
}
