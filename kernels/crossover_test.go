package kernels

import (
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/diff/fd"

	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

// crossoverStencil is the five-point central stencil for a first derivative: error
// ~ h^4 |u^(5)|/30 + 1e-16 |u|/h (numerical analysis, common practice).
var crossoverStencil = fd.Formula{
	Stencil: []fd.Point{
		{Loc: -2, Coeff: 1.0 / 12}, {Loc: -1, Coeff: -8.0 / 12},
		{Loc: 1, Coeff: 8.0 / 12}, {Loc: 2, Coeff: -1.0 / 12},
	},
	Derivative: 1,
}

// crossoverDerivative differentiates u at x with step h.
func crossoverDerivative(u func(float64) float64, x, h float64) float64 {
	st := crossoverStencil
	st.Step = h
	return fd.Derivative(u, x, &fd.Settings{Formula: st})
}

func mustCrossover(t *testing.T, rc float64, modes string) *Crossover {
	t.Helper()
	k, err := New("crossover", Values{Num: map[string]float64{"r_c": rc}, Str: map[string]string{"modes": modes}})
	if err != nil {
		t.Fatal(err)
	}
	return k.(*Crossover)
}

func TestCrossoverNewtonLimit(t *testing.T) {
	// PHYSICS.md item 4: at x = r/r_c -> 0 the force ratio is 1 - (2/pi) x,
	// so the correction is +(2/pi) x of Newton (weaker gravity). Next terms,
	// derived here from the series A&S 5.2.14, 5.2.16: the force deficit is
	// (2/pi) x - x^2/2 + O(x^3 ln x), the potential deficit
	// (2/pi) x (1 - gamma - ln x) + x^2/2 + O(x^3 ln x). With t = 4/3 the
	// x -> 0 limit is t mu/r: the correction is (t - 1) - t * deficit.
	const mu = units.GMSun
	const eulerGamma = 0.57721566490153286 // A&S 6.1.3
	rc := 5e9 * units.Parsec               // x = 1e-15 is then about 1 au
	for _, modes := range []string{"scalar", "spin2"} {
		k := mustCrossover(t, rc, modes)
		tf := 1.0
		if modes == "spin2" {
			tf = 4.0 / 3
		}
		for _, x := range []float64{1e-3, 1e-6, 1e-9, 1e-12, 1e-15} {
			r := x * rc
			ar, phi := k.Radial(mu, r)
			next := x * x * x * (1 - math.Log(x))
			force := 2/math.Pi*x - x*x/2
			pot := 2/math.Pi*x*(1-eulerGamma-math.Log(x)) + x*x/2
			wantAr := -(mu / (r * r)) * ((tf - 1) - tf*force)
			wantPhi := -(mu / r) * ((tf - 1) - tf*pot)
			// the deficits are ~1e-16 accurate; the rest is the next term
			if math.Abs(ar-wantAr) > (mu/(r*r))*tf*(next+1e-15*force) {
				t.Errorf("%s x = %g: a_corr = %.17g, want %.17g", modes, x, ar, wantAr)
			}
			if math.Abs(phi-wantPhi) > (mu/r)*tf*(next+1e-15*pot) {
				t.Errorf("%s x = %g: phi_corr = %.17g, want %.17g", modes, x, phi, wantPhi)
			}
		}
	}
}

func TestCrossoverFiveDimensional(t *testing.T) {
	// PHYSICS.md item 4: at x >> 1, f ~ 1/x gives Phi ~ -(2/pi) t mu r_c/r^2.
	// With the asymptotic series A&S 5.2.34-35 and their enveloping remainder
	// (from f = Int e^(-xt)/(1+t^2) dt, A&S 5.2.12, memory):
	// f = 1/x - 2/x^3 +- 24/x^5 and f + x g = 2/x - 8/x^3 +- 144/x^5, so the
	// whole potential is -(2/pi) t mu r_c/r^2 (1 - 2/x^2 +- 24/x^4) and the
	// force -(4/pi) t mu r_c/r^3 (1 - 4/x^2 +- 72/x^4). Newton plus the
	// correction cancel to ~1/x, costing ~1e-16 x in rounding.
	const mu = 3.986004418e14 // any mu; the Earth's (IERS 2010)
	rc := 1e6
	for _, modes := range []string{"scalar", "spin2"} {
		k := mustCrossover(t, rc, modes)
		tf := 1.0
		if modes == "spin2" {
			tf = 4.0 / 3
		}
		for _, x := range []float64{30, 1e2, 1e3, 1e5} {
			r := x * rc
			ar, phi := k.Radial(mu, r)
			totalPhi := -mu/r + phi
			totalAr := -mu/(r*r) + ar
			phiRatio := totalPhi / (-(2 / math.Pi) * tf * mu * rc / (r * r))
			arRatio := totalAr / (-(4 / math.Pi) * tf * mu * rc / (r * r * r))
			x2 := x * x
			if math.Abs(phiRatio-(1-2/x2)) > 24/(x2*x2)+4e-16*x {
				t.Errorf("%s x = %g: Phi / five-dimensional = %.17g, want 1 - 2/x^2 = %.17g", modes, x, phiRatio, 1-2/x2)
			}
			if math.Abs(arRatio-(1-4/x2)) > 72/(x2*x2)+4e-16*x {
				t.Errorf("%s x = %g: a_r / five-dimensional = %.17g, want 1 - 4/x^2 = %.17g", modes, x, arRatio, 1-4/x2)
			}
		}
	}
}

func TestCrossoverForceIsMinusGradient(t *testing.T) {
	// a_r = -dPhi/dr (definition of the potential), checked by finite
	// differences of the correction's own phi at step h = 1e-3 r: error
	// ~ 1e-12 of the larger of |phi|/r and |a| (crossoverStencil), tolerance 1e-10.
	// Then Accel = -grad Energy in three dimensions (gonum fd.Gradient).
	const mu = 1.0
	rc := 1.0
	for _, modes := range []string{"scalar", "spin2"} {
		k := mustCrossover(t, rc, modes)
		for _, r := range []float64{1e-6, 1e-3, 0.3, 0.999, 1.001, 1.5, 4, 47, 49, 300} {
			ar, phi := k.Radial(mu, r)
			phiOf := func(s float64) float64 { _, p := k.Radial(mu, s); return p }
			d := crossoverDerivative(phiOf, r, 1e-3*r)
			scale := math.Max(math.Abs(phi)/r, math.Abs(ar))
			if math.Abs(-d-ar) > 1e-10*scale {
				t.Errorf("%s r = %g: a_r = %.15g, -dPhi/dr = %.15g", modes, r, ar, -d)
			}
		}
		x := vec.V{0.3, -0.4, 1.2} // r = 1.3
		energy := func(p []float64) float64 { return k.Energy(mu, vec.V{p[0], p[1], p[2]}, vec.V{}) }
		grad := fd.Gradient(nil, energy, x[:], &fd.Settings{Formula: fd.Central, Step: 1e-5})
		a := k.Accel(mu, x, vec.V{})
		for i := range 3 {
			// central differences, h = 1e-5: error ~ 1e-10 |phi'''| + 1e-11 |phi|
			if math.Abs(a[i]+grad[i]) > 1e-9*a.Norm() {
				t.Errorf("%s: Accel[%d] = %.12g, -grad Energy = %.12g", modes, i, a[i], -grad[i])
			}
		}
	}
}

func TestCrossoverParameters(t *testing.T) {
	info, ok := Lookup("crossover")
	if !ok {
		t.Fatal("crossover is not registered")
	}
	if info.Role != Correction || !strings.Contains(info.Mu, "short-distance") || strings.Contains(info.Summary, "\n") {
		t.Errorf("info: role %v, mu %q, summary %q", info.Role, info.Mu, info.Summary)
	}
	bad := []struct {
		name string
		v    Values
		want string
	}{
		{"no r_c", Values{}, "required"},
		{"r_c = 0", Values{Num: map[string]float64{"r_c": 0}}, "out of range"},
		{"r_c < 0", Values{Num: map[string]float64{"r_c": -1}}, "out of range"},
		{"r_c inf", Values{Num: map[string]float64{"r_c": math.Inf(1)}}, "not finite"},
		{"bad modes", Values{Num: map[string]float64{"r_c": 1}, Str: map[string]string{"modes": "tensor"}}, "not allowed"},
		{"unknown", Values{Num: map[string]float64{"r_c": 1, "rc": 1}}, "unknown parameter"},
	}
	for _, c := range bad {
		if _, err := New("crossover", c.v); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one saying %q", c.name, err, c.want)
		}
	}
	// Values gives back what it was built with, and the defaults.
	k, err := New("crossover", Values{Num: map[string]float64{"r_c": 1.5e26}})
	if err != nil {
		t.Fatal(err)
	}
	v := k.Values()
	if v.Num["r_c"] != 1.5e26 || v.Str["modes"] != "scalar" || len(v.Num) != 1 || len(v.Str) != 1 {
		t.Errorf("Values = %+v", v)
	}
	again, err := New("crossover", v)
	if err != nil {
		t.Fatal(err)
	}
	if again.Values().Num["r_c"] != 1.5e26 {
		t.Errorf("rebuilt from Values: %+v", again.Values())
	}
}
