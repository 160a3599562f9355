package units

import (
	"math"
	"testing"
)

// FuzzParse: no input makes Parse panic; whatever it accepts is finite,
// and Format writes it so that Parse reads back the same value, bit for
// bit, and the same dimension. go test runs the seeds (and the corpus in
// testdata/fuzz/FuzzParse); go test -fuzz FuzzParse explores further.
func FuzzParse(f *testing.F) {
	for _, s := range []string{
		"0.5", "  -2e-3 ", "30 km/s", "1e-23 eV", "1.2 Msun", "3 Gpc", "1 m^3/s^2",
		"0.01 au/d", "7 deg", "43 arcsec", "88 d", "1 century", "2400 km", "6e24 kg",
		"-0 m", "5e-324 m", "1.7976931348623157e308", "1e308 au", "0 Gpc^6*Gpc^6",
		"1 m^6*m^6*m^6", "1 uas^-6*uas^-6", "1 m*s^-1*eV*rad^-2", "1 /s", "1 m/", "1e400",
		"nan m", "inf", "+.5e+3 km", "1.2.3 m", "0x10 m", "1_000 m", "1 m^+3", "1 m^0",
	} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		q, err := Parse(s)
		if err != nil {
			if err.Error() == "" {
				t.Fatalf("Parse(%q): empty error", s)
			}
			return
		}
		if math.IsNaN(q.Value) || math.IsInf(q.Value, 0) {
			t.Fatalf("Parse(%q) accepted a non-finite value %v", s, q.Value)
		}
		text := Format(q)
		back, err := Parse(text)
		if err != nil {
			t.Fatalf("Parse(%q) = %v, but Format gives %q, which does not parse: %v", s, q, text, err)
		}
		if math.Float64bits(back.Value) != math.Float64bits(q.Value) || back.Dim != q.Dim {
			t.Fatalf("Parse(%q) = %v; Format %q reads back as %v", s, q, text, back)
		}
		if v, err := ParseAs(text, q.Dim); err != nil || math.Float64bits(v) != math.Float64bits(q.Value) {
			t.Fatalf("ParseAs(%q, %v) = %v, %v", text, q.Dim, v, err)
		}
	})
}
