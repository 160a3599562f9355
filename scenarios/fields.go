package scenarios

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

// table is one decoded TOML table with its field path, for typed reads
// that report problems against the right path.
type table struct {
	path string
	m    map[string]any
	r    *report
}

func (t *table) field(k string) string {
	if t.path == "" {
		return k
	}
	return t.path + "." + k
}

func (t *table) has(k string) bool { _, ok := t.m[k]; return ok }

// checkKeys reports every key not in allowed: a misspelt key must never
// fall back to a default.
func (t *table) checkKeys(allowed []string) {
	keys := make([]string, 0, len(t.m))
	for k := range t.m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, k := range keys {
		if contains(allowed, k) {
			continue
		}
		hint := ""
		if near := closest(k, allowed); near != "" {
			hint = fmt.Sprintf("; did you mean %q?", near)
		}
		where := "here"
		if t.path != "" {
			where = "in " + t.path
		}
		t.r.add(t.field(k), nil, "unknown key %q %s (allowed: %s)%s", k, where, strings.Join(allowed, ", "), hint)
	}
}

// str reads a string.
func (t *table) str(k string) (string, bool) {
	v, ok := t.m[k]
	if !ok {
		return "", false
	}
	s, isStr := v.(string)
	if !isStr {
		t.r.add(t.field(k), v, "must be a string (in quotes)")
		return "", false
	}
	return s, true
}

// boolean reads true or false.
func (t *table) boolean(k string) (bool, bool) {
	v, ok := t.m[k]
	if !ok {
		return false, false
	}
	b, isBool := v.(bool)
	if !isBool {
		t.r.add(t.field(k), v, "must be true or false")
		return false, false
	}
	return b, true
}

// number reads a finite dimensionless number: a TOML number, or a string
// holding one.
func (t *table) number(k string) (float64, bool) {
	v, ok := t.m[k]
	if !ok {
		return 0, false
	}
	x, err := dimensionless(v)
	if err != nil {
		t.r.add(t.field(k), v, "%v", err)
		return 0, false
	}
	return x, true
}

func dimensionless(v any) (float64, error) {
	var x float64
	switch n := v.(type) {
	case int64:
		x = float64(n)
	case float64:
		x = n
	case string:
		q, err := units.ParseAs(n, units.Dimensionless)
		if err != nil {
			return 0, fmt.Errorf("must be a plain number: %v", err)
		}
		x = q
	default:
		return 0, fmt.Errorf("must be a number")
	}
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return 0, fmt.Errorf("must be a finite number")
	}
	return x, nil
}

// integer reads a whole number.
func (t *table) integer(k string) (int64, bool) {
	v, ok := t.m[k]
	if !ok {
		return 0, false
	}
	switch n := v.(type) {
	case int64:
		return n, true
	case float64:
		if n == math.Trunc(n) && math.Abs(n) < 1<<53 {
			return int64(n), true
		}
	}
	t.r.add(t.field(k), v, "must be a whole number")
	return 0, false
}

// quantity reads a value of dimension dim: a string with a unit ("0.39 au"),
// or a bare number when dim is dimensionless.
func (t *table) quantity(k string, dim units.Dim) (float64, bool) {
	v, ok := t.m[k]
	if !ok {
		return 0, false
	}
	x, err := parseQuantity(v, dim)
	if err != nil {
		t.r.add(t.field(k), v, "%v", err)
		return 0, false
	}
	return x, true
}

func parseQuantity(v any, dim units.Dim) (float64, error) {
	if dim == units.Dimensionless {
		return dimensionless(v)
	}
	switch x := v.(type) {
	case string:
		return units.ParseAs(x, dim)
	case int64, float64:
		return 0, fmt.Errorf("%s %s needs a unit, written as a string (for example %s)", article(dim.String()), dim, units.Example(dim))
	}
	return 0, fmt.Errorf("%s %s must be a string with a unit (for example %s)", article(dim.String()), dim, units.Example(dim))
}

// vector reads a three-vector of dimension dim, such as ["1 au", "0 m", "0 m"].
func (t *table) vector(k string, dim units.Dim) (vec.V, bool) {
	v, ok := t.m[k]
	if !ok {
		return vec.V{}, false
	}
	list, isList := v.([]any)
	if !isList || len(list) != 3 {
		t.r.add(t.field(k), v, "must be a list of three %s values [x, y, z] (for example %s in each)", dim, units.Example(dim))
		return vec.V{}, false
	}
	var out vec.V
	good := true
	for i, e := range list {
		x, err := parseQuantity(e, dim)
		if err != nil {
			t.r.add(t.field(k), v, "the %s component: %v", "xyz"[i:i+1], err)
			good = false
			continue
		}
		out[i] = x
	}
	return out, good
}

// subTable returns a nested table [k], if present and really a table.
func (t *table) subTable(k string) (*table, bool) {
	v, ok := t.m[k]
	if !ok {
		return nil, false
	}
	m, isMap := v.(map[string]any)
	if !isMap {
		t.r.add(t.field(k), v, "must be a table, written [%s] on its own line", k)
		return nil, false
	}
	return &table{path: t.field(k), m: m, r: t.r}, true
}

// tableList returns the tables of an array of tables [[k]].
func (t *table) tableList(k string) []*table {
	v, ok := t.m[k]
	if !ok {
		return nil
	}
	var maps []map[string]any
	switch x := v.(type) {
	case []map[string]any:
		maps = x
	case []any:
		for _, e := range x {
			m, isMap := e.(map[string]any)
			if !isMap {
				t.r.add(t.field(k), v, "must be an array of tables, each written [[%s]]", k)
				return nil
			}
			maps = append(maps, m)
		}
	default:
		t.r.add(t.field(k), v, "must be an array of tables, each written [[%s]] (double brackets)", k)
		return nil
	}
	out := make([]*table, len(maps))
	for i, m := range maps {
		out[i] = &table{path: fmt.Sprintf("%s[%d]", k, i+1), m: m, r: t.r}
	}
	return out
}

// article returns "an" before a vowel, else "a".
func article(word string) string {
	if word != "" && strings.ContainsRune("aeiou", rune(word[0])) {
		return "an"
	}
	return "a"
}

func contains(list []string, s string) bool {
	for _, c := range list {
		if c == s {
			return true
		}
	}
	return false
}

// closest returns the allowed word within edit distance 2 of k, if any.
func closest(k string, allowed []string) string {
	best, bestD := "", 3
	for _, a := range allowed {
		if d := editDistance(strings.ToLower(k), a); d < bestD {
			best, bestD = a, d
		}
	}
	return best
}

// editDistance counts insertions, deletions, substitutions and swaps of
// neighbours (optimal string alignment): a swap, among the commonest
// typing slips (Damerau, Commun. ACM 7, 171 (1964)), costs one, so
// "rnage" is nearer "range" than "name".
func editDistance(a, b string) int {
	d := make([][]int, len(a)+1)
	for i := range d {
		d[i] = make([]int, len(b)+1)
		d[i][0] = i
	}
	for j := range d[0] {
		d[0][j] = j
	}
	for i := 1; i <= len(a); i++ {
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			d[i][j] = min(d[i-1][j]+1, d[i][j-1]+1, d[i-1][j-1]+cost)
			if i > 1 && j > 1 && a[i-1] == b[j-2] && a[i-2] == b[j-1] {
				d[i][j] = min(d[i][j], d[i-2][j-2]+1)
			}
		}
	}
	return d[len(a)][len(b)]
}
