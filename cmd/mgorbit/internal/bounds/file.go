package bounds

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"math"
	"os"
	"sort"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"

	"mgorbit/scenarios"
	"mgorbit/scenarios/units"
)

// Kind tells a measurement from a limit.
type Kind string

const (
	// Measurement is value ± sigma, judged two-sided.
	Measurement Kind = "measurement"
	// Limit is an upper and/or lower limit, judged one-sided.
	Limit Kind = "limit"
)

// Rule says how several bounds combine into one verdict.
type Rule string

const (
	// Each excludes a point that any bound excludes at its own confidence.
	Each Rule = "each"
	// ChiSquare sums the measurements' squared pulls against the chi-square
	// quantile of as many degrees of freedom; limits apply one by one.
	ChiSquare Rule = "chi-square"
)

// DefaultConfidence is used where a file states none (common practice).
const DefaultConfidence = 0.95

// Bound is one [[bound]] table of a bounds file.
type Bound struct {
	// Name labels the bound in columns (bound_NAME_pull) and messages.
	Name string
	// Observable is a numeric column of the scan table, in its unit.
	Observable string
	// Body selects that body's rows ("" when the observable does not
	// depend on the body, or the scan has one body).
	Body string
	// Scenario, when set, restricts the bound to scans of that scenario.
	Scenario string
	Kind     Kind
	// Value and Sigma (1 sigma) of a measurement; NaN for a limit.
	Value, Sigma float64
	// Upper and Lower of a limit; NaN where absent.
	Upper, Lower float64
	// Confidence is the level in (0, 1); ConfidenceDefault is set when the
	// file gave none.
	Confidence        float64
	ConfidenceDefault bool
	// Impact is the impact parameter (m) a light observable was measured
	// at (0: not stated), Source the body the light passed ("" the first
	// massive one).
	Impact     float64
	ImpactText string
	Source     string
	Note       string

	index int            // from 1, as the file counts [[bound]] tables
	lines map[string]int // the file's key lines, for messages
	file  string
}

// Set is a parsed bounds file.
type Set struct {
	File, Text, Hash string
	Bounds           []*Bound
	Rule             Rule
	// Confidence is the chi-square test's level.
	Confidence        float64
	ConfidenceDefault bool
	lines             map[string]int
}

// K is a measurement's two-sided normal quantile Phi^-1((1 + CL)/2): a
// point is excluded beyond k sigma.
func (b *Bound) K() float64 { return TwoSidedK(b.Confidence) }

// Z is the one-sided normal quantile Phi^-1(CL), a limit's allowance for
// the integration error.
func (b *Bound) Z() float64 { return OneSidedZ(b.Confidence) }

// Field is the bound's key path in messages: bound[2].sigma.
func (b *Bound) Field(key string) string {
	f := fmt.Sprintf("bound[%d]", b.index)
	if key != "" {
		f += "." + key
	}
	return f
}

// Problem locates a message at one of the bound's keys.
func (b *Bound) Problem(key string, value any, format string, args ...any) *scenarios.Problem {
	p := &scenarios.Problem{File: b.file, Field: b.Field(key), Msg: fmt.Sprintf(format, args...)}
	if value != nil {
		p.Value = scenarios.TOMLText(value)
	}
	p.Line = b.lines[b.Field(key)]
	if p.Line == 0 {
		p.Line = b.lines[b.Field("")]
	}
	return p
}

// Describe says what the bound is in a few words.
func (b *Bound) Describe() string {
	var s string
	if b.Kind == Measurement {
		s = fmt.Sprintf("%s = %s ± %s", b.Observable, num(b.Value), num(b.Sigma))
	} else {
		var parts []string
		if !math.IsNaN(b.Lower) {
			parts = append(parts, num(b.Lower)+" <=")
		}
		parts = append(parts, b.Observable)
		if !math.IsNaN(b.Upper) {
			parts = append(parts, "<= "+num(b.Upper))
		}
		s = strings.Join(parts, " ")
	}
	cl := "CL " + num(b.Confidence)
	if b.ConfidenceDefault {
		cl += " (default)"
	}
	if b.Kind == Measurement {
		cl += fmt.Sprintf(", excluded beyond %.4g sigma", b.K())
	}
	s += " (" + cl + ")"
	if b.Body != "" {
		s += ", body " + b.Body
	}
	if b.Impact > 0 {
		s += ", at b = " + b.ImpactText
	}
	return s
}

func num(x float64) string { return strconv.FormatFloat(x, 'g', 6, 64) }

// Load reads and checks a bounds file.
func Load(path string) (*Set, error) {
	text, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("bounds file %s: %w", path, err)
	}
	return Parse(path, text)
}

