package scan

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"

	"mgorbit/kernels"
	"mgorbit/scenarios"
)

// document is a scenario's TOML decoded into plain maps, the form in which
// values are set before the text is written out and read back.
type document map[string]any

func decodeDocument(text string) (document, error) {
	var doc map[string]any
	if _, err := toml.Decode(text, &doc); err != nil {
		return nil, err
	}
	return doc, nil
}

// clone copies the maps and lists, so points never share a table.
func clone(v any) any {
	switch x := v.(type) {
	case map[string]any:
		m := make(map[string]any, len(x))
		for k, e := range x {
			m[k] = clone(e)
		}
		return m
	case []map[string]any:
		l := make([]map[string]any, len(x))
		for k, e := range x {
			l[k] = clone(e).(map[string]any)
		}
		return l
	case []any:
		l := make([]any, len(x))
		for k, e := range x {
			l[k] = clone(e)
		}
		return l
	}
	return v
}

// tables returns the array of tables doc[key] ([[body]], [[kernel]]).
func tables(doc document, key string) []map[string]any {
	switch x := doc[key].(type) {
	case []map[string]any:
		return x
	case []any:
		var out []map[string]any
		for _, e := range x {
			if m, ok := e.(map[string]any); ok {
				out = append(out, m)
			}
		}
		return out
	}
	return nil
}

// target finds the table that path's last key lives in, and that key.
func (doc document) target(path string) (map[string]any, string, error) {
	parts := strings.Split(path, ".")
	key := parts[len(parts)-1]
	switch parts[0] {
	case "integrator":
		m, ok := doc["integrator"].(map[string]any)
		if !ok {
			m = map[string]any{}
			doc["integrator"] = m
		}
		return m, key, nil
	case "body", "kernel":
		list := tables(doc, parts[0])
		var names []string
		for _, t := range list {
			if n, ok := t["name"].(string); ok {
				names = append(names, n)
			}
		}
		if parts[0] == "kernel" {
			if k, err := strconv.Atoi(parts[1]); err == nil {
				if k < 1 || k > len(list) {
					return nil, "", fmt.Errorf("%s: the scenario has %d [[kernel]] tables", path, len(list))
				}
				return list[k-1], key, nil
			}
		}
		var found map[string]any
		count := 0
		for _, t := range list {
			if n, _ := t["name"].(string); n == parts[1] {
				found = t
				count++
			}
		}
		switch {
		case count == 0 && parts[0] == "kernel" && len(list) == 0:
			return nil, "", fmt.Errorf("%s: the scenario has no [[kernel]] tables (its stack is the default newton); add the kernel to the scenario first", path)
		case count == 0:
			return nil, "", fmt.Errorf("%s: no [[%s]] named %q in the scenario (there are: %s)", path, parts[0], parts[1], strings.Join(names, ", "))
		case count > 1:
			return nil, "", fmt.Errorf("%s: %d [[kernel]] tables are named %q; address one by its position, kernel.N.%s", path, count, parts[1], key)
		}
		return found, key, nil
	}
	return nil, "", fmt.Errorf("%s: unknown path", path)
}

// tomlValue is the TOML value for text at key of table t: a string when
// text has a unit, when the value it replaces is a string, or when the key
// is a kernel's choice parameter; a float for other numbers; a boolean or a
// string for words.
func tomlValue(t map[string]any, key, text string) any {
	old, had := t[key]
	if _, isStr := old.(string); isStr {
		return text
	}
	if kernelChoice(t, key) {
		return text
	}
	num, unit, err := quantityText(text)
	if err == nil && unit == "" {
		if _, isInt := old.(int64); had && isInt && num == math.Trunc(num) && math.Abs(num) < 1<<53 {
			return int64(num)
		}
		return num
	}
	if err == nil {
		return text
	}
	switch text {
	case "true":
		return true
	case "false":
		return false
	}
	return text
}

// kernelChoice reports whether key is a choice parameter of the kernel that
// table t declares (choices are written as strings, even "+1").
func kernelChoice(t map[string]any, key string) bool {
	name, ok := t["name"].(string)
	if !ok {
		return false
	}
	info, ok := kernels.Lookup(name)
	if !ok {
		return false
	}
	for _, p := range info.Params {
		if p.Name == key {
			return p.Kind == kernels.Choice
		}
	}
	return false
}

