package external

import (
	"encoding/json"
	"os/exec"
	"testing"
)

// DuckDBTable is what testdata/duckdb/check.mjs prints for a file or glob.
// Cells stay raw JSON, so each test decodes them exactly as it needs
// (doubles are shortest round-trip decimals; -0, NaN and the infinities are
// strings; BIGINTs decimal strings).
type DuckDBTable struct {
	RowCount int `json:"row_count"`
	Columns  []struct {
		Name string `json:"name"`
		Type string `json:"type"`
	} `json:"columns"`
	Rows  [][]json.RawMessage `json:"rows"`
	Files []struct {
		File      string            `json:"file"`
		CreatedBy string            `json:"created_by"`
		KV        map[string]string `json:"kv"`
		Columns   []struct {
			Name        string   `json:"name"`
			Repetition  string   `json:"repetition"`
			Compression []string `json:"compression"`
		} `json:"columns"`
	} `json:"files"`
}

// ColumnIndex maps column names to their positions in Rows.
func (d DuckDBTable) ColumnIndex() map[string]int {
	at := map[string]int{}
	for k, c := range d.Columns {
		at[c.Name] = k
	}
	return at
}

// ReadDuckDB reads a Parquet file or glob with DuckDB (skipping or failing
// as DuckDB does when the reader is missing).
func ReadDuckDB(t testing.TB, target string) DuckDBTable {
	t.Helper()
	node, script := DuckDB(t)
	out, err := exec.Command(node, script, target).Output()
	if err != nil {
		msg := ""
		if exit, ok := err.(*exec.ExitError); ok {
			msg = string(exit.Stderr)
		}
		t.Fatalf("DuckDB over %s: %v\n%s", target, err, msg)
	}
	var d DuckDBTable
	if err := json.Unmarshal(out, &d); err != nil {
		t.Fatalf("decoding DuckDB output: %v\n%s", err, out)
	}
	return d
}
