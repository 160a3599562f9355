package kernels_test

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"os/exec"
	"testing"

	"gonum.org/v1/gonum/diff/fd"

	"mgorbit/integrator/kepler"
	"mgorbit/integrator/reference"
	"mgorbit/kernels"
	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
	"mgorbit/testdata/external"
)

// The Binet-form term of PHYSICS.md: potential -mu h^2/(c^2 r^3), radial
// force -3 mu h^2/(c^2 r^4), on top of Newton.
func TestGROrbitForceAndPotential(t *testing.T) {
	k, err := kernels.New("gr-orbit", kernels.Values{})
	if err != nil {
		t.Fatal(err)
	}
	g := k.(kernels.FixedAngularMomentumCentral)
	if k.Info().Role != kernels.Base || k.Info().VelocityDependent {
		t.Errorf("gr-orbit: role %v, velocity-dependent %v; want a base law with position-only kicks", k.Info().Role, k.Info().VelocityDependent)
	}
	mu := units.GMSun
	c2 := units.C * units.C
	x := vec.V{0.3 * units.AU, -0.2 * units.AU, 0.05 * units.AU}
	v := vec.V{12e3, 41e3, -3e3}
	r := x.Norm()
	h := x.Cross(v).Norm()
	// the published form, term by term
	wantAr := -3 * mu * h * h / (c2 * r * r * r * r)
	wantPhi := -mu * h * h / (c2 * r * r * r)
	ar, phi := g.RadialAtH(mu, h, r)
	if math.Abs(ar/wantAr-1) > 1e-15 || math.Abs(phi/wantPhi-1) > 1e-15 {
		t.Errorf("RadialAtH = %g, %g; PHYSICS.md form %g, %g", ar, phi, wantAr, wantPhi)
	}
	// a_r = -dPhi/dr at fixed h (five-point derivative, gonum)
	dphi := fd.Derivative(func(s float64) float64 { _, p := g.RadialAtH(mu, h, s); return p }, r,
		&fd.Settings{Formula: fd.Central, Step: 1e-4 * r})
	if math.Abs(-dphi/ar-1) > 1e-7 {
		t.Errorf("a_r = %g, -dPhi/dr = %g", ar, -dphi)
	}
	// full law: Newton plus the radial term
	a := k.Accel(mu, x, v)
	newton := kernels.Newton{}.Accel(mu, x, v)
	want := newton.AddScaled(wantAr/r, x)
	if d := a.Sub(want).Norm() / newton.Norm(); d > 1e-15 {
		t.Errorf("Accel differs from Newton + radial term by %.2g of Newton", d)
	}
	if e, w := k.Energy(mu, x, v), -mu/r+wantPhi; math.Abs(e/w-1) > 1e-15 {
		t.Errorf("Energy = %.17g, want -mu/r - mu h^2/(c^2 r^3) = %.17g", e, w)
	}
	// Newtonian limit: the term vanishes for radial motion (h = 0) and scales as 1/c^2
	if a0 := k.Accel(mu, x, x.Scale(1e-9)); a0.Sub(newton).Norm() > 1e-15*newton.Norm() {
		t.Errorf("radial motion: gr-orbit differs from Newton")
	}
}

// TestGROrbitAdvanceFirstOrder: the exact quadrature for this law (the
// semi-analytic path, reference.FromState at fixed h) against Gauss's
// first-order result 6 pi mu/(c^2 a (1 - e^2)) (PHYSICS.md): they must
// agree to O(mu/(c^2 a)) relative, and the difference must shrink in
// proportion when the orbit is made 10 times larger.
func TestGROrbitAdvanceFirstOrder(t *testing.T) {
	mu := units.GMSun
	c2 := units.C * units.C
	for _, e := range []float64{0.2056, 0.6, 0.9} {
		var rels [2]float64
		for k, a := range []float64{mu / c2 * 1e5, mu / c2 * 1e6} {
			adv := exactAdvance(t, mu, a, e)
			first := 6 * math.Pi * mu / (c2 * a * (1 - e*e))
			rels[k] = adv/first - 1
		}
		t.Logf("e = %.4f: exact/first-order - 1 = %.3g at mu/(c^2 a) = 1e-5, %.3g at 1e-6", e, rels[0], rels[1])
		eps := 1e-5 / (1 - e*e)
		if math.Abs(rels[0]) > 20*eps || math.Abs(rels[0]) < 0.1*eps {
			t.Errorf("e = %g: relative difference %.3g is not O(mu/(c^2 p)) = %.2g", e, rels[0], eps)
		}
		if r := rels[0] / rels[1]; r < 8 || r > 12.5 {
			t.Errorf("e = %g: the second-order difference scales by %.2f for 10x mu/(c^2 a), want about 10", e, r)
		}
	}
}

