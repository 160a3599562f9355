package lensing

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/diff/fd"

	"mgorbit/kernels"
	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

func newKernel(t *testing.T, name string, num map[string]float64, str map[string]string) kernels.Kernel {
	t.Helper()
	k, err := kernels.New(name, kernels.Values{Num: num, Str: str})
	if err != nil {
		t.Fatalf("New(%s): %v", name, err)
	}
	return k
}

func compute(t *testing.T, st *kernels.Stack, mu float64, ray Ray) Result {
	t.Helper()
	r, err := Compute(st, mu, ray)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

const rSun = 6.957e8 // nominal solar radius, m (IAU 2015 Resolution B3)

// General relativity: theta = 4 mu/(c^2 b) (PHYSICS.md; Will, Living Rev.
// Relativ. 17, 4 (2014)), 1.75 arcsec at the solar limb, from the
// quadrature of Phi + Psi = -2 mu/r.
func TestDeflectionGR(t *testing.T) {
	worst := 0.0
	defer func() { t.Logf("largest relative error of the quadrature: %.2g", worst) }()
	for _, base := range []kernels.Kernel{kernels.Newton{}, kernels.GR1PN{}, kernels.EIH{}} {
		st := kernels.MustStack(base)
		for _, c := range []struct{ mu, b float64 }{
			{units.GMSun, rSun}, {units.GMSun, 1.7 * rSun}, {units.GMSun, units.AU},
			{3.986004418e14, 6.4e6}, {1, 1e-3}, {1e30, 3e22},
		} {
			theta, beyond, err := Deflection(st, c.mu, c.b)
			if err != nil {
				t.Fatal(err)
			}
			want := 4 * c.mu / (units.C * units.C * c.b)
			worst = math.Max(worst, math.Abs(theta/want-1))
			if e := math.Abs(theta/want - 1); e > 1e-10 || beyond != 0 {
				t.Errorf("%s: mu %g, b %g: theta %.16g, 4 mu/(c^2 b) = %.16g (rel %.2g), corrections' part %g",
					st, c.mu, c.b, theta, want, e, beyond)
			}
		}
	}
	st := kernels.MustStack(kernels.GR1PN{})
	r := compute(t, st, units.GMSun, NewRay(rSun))
	if r.GammaPotentials != 1 || math.Abs(r.GammaDeflectionMinusOne) > 1e-12 || math.Abs(r.RatioToGR-1) > 1e-12 {
		t.Errorf("GR: gamma from potentials %v, from deflection 1%+.3g, ratio to GR %v", r.GammaPotentials, r.GammaDeflectionMinusOne, r.RatioToGR)
	}
}

// The Shapiro delay along a straight ray in general relativity is
// (1 + gamma)(mu/c^3) ln((r_e + r_r + R)/(r_e + r_r - R)), R the
// emitter-receiver distance (Shapiro, Phys. Rev. Lett. 13, 789 (1964); Will
// 2014; memory), about (2 mu/c^3) ln(4 z_e z_r/b^2) for z >> b.
func TestShapiroGR(t *testing.T) {
	st := kernels.MustStack(kernels.GR1PN{})
	c3 := units.C * units.C * units.C
	for _, ray := range []Ray{
		NewRay(rSun),
		{B: 1.6 * rSun, Emitter: 8.43 * units.AU, Receiver: units.AU}, // a ray grazing the Sun
		{B: 1e3, Emitter: 2e3, Receiver: 5e2},
	} {
		dt, beyond, err := Shapiro(st, units.GMSun, ray)
		if err != nil {
			t.Fatal(err)
		}
		re, rr := math.Hypot(ray.B, ray.Emitter), math.Hypot(ray.B, ray.Receiver)
		big := ray.Emitter + ray.Receiver
		// r_e + r_r - R = (r_e - z_e) + (r_r - z_r), each b^2/(r + z): the
		// direct difference loses digits when z >> b
		small := ray.B*ray.B/(re+ray.Emitter) + ray.B*ray.B/(rr+ray.Receiver)
		want := 2 * units.GMSun / c3 * math.Log((re+rr+big)/small)
		t.Logf("ray %+v: delay %.6g s, relative difference from Shapiro's formula %.2g", ray, dt, dt/want-1)
		if e := math.Abs(dt/want - 1); e > 1e-12 || beyond != 0 {
			t.Errorf("ray %+v: delay %.16g s, Shapiro's formula %.16g s (rel %.2g)", ray, dt, want, e)
		}
		if g := ShapiroGR(units.GMSun, ray); math.Abs(g/want-1) > 1e-13 {
			t.Errorf("ShapiroGR %.16g, Shapiro's formula %.16g", g, want)
		}
		if ray.Emitter > 100*ray.B && ray.Receiver > 100*ray.B {
			asym := 2 * units.GMSun / c3 * math.Log(4*ray.Emitter*ray.Receiver/(ray.B*ray.B))
			// the next term is of relative order (b/z)^2 / ln(4 z^2/b^2)
			if e := math.Abs(dt/asym - 1); e > 1e-4 {
				t.Errorf("ray %+v: delay %.10g s, ln(4 z_e z_r/b^2) form %.10g s", ray, dt, asym)
			}
		}
	}
}

// PPN: theta = 2 (1 + gamma) mu/(c^2 b) (PHYSICS.md), and both gamma
// estimates return the parameter.
func TestDeflectionPPN(t *testing.T) {
	for _, gamma := range []float64{0, 0.5, 1 + 2.1e-5} {
		st := kernels.MustStack(newKernel(t, "ppn", map[string]float64{"gamma": gamma}, nil))
		r := compute(t, st, units.GMSun, NewRay(2*rSun))
		want := 2 * (1 + gamma) * units.GMSun / (units.C * units.C * 2 * rSun)
		if math.Abs(r.Angle/want-1) > 1e-12 {
			t.Errorf("gamma %g: theta %.15g, 2 (1 + gamma) mu/(c^2 b) = %.15g", gamma, r.Angle, want)
		}
		if math.Abs(r.GammaPotentials-gamma) > 1e-15 || math.Abs(r.GammaDeflectionMinusOne-(gamma-1)) > 1e-13 {
			t.Errorf("gamma %g: from potentials %.15g, from deflection 1 + %.6g", gamma, r.GammaPotentials, r.GammaDeflectionMinusOne)
		}
	}
}

// k1Table holds K_1(x) from Abramowitz & Stegun Table 9.8 (memory; SciPy's
// scipy.special.k1 gives the same to all digits shown, see the external test).
var k1Table = []struct{ x, k1 float64 }{
	{0.1, 9.853844781}, {0.5, 1.656441120}, {1, 0.6019072302}, {2, 0.1398658818},
	{5, 4.044613445e-3}, {10, 1.864877345e-5},
}

// A tensor Yukawa term, Phi = Psi = -alpha mu e^(-r/lambda)/r beyond
// Newton, bends light by alpha (4 mu/(c^2 b)) (b/lambda) K_1(b/lambda)
// (PHYSICS.md): the quadrature against Table 9.8.
func TestYukawaTensorDeflectionK1(t *testing.T) {
	const mu, lambda, alpha = units.GMSun, 1e10, 0.37
	y := newKernel(t, "yukawa", map[string]float64{"alpha": alpha, "lambda": lambda}, map[string]string{"exchange": "tensor"})
	st := kernels.MustStack(kernels.Newton{}, y)
	for _, c := range k1Table {
		b := c.x * lambda
		_, beyond, err := Deflection(st, mu, b)
		if err != nil {
			t.Fatal(err)
		}
		k1 := beyond / (alpha * DeflectionGR(mu, b) * c.x)
		t.Logf("b/lambda = %g: K_1 from the deflection %.13g, A&S %.10g", c.x, k1, c.k1)
		if e := math.Abs(k1/c.k1 - 1); e > 1e-9 { // the table's 10 digits
			t.Errorf("b/lambda = %g: K_1 from the deflection %.12g, A&S %.10g (rel %.2g)", c.x, k1, c.k1, e)
		}
	}
}

// Scalar exchange does not bend or delay light (PHYSICS.md: a conformally
// coupled scalar adds to Phi what it takes from Psi).
func TestScalarInvisibleToLight(t *testing.T) {
	for _, k := range []kernels.Kernel{
		newKernel(t, "yukawa", map[string]float64{"alpha": 0.5, "lambda": 1e9}, nil),
		newKernel(t, "crossover", map[string]float64{"r_c": 3e9}, nil),
		newKernel(t, "vainshtein", map[string]float64{"r_v": 5e9}, nil),
		newKernel(t, "tower", map[string]float64{"sites": 7, "circumference": 4e9}, nil),
	} {
		st := kernels.MustStack(kernels.GR1PN{}, k)
		r := compute(t, st, units.GMSun, NewRay(1.3e9))
		if r.AngleBeyond != 0 || r.ShapiroBeyond != 0 || math.Abs(r.RatioToGR-1) > 1e-12 {
			t.Errorf("%s: scalar part of the deflection %g, of the delay %g; ratio to GR %.15g", st, r.AngleBeyond, r.ShapiroBeyond, r.RatioToGR)
		}
		// gamma = (1 - s)/(1 + s), s the scalar's potential over Newton's
		// (PHYSICS.md, light deflection)
		_, phi := k.(kernels.Central).Radial(units.GMSun, 1.3e9)
		s := phi / (-units.GMSun / 1.3e9)
		if want := (1 - s) / (1 + s); math.Abs(r.GammaPotentials/want-1) > 1e-14 {
			t.Errorf("%s: gamma from potentials %.16g, (1 - s)/(1 + s) = %.16g", st, r.GammaPotentials, want)
		}
	}
}

// The coupling-fixed massive graviton (Phi = (4/3) phi, Psi = (2/3) phi,
// phi = -mu e^(-r/lambda)/r; PHYSICS.md): gamma = 1/2 from the potentials at
// every r, light bending (b/lambda) K_1(b/lambda) of GR's with the coupling
// mu, so equal to GR for b << lambda, and then gamma = 1/2 from the
// deflection too, measured against the static force's mu_dyn = (4/3) mu.
// The static normalisation (phi -> (3/4) phi) bends light by 3/4 of GR.
func TestMassiveGravitonGamma(t *testing.T) {
	const mu, lambda = units.GMSun, 1e16
	for _, norm := range []string{"coupling", "static"} {
		g := newKernel(t, "massive-graviton", map[string]float64{"lambda": lambda}, map[string]string{"normalisation": norm})
		st := kernels.MustStack(kernels.Newton{}, g)
		scale := 1.0
		if norm == "static" {
			scale = 0.75
		}
		for _, c := range k1Table {
			b := c.x * lambda
			r := compute(t, st, mu, NewRay(b))
			// the stack's potentials are Newton's plus a correction that
			// nearly cancels it where e^(-b/lambda) is small: 1e-16 e^(b/lambda)
			// of rounding is left
			if math.Abs(r.GammaPotentials-0.5) > 1e-15*math.Exp(c.x)*10 {
				t.Errorf("%s, b/lambda %g: gamma from potentials %.16g, want 1/2", norm, c.x, r.GammaPotentials)
			}
			if want := scale * c.x * c.k1; math.Abs(r.RatioToGR/want-1) > 1e-9 {
				t.Errorf("%s, b/lambda %g: ratio to GR %.12g, want %g (b/lambda) K_1 = %.12g", norm, c.x, r.RatioToGR, scale, want)
			}
		}
		// b << lambda: (b/lambda) K_1(b/lambda) = 1 + O(u^2 ln u)
		r := compute(t, st, mu, NewRay(1e-6*lambda))
		if math.Abs(r.RatioToGR-scale) > 1e-9 || math.Abs(r.GammaDeflection-0.5) > 1e-9 {
			t.Errorf("%s, b << lambda: ratio to GR %.12g (want %g), gamma from deflection %.12g (want 1/2)", norm, r.RatioToGR, scale, r.GammaDeflection)
		}
		if math.Abs(r.RatioToGRDynamical-0.75) > 1e-9 {
			t.Errorf("%s, b << lambda: ratio to GR with the dynamical mu %.12g, want 3/4", norm, r.RatioToGRDynamical)
		}
	}
}

// Vainshtein scalar with 2 beta^2 = 1/3: unscreened (b >> r_V) gamma = 1/2
// from both the potentials and the deflection (PHYSICS.md, the massive
// graviton's value); deep inside r_V, gamma -> 1 as xi -> 0, the deflection
// estimate following (1 - 2 beta^2 xi)/(1 + 2 beta^2 xi) exactly (light
// sees mu, an orbit (1 + 2 beta^2 xi) mu).
func TestVainshteinGamma(t *testing.T) {
	const mu, rv = units.GMSun, 1e12
	v := newKernel(t, "vainshtein", map[string]float64{"r_v": rv}, nil)
	st := kernels.MustStack(kernels.GR1PN{}, v)
	xi := func(x float64) float64 { return 2 * x * x * x * (math.Sqrt(1+1/(x*x*x)) - 1) } // PHYSICS.md, first form
	r := compute(t, st, mu, NewRay(1e6*rv))
	if math.Abs(r.GammaPotentials-0.5) > 1e-6 || math.Abs(r.GammaDeflection-0.5) > 1e-6 {
		t.Errorf("unscreened: gamma from potentials %.9g, from deflection %.9g, want 1/2", r.GammaPotentials, r.GammaDeflection)
	}
	prev := 1.0
	for _, x := range []float64{1e-1, 1e-2, 1e-3, 1e-4, 1e-6} {
		r := compute(t, st, mu, NewRay(x*rv))
		s := xi(x) / 3
		want := -2 * s / (1 + s)
		if math.Abs(r.GammaDeflectionMinusOne/want-1) > 1e-6 {
			t.Errorf("x = %g: gamma - 1 from the deflection %.9g, want -2 s/(1 + s) = %.9g", x, r.GammaDeflectionMinusOne, want)
		}
		if g := math.Abs(r.GammaPotentialsMinusOne); g >= prev {
			t.Errorf("x = %g: |gamma - 1| from the potentials %.3g does not fall with the screening (previous %.3g)", x, g, prev)
		}
		prev = math.Abs(r.GammaPotentialsMinusOne)
	}
	if prev > 1e-5 {
		t.Errorf("deep screening (x = 1e-6): |gamma - 1| from the potentials %.3g, want below 1e-5", prev)
	}
}

// Crossover with massive spin-2 modes: gamma -> 1/2 at r << r_c (the
// massive-graviton split); tower spin-2 modes at r << s: each of the N - 1
// massive modes adds (4/3) phi to Phi and (2/3) phi to Psi, so gamma =
// (1 + 2 (N - 1)/3)/(1 + 4 (N - 1)/3); far outside L only the zero mode
// is left and gamma -> 1 (PHYSICS.md, kernels 3 and 4).
func TestTowerCrossoverGamma(t *testing.T) {
	const mu = units.GMSun
	cr := newKernel(t, "crossover", map[string]float64{"r_c": 1e20}, map[string]string{"modes": "spin2"})
	g, _, err := GammaAt(kernels.MustStack(kernels.Newton{}, cr), mu, 1e9)
	if err != nil || math.Abs(g-0.5) > 1e-10 {
		t.Errorf("crossover spin2 at r = 1e-11 r_c: gamma %.12g (%v), want 1/2", g, err)
	}
	const n, l = 5, 1e12
	tw := newKernel(t, "tower", map[string]float64{"sites": n, "circumference": l}, map[string]string{"modes": "spin2"})
	st := kernels.MustStack(kernels.Newton{}, tw)
	g, _, _ = GammaAt(st, mu, 1e-9*l)
	if want := (1 + 2.0*(n-1)/3) / (1 + 4.0*(n-1)/3); math.Abs(g-want) > 1e-8 {
		t.Errorf("tower spin2, r << s: gamma %.12g, want %.12g", g, want)
	}
	g, _, _ = GammaAt(st, mu, 30*l)
	if math.Abs(g-1) > 1e-20 {
		t.Errorf("tower spin2, r >> L: gamma %.17g, want 1", g)
	}
}

// The two quadratures agree: at fixed end points, d(Delta t)/db = -theta/c
// (both are the same line integral of Phi + Psi, one differentiated across
// the ray). Checked on a tensor Yukawa term with gonum's finite differences.
func TestDelayDerivativeIsDeflection(t *testing.T) {
	const mu, lambda = units.GMSun, 2e9
	y := newKernel(t, "yukawa", map[string]float64{"alpha": 1, "lambda": lambda}, map[string]string{"exchange": "tensor"})
	st := kernels.MustStack(kernels.Newton{}, y)
	const ze = 2e12 // 1000 lambda: the Yukawa part has no tail beyond
	for _, b := range []float64{3e8, 2e9, 7e9} {
		_, theta, _ := Deflection(st, mu, b)
		delay := func(bb float64) float64 {
			_, d, _ := Shapiro(st, mu, Ray{B: bb, Emitter: ze, Receiver: ze})
			return d
		}
		d := fd.Derivative(delay, b, &fd.Settings{Formula: fd.Central, Step: 1e-4 * b})
		if e := math.Abs(-units.C*d/theta - 1); e > 1e-6 { // central difference: (1e-4)^2 truncation
			t.Errorf("b = %g: -c d(delay)/db = %.10g, deflection %.10g (rel %.2g)", b, -units.C*d, theta, e)
		}
	}
}

// Kernels without a metric split are refused with their names.
func TestLensingRefusesUndeclared(t *testing.T) {
	st := kernels.MustStack(kernels.Newton{}, undeclared{})
	if _, err := Compute(st, 1, NewRay(1)); err == nil {
		t.Error("a kernel without a metric split was accepted")
	}
	if _, err := Compute(kernels.MustStack(kernels.Newton{}), 1, Ray{B: 1, Emitter: -1, Receiver: 1}); err == nil {
		t.Error("a negative emitter distance was accepted")
	}
}

// undeclared is a correction with no metric split.
type undeclared struct{}

func (undeclared) Info() kernels.Info {
	return kernels.Info{Name: "undeclared", Role: kernels.Correction}
}
func (undeclared) Values() kernels.Values               { return kernels.Values{} }
func (undeclared) Accel(float64, vec.V, vec.V) vec.V    { return vec.V{} }
func (undeclared) Energy(float64, vec.V, vec.V) float64 { return 0 }