// template is the scenario document written once with a placeholder for
// each axis; a point's text is the template with the placeholders replaced.
// This gives the same text as setting the values in the document and
// encoding it each time, at a fraction of the cost for dense scans.
type template struct {
	before []string // text before each placeholder, then the tail
	order  []int    // the axis of each placeholder, in text order
	tables []map[string]any
	keys   []string
}

func placeholder(k int) string { return fmt.Sprintf("@@mgorbit-scan-axis-%d@@", k) }

func newTemplate(base document, axes []Axis) (*template, error) {
	doc := document(clone(map[string]any(base)).(map[string]any))
	tp := &template{}
	for k, ax := range axes {
		t, key, err := doc.target(ax.Path)
		if err != nil {
			return nil, err
		}
		// The placeholder's table keeps the replaced value's type for
		// tomlValue: a copy of the original table decides.
		orig := map[string]any{}
		for kk, v := range t {
			orig[kk] = v
		}
		tp.tables = append(tp.tables, orig)
		tp.keys = append(tp.keys, key)
		t[key] = placeholder(k)
	}
	var buf bytes.Buffer
	if err := toml.NewEncoder(&buf).Encode(map[string]any(doc)); err != nil {
		return nil, err
	}
	text := buf.String()
	// Placeholders are strings, so they are written in quotes; each must
	// occur exactly once.
	type at struct{ pos, axis int }
	var marks []at
	for k := range axes {
		q := `"` + placeholder(k) + `"`
		if strings.Count(text, q) != 1 {
			return nil, fmt.Errorf("internal: placeholder for %s written %d times", axes[k].Path, strings.Count(text, q))
		}
		marks = append(marks, at{strings.Index(text, q), k})
	}
	sort.Slice(marks, func(i, j int) bool { return marks[i].pos < marks[j].pos })
	order := make([]int, len(marks))
	last := 0
	for i, m := range marks {
		tp.before = append(tp.before, text[last:m.pos])
		order[i] = m.axis
		last = m.pos + len(placeholder(m.axis)) + 2
	}
	tp.before = append(tp.before, text[last:])
	tp.order = order
	return tp, nil
}

// text is the TOML of the point with the given axis value texts.
func (tp *template) text(values []string) []byte {
	var b strings.Builder
	for i, k := range tp.order {
		b.WriteString(tp.before[i])
		b.WriteString(tomlLiteral(tomlValue(tp.tables[k], tp.keys[k], values[k])))
	}
	b.WriteString(tp.before[len(tp.before)-1])
	return []byte(b.String())
}

// tomlLiteral writes a value as TOML.
func tomlLiteral(v any) string {
	switch x := v.(type) {
	case string:
		var b strings.Builder
		b.WriteByte('"')
		for _, r := range x {
			switch {
			case r == '"' || r == '\\':
				b.WriteByte('\\')
				b.WriteRune(r)
			case r < 0x20 || r == 0x7f:
				fmt.Fprintf(&b, "\\u%04X", r)
			default:
				b.WriteRune(r)
			}
		}
		b.WriteByte('"')
		return b.String()
	case float64:
		s := strconv.FormatFloat(x, 'g', -1, 64)
		if !strings.ContainsAny(s, ".eEn") { // keep it a float: 5 -> 5.0
			s += ".0"
		}
		return s
	case int64:
		return strconv.FormatInt(x, 10)
	case bool:
		return strconv.FormatBool(x)
	}
	panic(fmt.Sprintf("tomlLiteral: %T", v))
}

// pointScenario builds and checks one point's scenario.
func pointScenario(baseSource string, tp *template, axes []Axis, idx []int, point int) (*scenarios.Scenario, error) {
	values := make([]string, len(axes))
	for k, ax := range axes {
		values[k] = ax.Values[idx[k]].Text
	}
	name := fmt.Sprintf("scan point %d of %s (%s)", point, baseSource, assignment(axes, idx))
	sc, err := scenarios.Parse(name, tp.text(values))
	var probs scenarios.Problems
	if errors.As(err, &probs) {
		// Lines of the generated text mean nothing to the user: drop them.
		out := make(scenarios.Problems, len(probs))
		for k, p := range probs {
			q := *p
			q.Line = 0
			out[k] = &q
		}
		return nil, out
	}
	return sc, err
}

// assignment describes a point: "kernel.yukawa.lambda = 0.1 au, body.Tiber.e = 0.2".
func assignment(axes []Axis, idx []int) string {
	parts := make([]string, len(axes))
	for k, ax := range axes {
		parts[k] = ax.Path + " = " + ax.Values[idx[k]].Text
	}
	return strings.Join(parts, ", ")
}
