package kernels

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/diff/fd"

	"mgorbit/integrator/reference"
	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

func ppnNew(t *testing.T, beta, gamma float64) PPN {
	t.Helper()
	k, err := New("ppn", Values{Num: map[string]float64{"beta": beta, "gamma": gamma}})
	if err != nil {
		t.Fatal(err)
	}
	return k.(PPN)
}

// At beta = gamma = 1 the PPN law is the 1PN test-body law of general
// relativity (PHYSICS.md kernel 6, Will 2014): acceleration, energy and
// angular-momentum factor are gr1pn's, to the last bit (the coefficients
// 2 (beta + gamma) = 4 and 2 (1 + gamma) = 4 are exact).
func TestPPNIsGR1PNAtUnity(t *testing.T) {
	k := ppnNew(t, 1, 1)
	if info := k.Info(); info.Role != Base || !info.VelocityDependent {
		t.Errorf("ppn: role %v, velocity-dependent %v; want a velocity-dependent base law", info.Role, info.VelocityDependent)
	}
	mu := units.GMSun
	for _, s := range []struct{ x, v vec.V }{
		{vec.V{5.79e10, 0, 0}, vec.V{0, 4.79e4, 0}},
		{vec.V{-3e10, 4e10, 1e10}, vec.V{2e4, 3e4, -1e4}},
		{vec.V{1e7, -2e6, 3e6}, vec.V{-5e7, 1e8, 2e7}},
	} {
		if a, g := k.Accel(mu, s.x, s.v), (GR1PN{}).Accel(mu, s.x, s.v); a != g {
			t.Errorf("x=%v: ppn(1,1) acceleration %v, gr1pn %v", s.x, a, g)
		}
		if e, g := k.Energy(mu, s.x, s.v), (GR1PN{}).Energy(mu, s.x, s.v); e != g {
			t.Errorf("x=%v: ppn(1,1) energy %v, gr1pn %v", s.x, e, g)
		}
		if j, g := k.JFactor(mu, s.x, s.v), (GR1PN{}).JFactor(mu, s.x, s.v); j != g {
			t.Errorf("x=%v: ppn(1,1) J factor %v, gr1pn %v", s.x, j, g)
		}
	}
	if k.PrecessionFactor() != 1 || k.DeflectionFactor() != 1 {
		t.Errorf("factors at beta = gamma = 1: precession %g, deflection %g; want 1, 1", k.PrecessionFactor(), k.DeflectionFactor())
	}
}

// The acceleration against the PPN test-body equation written out here
// (Will, Living Rev. Relativ. 17, 4 (2014)): a = -(mu/r^3) x
// + (mu/(c^2 r^3)) [(2 (beta + gamma) mu/r - gamma v^2) x + 2 (1 + gamma) (x.v) v].
func TestPPNFormula(t *testing.T) {
	const c2 = units.C * units.C
	mu := 1e20
	x, v := vec.V{1e9, -2e9, 5e8}, vec.V{3e5, 2e5, -1e5}
	for _, bg := range [][2]float64{{1, 1}, {0.5, 1}, {1, 0}, {2, 0.7}} {
		beta, gamma := bg[0], bg[1]
		k := ppnNew(t, beta, gamma)
		r := x.Norm()
		want := x.Scale(-mu / (r * r * r)).
			Add(x.Scale(mu / (c2 * r * r * r) * (2*(beta+gamma)*mu/r - gamma*v.Dot(v)))).
			Add(v.Scale(mu / (c2 * r * r * r) * 2 * (1 + gamma) * x.Dot(v)))
		got := k.Accel(mu, x, v)
		if d := got.Sub(want).Norm() / want.Norm(); d > 1e-15 {
			t.Errorf("beta %g gamma %g: acceleration %v, formula %v (rel %.1e)", beta, gamma, got, want, d)
		}
	}
	if a := ppnNew(t, 1, 1).Accel(mu, vec.V{}, v); a != (vec.V{}) {
		t.Errorf("acceleration at the centre %v, want zero", a)
	}
}

// The perihelion advance is (2 + 2 gamma - beta)/3 of 6 pi mu/(c^2 a (1 - e^2))
// per orbit (Will 2014; memory), by Gauss's first-order average of the
// PPN terms (reference.GaussAdvance, which takes the transverse term along).
// mu/(c^2 a) = 1e-6: the perturbation formed as PPN minus Newton then keeps
// about 1e-10 of its digits, and the first-order average is exact in it.
func TestPPNPrecessionFactor(t *testing.T) {
	mu := 1.0e20
	a := 1e6 * mu / (units.C * units.C)
	for _, bg := range [][2]float64{{1, 1}, {0, 0}, {1, 0}, {3, 1}, {1.2, 0.4}, {2, 2.5}} {
		beta, gamma := bg[0], bg[1]
		k := ppnNew(t, beta, gamma)
		perturb := func(x, v vec.V) vec.V { return k.Accel(mu, x, v).Sub((Newton{}).Accel(mu, x, v)) }
		for _, e := range []float64{0.05, 0.4, 0.85} {
			got, err := reference.GaussAdvance(mu, a, e, perturb)
			if err != nil {
				t.Fatal(err)
			}
			want := (2 + 2*gamma - beta) / 3 * 6 * math.Pi * mu / (units.C * units.C * a * (1 - e*e))
			if rel := math.Abs(got/want - 1); rel > 1e-8 || (want == 0 && math.Abs(got) > 1e-14) {
				t.Errorf("beta %g gamma %g e %g: advance %.12e, (2+2gamma-beta)/3 x GR = %.12e (rel %.1e)", beta, gamma, e, got, want, rel)
			}
		}
	}
}

