package units

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
)

// Dim is a physical dimension as exponents of length, time, rest energy and
// angle. A mass is a gravitational parameter GM, so it is L^3 T^-2.
type Dim struct{ L, T, E, A int8 }

// The dimensions the scenario schema uses.
var (
	Dimensionless = Dim{}
	Length        = Dim{L: 1}
	Time          = Dim{T: 1}
	Mass          = Dim{L: 3, T: -2} // as GM
	Speed         = Dim{L: 1, T: -1}
	Energy        = Dim{E: 1} // a mediator's rest energy, in eV
	Angle         = Dim{A: 1}
)

// String names the dimension the way an error message should.
func (d Dim) String() string {
	switch d {
	case Dimensionless:
		return "dimensionless"
	case Length:
		return "length"
	case Time:
		return "time"
	case Mass:
		return "mass"
	case Speed:
		return "speed"
	case Energy:
		return "energy"
	case Angle:
		return "angle"
	}
	return fmt.Sprintf("L^%d T^%d E^%d A^%d", d.L, d.T, d.E, d.A)
}

func (d Dim) mul(o Dim, sign int8) Dim {
	return Dim{d.L + sign*o.L, d.T + sign*o.T, d.E + sign*o.E, d.A + sign*o.A}
}

func (d Dim) pow(n int8) Dim { return Dim{d.L * n, d.T * n, d.E * n, d.A * n} }

type unit struct {
	factor float64 // SI value of one unit (GM for masses, eV for energies, rad for angles)
	dim    Dim
}

// table lists every unit name the parser knows, with its SI factor and source.
var table = map[string]unit{
	// length
	"m":   {1, Length},
	"cm":  {1e-2, Length},
	"mm":  {1e-3, Length},
	"km":  {1e3, Length},
	"au":  {AU, Length},
	"pc":  {Parsec, Length},
	"kpc": {1e3 * Parsec, Length},
	"Mpc": {1e6 * Parsec, Length},
	"Gpc": {1e9 * Parsec, Length},
	"ly":  {C * JulianYear, Length}, // IAU: light-year with the Julian year
	// nominal solar radius, IAU 2015 Resolution B3
	"Rsun": {6.957e8, Length},
	// time
	"s":       {1, Time},
	"min":     {60, Time},
	"h":       {3600, Time},
	"d":       {Day, Time},
	"yr":      {JulianYear, Time},
	"kyr":     {1e3 * JulianYear, Time},
	"Myr":     {1e6 * JulianYear, Time},
	"century": {JulianCentury, Time},
	// mass, as GM
	"kg":   {G, Mass},
	"g":    {G * 1e-3, Mass},
	"Msun": {GMSun, Mass},
	// nominal terrestrial and jovian GM, IAU 2015 Resolution B3 (memory)
	"Mearth": {3.986004e14, Mass},
	"Mjup":   {1.2668653e17, Mass},
	// rest energy, in eV
	"eV":  {1, Energy},
	"meV": {1e-3, Energy},
	"keV": {1e3, Energy},
	"MeV": {1e6, Energy},
	"GeV": {1e9, Energy},
	// angle
	"rad":    {1, Angle},
	"deg":    {math.Pi / 180, Angle},
	"arcmin": {math.Pi / 180 / 60, Angle},
	"arcsec": {1 / ArcsecPerRad, Angle},
	"mas":    {1e-3 / ArcsecPerRad, Angle},
	"uas":    {1e-6 / ArcsecPerRad, Angle},
}

// UnitNames lists the known unit names, sorted, for help texts.
func UnitNames() []string {
	names := make([]string, 0, len(table))
	for n := range table {
		names = append(names, n)
	}
	sort.Strings(names)
	return names
}

// Quantity is a parsed value in SI (GM for masses, eV for energies, radians
// for angles) with its dimension.
type Quantity struct {
	Value float64
	Dim   Dim
}

// Parse reads "NUMBER [UNIT]" where UNIT is a product of known units with
// optional integer powers, joined by '*' or '/', e.g. "30 km/s", "1e-23 eV",
// "1.2 Msun", "3 Gpc", "0.5", "1 m^3/s^2". A bare number is dimensionless.
// Non-finite numbers are refused: a scenario never means infinity by accident.
func Parse(s string) (Quantity, error) {
	t := strings.TrimSpace(s)
	if t == "" {
		return Quantity{}, fmt.Errorf("empty quantity")
	}
	// the number is the longest prefix that parses as a float
	end := numberEnd(t)
	if end == 0 {
		if w := strings.ToLower(strings.TrimLeft(t, "+-")); strings.HasPrefix(w, "nan") || strings.HasPrefix(w, "inf") {
			return Quantity{}, fmt.Errorf("%q: the number is not finite (NaN and infinity are not allowed)", s)
		}
		return Quantity{}, fmt.Errorf("%q does not start with a number", s)
	}
	v, err := strconv.ParseFloat(t[:end], 64)
	if errors.Is(err, strconv.ErrRange) {
		return Quantity{}, fmt.Errorf("%q: the number %s is out of the float64 range", s, t[:end])
	}
	if err != nil {
		return Quantity{}, fmt.Errorf("%q: bad number %q", s, t[:end])
	}
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return Quantity{}, fmt.Errorf("%q: the number is not finite", s)
	}
	factor, dim, err := parseUnit(strings.TrimSpace(t[end:]))
	if err != nil {
		return Quantity{}, fmt.Errorf("%q: %v", s, err)
	}
	q := Quantity{Value: v * factor, Dim: dim}
	if math.IsInf(q.Value, 0) || (q.Value == 0 && v != 0) {
		return Quantity{}, fmt.Errorf("%q: out of the float64 range after conversion to SI", s)
	}
	return q, nil
}