// Parse checks a bounds file's text; name stands for the file in
// messages. Every problem is reported at once, as scenarios.Problems.
func Parse(name string, text []byte) (*Set, error) {
	sum := sha256.Sum256(text)
	set := &Set{File: name, Text: string(text), Hash: hex.EncodeToString(sum[:]), lines: scenarios.LocateKeys(string(text))}
	var probs scenarios.Problems
	add := func(field string, value any, format string, args ...any) {
		p := &scenarios.Problem{File: name, Field: field, Line: set.line(field), Msg: fmt.Sprintf(format, args...)}
		if value != nil {
			p.Value = scenarios.TOMLText(value)
		}
		probs = append(probs, p)
	}
	var doc map[string]any
	if _, err := toml.Decode(string(text), &doc); err != nil {
		var pe toml.ParseError
		if errors.As(err, &pe) {
			return nil, scenarios.Problems{{File: name, Line: pe.Position.Line, Field: pe.LastKey, Msg: "TOML syntax: " + pe.Message}}
		}
		return nil, scenarios.Problems{{File: name, Msg: "TOML: " + err.Error()}}
	}
	for _, k := range sortedKeys(doc) {
		if k != "bound" && k != "combine" {
			add(k, nil, "unknown key (a bounds file has [[bound]] tables and an optional [combine] table)")
		}
	}
	set.Rule, set.Confidence, set.ConfidenceDefault = Each, DefaultConfidence, true
	if c, ok := doc["combine"]; ok {
		m, ok := c.(map[string]any)
		if !ok {
			add("combine", c, "must be a table: [combine] with rule and confidence")
		} else {
			for _, k := range sortedKeys(m) {
				v := m[k]
				switch k {
				case "rule":
					s, _ := v.(string)
					switch Rule(s) {
					case Each, ChiSquare:
						set.Rule = Rule(s)
					default:
						add("combine.rule", v, "allowed: %q (excluded if any bound excludes, the default) or %q (sum of squared pulls against the chi-square quantile)", Each, ChiSquare)
					}
				case "confidence":
					if x, err := confidence(v); err != nil {
						add("combine.confidence", v, "%v", err)
					} else {
						set.Confidence, set.ConfidenceDefault = x, false
					}
				default:
					add("combine."+k, nil, "unknown key (allowed in [combine]: rule, confidence)")
				}
			}
		}
	}
	raw, ok := doc["bound"]
	list, isList := raw.([]map[string]any)
	switch {
	case !ok:
		add("", nil, "no [[bound]] tables: write at least one, with name, observable, and value and sigma (or upper / lower)")
	case !isList:
		add("bound", raw, "must be an array of tables, written [[bound]]")
	}
	seen := map[string]int{}
	for i, m := range list {
		b := &Bound{index: i + 1, lines: set.lines, file: name, Value: math.NaN(), Sigma: math.NaN(), Upper: math.NaN(), Lower: math.NaN()}
		ps := b.parse(m)
		probs = append(probs, ps...)
		if b.Name != "" {
			col := ColumnStem(b.Name)
			if j, dup := seen[col]; dup {
				probs = append(probs, b.Problem("name", b.Name, "bound[%d] already has this name (or one that makes the same column name, bound_%s_...): names must differ", j, col))
			}
			seen[col] = i + 1
		}
		set.Bounds = append(set.Bounds, b)
	}
	if len(probs) > 0 {
		sort.SliceStable(probs, func(i, j int) bool {
			li, lj := probs[i].Line, probs[j].Line
			if li == 0 || lj == 0 {
				return li != 0 && lj == 0
			}
			return li < lj
		})
		return nil, probs
	}
	return set, nil
}

