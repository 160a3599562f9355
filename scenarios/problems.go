package scenarios

import (
	"fmt"
	"sort"
	"strconv"
	"strings"
)

// Problem is one thing wrong with a scenario, located by file, line and
// field path (body[2].e is the e of the second [[body]] table; counts start
// at 1, as a reader counts tables in the file).
type Problem struct {
	File string
	// Line is the TOML line, 0 when not known.
	Line int
	// Field is the path of the offending key, "" for the scenario as a whole.
	Field string
	// Value is the value as written (TOML syntax), "" when absent.
	Value string
	// Msg says what is wrong and what is allowed.
	Msg string
}

func (p *Problem) Error() string {
	var b strings.Builder
	b.WriteString(p.File)
	if p.Line > 0 {
		b.WriteString(":" + strconv.Itoa(p.Line))
	}
	b.WriteString(": ")
	if p.Field != "" {
		b.WriteString(p.Field)
		if p.Value != "" {
			b.WriteString(" = " + p.Value)
		}
		b.WriteString(": ")
	}
	b.WriteString(p.Msg)
	return b.String()
}

// Problems is every problem found in one scenario, in file order. Load and
// Parse return it as their error, so all mistakes are reported at once.
type Problems []*Problem

func (ps Problems) Error() string {
	lines := make([]string, len(ps))
	for i, p := range ps {
		lines[i] = p.Error()
	}
	return strings.Join(lines, "\n")
}

// report collects problems for one file.
type report struct {
	file  string
	lines map[string]int
	list  Problems
}

// add records a problem at field (value v as written, nil when absent).
func (r *report) add(field string, v any, format string, args ...any) {
	p := &Problem{File: r.file, Field: field, Line: r.line(field), Msg: fmt.Sprintf(format, args...)}
	if v != nil {
		p.Value = tomlText(v)
	}
	r.list = append(r.list, p)
}

func (r *report) failed() bool { return len(r.list) > 0 }

func (r *report) err() error {
	if len(r.list) == 0 {
		return nil
	}
	sort.SliceStable(r.list, func(i, j int) bool {
		li, lj := r.list[i].Line, r.list[j].Line
		if li == 0 || lj == 0 { // unlocated problems go last
			return li != 0 && lj == 0
		}
		return li < lj
	})
	return r.list
}

// line finds the TOML line of field, or of the nearest enclosing table.
func (r *report) line(field string) int {
	for f := field; f != ""; {
		if n, ok := r.lines[f]; ok {
			return n
		}
		i := strings.LastIndexByte(f, '.')
		if i < 0 {
			break
		}
		f = f[:i]
	}
	return 0
}

// rawText is shown in messages as it is (for values the file did not write,
// such as defaults).
type rawText string

// tomlText writes a decoded TOML value back in TOML syntax for messages.
func tomlText(v any) string {
	switch x := v.(type) {
	case rawText:
		return string(x)
	case string:
		return strconv.Quote(x)
	case float64:
		return strconv.FormatFloat(x, 'g', -1, 64)
	case int64:
		return strconv.FormatInt(x, 10)
	case bool:
		return strconv.FormatBool(x)
	case []any:
		parts := make([]string, len(x))
		for i, e := range x {
			parts[i] = tomlText(e)
		}
		return "[" + strings.Join(parts, ", ") + "]"
	case map[string]any, []map[string]any:
		return "{...}"
	}
	return fmt.Sprint(v)
}

// locateKeys maps field paths (name, integrator.method, body[2], body[2].e)
// to the line where the file writes them. BurntSushi/toml reports lines
// only for syntax errors, so this light scan of the text supplies them for
// everything else. It understands table headers, array-of-table headers,
// key lines and multi-line strings; anything it misses simply has no line.
func locateKeys(text string) map[string]int {
	out := map[string]int{}
	count := map[string]int{}
	table := ""
	closing := "" // the delimiter of an open multi-line string
	for n, raw := range strings.Split(text, "\n") {
		ln := n + 1
		s := strings.TrimSpace(raw)
		if closing != "" {
			if strings.Count(s, closing)%2 == 1 {
				closing = ""
			}
			continue
		}
		if s == "" || s[0] == '#' {
			continue
		}
		if strings.HasPrefix(s, "[[") {
			if end := strings.Index(s, "]]"); end > 0 {
				name := keyPath(s[2:end])
				count[name]++
				table = name + "[" + strconv.Itoa(count[name]) + "]"
				setFirst(out, table, ln)
			}
			continue
		}
		if s[0] == '[' {
			if end := strings.IndexByte(s, ']'); end > 0 {
				table = keyPath(s[1:end])
				setFirst(out, table, ln)
			}
			continue
		}
		eq := strings.IndexByte(s, '=')
		if eq <= 0 || !isKeyText(s[:eq]) {
			continue
		}
		key := keyPath(s[:eq])
		if table != "" {
			key = table + "." + key
		}
		setFirst(out, key, ln)
		rest := s[eq+1:]
		for _, d := range []string{`"""`, `'''`} {
			if strings.Count(rest, d)%2 == 1 {
				closing = d
			}
		}
	}
	return out
}

func setFirst(m map[string]int, k string, v int) {
	if _, ok := m[k]; !ok {
		m[k] = v
	}
}

// isKeyText reports whether s can be a (dotted, possibly quoted) TOML key.
func isKeyText(s string) bool {
	inQuote := byte(0)
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case inQuote != 0:
			if c == inQuote {
				inQuote = 0
			}
		case c == '"' || c == '\'':
			inQuote = c
		case c == '.' || c == ' ' || c == '\t' || c == '_' || c == '-' ||
			c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9':
		default:
			return false
		}
	}
	return inQuote == 0 && strings.TrimSpace(s) != ""
}

// keyPath normalises a written key: parts trimmed, quotes removed.
func keyPath(s string) string {
	parts := strings.Split(s, ".")
	for i, p := range parts {
		p = strings.TrimSpace(p)
		if len(p) >= 2 && (p[0] == '"' || p[0] == '\'') && p[len(p)-1] == p[0] {
			p = p[1 : len(p)-1]
		}
		parts[i] = p
	}
	return strings.Join(parts, ".")
}

// TOMLText writes a decoded TOML value back in TOML syntax, for messages
// about other TOML files the project reads (bounds files).
func TOMLText(v any) string { return tomlText(v) }

// LocateKeys maps field paths (table.key, array[2], array[2].key) to the
// line of text that writes them, for messages about other TOML files.
func LocateKeys(text string) map[string]int { return locateKeys(text) }
