package scan

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode"

	"mgorbit/scenarios/units"
)

// Grid kinds.
const (
	Linear      = "lin"
	Logarithmic = "log"
	List        = "list"
)

// Axis is one swept quantity and the values it takes.
type Axis struct {
	// Path addresses the value in the scenario document: body.NAME.KEY,
	// kernel.NAME.KEY (or kernel.N.KEY, N counting [[kernel]] tables from
	// 1) or integrator.KEY.
	Path string
	// Kind is Linear, Logarithmic or List; Spec is the grid as written.
	Kind, Spec string
	Values     []Value
	// Numeric axes have a number in every value (SI in Value.SI); the
	// others are words such as a kernel's choice parameter.
	Numeric bool
	Dim     units.Dim
	// Unit is the unit the values are written in ("" for plain numbers or
	// when the values use different units).
	Unit string
}

// Value is one grid value.
type Value struct {
	// Text is what goes into the scenario: "0.1 au", "0.005", "spin2".
	Text string
	// SI is Text read by the scenario's own unit parser (NaN for words).
	SI float64
	// InUnit is the number in Axis.Unit (NaN when the axis has no unit).
	InUnit float64
}

// ParseSweep reads PATH=GRID with GRID one of
//
//	lin:START:STOP:N   N values evenly spaced from START to STOP
//	log:START:STOP:N   N values evenly spaced in the logarithm
//	list:V1,V2,...     the values as given (numbers with units, or words)
//
// START and STOP are quantities such as "0.1 au" or "0.5"; a unit given on
// only one of them holds for both.
func ParseSweep(s string) (Axis, error) {
	eq := strings.IndexByte(s, '=')
	if eq < 0 {
		return Axis{}, fmt.Errorf("sweep %q: expected PATH=GRID, e.g. 'kernel.yukawa.lambda=log:0.1 au:100 au:40'", s)
	}
	ax := Axis{Path: strings.TrimSpace(s[:eq]), Spec: strings.TrimSpace(s[eq+1:])}
	if err := checkPath(ax.Path); err != nil {
		return Axis{}, fmt.Errorf("sweep %q: %v", s, err)
	}
	kind, rest, ok := strings.Cut(ax.Spec, ":")
	if !ok {
		return Axis{}, fmt.Errorf("sweep %q: grid %q has no kind; write lin:START:STOP:N, log:START:STOP:N or list:V1,V2,...", s, ax.Spec)
	}
	ax.Kind = strings.TrimSpace(kind)
	var err error
	switch ax.Kind {
	case Linear, Logarithmic:
		err = ax.parseRange(rest)
	case List:
		err = ax.parseList(rest)
	default:
		err = fmt.Errorf("unknown grid kind %q (lin, log or list)", ax.Kind)
	}
	if err != nil {
		return Axis{}, fmt.Errorf("sweep %s: %v", ax.Path, err)
	}
	return ax, nil
}

func checkPath(p string) error {
	parts := strings.Split(p, ".")
	bad := func() error {
		return fmt.Errorf("path %q: expected body.NAME.KEY, kernel.NAME.KEY (or kernel.N.KEY) or integrator.KEY", p)
	}
	for _, x := range parts {
		if x == "" {
			return bad()
		}
	}
	switch {
	case len(parts) == 3 && (parts[0] == "body" || parts[0] == "kernel"):
	case len(parts) == 2 && parts[0] == "integrator":
	default:
		return bad()
	}
	return nil
}

// quantityText splits "0.1 au" into its number and unit text.
func quantityText(s string) (num float64, unit string, err error) {
	s = strings.TrimSpace(s)
	end := 0
	for end < len(s) {
		c := s[end]
		if c >= '0' && c <= '9' || c == '.' || c == '+' || c == '-' ||
			(c == 'e' || c == 'E') && end > 0 && end+1 < len(s) && strings.ContainsRune("0123456789+-", rune(s[end+1])) {
			end++
			continue
		}
		break
	}
	num, err = strconv.ParseFloat(s[:end], 64)
	if err != nil || math.IsInf(num, 0) || math.IsNaN(num) {
		return 0, "", fmt.Errorf("%q does not start with a finite number", s)
	}
	return num, strings.TrimSpace(s[end:]), nil
}

