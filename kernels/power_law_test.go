package kernels

import (
	"math"
	"strings"
	"testing"

	"mgorbit/integrator/reference"
	"mgorbit/kernels/vec"
)

func plNew(t *testing.T, k, n, r0 float64) *PowerLaw {
	t.Helper()
	kk, err := New("power-law", Values{Num: map[string]float64{"k": k, "n": n, "r0": r0}})
	if err != nil {
		t.Fatal(err)
	}
	return kk.(*PowerLaw)
}

// The force law as written and a_r = -dPhi/dr (gonum finite differences of
// the potential), for powers on both sides of the logarithmic case n = 1
// and inside the band near it where the potential changes form.
func TestPowerLawFormulaAndSlope(t *testing.T) {
	const mu, r0 = 4.0, 2.0
	for _, n := range []float64{-3, -1, 0, 0.5, 1, 1 + 5e-5, 1 - 1e-7, 2, 3.5} {
		p := plNew(t, 0.02, n, r0)
		for _, r := range []float64{0.3, 2, 7.5} {
			ar, _ := p.Radial(mu, r)
			want := -mu / (r * r) * 0.02 * math.Pow(r/r0, n)
			if rel := math.Abs(ar/want - 1); rel > 1e-15 {
				t.Errorf("n %g r %g: a_r %g, want %g", n, r, ar, want)
			}
			if rel := math.Abs(ar/ykwPotentialSlope(p, mu, r, r) - 1); rel > 1e-9 {
				t.Errorf("n %g r %g: a_r differs from -dPhi/dr by %.1e", n, r, rel)
			}
		}
	}
	// the potential's zero: infinity for n < 1, the centre for n > 1, r0 for n = 1
	if _, phi := plNew(t, 1, -1, 1).Radial(1, 1e12); math.Abs(phi) > 1e-23 {
		t.Errorf("n = -1: Phi(1e12) = %g, want -> 0", phi)
	}
	if _, phi := plNew(t, 1, 3, 1).Radial(1, 1e-6); math.Abs(phi) > 1e-11 {
		t.Errorf("n = 3: Phi(1e-6) = %g, want -> 0", phi)
	}
	if _, phi := plNew(t, 1, 1, 3).Radial(1, 3); phi != 0 {
		t.Errorf("n = 1: Phi(r0) = %g, want 0", phi)
	}
	if ar, phi := plNew(t, 1, -2, 1).Radial(1, 0); ar != 0 || phi != 0 {
		t.Errorf("at the centre: %g, %g; want 0, 0", ar, phi)
	}
}

// n = 0 is Newton's law with mu (1 + k), whose orbits close (Bertrand's
// theorem): as n -> 0 the advance must vanish in proportion to n. (At n = 0
// itself the correction is an exact multiple of 1/r, whose zero advance the
// references cannot resolve in float64 and say so.)
func TestPowerLawNewtonConstantLimit(t *testing.T) {
	var prev float64
	for _, n := range []float64{1e-2, 1e-3, 1e-4} {
		p := plNew(t, 0.05, n, 1)
		ex, err := reference.FromApsides(1, 0.7, 1.3, p.Radial)
		if err != nil {
			t.Fatal(err)
		}
		if prev != 0 {
			// n down 10x: the advance falls 10x, to O(n) relative
			if q := prev / ex.AdvancePerOrbit; math.Abs(q/10-1) > 0.02 {
				t.Errorf("n %g: advance fell %.4f times for n down 10x, want 10", n, q)
			}
		}
		prev = ex.AdvancePerOrbit
	}
}

// n = -1 is the inverse-cube force -mu k r0/r^3, potential -(mu k r0/2)/r^2:
// the orbit is exactly u = A cos(s phi) + const with s = sqrt(1 - mu k r0/h^2)
// (Goldstein, Classical Mechanics, the inverse-cube problem), so the advance
// is 2 pi (1/s - 1) exactly.
func TestPowerLawInverseCube(t *testing.T) {
	const mu, r0 = 1.0, 0.8
	for _, k := range []float64{1e-8, 1e-3, 0.1} {
		p := plNew(t, k, -1, r0)
		x, v := vec.V{1, 0, 0}, vec.V{0.25, 0.95, 0}
		ex, err := reference.FromState(mu, x, v, p.Radial)
		if err != nil {
			t.Fatal(err)
		}
		h := x.Cross(v).Norm()
		q := mu * k * r0 / (h * h)
		s := math.Sqrt(1 - q)
		want := 2 * math.Pi * q / (s * (1 + s)) // 2 pi (1/s - 1) without cancellation
		if rel := math.Abs(ex.AdvancePerOrbit/want - 1); rel > 1e-10 {
			t.Errorf("k %g: exact quadrature %.14e, closed form %.14e (rel %.1e)", k, ex.AdvancePerOrbit, want, rel)
		}
	}
}

