package bounds

import (
	"math"
	"testing"
)

// The confidence levels' multipliers. The central interval of +-k sigma
// holds erf(k/sqrt 2) of a normal distribution (A&S 26.2.5 with 7.1.1), so
// those levels must give back k = 1, 2, 3 exactly; the handbook values are
// 1.959964 for 95% (A&S Table 26.5, memory) and 0.994458 for 68%, the
// rounded level often written for 1 sigma (A&S Table 26.1 lists
// P(0.99) = 0.838913 and P(1.00) = 0.841345, memory; linear
// interpolation to P = 0.84 gives 0.99447, good to about 1e-5 at this
// spacing).
func TestConfidenceMultipliers(t *testing.T) {
	for _, c := range []struct {
		cl, k, tol float64
		src        string
	}{
		{math.Erf(1 / math.Sqrt2), 1, 1e-12, "erf(1/sqrt 2)"},
		{math.Erf(2 / math.Sqrt2), 2, 1e-12, "erf(2/sqrt 2)"},
		{math.Erf(3 / math.Sqrt2), 3, 1e-11, "erf(3/sqrt 2)"},
		{0.95, 1.959964, 1e-6, "A&S Table 26.5"},
		{0.68, 0.99447, 2e-5, "A&S Table 26.1, interpolated"},
	} {
		if got := TwoSidedK(c.cl); math.Abs(got-c.k) > c.tol {
			t.Errorf("CL %.10g (%s): k = %.10g, want %.10g", c.cl, c.src, got, c.k)
		}
	}
	// One-sided: 95% of a normal distribution lies below 1.644854 sigma
	// (A&S Table 26.5, memory).
	if z := OneSidedZ(0.95); math.Abs(z-1.644854) > 1e-6 {
		t.Errorf("one-sided 95%%: z = %.10g, want 1.644854", z)
	}
}

// The chi-square thresholds: one degree of freedom is a squared normal
// variable, so its quantile is k^2 (3.841459 at 95%); two degrees of
// freedom are exponential with mean 2 (A&S 26.4.1 with nu = 2), so the
// quantile is -2 ln(1 - CL) and the p-value exp(-x/2).
func TestChiSquareThresholds(t *testing.T) {
	for _, cl := range []float64{0.6827, 0.9, 0.95, 0.99} {
		k := TwoSidedK(cl)
		if got := ChiSquareThreshold(1, cl); math.Abs(got/(k*k)-1) > 1e-10 {
			t.Errorf("1 dof at %g: %.12g, want k^2 = %.12g", cl, got, k*k)
		}
		if got, want := ChiSquareThreshold(2, cl), -2*math.Log(1-cl); math.Abs(got/want-1) > 1e-10 {
			t.Errorf("2 dof at %g: %.12g, want -2 ln(1 - CL) = %.12g", cl, got, want)
		}
	}
	for _, x := range []float64{0.5, 3, 10} {
		if got, want := ChiSquarePValue(2, x), math.Exp(-x/2); math.Abs(got/want-1) > 1e-10 {
			t.Errorf("p-value of %g at 2 dof: %.12g, want exp(-x/2) = %.12g", x, got, want)
		}
	}
}
