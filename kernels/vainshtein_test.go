package kernels

import (
	"encoding/json"
	"math"
	"os/exec"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/gonum/diff/fd"

	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
	"mgorbit/testdata/external"
)

func mustVainshtein(t *testing.T, num map[string]float64, sigma string) *Vainshtein {
	t.Helper()
	v := Values{Num: num, Str: map[string]string{}}
	if sigma != "" {
		v.Str["sigma"] = sigma
	}
	k, err := New("vainshtein", v)
	if err != nil {
		t.Fatal(err)
	}
	return k.(*Vainshtein)
}

// vainshteinXiOf reads xi back from the kernel's force: a_corr = -(mu/r^2) s xi.
func vainshteinXiOf(k *Vainshtein, mu, r float64) float64 {
	ar, _ := k.Radial(mu, r)
	return -ar * r * r / (mu * k.strength)
}

func TestVainshteinScreeningLimits(t *testing.T) {
	// PHYSICS.md item 5: xi -> 1 for x >> 1, xi -> 2 x^(3/2) for x << 1.
	// Expanding its closed form (derived here): xi = 1 - 1/(4x^3) + 1/(8x^6)
	// + O(x^-9), and with t = x^(3/2), xi/(2t) = sqrt(1 + t^2) - t =
	// 1 - t + t^2/2 + O(t^4). The tolerances are the next terms, doubled.
	k := mustVainshtein(t, map[string]float64{"r_v": 2.0}, "")
	const mu = 7.0
	for _, x := range []float64{3, 10, 100, 1e4, 1e8} {
		xi := vainshteinXiOf(k, mu, 2*x)
		e := 1 / (x * x * x)
		if math.Abs(xi-(1-e/4)) > e*e/4+4e-16 {
			t.Errorf("x = %g: xi = %.17g, want 1 - 1/(4x^3) = %.17g", x, xi, 1-e/4)
		}
	}
	for _, x := range []float64{0.1, 1e-3, 1e-6, 1e-12, 1e-100} {
		xi := vainshteinXiOf(k, mu, 2*x)
		tt := x * math.Sqrt(x)
		if math.Abs(xi/(2*tt)-(1-tt)) > tt*tt+4e-16 {
			t.Errorf("x = %g: xi / (2 x^1.5) = %.17g, want 1 - x^1.5 = %.17g", x, xi/(2*tt), 1-tt)
		}
	}
	// The stable form equals PHYSICS.md's first form 2 x^3 (sqrt(1 + x^-3) - 1)
	// where that form loses little (x near 1).
	for _, x := range []float64{0.5, 0.9, 1, 1.1, 2} {
		first := 2 * x * x * x * (math.Sqrt(1+1/(x*x*x)) - 1)
		if got := vainshteinXi(x); math.Abs(got-first) > 1e-14*first {
			t.Errorf("x = %g: xi = %.17g, first form %.17g", x, got, first)
		}
	}
}

func TestVainshteinDeepScreening(t *testing.T) {
	// PHYSICS.md item 5, induced-gravity parameterisation (2 beta^2 = 1/3,
	// r_V^3 = (8/9) r_g r_c^2, r_g = 2 mu/c^2): deep inside r_V the force
	// changes by the fraction sigma (r^3/(2 r_g r_c^2))^(1/2). The next term
	// of xi is a relative -x^(3/2) (above), 1e-11 to 2e-9 here. The Sun at 1 au and
	// 40 au and a source four times heavier, alternating, so that r_V is
	// taken from each call's mu.
	rc := 5e9 * units.Parsec
	for _, sigma := range []string{"+1", "-1"} {
		k := mustVainshtein(t, map[string]float64{"r_c": rc}, sigma)
		s := 1.0
		if sigma == "-1" {
			s = -1
		}
		for _, r := range []float64{units.AU, 40 * units.AU} {
			for _, mu := range []float64{units.GMSun, 4 * units.GMSun, units.GMSun} {
				rg := 2 * mu / (units.C * units.C)
				want := s * math.Sqrt(r*r*r/(2*rg*rc*rc))
				ar, _ := k.Radial(mu, r)
				got := -ar / (mu / (r * r)) // fractional extra attraction
				x := r / math.Cbrt(8.0/9*rg*rc*rc)
				if math.Abs(got-want) > 2*x*math.Sqrt(x)*math.Abs(want) {
					t.Errorf("sigma %s mu %g r %g: fractional force %.15g, want %.15g", sigma, mu, r, got, want)
				}
				a := k.Accel(mu, vec.V{0, r, 0}, vec.V{})
				if math.Abs(a[1]-ar) > 1e-15*math.Abs(ar) || a[0] != 0 || a[2] != 0 {
					t.Errorf("Accel = %v, Radial a_r = %g", a, ar)
				}
			}
		}
	}
	// r_V ~ 100 pc for a Sun-like star at r_c ~ 4 Gpc (PHYSICS.md, common
	// practice: an order of magnitude only).
	k := mustVainshtein(t, map[string]float64{"r_c": 4e9 * units.Parsec}, "")
	if rv := k.radius(units.GMSun) / units.Parsec; rv < 50 || rv > 200 {
		t.Errorf("r_V = %g pc for the Sun at r_c = 4 Gpc, want about 100", rv)
	}
}