// ParseAs parses s and checks that it has dimension want.
func ParseAs(s string, want Dim) (float64, error) {
	q, err := Parse(s)
	if err != nil {
		return 0, err
	}
	if q.Dim != want {
		if q.Dim == Dimensionless {
			return 0, fmt.Errorf("%q has no unit; a %s needs one (for example %s)", s, want, Example(want))
		}
		return 0, fmt.Errorf("%q has the dimension of %s, but %s is needed (for example %s)", s, q.Dim, want, Example(want))
	}
	return q.Value, nil
}

// Example gives a sample quantity of a dimension, for error messages.
func Example(d Dim) string {
	switch d {
	case Length:
		return `"0.39 au", "3 Gpc" or "1e9 m"`
	case Time:
		return `"88 d", "10 yr" or "3600 s"`
	case Mass:
		return `"1.2 Msun" or "6e24 kg"`
	case Speed:
		return `"30 km/s" or "0.01 au/d"`
	case Energy:
		return `"1e-23 eV"`
	case Angle:
		return `"7 deg", "0.1 rad" or "43 arcsec"`
	case Dimensionless:
		return `"0.5"`
	}
	return "a number with a unit"
}

func numberEnd(t string) int {
	i := 0
	if i < len(t) && (t[i] == '+' || t[i] == '-') {
		i++
	}
	digits := false
	for i < len(t) && (t[i] >= '0' && t[i] <= '9' || t[i] == '.') {
		if t[i] != '.' {
			digits = true
		}
		i++
	}
	if !digits {
		return 0
	}
	if i < len(t) && (t[i] == 'e' || t[i] == 'E') {
		j := i + 1
		if j < len(t) && (t[j] == '+' || t[j] == '-') {
			j++
		}
		k := j
		for k < len(t) && t[k] >= '0' && t[k] <= '9' {
			k++
		}
		if k > j { // only a real exponent; "1 eV" keeps its "e"... handled by the space
			i = k
		}
	}
	return i
}

func parseUnit(u string) (float64, Dim, error) {
	if u == "" {
		return 1, Dimensionless, nil
	}
	factor, dim := 1.0, Dimensionless
	sign := int8(1)
	rest := u
	for {
		rest = strings.TrimSpace(rest)
		j := strings.IndexAny(rest, "*/")
		tok := rest
		if j >= 0 {
			tok = rest[:j]
		}
		tok = strings.TrimSpace(tok)
		if tok == "" {
			return 0, Dim{}, fmt.Errorf("malformed unit %q", u)
		}
		name, pow := tok, int8(1)
		if k := strings.IndexByte(tok, '^'); k >= 0 {
			name = tok[:k]
			p, err := strconv.ParseInt(tok[k+1:], 10, 8)
			if err != nil || p == 0 || p > 6 || p < -6 {
				return 0, Dim{}, fmt.Errorf("bad power in unit %q (allowed: whole numbers from -6 to 6)", tok)
			}
			pow = int8(p)
		}
		un, ok := table[name]
		if !ok {
			return 0, Dim{}, fmt.Errorf("unknown unit %q (known: %s)", name, strings.Join(UnitNames(), " "))
		}
		f := math.Pow(un.factor, float64(pow))
		if sign > 0 {
			factor *= f
		} else {
			factor /= f
		}
		dim = dim.mul(un.dim.pow(pow), sign)
		if !dim.within(MaxExponent) {
			return 0, Dim{}, fmt.Errorf("unit %q: a dimension exponent beyond %d is not a physical quantity", u, MaxExponent)
		}
		if j < 0 {
			break
		}
		if rest[j] == '/' {
			sign = -1
		} else {
			sign = 1
		}
		rest = rest[j+1:]
	}
	// 0 or Inf would turn the number into 0, Inf or NaN (0 * Inf)
	if factor == 0 || math.IsInf(factor, 0) {
		return 0, Dim{}, fmt.Errorf("unit %q is out of the float64 range in SI", u)
	}
	return factor, dim, nil
}

// MaxExponent bounds each exponent of a parsed unit's dimension (the
// int8 exponents would otherwise wrap round).
const MaxExponent = 24

func (d Dim) within(n int8) bool {
	in := func(x int8) bool { return x >= -n && x <= n }
	return in(d.L) && in(d.T) && in(d.E) && in(d.A)
}

// Format writes an SI value with its dimension's SI unit so that Parse reads
// it back to the same float64 (used by the fuzz round trip and metadata).
func Format(q Quantity) string {
	v := strconv.FormatFloat(q.Value, 'g', -1, 64)
	switch q.Dim {
	case Dimensionless:
		return v
	case Length:
		return v + " m"
	case Time:
		return v + " s"
	case Speed:
		return v + " m/s"
	case Energy:
		return v + " eV"
	case Angle:
		return v + " rad"
	}
	var parts []string
	add := func(name string, p int8) {
		// Parse takes powers up to 6 per factor: write m^14 as m^6*m^6*m^2
		for p > 6 || p < -6 {
			step := int8(6)
			if p < 0 {
				step = -6
			}
			parts = append(parts, name+"^"+strconv.Itoa(int(step)))
			p -= step
		}
		if p == 1 {
			parts = append(parts, name)
		} else if p != 0 {
			parts = append(parts, name+"^"+strconv.Itoa(int(p)))
		}
	}
	// GM-valued masses and other compounds in base units (m, s, eV, rad)
	add("m", q.Dim.L)
	add("s", q.Dim.T)
	add("eV", q.Dim.E)
	add("rad", q.Dim.A)
	if len(parts) == 0 {
		return v
	}
	return v + " " + strings.Join(parts, "*")
}