// unitFactor is the SI value of one unit (1 for none), by the scenario parser.
func unitFactor(unit string) (float64, units.Dim, error) {
	if unit == "" {
		return 1, units.Dimensionless, nil
	}
	q, err := units.Parse("1 " + unit)
	if err != nil {
		return 0, units.Dim{}, err
	}
	return q.Value, q.Dim, nil
}

func (ax *Axis) parseRange(rest string) error {
	f := strings.Split(rest, ":")
	if len(f) != 3 {
		return fmt.Errorf("%s grid %q: expected %s:START:STOP:N", ax.Kind, ax.Spec, ax.Kind)
	}
	a, ua, err := quantityText(f[0])
	if err != nil {
		return fmt.Errorf("start: %v", err)
	}
	b, ub, err := quantityText(f[1])
	if err != nil {
		return fmt.Errorf("stop: %v", err)
	}
	n, err := strconv.Atoi(strings.TrimSpace(f[2]))
	if err != nil || n < 1 {
		return fmt.Errorf("count %q: must be a whole number of at least 1", strings.TrimSpace(f[2]))
	}
	if ua == "" {
		ua = ub
	}
	if ub == "" {
		ub = ua
	}
	fa, da, err := unitFactor(ua)
	if err != nil {
		return fmt.Errorf("start: %v", err)
	}
	fb, db, err := unitFactor(ub)
	if err != nil {
		return fmt.Errorf("stop: %v", err)
	}
	if da != db {
		return fmt.Errorf("start is a %s but stop a %s", da, db)
	}
	// The grid is made in the start's unit, so its values read as written.
	b = b * fb / fa
	if ax.Kind == Logarithmic && !(a > 0 && b > 0 || a < 0 && b < 0) {
		return fmt.Errorf("a log grid needs START and STOP of the same sign, neither zero (got %v and %v)", a, b)
	}
	ax.Numeric, ax.Dim, ax.Unit = true, da, ua
	for k := 0; k < n; k++ {
		var x float64
		switch {
		case k == 0:
			x = a
		case k == n-1:
			x = b
		case ax.Kind == Linear:
			x = a + (b-a)*float64(k)/float64(n-1)
		default:
			x = a * math.Pow(b/a, float64(k)/float64(n-1))
		}
		// Twelve digits: a grid needs no more, and 0.1 + 0.2 reads as 0.3.
		text := strconv.FormatFloat(x, 'g', 12, 64)
		if ua != "" {
			text += " " + ua
		}
		v, err := numericValue(text, da)
		if err != nil {
			return err
		}
		ax.Values = append(ax.Values, v)
	}
	return nil
}

func (ax *Axis) parseList(rest string) error {
	var items []string
	for _, it := range strings.Split(rest, ",") {
		if it = strings.TrimSpace(it); it == "" {
			return fmt.Errorf("list %q has an empty item", ax.Spec)
		}
		items = append(items, it)
	}
	numeric := 0
	for _, it := range items {
		if _, err := units.Parse(it); err == nil {
			numeric++
		}
	}
	switch numeric {
	case 0:
		for _, it := range items {
			ax.Values = append(ax.Values, Value{Text: it, SI: math.NaN(), InUnit: math.NaN()})
		}
		return nil
	case len(items):
	default:
		return fmt.Errorf("list %q mixes numbers and words", ax.Spec)
	}
	ax.Numeric = true
	first, _ := units.Parse(items[0])
	ax.Dim = first.Dim
	_, ax.Unit, _ = quantityText(items[0])
	for _, it := range items {
		v, err := numericValue(it, ax.Dim)
		if err != nil {
			return err
		}
		if _, u, _ := quantityText(it); u != ax.Unit {
			ax.Unit = "" // mixed units: the SI column alone carries the number
		}
		ax.Values = append(ax.Values, v)
	}
	if ax.Unit == "" && ax.Dim != units.Dimensionless {
		for k := range ax.Values {
			ax.Values[k].InUnit = math.NaN()
		}
	}
	return nil
}