func exactAdvance(t *testing.T, mu, a, e float64) float64 {
	t.Helper()
	x, v, err := kepler.ToState(mu, kepler.Elements{A: a, E: e, M: 1})
	if err != nil {
		t.Fatal(err)
	}
	g := kernels.GROrbit{}
	h := x.Cross(v).Norm()
	ex, err := reference.FromState(mu, x, v, func(mu, r float64) (float64, float64) { return g.RadialAtH(mu, h, r) })
	if err != nil {
		t.Fatal(err)
	}
	return ex.AdvancePerOrbit
}

// TestExternalGROrbitAdvanceMpmath: the exact apsidal advance of the Binet
// orbit d^2u/dphi^2 + u = mu/h^2 + 3 mu u^2/c^2 at 40 digits (mpmath): with
// (du/dphi)^2 = (2 mu/c^2)(u1 - u)(u - u2)(u3 - u), the roots of the cubic
// 2E/h^2 + 2 mu u/h^2 - u^2 + 2 mu u^3/c^2, and u = uc + ua cos(theta), the
// apsidal angle is Int_0^pi dtheta / sqrt((2 mu/c^2)(u3 - u)). The
// semi-analytic path (reference.FromState with RadialAtH) must match it.
func TestExternalGROrbitAdvanceMpmath(t *testing.T) {
	py := external.Python(t)
	mu := units.GMSun
	c := units.C
	type cs struct{ X, V [3]float64 }
	var cases []cs
	var got []float64
	// Mercury (PHYSICS.md elements) and a strongly relativistic e = 0.9 orbit
	for _, el := range []kepler.Elements{
		{A: 0.38709893 * units.AU, E: 0.20563069, M: 0.5},
		{A: mu / (c * c) * 1e5, E: 0.6, M: 2},
		{A: mu / (c * c) * 1e4, E: 0.9, M: 3},
	} {
		x, v, err := kepler.ToState(mu, el)
		if err != nil {
			t.Fatal(err)
		}
		cases = append(cases, cs{x, v})
		got = append(got, exactAdvanceState(t, mu, x, v))
	}
	script := `
import json, sys, mpmath as mp
mp.mp.dps = 40
mu = mp.mpf(sys.argv[1]); c = mp.mpf(sys.argv[2])
out = []
for cs in json.load(sys.stdin):
    x = [mp.mpf(u) for u in cs["X"]]; v = [mp.mpf(u) for u in cs["V"]]
    r = mp.sqrt(sum(q*q for q in x))
    hv = [x[1]*v[2]-x[2]*v[1], x[2]*v[0]-x[0]*v[2], x[0]*v[1]-x[1]*v[0]]
    h2 = sum(q*q for q in hv)
    E = sum(q*q for q in v)/2 - mu/r - mu*h2/(c**2*r**3)
    roots = sorted(mp.re(z) for z in mp.polyroots([2*mu/c**2, -1, 2*mu/h2, 2*E/h2], maxsteps=200, extraprec=200))
    u2, u1, u3 = roots
    uc, ua = (u1+u2)/2, (u1-u2)/2
    psi = mp.quad(lambda th: 1/mp.sqrt(2*mu/c**2*(u3 - uc - ua*mp.cos(th))), [0, mp.pi])
    out.append(mp.nstr(2*psi - 2*mp.pi, 25))
print(json.dumps(out))
`
	in, _ := json.Marshal(cases)
	cmd := exec.Command(py, "-c", script, fmt.Sprint(mu), fmt.Sprint(c))
	cmd.Stdin = bytes.NewReader(in)
	raw, err := cmd.Output()
	if err != nil {
		t.Fatalf("mpmath: %v", err)
	}
	var ref []string
	if err := json.Unmarshal(raw, &ref); err != nil {
		t.Fatalf("mpmath output %q: %v", raw, err)
	}
	for i := range cases {
		var want float64
		fmt.Sscan(ref[i], &want)
		rel := got[i]/want - 1
		t.Logf("case %d: semi-analytic %.15g rad/orbit, mpmath %s (relative %.2g)", i, got[i], ref[i], rel)
		if math.Abs(rel) > 1e-10 {
			t.Errorf("case %d: advance %.15g, mpmath %s", i, got[i], ref[i])
		}
	}
}

func exactAdvanceState(t *testing.T, mu float64, x, v vec.V) float64 {
	t.Helper()
	g := kernels.GROrbit{}
	h := x.Cross(v).Norm()
	ex, err := reference.FromState(mu, x, v, func(mu, r float64) (float64, float64) { return g.RadialAtH(mu, h, r) })
	if err != nil {
		t.Fatal(err)
	}
	return ex.AdvancePerOrbit
}
