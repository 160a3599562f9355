package study

import (
	"context"
	"math"
	"testing"

	"mgorbit/integrator/kepler"
	"mgorbit/integrator/reference"
	"mgorbit/kernels"
	"mgorbit/scenarios"
	"mgorbit/scenarios/units"
)

func shareKernel(t *testing.T, name string, num map[string]float64) kernels.Kernel {
	t.Helper()
	k, err := kernels.New(name, kernels.Values{Num: num})
	if err != nil {
		t.Fatal(err)
	}
	return k
}

// Each term's share against its published first-order advance, for
// gr1pn + j2 + yukawa on an equatorial orbit: 6 pi mu/(c^2 a (1 - e^2))
// (Will 2014), 3 pi J2 (R/p)^2 (from the secular rates d omega/dt +
// d Omega/dt; Murray & Dermott ch. 6, memory), and for the Yukawa term the
// exact apsidal quadrature, which equals the first-order share to
// O(alpha) = 1e-7 relative.
func TestTermSharesEquatorial(t *testing.T) {
	mu := units.GMSun
	a, e := 1e6*mu/(units.C*units.C), 0.3 // mu/(c^2 a) = 1e-6
	p := a * (1 - e*e)
	const j2 = 1e-4
	radius := 0.2 * a
	stack := kernels.MustStack(kernels.GR1PN{},
		shareKernel(t, "j2", map[string]float64{"j2": j2, "radius": radius}),
		shareKernel(t, "yukawa", map[string]float64{"alpha": 1e-7, "lambda": a}))
	x, v, err := kepler.ToState(mu, kepler.Elements{A: a, E: e, Peri: 0.7, M: 1.2})
	if err != nil {
		t.Fatal(err)
	}
	terms, err := TermShares(stack, mu, x, v, math.NaN())
	if err != nil {
		t.Fatal(err)
	}
	if len(terms) != 3 || terms[0].Term != "gr1pn" || terms[1].Term != "j2" || terms[2].Term != "yukawa" {
		t.Fatalf("terms %+v, want gr1pn, j2, yukawa", terms)
	}
	exact, err := reference.FromState(mu, x, v, stack.CorrectionRadial) // the central correction: yukawa alone
	if err != nil {
		t.Fatal(err)
	}
	want := []float64{
		6 * math.Pi * mu / (units.C * units.C * p),
		3 * math.Pi * j2 * (radius / p) * (radius / p),
		exact.AdvancePerOrbit,
	}
	// 1e-8: the 1PN difference from Newton keeps ~1e-10 of its digits; the
	// Yukawa share differs from the exact advance at O(alpha): 10 alpha
	// (common practice, a margin on the leading neglected order)
	tol := []float64{1e-8, 1e-8, 1e-6}
	var sum, shares float64
	for k, s := range terms {
		t.Logf("%s (%s): %.10e rad/orbit, want %.10e, share %.4f", s.Term, s.Role, s.AdvancePerOrbit, want[k], s.Share)
		if rel := math.Abs(s.AdvancePerOrbit/want[k] - 1); rel > tol[k] {
			t.Errorf("%s: share %.12e, want %.12e (rel %.1e)", s.Term, s.AdvancePerOrbit, want[k], rel)
		}
		sum += s.AdvancePerOrbit
		shares += s.Share
		if c := PerCentury(s.AdvancePerOrbit, kepler.Period(mu, a)); math.Abs(s.AdvancePerCentury/c-1) > 1e-12 {
			t.Errorf("%s: %g arcsec/century, want %g over the Kepler period", s.Term, s.AdvancePerCentury, c)
		}
	}
	if math.Abs(shares-1) > 1e-14 || math.Abs(terms[1].Share-want[1]/sum) > 1e-12 {
		t.Errorf("shares sum to %.15f, want 1", shares)
	}
}

