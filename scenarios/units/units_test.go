package units

import (
	"math"
	"strings"
	"testing"
)

// TestConstants checks each constant against the standard constants.go
// names for it.
func TestConstants(t *testing.T) {
	cases := []struct {
		name      string
		got, want float64
		rel       float64
		src       string
	}{
		{"AU", AU, 149597870700, 0, "IAU 2012 Resolution B2: 149 597 870 700 m exactly"},
		{"C", C, 299792458, 0, "SI: 299 792 458 m/s exactly"},
		{"GMSun", GMSun, 1.3271244e20, 0, "IAU 2015 Resolution B3: nominal 1.327 124 4e20 m^3 s^-2"},
		{"G", G, 6.67430e-11, 0, "CODATA 2018: 6.674 30e-11 m^3 kg^-1 s^-2"},
		{"Day", Day, 86400, 0, "SI day of 86 400 s"},
		{"JulianYear", JulianYear, 31557600, 0, "IAU: Julian year 365.25 d = 31 557 600 s"},
		{"JulianCentury", JulianCentury, 3155760000, 0, "36 525 d"},
		{"Parsec", Parsec, 3.085677581491367e16, 2e-16, "IAU 2015 Resolution B2: 1 pc = 3.085 677 581 491 367e16 m (memory)"},
		{"HbarCeVm", HbarCeVm, 197.3269804e-9, 1e-15, "CODATA 2018: hbar c = 197.326 980 4 MeV fm"},
		{"ElectronVolt", ElectronVolt, 1.602176634e-19, 0, "SI 2019: 1.602 176 634e-19 J exactly"},
		{"ArcsecPerRad", ArcsecPerRad, 206264.806247096355, 1e-15, "648 000/pi = 206 264.806 247 096 355 (mpmath, 30 digits)"},
		{"light-year", mustParse(t, "1 ly"), 9460730472580800, 0, "IAU: 9 460 730 472 580 800 m (with the Julian year)"},
		{"Rsun", mustParse(t, "1 Rsun"), 6.957e8, 0, "IAU 2015 Resolution B3: nominal solar radius 6.957e8 m"},
		// PHYSICS.md: a 1e-23 eV mediator has range 1.973e16 m
		{"RangeFromMass", RangeFromMass(1e-23), 1.973269804e16, 1e-15, "hbar c / (m c^2), CODATA 2018"},
		{"MassFromRange", MassFromRange(1.973269804e16), 1e-23, 1e-15, "inverse of the above"},
	}
	for _, c := range cases {
		if d := math.Abs(c.got-c.want) / c.want; d > c.rel {
			t.Errorf("%s = %.17g, want %.17g (%s)", c.name, c.got, c.want, c.src)
		}
	}
}

func mustParse(t *testing.T, s string) float64 {
	t.Helper()
	q, err := Parse(s)
	if err != nil {
		t.Fatal(err)
	}
	return q.Value
}

// TestParse: unit conversions from the definitions in constants.go and the
// SI prefixes (1 pi rad = 180 deg; 1 deg = 60 arcmin = 3600 arcsec).
func TestParse(t *testing.T) {
	cases := []struct {
		in   string
		want float64
		dim  Dim
	}{
		{"0.5", 0.5, Dimensionless},
		{"  -2e-3 ", -2e-3, Dimensionless},
		{"1 au", 149597870700, Length},
		{"3 km", 3000, Length},
		{"2.5e3 m", 2500, Length},
		{"1 Gpc", 1e9 * Parsec, Length},
		{"30 km/s", 3e4, Speed},
		{"0.01 au/d", 0.01 * 149597870700 / 86400, Speed},
		{"88 d", 88 * 86400, Time},
		{"10 yr", 10 * 31557600, Time},
		{"1.2 Msun", 1.2 * GMSun, Mass},
		{"6e24 kg", 6e24 * G, Mass},
		{"1 m^3/s^2", 1, Mass},
		{"1 m^3*s^-2", 1, Mass},
		{"1e-23 eV", 1e-23, Energy},
		{"1eV", 1, Energy}, // the e of eV is not an exponent
		{"2 keV", 2000, Energy},
		{"180 deg", math.Pi, Angle},
		{"60 arcmin", math.Pi / 180, Angle},
		{"3600 arcsec", math.Pi / 180, Angle},
		{"1000 mas", math.Pi / 180 / 3600, Angle},
	}
	for _, c := range cases {
		q, err := Parse(c.in)
		if err != nil {
			t.Errorf("%q: %v", c.in, err)
			continue
		}
		if q.Dim != c.dim || math.Abs(q.Value-c.want) > 1e-15*math.Abs(c.want) {
			t.Errorf("%q = %.17g %v, want %.17g %v", c.in, q.Value, q.Dim, c.want, c.dim)
		}
	}
}

func TestParseErrors(t *testing.T) {
	cases := []struct{ in, want string }{
		{"", "empty"},
		{"au", "does not start with a number"},
		{"1 furlong", `unknown unit "furlong"`},
		{"nan m", "not finite"},
		{"1e400 m", "out of the float64 range"},
		{"1e308 au", "out of the float64 range"},
		{"1 m^7", "bad power"},
		{"1 m/", "malformed unit"},
	}
	for _, c := range cases {
		_, err := Parse(c.in)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("Parse(%q) = %v, want an error with %q", c.in, err, c.want)
		}
	}
	for _, c := range []struct {
		in   string
		dim  Dim
		want string
	}{
		{"3 km", Mass, "has the dimension of length, but mass is needed"},
		{"3", Length, "has no unit"},
		{"30 km/s", Time, "dimension of speed"},
	} {
		_, err := ParseAs(c.in, c.dim)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("ParseAs(%q, %v) = %v, want %q", c.in, c.dim, err, c.want)
		}
	}
}

// TestFormatRoundTrip: Format writes what Parse reads back exactly.
func TestFormatRoundTrip(t *testing.T) {
	for _, q := range []Quantity{{1.5e11, Length}, {0.1, Dimensionless}, {1.3271244e20, Mass},
		{3e4, Speed}, {1e-23, Energy}, {0.3, Angle}, {86400.5, Time}} {
		back, err := Parse(Format(q))
		if err != nil || back != q {
			t.Errorf("Format(%v) = %q reads back as %v, %v", q, Format(q), back, err)
		}
	}
}