func TestVainshteinPotential(t *testing.T) {
	// a_r = -dPhi/dr (definition), by five-point differences at h = 1e-3 r
	// (error ~ 1e-12 of |a| from the stencil plus ~ 1e-16 |phi|/h from
	// rounding, which matters deep inside r_V where phi is nearly constant),
	// at points on both sides of every switch of series (x = 1 and where U
	// or W = 1/4, 1/8, 1/64).
	const mu, rv = 2.5, 3.0
	k := mustVainshtein(t, map[string]float64{"r_v": rv, "coupling": 0.7}, "-1")
	phiOf := func(r float64) float64 { _, p := k.Radial(mu, r); return p }
	xs := []float64{1e-8, 1e-3, 0.2, 0.2513, 0.2514, 0.5228, 0.5229, 0.6933, 0.6934, 0.99, 1, 1.01,
		1.4422, 1.4423, 1.9129, 1.9130, 3.979, 3.980, 30, 1e4}
	for _, x := range xs {
		r := x * rv
		ar, phi := k.Radial(mu, r)
		h := 1e-3 * r
		d := crossoverDerivative(phiOf, r, h)
		if math.Abs(-d-ar) > 1e-10*math.Abs(ar)+1e-15*math.Abs(phi)/h {
			t.Errorf("x = %g: a_r = %.15g, -dPhi/dr = %.15g", x, ar, -d)
		}
	}
	// Unscreened, x >> 1: the extra potential is -s mu/r (xi -> 1), up to
	// the 1/(4x^3) of xi, integrated: I(x) = 1/x - 1/(16 x^4) + O(x^-7).
	for _, x := range []float64{10, 1e3, 1e6} {
		_, phi := k.Radial(mu, x*rv)
		ratio := phi / (-k.strength * mu / (x * rv))
		if want := 1 - 1/(16*x*x*x); math.Abs(ratio-want) > 1/math.Pow(x, 6)+4e-16 {
			t.Errorf("x = %g: phi / (-s mu/r) = %.17g, want %.17g", x, ratio, want)
		}
	}
	if _, phi := k.Radial(mu, math.Inf(1)); phi != 0 {
		t.Errorf("phi(inf) = %g, want 0", phi)
	}
	// Accel = -grad Energy in three dimensions.
	x := vec.V{1.1, 2.0, -0.7}
	energy := func(p []float64) float64 { return k.Energy(mu, vec.V{p[0], p[1], p[2]}, vec.V{}) }
	grad := fd.Gradient(nil, energy, x[:], &fd.Settings{Formula: fd.Central, Step: 1e-5})
	a := k.Accel(mu, x, vec.V{})
	for i := range 3 {
		if math.Abs(a[i]+grad[i]) > 1e-9*a.Norm() {
			t.Errorf("Accel[%d] = %.12g, -grad Energy = %.12g", i, a[i], -grad[i])
		}
	}
}

// vainshteinScript integrates I(x) = Int_x^inf xi(y)/y^2 dy with mpmath's
// tanh-sinh quadrature at 30 digits (xi in the stable form of PHYSICS.md,
// since the first form cancels at large y), and evaluates xi by PHYSICS.md's
// first form 2 x^3 (sqrt(1 + x^-3) - 1) at 60 digits. One x per line in.
const vainshteinScript = `
import json, sys
import mpmath as mp
mp.mp.dps = 30
xi = lambda y: 2 / (1 + mp.sqrt(1 + y**-3))
shape, first = [], []
for line in sys.stdin:
    if not line.strip():
        continue
    x = mp.mpf(float(line))
    pts = [x, 1, mp.inf] if x < 1 else [x, mp.inf]
    shape.append(float(mp.quad(lambda y: xi(y) / y**2, pts)))
    with mp.workdps(60):
        first.append(float(2 * x**3 * (mp.sqrt(1 + x**-3) - 1)))
whole = mp.quad(lambda y: xi(y) / y**2, [0, 1, mp.inf])
json.dump({"shape": shape, "xi": first, "at_zero": float(whole)}, sys.stdout)
`

