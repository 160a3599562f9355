package study

import (
	"math"
	"testing"

	"mgorbit/kernels"
	"mgorbit/scenarios/units"
)

// Without integrating, the 1PN advance of Mercury is the published 42.98
// arcsec per Julian century (Will 2014), per orbit over the published
// period 87.969 d; nothing integrated is reported.
func TestSemiAnalyticOnlyMercury(t *testing.T) {
	gr := kernels.MustStack(kernels.GR1PN{})
	sc := testScenario(t, gr, units.GMSun, mercuryA, mercuryE, "yoshida6", 200.3, 20)
	sums, err := SemiAnalyticOnly(sc)
	if err != nil {
		t.Fatal(err)
	}
	if len(sums) != 1 {
		t.Fatalf("%d summaries, want 1", len(sums))
	}
	s := sums[0]
	if s.SemiPath != "gauss-first-order" {
		t.Errorf("path %q, want gauss-first-order (notes %q)", s.SemiPath, s.Notes)
	}
	if got := PerCentury(s.SemiAnomalyPerOrbit, 87.969*units.Day); math.Abs(got/mercuryArcsec-1) > 1e-3 {
		t.Errorf("semi-analytic advance %.5f arcsec/century, want 42.98 to 0.1%%", got)
	}
	for name, v := range map[string]float64{"precession": s.PrecessionPerOrbit, "anomaly": s.AnomalyPerOrbit,
		"radial period": s.RadialPeriod, "energy error": s.EnergyErr, "size": s.SizeA} {
		if !math.IsNaN(v) {
			t.Errorf("%s = %v without an integration, want NaN", name, v)
		}
	}
	if s.Passages != 0 {
		t.Errorf("%d pericentre passages without an integration", s.Passages)
	}
}

// The semi-analytic-only path is the one a full study reports (same
// helper), and for a Yukawa orbit of small e its apsides bracket a and its
// advance is the near-circular formula 2 pi [(1 - eps)^(-1/2) - 1]
// (PHYSICS.md, Goldstein) to O(e^2).
func TestSemiAnalyticOnlyMatchesStudy(t *testing.T) {
	yk, err := kernels.New("yukawa", kernels.Values{Num: map[string]float64{"alpha": 1e-4, "lambda": units.AU}})
	if err != nil {
		t.Fatal(err)
	}
	stack := kernels.MustStack(kernels.Newton{}, yk)
	const a, e = units.AU, 0.002
	sc := testScenario(t, stack, units.GMSun, a, e, "yoshida6", 150.3, 10)
	refs, err := SemiAnalyticReferences(sc)
	if err != nil {
		t.Fatal(err)
	}
	full := run(t, sc)
	r := refs[0]
	if r.SemiAnomalyPerOrbit != full.SemiAnomalyPerOrbit || r.SemiRadialPeriod != full.SemiRadialPeriod || r.SemiPath != full.SemiPath {
		t.Errorf("semi-analytic only: %v, %v, %s; the study: %v, %v, %s", r.SemiAnomalyPerOrbit, r.SemiRadialPeriod, r.SemiPath,
			full.SemiAnomalyPerOrbit, full.SemiRadialPeriod, full.SemiPath)
	}
	if !(r.RMin < a && r.RMax > a) {
		t.Errorf("apsides %v, %v do not bracket a = %v", r.RMin, r.RMax, a)
	}
	rm := (r.RMin + r.RMax) / 2
	u := rm / units.AU
	eps := 1e-4 * u * u * math.Exp(-u) / (1 + 1e-4*(1+u)*math.Exp(-u))
	want := 2 * math.Pi * (1/math.Sqrt(1-eps) - 1)
	if rel := math.Abs(r.SemiAnomalyPerOrbit/want - 1); rel > 3*(e*e+eps) {
		t.Errorf("advance %.10g, near-circular formula %.10g: relative %.2g", r.SemiAnomalyPerOrbit, want, rel)
	}
}

// With two terms beyond Newton the semi-analytic path reports each term's
// first-order share: the 1PN one is Mercury's 42.98 arcsec per Julian
// century (Will 2014), and the shares add up to 1.
func TestSemiAnalyticOnlyTermShares(t *testing.T) {
	yk, err := kernels.New("yukawa", kernels.Values{Num: map[string]float64{"alpha": 1e-9, "lambda": units.AU}})
	if err != nil {
		t.Fatal(err)
	}
	sc := testScenario(t, kernels.MustStack(kernels.GR1PN{}, yk), units.GMSun, mercuryA, mercuryE, "yoshida6", 200.3, 20)
	sums, err := SemiAnalyticOnly(sc)
	if err != nil {
		t.Fatal(err)
	}
	terms := sums[0].Terms
	if len(terms) != 2 || terms[0].Term != "gr1pn" || terms[1].Term != "yukawa" {
		t.Fatalf("terms %+v, want gr1pn and yukawa", terms)
	}
	if got := terms[0].AdvancePerCentury; math.Abs(got/mercuryArcsec-1) > 1e-3 {
		t.Errorf("1PN share %.5f arcsec/century, want 42.98 to 0.1%%", got)
	}
	if s := terms[0].Share + terms[1].Share; math.Abs(s-1) > 1e-12 {
		t.Errorf("shares add up to %v", s)
	}
}