// On an inclined orbit the shares are the pericentre's advance within the
// orbit plane, d omega + cos i d Omega per orbit: for J2,
// (3/4)(5 cos^2 i - 1) - (3/2) cos^2 i = (3/4)(3 cos^2 i - 1) times
// n J2 (R/p)^2 (textbook rates, memory); for frame dragging (-6 + 2) cos i
// times G J/(c^2 a^3 (1 - e^2)^(3/2)) (Lense-Thirring rates, memory).
func TestTermSharesInclined(t *testing.T) {
	mu := units.GMSun
	a, e := 1e4*mu/(units.C*units.C), 0.4
	p := a * (1 - e*e)
	const j2 = 1e-3
	radius := 0.1 * a
	for _, inc := range []float64{20, 70, 120} {
		el := kepler.Elements{A: a, E: e, I: inc * math.Pi / 180, Node: 2.3, Peri: 0.8, M: 0.5}
		x, v, err := kepler.ToState(mu, el)
		if err != nil {
			t.Fatal(err)
		}
		stack := kernels.MustStack(kernels.Newton{},
			shareKernel(t, "j2", map[string]float64{"j2": j2, "radius": radius}),
			shareKernel(t, "lense-thirring", map[string]float64{"spin": 0.7}))
		terms, err := TermShares(stack, mu, x, v, math.NaN())
		if err != nil {
			t.Fatal(err)
		}
		ci := math.Cos(el.I)
		gj := 0.7 * mu * mu / units.C
		period := kepler.Period(mu, a)
		want := []float64{
			1.5 * math.Pi * j2 * (radius / p) * (radius / p) * (3*ci*ci - 1),
			-4 * ci * gj / (units.C * units.C * a * a * a * math.Pow(1-e*e, 1.5)) * period,
		}
		for k, s := range terms {
			if rel := math.Abs(s.AdvancePerOrbit/want[k] - 1); rel > 1e-9 {
				t.Errorf("i = %g deg, %s: in-plane advance %.12e, want %.12e (rel %.1e)", inc, s.Term, s.AdvancePerOrbit, want[k], rel)
			}
		}
	}
}

// A study carries the shares in its summary, and a Newtonian stack none.
func TestTermSharesInStudy(t *testing.T) {
	mu, a, e := 1.0, 1.0, 0.2
	x, v, err := kepler.ToState(mu, kepler.Elements{A: a, E: e, Peri: 0.3, M: 0.1})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		stack *kernels.Stack
		terms int
	}{
		{kernels.MustStack(kernels.Newton{}), 0},
		{kernels.MustStack(kernels.Newton{}, shareKernel(t, "power-law", map[string]float64{"k": 1e-4, "n": 2, "r0": 1})), 1},
	} {
		sc := &scenarios.Scenario{Name: "shares", Source: "test", Stack: c.stack,
			Bodies: []scenarios.Body{{Name: "centre", GM: mu}, {Name: "probe", Test: true, Primary: "centre", X: x, V: v}},
			Integrator: scenarios.IntegratorSpec{Method: "yoshida6", StepsPerOrbit: 100.3, Orbits: 4,
				EnergyTolerance: 1e-6, AngularMomentumTolerance: 1e-6}}
		st, err := Run(context.Background(), sc, Options{})
		if err != nil {
			t.Fatal(err)
		}
		s := st.Summaries[0]
		if len(s.Terms) != c.terms {
			t.Fatalf("%s: %d terms, want %d (notes: %s)", c.stack, len(s.Terms), c.terms, s.Notes)
		}
		if c.terms == 1 {
			// n = 2: -2 pi k (a/r0)^2 sqrt(1 - e^2) (power_law_test.go's closed form)
			want := -2 * math.Pi * 1e-4 * math.Sqrt(1-e*e)
			if math.Abs(s.Terms[0].AdvancePerOrbit/want-1) > 1e-10 || s.Terms[0].Share != 1 {
				t.Errorf("power-law share %+v, want advance %.10e and share 1", s.Terms[0], want)
			}
		}
	}
}