func TestExternalVainshteinPotential(t *testing.T) {
	py := external.Python(t)
	var xs []float64
	for i := 0; i <= 80; i++ {
		xs = append(xs, 1e-8*math.Pow(1e14, float64(i)/80))
	}
	xs = append(xs, 0.2513, 0.2514, 0.5228, 0.5229, 0.6933, 0.6934, 1, 1.4422, 1.4423, 1.9129, 1.9130, 3.979, 3.980)
	var in strings.Builder
	for _, x := range xs {
		in.WriteString(strconv.FormatFloat(x, 'g', -1, 64) + "\n")
	}
	cmd := exec.Command(py, "-c", vainshteinScript)
	cmd.Stdin = strings.NewReader(in.String())
	var stderr strings.Builder
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("mpmath script: %v\n%s", err, stderr.String())
	}
	var ref struct {
		Shape, Xi []float64
		AtZero    float64 `json:"at_zero"`
	}
	if err := json.Unmarshal(out, &ref); err != nil || len(ref.Shape) != len(xs) || len(ref.Xi) != len(xs) {
		t.Fatalf("mpmath output: %v (%d values for %d points)", err, len(ref.Shape), len(xs))
	}
	// the potential shape to 1e-14 relative (the energy guards' need); xi to
	// 1e-15, the five roundings of its formula plus that of the reference
	worstShape, worstXi := 0.0, 0.0
	for i, x := range xs {
		eS := math.Abs(vainshteinShape(x)-ref.Shape[i]) / ref.Shape[i]
		eX := math.Abs(vainshteinXi(x)-ref.Xi[i]) / ref.Xi[i]
		worstShape, worstXi = math.Max(worstShape, eS), math.Max(worstXi, eX)
		if eS > 1e-14 {
			t.Errorf("I(%g) = %.17g, mpmath %.17g", x, vainshteinShape(x), ref.Shape[i])
		}
		if eX > 1e-15 {
			t.Errorf("xi(%g) = %.17g, mpmath %.17g", x, vainshteinXi(x), ref.Xi[i])
		}
	}
	if e := math.Abs(vainshteinShapeAtZero-ref.AtZero) / ref.AtZero; e > 1e-15 {
		t.Errorf("I(0) = %.17g, mpmath quadrature %.17g", vainshteinShapeAtZero, ref.AtZero)
	}
	t.Logf("largest relative error: potential %.3g, xi %.3g", worstShape, worstXi)
}

func TestVainshteinParameters(t *testing.T) {
	info, ok := Lookup("vainshtein")
	if !ok {
		t.Fatal("vainshtein is not registered")
	}
	if info.Role != Correction || !strings.Contains(info.Mu, "bare") {
		t.Errorf("info: role %v, mu %q", info.Role, info.Mu)
	}
	bad := []struct {
		name string
		v    Values
		want string
	}{
		{"no radius", Values{}, "missing"},
		{"both radii", Values{Num: map[string]float64{"r_v": 1, "r_c": 1}}, "not both"},
		{"both couplings", Values{Num: map[string]float64{"r_v": 1, "coupling": 0.3, "beta": 0.4}}, "not both"},
		{"coupling 0", Values{Num: map[string]float64{"r_v": 1, "coupling": 0}}, "out of range"},
		{"beta < 0", Values{Num: map[string]float64{"r_v": 1, "beta": -0.4}}, "out of range"},
		{"r_v < 0", Values{Num: map[string]float64{"r_v": -1}}, "out of range"},
		{"r_c inf", Values{Num: map[string]float64{"r_c": math.Inf(1)}}, "not finite"},
		{"sigma 0", Values{Num: map[string]float64{"r_v": 1}, Str: map[string]string{"sigma": "0"}}, "not allowed"},
		{"unknown", Values{Num: map[string]float64{"r_v": 1, "rv": 1}}, "unknown parameter"},
	}
	for _, c := range bad {
		if _, err := New("vainshtein", c.v); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one saying %q", c.name, err, c.want)
		}
	}
	// Unscreened strength: default 2 beta^2 = 1/3 (PHYSICS.md induced-gravity
	// value); beta = 0.5 gives 2 beta^2 = 0.5; sigma = -1 flips the sign.
	// Read at x = 1e8, where xi = 1 - 2.5e-25.
	cases := []struct {
		num   map[string]float64
		sigma string
		want  float64
	}{
		{map[string]float64{"r_v": 1}, "", 1.0 / 3},
		{map[string]float64{"r_v": 1, "beta": 0.5}, "", 0.5},
		{map[string]float64{"r_v": 1, "coupling": 0.2}, "-1", -0.2},
	}
	for _, c := range cases {
		k := mustVainshtein(t, c.num, c.sigma)
		ar, _ := k.Radial(1, 1e8)
		if got := -ar * 1e16; math.Abs(got-c.want) > 1e-15 {
			t.Errorf("%v sigma %q: unscreened extra force %.17g of Newton, want %.17g", c.num, c.sigma, got, c.want)
		}
		// Values gives back what it was built with, and rebuilds the same kernel.
		v := k.Values()
		for name, x := range c.num {
			if v.Num[name] != x {
				t.Errorf("Values = %+v, built with %v", v, c.num)
			}
		}
		again, err := New("vainshtein", v)
		if err != nil {
			t.Fatalf("rebuilding from %+v: %v", v, err)
		}
		if a2, _ := again.(*Vainshtein).Radial(1, 1e8); a2 != ar {
			t.Errorf("rebuilt from %+v: a_r %g, was %g", v, a2, ar)
		}
	}
	if k := mustVainshtein(t, map[string]float64{"r_c": 1e26}, ""); k.Values().Str["sigma"] != "+1" {
		t.Errorf("default sigma: %+v", k.Values())
	}
	// No source, no force (r_V = 0 in the r_c parameterisation).
	k := mustVainshtein(t, map[string]float64{"r_c": 1e26}, "")
	if ar, phi := k.Radial(0, 1); ar != 0 || phi != 0 {
		t.Errorf("mu = 0: a_r %g, phi %g", ar, phi)
	}
}
