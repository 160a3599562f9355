package units

import (
	"math"
	"testing"
)

// The Earth and Jupiter mass units are the IAU 2015 Resolution B3 nominal
// GM values (memory), checked against independent published ratios.
func TestPlanetMassUnits(t *testing.T) {
	for _, c := range []struct {
		text string
		want float64
	}{
		{"1 Mearth", 3.986004e14}, // IAU 2015 B3 nominal terrestrial GM (memory)
		{"2.5 Mjup", 2.5 * 1.2668653e17},
		{"317.8 Mearth", 317.8 * 3.986004e14},
	} {
		got, err := ParseAs(c.text, Mass)
		if err != nil {
			t.Fatalf("%s: %v", c.text, err)
		}
		if math.Abs(got/c.want-1) > 1e-15 {
			t.Errorf("%s = %.10g m^3 s^-2, want %.10g", c.text, got, c.want)
		}
	}
	gmE, _ := ParseAs("1 Mearth", Mass)
	gmJ, _ := ParseAs("1 Mjup", Mass)

	// Sun/Earth mass ratio 332 946.0487 (IAU 2009 system of astronomical
	// constants; memory). The nominal values carry 7 and 8 digits, so the
	// ratio of nominal GMs agrees to a few 1e-7.
	if r := GMSun / gmE; math.Abs(r/332946.0487-1) > 3e-7 {
		t.Errorf("Msun/Mearth = %.4f, want 332946.0487 (IAU 2009)", r)
	}
	// Sun/(Jupiter system) mass ratio 1047.348644 (IAU 2009; memory). The
	// nominal GM is Jupiter alone: adding the Galilean satellites' GM, 5959.9
	// + 3202.7 + 9887.8 + 7179.3 km^3 s^-2 (JPL satellite ephemerides;
	// memory), gives the system's.
	satellites := (5959.9 + 3202.7 + 9887.8 + 7179.3) * 1e9
	if r := GMSun / (gmJ + satellites); math.Abs(r/1047.348644-1) > 3e-7 {
		t.Errorf("Msun/(Mjup + Galilean satellites) = %.6f, want 1047.348644 (IAU 2009)", r)
	}
	// Jupiter is about 317.8 Earth masses (common knowledge, memory).
	if r := gmJ / gmE; math.Abs(r-317.83) > 0.01 {
		t.Errorf("Mjup/Mearth = %.3f, want about 317.83", r)
	}
}
