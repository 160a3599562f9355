package kernels

import (
	"math"
	"testing"

	"mgorbit/integrator/reference"
	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

func ccNew(t *testing.T, lambda float64) *Cosmological {
	t.Helper()
	k, err := New("cosmological-constant", Values{Num: map[string]float64{"lambda_cc": lambda}})
	if err != nil {
		t.Fatal(err)
	}
	return k.(*Cosmological)
}

// The Newtonian limit of Schwarzschild-de Sitter: Phi = -Lambda c^2 r^2/6,
// a_r = +Lambda c^2 r/3 (Kerr, Hauck & Mashhoon 2003; memory), with
// a_r = -dPhi/dr; the unit m^-2 parses.
func TestCosmologicalField(t *testing.T) {
	lambda, err := units.ParseAs("1.1e-52 m^-2", InverseArea)
	if err != nil {
		t.Fatal(err)
	}
	if lambda != 1.1e-52 {
		t.Errorf("1.1e-52 m^-2 parsed as %g", lambda)
	}
	k := ccNew(t, lambda)
	c2 := units.C * units.C
	for _, r := range []float64{1e9, units.AU, 1e20} {
		ar, phi := k.Radial(units.GMSun, r)
		if rel := math.Abs(ar/(lambda*c2*r/3) - 1); rel > 1e-15 {
			t.Errorf("r = %g: a_r = %g, want Lambda c^2 r/3 = %g", r, ar, lambda*c2*r/3)
		}
		if rel := math.Abs(phi/(-lambda*c2*r*r/6) - 1); rel > 1e-15 {
			t.Errorf("r = %g: Phi = %g, want -Lambda c^2 r^2/6", r, phi)
		}
		if rel := math.Abs(ar/ykwPotentialSlope(k, units.GMSun, r, r) - 1); rel > 1e-9 {
			t.Errorf("r = %g: a_r differs from -dPhi/dr by %.1e", r, rel)
		}
		x := vec.V{0.6 * r, 0, -0.8 * r}
		if d := k.Accel(1, x, vec.V{}).Sub(x.Scale(ar / r)).Norm(); d > 1e-15*math.Abs(ar) {
			t.Errorf("Accel is not a_r along x/r")
		}
	}
	// the measured value is 1.1056e-52 m^-2 = 3 Omega_L H0^2/c^2 with
	// Omega_L = 0.6889, H0 = 67.66 km/s/Mpc (Planck 2018 VI; memory)
	h0 := 67.66e3 / (1e6 * units.Parsec)
	if l := 3 * 0.6889 * h0 * h0 / c2; math.Abs(l/1.1056e-52-1) > 1e-3 {
		t.Errorf("Planck 2018 Lambda = %g, want 1.1056e-52", l)
	}
}

// The advance per orbit pi Lambda c^2 a^3 sqrt(1 - e^2)/mu (derived in the
// kernel's doc comment from Gauss's equation; Kerr, Hauck & Mashhoon 2003,
// memory), against Gauss's numerical average (the same first order, to
// quadrature accuracy) and the exact apsidal quadrature, which agrees to
// first order: the difference is O(k a^3/mu) relative, shown by its
// scaling.
func TestCosmologicalPrecession(t *testing.T) {
	const mu, a = 1.0, 1.0
	c2 := units.C * units.C
	for _, e := range []float64{0.1, 0.4, 0.8} {
		var prev float64
		for _, strength := range []float64{1e-5, 1e-6} { // k a^3/mu, k = Lambda c^2/3
			lambda := 3 * strength * mu / (a * a * a * c2)
			k := ccNew(t, lambda)
			want := math.Pi * lambda * c2 * a * a * a * math.Sqrt(1-e*e) / mu
			g, err := reference.GaussAdvance(mu, a, e, func(x, v vec.V) vec.V { return k.Accel(mu, x, v) })
			if err != nil {
				t.Fatal(err)
			}
			if rel := math.Abs(g/want - 1); rel > 1e-10 {
				t.Errorf("e %g: Gauss %.12e, formula %.12e (rel %.1e)", e, g, want, rel)
			}
			ex, err := reference.FromApsides(mu, a*(1-e), a*(1+e), k.Radial)
			if err != nil {
				t.Fatal(err)
			}
			rel := math.Abs(ex.AdvancePerOrbit/want - 1)
			t.Logf("e %g, k a^3/mu %g: exact %.10e, formula %.10e, rel diff %.2e", e, strength, ex.AdvancePerOrbit, want, rel)
			if rel > 10*strength {
				t.Errorf("e %g: exact %.10e vs first order %.10e: rel %.1e > 10 k a^3/mu", e, ex.AdvancePerOrbit, want, rel)
			}
			if prev != 0 {
				if q := prev / rel; q < 8 || q > 12 {
					t.Errorf("e %g: the difference fell %.2f times for a 10x weaker term, want ~10 (first order)", e, q)
				}
			}
			prev = rel
		}
	}
	// Mercury with the measured Lambda: the size quoted in the doc comment
	el := 0.38709893 * units.AU
	m := math.Pi * 1.1e-52 * c2 * el * el * el * math.Sqrt(1-0.20563069*0.20563069) / units.GMSun
	perCentury := m / (87.969 * units.Day) * units.JulianCentury * units.ArcsecPerRad
	t.Logf("Mercury: %.2e rad per orbit, %.2e arcsec per century", m, perCentury)
	if perCentury < 3e-15 || perCentury > 5e-15 {
		t.Errorf("Mercury's Lambda advance %.2e arcsec/century, the doc comment says about 4e-15", perCentury)
	}
}