// E and J of the doc comment are conserved to O(1/c^4): along the motion,
// dE/dt = grad_x E . v + grad_v E . a (gradients by gonum's finite
// differences of Energy and JFactor, independent of how Accel was derived)
// falls as eps^2, eps = mu/(c^2 r), relative to the Newtonian power scale
// mu v/r^2; and the Newtonian energy alone is not conserved (falls as eps).
func TestPPNConservedQuantities(t *testing.T) {
	mu := units.GMSun
	const c2 = units.C * units.C
	beta, gamma := 1.7, 0.3
	k := ppnNew(t, beta, gamma)
	rate := func(f func(x, v vec.V) float64, x, v vec.V) float64 {
		a := k.Accel(mu, x, v)
		var d float64
		for i := range 6 {
			along := func(h float64) float64 {
				xx, vv := x, v
				if i < 3 {
					xx[i] += h
				} else {
					vv[i-3] += h
				}
				return f(xx, vv)
			}
			// five-point stencil (A&S 25.3.6), step 1e-4 of |x| or |v|
			step := 1e-4 * x.Norm()
			w := v[i%3]
			if i >= 3 {
				step, w = 1e-4*v.Norm(), a[i-3]
			}
			d += w * fd.Derivative(along, 0, &fd.Settings{Formula: fivePoint, Step: step})
		}
		return d
	}
	energy := func(x, v vec.V) float64 { return 0.5*v.Dot(v) + k.Energy(mu, x, v) }
	newtonEnergy := func(x, v vec.V) float64 { return 0.5*v.Dot(v) - mu/x.Norm() }
	angMom := func(x, v vec.V) float64 { return x.Cross(v).Norm() * k.JFactor(mu, x, v) }
	var prevE, prevJ float64
	for _, eps := range []float64{1e-3, 1e-4} {
		r := mu / (c2 * eps)
		// an eccentric state: speed 1.2 of circular, 30 degrees off the tangent
		vc := 1.2 * math.Sqrt(mu/r)
		x := vec.V{r * 0.6, r * 0.8, 0}
		v := vec.V{-0.8 * vc * math.Cos(0.5), 0.6 * vc * math.Cos(0.5), vc * math.Sin(0.5)}.AddScaled(0.3*vc/r, x)
		scale := mu / (r * r) * v.Norm()
		dE := math.Abs(rate(energy, x, v)) / scale
		dN := math.Abs(rate(newtonEnergy, x, v)) / scale
		dJ := math.Abs(rate(angMom, x, v)) / (x.Cross(v).Norm() * v.Norm() / r)
		t.Logf("eps %g: |dE/dt| = %.2e, Newtonian |dE/dt| = %.2e, |dJ/dt| = %.2e (normalised)", eps, dE, dN, dJ)
		if dN < 0.1*eps {
			t.Errorf("eps %g: the Newtonian energy changes at only %.2e: the check cannot tell", eps, dN)
		}
		// a loose sanity bound on the size; the check is the scaling below
		if dE > 100*eps*eps || dJ > 100*eps*eps {
			t.Errorf("eps %g: conserved quantities change at %.2e, %.2e, want O(eps^2) = %.0e", eps, dE, dJ, eps*eps)
		}
		if prevE != 0 {
			// eps down 10x: O(eps^2) residuals fall 100x (within a factor 2)
			if q := prevE / dE; q < 50 || q > 200 {
				t.Errorf("energy residual fell %.1f times for eps down 10x, want ~100 (second order)", q)
			}
			if q := prevJ / dJ; q < 50 || q > 200 {
				t.Errorf("angular-momentum residual fell %.1f times for eps down 10x, want ~100", q)
			}
		}
		prevE, prevJ = dE, dJ
	}
}

func TestPPNParameters(t *testing.T) {
	k, err := New("ppn", Values{})
	if err != nil {
		t.Fatal(err)
	}
	if v := k.Values(); v.Num["beta"] != 1 || v.Num["gamma"] != 1 {
		t.Errorf("defaults %v, want beta = gamma = 1 (general relativity)", v.Num)
	}
	// Cassini's gamma - 1 = 2.1e-5 (Bertotti, Iess & Tortora 2003): the
	// deflection factor (1 + gamma)/2 and the precession factor.
	g := ppnNew(t, 1, 1+2.1e-5)
	if d := g.DeflectionFactor() - 1; math.Abs(d-1.05e-5) > 1e-15 {
		t.Errorf("deflection factor - 1 = %g, want 1.05e-5", d)
	}
	if d := g.PrecessionFactor() - 1; math.Abs(d-1.4e-5) > 1e-15 {
		t.Errorf("precession factor - 1 = %g, want 2/3 x 2.1e-5 = 1.4e-5", d)
	}
	for _, bad := range []map[string]float64{{"beta": math.NaN()}, {"gamma": math.Inf(1)}, {"alpha": 1}} {
		if _, err := New("ppn", Values{Num: bad}); err == nil {
			t.Errorf("New(ppn, %v) accepted", bad)
		}
	}
}