func (s *Set) line(field string) int {
	for f := field; f != ""; {
		if n, ok := s.lines[f]; ok {
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

// boundKeys are the keys a [[bound]] table may have.
var boundKeys = []string{"name", "observable", "body", "scenario", "value", "sigma", "upper", "lower", "confidence", "impact", "source", "note"}

func (b *Bound) parse(m map[string]any) scenarios.Problems {
	var probs scenarios.Problems
	add := func(key string, v any, format string, args ...any) {
		probs = append(probs, b.Problem(key, v, format, args...))
	}
	str := func(key string) string {
		v, ok := m[key]
		if !ok {
			return ""
		}
		s, isStr := v.(string)
		if !isStr {
			add(key, v, "must be a string in quotes")
		}
		return strings.TrimSpace(s)
	}
	number := func(key string) (float64, bool) {
		v, ok := m[key]
		if !ok {
			return math.NaN(), false
		}
		x, err := finite(v)
		if err != nil {
			add(key, v, "%v (a plain number in the observable's unit, which its column name carries)", err)
			return math.NaN(), false
		}
		return x, true
	}
	for _, k := range sortedKeys(m) {
		if !contains(boundKeys, k) {
			add(k, nil, "unknown key (allowed: %s)", strings.Join(boundKeys, ", "))
		}
	}
	b.Name = str("name")
	if _, ok := m["name"]; !ok {
		add("", nil, "has no name: give each bound a name such as \"tiber-perihelion\" (it names the columns bound_NAME_pull)")
	} else if _, isStr := m["name"].(string); isStr && !validName(b.Name) {
		add("name", b.Name, "letters, digits, '-' and '_' only, starting with a letter")
	}
	b.Observable = str("observable")
	if v, ok := m["observable"]; !ok {
		add("", nil, "has no observable: name the scan column it bounds, e.g. \"anomaly_arcsec_per_century\" or \"gamma_deflection_minus_1\"")
	} else if _, isStr := v.(string); isStr && b.Observable == "" {
		add("observable", v, "must name a scan column, e.g. \"anomaly_arcsec_per_century\"")
	}
	b.Body, b.Scenario, b.Source, b.Note = str("body"), str("scenario"), str("source"), str("note")

	value, hasValue := number("value")
	sigma, hasSigma := number("sigma")
	upper, hasUpper := number("upper")
	lower, hasLower := number("lower")
	_, wroteValue := m["value"]
	_, wroteSigma := m["sigma"]
	_, wroteUpper := m["upper"]
	_, wroteLower := m["lower"]
	switch {
	case (wroteValue || wroteSigma) && (wroteUpper || wroteLower):
		add("", nil, "give either value and sigma (a measurement) or upper and/or lower (a limit), not both")
	case wroteValue || wroteSigma:
		b.Kind = Measurement
		switch {
		case !wroteSigma:
			add("value", m["value"], "needs sigma, its 1-sigma uncertainty (for a one-sided limit write upper = or lower = instead)")
		case !wroteValue:
			add("sigma", m["sigma"], "needs value, the measured value (0 for a residual consistent with none)")
		case hasSigma && !(sigma > 0):
			add("sigma", m["sigma"], "must be positive")
		}
		if hasValue && hasSigma {
			b.Value, b.Sigma = value, sigma
		}
	case wroteUpper || wroteLower:
		b.Kind = Limit
		if hasUpper {
			b.Upper = upper
		}
		if hasLower {
			b.Lower = lower
		}
		if hasUpper && hasLower && !(lower < upper) {
			add("lower", m["lower"], "must be below upper = %s", num(upper))
		}
	default:
		add("", nil, "has neither value and sigma (a measurement) nor upper / lower (a limit)")
	}

	b.Confidence, b.ConfidenceDefault = DefaultConfidence, true
	if v, ok := m["confidence"]; ok {
		if x, err := confidence(v); err != nil {
			add("confidence", v, "%v", err)
		} else {
			b.Confidence, b.ConfidenceDefault = x, false
		}
	}
	if v, ok := m["impact"]; ok {
		s, isStr := v.(string)
		x, err := units.ParseAs(s, units.Length)
		switch {
		case !isStr:
			add("impact", v, "must be a length with a unit, in quotes, e.g. \"1.6 Rsun\"")
		case err != nil:
			add("impact", v, "%v (a length with a unit, e.g. \"1.6 Rsun\")", err)
		case !(x > 0):
			add("impact", v, "must be a positive length")
		default:
			b.Impact, b.ImpactText = x, strings.TrimSpace(s)
		}
	}
	return probs
}

// confidence reads a confidence level.
func confidence(v any) (float64, error) {
	x, err := finite(v)
	if err != nil {
		return 0, fmt.Errorf("%v (a confidence level between 0 and 1, e.g. 0.95)", err)
	}
	if !(x > 0 && x < 1) {
		return 0, fmt.Errorf("must lie strictly between 0 and 1 (0.6827 is 1 sigma, 0.95 about 1.96 sigma)")
	}
	return x, nil
}

func finite(v any) (float64, error) {
	var x float64
	switch n := v.(type) {
	case float64:
		x = n
	case int64:
		x = float64(n)
	default:
		return 0, fmt.Errorf("must be a number")
	}
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return 0, fmt.Errorf("must be a finite number")
	}
	return x, nil
}

func validName(s string) bool {
	for i, r := range s {
		letter := r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z'
		if i == 0 && !letter {
			return false
		}
		if !letter && !(r >= '0' && r <= '9') && r != '-' && r != '_' {
			return false
		}
	}
	return s != ""
}

// ColumnStem is a bound's name in column names: lower case, '-' as '_'.
func ColumnStem(name string) string {
	return strings.ReplaceAll(strings.ToLower(name), "-", "_")
}

func sortedKeys[V any](m map[string]V) []string {
	ks := make([]string, 0, len(m))
	for k := range m {
		ks = append(ks, k)
	}
	sort.Strings(ks)
	return ks
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}