// First-order closed forms from Gauss's equation, Delta varpi = (k p^n/(e r0^n))
// Int_0^2pi cos f (1 + e cos f)^-n df, the integrals derived here by
// differentiating Int (1 + e cos f)^-1 df = 2 pi/sqrt(1 - e^2) and
// Int (1 + e cos f)^-2 df = 2 pi/(1 - e^2)^(3/2) in e:
//
//	n = 2: Delta varpi = -2 pi k (a/r0)^2 sqrt(1 - e^2)   (a constant radial force;
//	       the known result for a constant extra acceleration, memory)
//	n = 3: Delta varpi = -3 pi k (a/r0)^3 sqrt(1 - e^2)   (a Hooke term; with
//	       k = -Lambda c^2 r0^3/(3 mu) the cosmological constant's advance)
//
// against Gauss's numerical average of the kernel, and the exact quadrature
// (agreeing to first order in k) for those and for non-integer powers.
func TestPowerLawFirstOrder(t *testing.T) {
	const mu, a, r0 = 1.0, 1.0, 1.3
	for _, e := range []float64{0.2, 0.6} {
		closed := map[float64]float64{
			2: -2 * math.Pi * (a / r0) * (a / r0) * math.Sqrt(1-e*e),
			3: -3 * math.Pi * math.Pow(a/r0, 3) * math.Sqrt(1-e*e),
		}
		for _, n := range []float64{-2.5, 0.5, 1, 2, 3, 4.2} {
			var prev float64
			for _, k := range []float64{1e-5, 1e-6} {
				p := plNew(t, k, n, r0)
				g, err := reference.GaussAdvance(mu, a, e, func(x, v vec.V) vec.V { return p.Accel(mu, x, v) })
				if err != nil {
					t.Fatal(err)
				}
				if c, ok := closed[n]; ok {
					if rel := math.Abs(g/(k*c) - 1); rel > 1e-10 {
						t.Errorf("n %g e %g: Gauss %.12e, closed form %.12e (rel %.1e)", n, e, g, k*c, rel)
					}
				}
				ex, err := reference.FromApsides(mu, a*(1-e), a*(1+e), p.Radial)
				if err != nil {
					t.Fatal(err)
				}
				rel := math.Abs(ex.AdvancePerOrbit/g - 1)
				if rel > 20*k {
					t.Errorf("n %g e %g k %g: exact %.10e, Gauss %.10e (rel %.1e > 20 k)", n, e, k, ex.AdvancePerOrbit, g, rel)
				}
				if prev != 0 {
					if q := prev / rel; q < 8 || q > 12 {
						t.Errorf("n %g e %g: exact - Gauss fell %.2f times for k down 10x, want ~10 (first order)", n, e, q)
					}
				}
				prev = rel
			}
		}
	}
}

func TestPowerLawParameters(t *testing.T) {
	for _, c := range []struct {
		num  map[string]float64
		want string
	}{
		{map[string]float64{"n": 1, "r0": 1}, "k is required"},
		{map[string]float64{"k": 1, "r0": 1}, "n is required"},
		{map[string]float64{"k": 1, "n": 1}, "r0 is required"},
		{map[string]float64{"k": 1, "n": 1, "r0": -1}, "out of range"},
		{map[string]float64{"k": 1, "n": 40, "r0": 1}, "out of range"},
	} {
		if _, err := New("power-law", Values{Num: c.num}); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("New(power-law, %v): %v, want an error containing %q", c.num, err, c.want)
		}
	}
	p := plNew(t, 0.1, 2, 5)
	if v := p.Values(); v.Num["k"] != 0.1 || v.Num["n"] != 2 || v.Num["r0"] != 5 {
		t.Errorf("Values %v", v.Num)
	}
}
