package observe

import (
	"math"
	"testing"

	"mgorbit/kernels/vec"
)

// A quintic Hermite interpolant reproduces any polynomial of degree five
// exactly (its defining property; e.g. Burden & Faires, Numerical Analysis,
// section 3.4 on Hermite interpolation).
func TestHermiteExactOnQuintic(t *testing.T) {
	p := func(t float64) float64 { return 1 - 2*t + 0.5*t*t + 3*t*t*t - t*t*t*t + 0.25*t*t*t*t*t }
	dp := func(t float64) float64 { return -2 + t + 9*t*t - 4*t*t*t + 1.25*t*t*t*t }
	ddp := func(t float64) float64 { return 1 + 18*t - 12*t*t + 5*t*t*t }
	t0, H := 0.3, 0.7
	h := Hermite{H: H}
	for k := 0; k < 3; k++ {
		s := float64(k + 1)
		h.X0[k], h.V0[k], h.A0[k] = s*p(t0), s*dp(t0), s*ddp(t0)
		h.X1[k], h.V1[k], h.A1[k] = s*p(t0+H), s*dp(t0+H), s*ddp(t0+H)
	}
	for _, f := range []float64{0, 0.1, 0.37, 0.5, 0.93, 1} {
		x, v := h.At(f)
		tt := t0 + f*H
		for k := 0; k < 3; k++ {
			s := float64(k + 1)
			if math.Abs(x[k]-s*p(tt)) > 1e-13 || math.Abs(v[k]-s*dp(tt)) > 1e-12 {
				t.Errorf("s=%.2f component %d: got (%.15g, %.15g), want (%.15g, %.15g)", f, k, x[k], v[k], s*p(tt), s*dp(tt))
			}
		}
	}
}

// The root of x.v is where r is smallest: on the ellipse x(t) = (2 cos t,
// sin t), r^2 = 1 + 3 cos^2 t is smallest at t = pi/2.
func TestRadialRootFindsPericentre(t *testing.T) {
	pos := func(t float64) vec.V { return vec.V{2 * math.Cos(t), math.Sin(t), 0} }
	vel := func(t float64) vec.V { return vec.V{-2 * math.Sin(t), math.Cos(t), 0} }
	acc := func(t float64) vec.V { return vec.V{-2 * math.Cos(t), -math.Sin(t), 0} }
	t0, t1 := math.Pi/2-0.05, math.Pi/2+0.03
	h := Hermite{X0: pos(t0), V0: vel(t0), A0: acc(t0), X1: pos(t1), V1: vel(t1), A1: acc(t1), H: t1 - t0}
	s := h.RadialRoot()
	got := t0 + s*(t1-t0)
	// interpolation error O(H^6) ~ 1e-10 for H = 0.08
	if math.Abs(got-math.Pi/2) > 1e-9 {
		t.Errorf("pericentre at t = %.12f, want pi/2 = %.12f", got, math.Pi/2)
	}
}

// FitLine against a hand-computed least-squares fit of y = (1, 3, 4, 8) on
// k = 0..3 (normal equations, any statistics text): kbar = 1.5, ybar = 4,
// S_kk = 5, S_ky = 11 -> slope 2.2, intercept 0.7; residuals 0.3, 0.1,
// -1.1, 0.7 -> sum r^2 = 1.8, stderr = sqrt(1.8/(n-2)/S_kk) = sqrt(0.18).
func TestFitLine(t *testing.T) {
	l, err := FitLine([]float64{1, 3, 4, 8})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(l.Slope-2.2) > 1e-14 || math.Abs(l.Intercept-0.7) > 1e-14 {
		t.Errorf("fit %.15g + %.15g k, want 0.7 + 2.2 k", l.Intercept, l.Slope)
	}
	if want := math.Sqrt(0.18); math.Abs(l.SlopeErr-want) > 1e-14 {
		t.Errorf("slope stderr %.15g, want %.15g", l.SlopeErr, want)
	}
	if _, err := FitLine([]float64{1, 2}); err == nil {
		t.Error("a fit of two points must be refused")
	}
}

func TestUnwrap(t *testing.T) {
	in := []float64{3.0, -3.0, -2.5, 3.1}
	out := Unwrap(in)
	want := []float64{3.0, 2*math.Pi - 3.0, 2*math.Pi - 2.5, 3.1}
	// -3.0 follows 3.0: the short way is +0.283, so -3 + 2 pi; 3.1 follows
	// 2 pi - 2.5 = 3.783: short way is -0.683, so 3.1.
	for i := range want {
		if math.Abs(out[i]-want[i]) > 1e-15 {
			t.Errorf("unwrap[%d] = %.15g, want %.15g", i, out[i], want[i])
		}
	}
}