func numericValue(text string, dim units.Dim) (Value, error) {
	q, err := units.Parse(text)
	if err != nil {
		return Value{}, err
	}
	if q.Dim != dim {
		return Value{}, fmt.Errorf("%q is a %s, the other values a %s", text, q.Dim, dim)
	}
	num, _, err := quantityText(text)
	if err != nil {
		return Value{}, err
	}
	return Value{Text: text, SI: q.Value, InUnit: num}, nil
}

// Column names. Every axis has an index and a text column; a numeric axis
// also has its SI value and, when written in another unit, the value in it.

// Name is the path as a column-name stem: body.Tiber.e -> body_tiber_e.
func (ax *Axis) Name() string { return sanitize(ax.Path) }

// IndexColumn holds the value's position on the axis, from 0.
func (ax *Axis) IndexColumn() string { return "sweep_" + ax.Name() + "_index" }

// TextColumn holds the value as written into the scenario.
func (ax *Axis) TextColumn() string { return "sweep_" + ax.Name() + "_text" }

// SIColumn holds the SI value ("" for a word axis).
func (ax *Axis) SIColumn() string {
	if !ax.Numeric {
		return ""
	}
	if ax.Dim == units.Dimensionless {
		return "sweep_" + ax.Name()
	}
	return "sweep_" + ax.Name() + "_" + siUnitName(ax.Dim)
}

// UnitColumn holds the value in the written unit, when that is not SI.
func (ax *Axis) UnitColumn() string {
	if !ax.Numeric || ax.Unit == "" || unitName(ax.Unit) == siUnitName(ax.Dim) {
		return ""
	}
	return "sweep_" + ax.Name() + "_" + unitName(ax.Unit)
}

// PlotColumn is the column to plot against: the written unit's if any.
func (ax *Axis) PlotColumn() string {
	if c := ax.UnitColumn(); c != "" {
		return c
	}
	if c := ax.SIColumn(); c != "" {
		return c
	}
	return ax.IndexColumn()
}

// siUnitName names the SI unit in column names (masses are GM).
func siUnitName(d units.Dim) string {
	switch d {
	case units.Mass:
		return "gm_m3_per_s2"
	case units.Energy:
		return "eV"
	}
	s := strings.TrimPrefix(units.Format(units.Quantity{Value: 1, Dim: d}), "1 ")
	return unitName(s)
}

// unitName writes a unit for a column name: km/s -> km_per_s, m^3 -> m3.
// Case is kept: MeV and meV differ.
func unitName(u string) string {
	u = strings.ReplaceAll(u, "/", "_per_")
	u = strings.ReplaceAll(u, "*", "_")
	u = strings.ReplaceAll(u, "^", "")
	u = strings.ReplaceAll(u, " ", "")
	return strings.ReplaceAll(u, "-", "neg")
}

// sanitize lowercases and turns every other character into '_'.
func sanitize(p string) string {
	var b strings.Builder
	for _, r := range strings.ToLower(p) {
		if r < unicode.MaxASCII && (unicode.IsLetter(r) || unicode.IsDigit(r)) {
			b.WriteRune(r)
		} else {
			b.WriteByte('_')
		}
	}
	return b.String()
}

// ParseSweeps parses several sweeps, one axis each, in order.
func ParseSweeps(sweeps []string) ([]Axis, error) {
	var axes []Axis
	for _, s := range sweeps {
		ax, err := ParseSweep(s)
		if err != nil {
			return nil, err
		}
		axes = append(axes, ax)
	}
	return axes, nil
}
