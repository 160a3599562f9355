package kepler

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"os/exec"
	"testing"

	"mgorbit/kernels/vec"
	"mgorbit/testdata/external"
)

// TestStumpffClosedForms compares the series-and-doubling evaluation with
// the closed forms c0 = cos x, c1 = sin x/x, c2 = (1 - cos x)/x^2,
// c3 = (x - sin x)/x^3, x = sqrt(z) (cosh and sinh for z < 0) (Danby,
// Fundamentals of Celestial Mechanics, eq. 6.9.x; the definitions), at
// arguments where the closed forms lose at most a few digits to
// cancellation: the tolerance is that loss, 1e-15 over (1 - cos x)/x^2 or
// (x - sin x)/x^3 relative to its terms.
func TestStumpffClosedForms(t *testing.T) {
	for _, z := range []float64{0.3, 1, 2.5, 10, 39, 100, 1e3, -0.3, -1, -7, -50, -400} {
		c0, c1, c2, c3 := Stumpff(z)
		x := math.Sqrt(math.Abs(z))
		var w0, w1, w2, w3 float64
		if z > 0 {
			w0, w1 = math.Cos(x), math.Sin(x)/x
			w2, w3 = (1-math.Cos(x))/z, (x-math.Sin(x))/(z*x)
		} else {
			w0, w1 = math.Cosh(x), math.Sinh(x)/x
			w2, w3 = (math.Cosh(x)-1)/(-z), (math.Sinh(x)-x)/(-z*x)
		}
		// absolute scale of each closed form's terms
		scale := []float64{1, math.Max(1, math.Abs(w1)), (1 + math.Abs(w0)) / math.Abs(z), (x + math.Abs(math.Sin(x))) / (math.Abs(z) * x)}
		if z < 0 {
			scale = []float64{w0, w1, (w0 + 1) / -z, (math.Sinh(x) + x) / (-z * x)}
		}
		got := []float64{c0, c1, c2, c3}
		want := []float64{w0, w1, w2, w3}
		for k := range got {
			if d := math.Abs(got[k] - want[k]); d > 2e-14*scale[k] {
				t.Errorf("z=%g: c%d = %.17g, closed form %.17g (diff %.2g, scale %.2g)", z, k, got[k], want[k], d, scale[k])
			}
		}
	}
	// z -> 0: the series' leading terms 1, 1, 1/2, 1/6 (definition).
	c0, c1, c2, c3 := Stumpff(0)
	if c0 != 1 || c1 != 1 || c2 != 0.5 || math.Abs(c3-1.0/6) > 1e-17 {
		t.Errorf("Stumpff(0) = %v %v %v %v, want 1 1 1/2 1/6", c0, c1, c2, c3)
	}
}

// keplerState is the analytic Kepler solution: the state at mean anomaly M
// via Kepler's equation (SolveKepler, checked against published examples
// and mpmath in kepler_test.go) and the perifocal formulas.
func keplerState(t *testing.T, mu float64, el Elements) (vec.V, vec.V) {
	t.Helper()
	x, v, err := ToState(mu, el)
	if err != nil {
		t.Fatal(err)
	}
	return x, v
}

// TestDriftAgainstKeplerEquation: Drift from the state at M0 over dt must
// land on the state at M0 + n dt, n = sqrt(mu/a^3) (Kepler's equation), for
// e = 0, 0.5, 0.9, 0.99, short and long drifts, both directions. The
// tolerance is relative to the orbit's size and speed scale: rounding of
// the phase n dt is about 1e-16 n dt rad, so it grows with the drift length.
func TestDriftAgainstKeplerEquation(t *testing.T) {
	mu := 1.32712440018e20
	a := 1.5e11
	n := math.Sqrt(mu / (a * a * a))
	P := 2 * math.Pi / n
	worst := 0.0
	for _, e := range []float64{0, 0.5, 0.9, 0.99} {
		for _, M0 := range []float64{0, 0.4, 2.9, 4.4, 6.1} {
			for _, frac := range []float64{1e-4, 0.013, 0.37, -0.21, 0.9, 3.7, -12.3, 1e4 + 0.377} {
				dt := frac * P
				el := Elements{A: a, E: e, I: 0.4, Node: 1.1, Peri: 2.3, M: M0}
				x0, v0 := keplerState(t, mu, el)
				el.M = M0 + n*dt
				x1, v1 := keplerState(t, mu, el)
				gx, gv := Drift(mu, x0, v0, dt)
				// Both sides round the phase: the period recovered from the
				// rounded state and n dt carry ~1e-15 rad per radian of
				// travel, which moves the body along the track by that times
				// its speed, up to sqrt((1+e)/(1-e)) of the mean (the exact
				// propagation of the same float state is checked against
				// mpmath in TestExternalDriftMpmath).
				boost := math.Sqrt((1 + e) / (1 - e))
				speed := math.Sqrt(mu/a) * boost
				phase := 1e-14 * (1 + math.Abs(n*dt)) * boost
				tolX := phase * a
				tolV := phase * speed / (1 - e)
				dx, dv := gx.Sub(x1).Norm(), gv.Sub(v1).Norm()
				worst = math.Max(worst, dx/a)
				if dx > tolX || dv > tolV || math.IsNaN(dx) {
					t.Errorf("e=%g M0=%g dt=%g P: position off by %.3g m (tol %.2g), velocity by %.3g m/s (tol %.2g)",
						e, M0, frac, dx, tolX, dv, tolV)
				}
			}
		}
	}
	t.Logf("largest position difference from Kepler's equation: %.2g a", worst)
}

// TestDriftHyperbolic checks unbound orbits against the hyperbolic Kepler
// equation M = e sinh H - H, M = n (t - t_p), n = sqrt(mu/a^3), with
// perifocal position a (e - cosh H), a sqrt(e^2 - 1) sinh H (a > 0 here;
// e.g. Vallado, Fundamentals of Astrodynamics and Applications, sec. 2.2),
// and the parabola against Barker's equation
// t - t_p = sqrt(p^3/mu) (D + D^3/3)/2, D = tan(f/2), r = p/(1 + cos f).
func TestDriftHyperbolic(t *testing.T) {
	mu := 3.986004418e14
	hyper := func(a, e, M float64) (vec.V, vec.V) {
		// Newton from the asinh start, converged to rounding
		H := math.Asinh(M / e)
		for i := 0; i < 100; i++ {
			dH := (e*math.Sinh(H) - H - M) / (e*math.Cosh(H) - 1)
			H -= dH
			if math.Abs(dH) < 1e-16*math.Max(1, math.Abs(H)) {
				break
			}
		}
		q := math.Sqrt(e*e - 1)
		Hdot := math.Sqrt(mu/(a*a*a)) / (e*math.Cosh(H) - 1)
		return vec.V{a * (e - math.Cosh(H)), a * q * math.Sinh(H), 0},
			vec.V{-a * math.Sinh(H) * Hdot, a * q * math.Cosh(H) * Hdot, 0}
	}
	a := 2e7
	n := math.Sqrt(mu / (a * a * a))
	for _, e := range []float64{1.2, 2, 5} {
		for _, c := range [][2]float64{{-3, 0.5}, {0, 2}, {1, -4}, {-20, 35}, {0.2, 1e-3}} {
			M0, dM := c[0], c[1]
			x0, v0 := hyper(a, e, M0)
			x1, v1 := hyper(a, e, M0+dM)
			gx, gv := Drift(mu, x0, v0, dM/n)
			scale := x1.Norm() + x0.Norm()
			// hyperbolic positions are exponentially sensitive to the phase:
			// 1e-16 in M moves the body by ~1e-16 r |M|.
			tol := 1e-14 * (1 + math.Abs(M0) + math.Abs(dM))
			if d := gx.Sub(x1).Norm(); d > tol*scale || math.IsNaN(d) {
				t.Errorf("e=%g M0=%g dM=%g: position off by %.3g m (%.2g relative)", e, M0, dM, d, d/scale)
			}
			vs := v1.Norm() + v0.Norm()
			if d := gv.Sub(v1).Norm(); d > tol*vs || math.IsNaN(d) {
				t.Errorf("e=%g M0=%g dM=%g: velocity off by %.3g (%.2g relative)", e, M0, dM, d, d/vs)
			}
		}
	}
	// parabola, p = 2 q
	p := 1.4e7
	barker := func(f float64) (float64, vec.V, vec.V) {
		D := math.Tan(f / 2)
		tp := math.Sqrt(p*p*p/mu) * (D + D*D*D/3) / 2
		r := p / (1 + math.Cos(f))
		vk := math.Sqrt(mu / p)
		return tp, vec.V{r * math.Cos(f), r * math.Sin(f), 0}, vec.V{-vk * math.Sin(f), vk * (1 + math.Cos(f)), 0}
	}
	for _, f := range [][2]float64{{-2, 1.5}, {0, 2.5}, {1, -2.8}} {
		t0, x0, v0 := barker(f[0])
		t1, x1, v1 := barker(f[1])
		gx, gv := Drift(mu, x0, v0, t1-t0)
		if d := gx.Sub(x1).Norm() / x1.Norm(); d > 1e-12 {
			t.Errorf("parabola f %g -> %g: position off by %.2g relative", f[0], f[1], d)
		}
		if d := gv.Sub(v1).Norm() / v1.Norm(); d > 1e-12 {
			t.Errorf("parabola f %g -> %g: velocity off by %.2g relative", f[0], f[1], d)
		}
	}
}

// TestDriftLong: a drift of 1e6 periods in one call against the same drift
// in 1e3 pieces of 1e3 periods plus the fractional rest, and energy and
// angular momentum (vis-viva; h = |x x v|) kept to rounding; and reversal
// (the flow at -dt undoes dt).
func TestDriftLong(t *testing.T) {
	mu := 1.0
	for _, e := range []float64{0.1, 0.9, 0.99} {
		x0, v0 := keplerState(t, mu, Elements{A: 1, E: e, I: 0.2, Node: 0.5, Peri: 1, M: 1.3})
		P := 2 * math.Pi
		dt := 1e6*P + 0.3141
		x1, v1 := Drift(mu, x0, v0, dt)
		el, err := FromState(mu, x1, v1)
		if err != nil {
			t.Fatal(err)
		}
		// the phase: mean anomaly 1.3 + dt (n = 1), rounding of dt ~ 1e-16 * 6e6
		wantM := math.Mod(1.3+dt, 2*math.Pi)
		if d := math.Abs(math.Remainder(el.M-wantM, 2*math.Pi)); d > 1e-8 {
			t.Errorf("e=%g: mean anomaly after 1e6 periods off by %.2g rad", e, d)
		}
		E0 := 0.5*v0.Norm2() - mu/x0.Norm()
		E1 := 0.5*v1.Norm2() - mu/x1.Norm()
		if d := math.Abs(E1/E0 - 1); d > 1e-13 {
			t.Errorf("e=%g: energy changed by %.2g relative", e, d)
		}
		if d := math.Abs(x1.Cross(v1).Norm()/x0.Cross(v0).Norm() - 1); d > 1e-13 {
			t.Errorf("e=%g: angular momentum changed by %.2g relative", e, d)
		}
		xb, vb := Drift(mu, x1, v1, -0.3141)
		xr, vr := Drift(mu, x0, v0, 0) // identity
		if xr != x0 || vr != v0 {
			t.Errorf("zero drift is not the identity")
		}
		// back by the fraction: the whole periods drop out, so the state is
		// the start, up to the rounding of dt itself (ulp(6.3e6) = 9e-10)
		// and of the period times 1e6, a few ulp of dt each.
		if d := xb.Sub(x0).Norm(); d > 20*(math.Nextafter(dt, math.Inf(1))-dt)*v0.Norm()*math.Sqrt((1+e)/(1-e)) {
			t.Errorf("e=%g: 1e6 periods + 0.3141, back 0.3141: position off by %.2g", e, d)
		}
		_ = vb
	}
}

// TestDriftComposes: many short drifts (the Wisdom-Holman use) agree with
// one long one; a check of the short-step start and convergence path.
func TestDriftComposes(t *testing.T) {
	mu := 1.0
	for _, e := range []float64{0, 0.6, 0.95} {
		x0, v0 := keplerState(t, mu, Elements{A: 1, E: e, M: 0.2})
		steps := 3031
		h := 2 * math.Pi * 7.3 / float64(steps)
		x, v := x0, v0
		for k := 0; k < steps; k++ {
			x, v = Drift(mu, x, v, h)
		}
		xl, _ := Drift(mu, x0, v0, h*float64(steps))
		if d := x.Sub(xl).Norm(); d > 1e-11 {
			t.Errorf("e=%g: %d short drifts differ from one long one by %.2g", e, steps, d)
		}
		_ = v
	}
}

func TestDriftInvalid(t *testing.T) {
	for _, c := range []struct {
		mu float64
		x  vec.V
		dt float64
	}{{0, vec.V{1, 0, 0}, 1}, {-1, vec.V{1, 0, 0}, 1}, {1, vec.V{}, 1}, {1, vec.V{1, 0, 0}, math.NaN()}} {
		x, _ := Drift(c.mu, c.x, vec.V{0, 1, 0}, c.dt)
		if !math.IsNaN(x[0]) {
			t.Errorf("%s: got %v, want NaN", fmt.Sprint(c), x)
		}
	}
}

func BenchmarkDrift(b *testing.B) {
	x, v := vec.V{1, 0.1, 0}, vec.V{0.05, 1.1, 0.01}
	for i := 0; i < b.N; i++ {
		x, v = Drift(1, x, v, 0.02)
	}
	_ = x
}

// TestExternalDriftMpmath propagates the same float64 states at 40 digits
// with mpmath, by the classical eccentric-anomaly f and g functions
// (Danby, Fundamentals of Celestial Mechanics, sec. 6.4: f = 1 - (a/r0)(1 -
// cos dE), g = dt - (dE - sin dE)/n, fdot = -sqrt(mu a) sin dE/(r r0),
// gdot = 1 - (a/r)(1 - cos dE)), Kepler's equation solved by mpmath's root
// finder: the drift's own error, free of the reference's rounding.
func TestExternalDriftMpmath(t *testing.T) {
	py := external.Python(t)
	type cs struct {
		X, V [3]float64
		Dt   float64
	}
	var cases []cs
	mu := 1.0
	for _, e := range []float64{0, 0.5, 0.9, 0.99} {
		for _, frac := range []float64{0.01, 0.37, 3.7, -12.3} {
			x, v := keplerState(t, mu, Elements{A: 1, E: e, I: 0.4, Node: 1.1, Peri: 2.3, M: 0.7})
			cases = append(cases, cs{x, v, frac * 2 * math.Pi})
		}
	}
	script := `
import json, sys, mpmath as mp
mp.mp.dps = 40
out = []
for c in json.load(sys.stdin):
    x = [mp.mpf(u) for u in c["X"]]; v = [mp.mpf(u) for u in c["V"]]; dt = mp.mpf(c["Dt"])
    mu = mp.mpf(1)
    dot = lambda p, q: sum(pi*qi for pi, qi in zip(p, q))
    r0 = mp.sqrt(dot(x, x)); a = 1/(2/r0 - dot(v, v)/mu); n = mp.sqrt(mu/a**3)
    ecos = 1 - r0/a; esin = dot(x, v)/mp.sqrt(mu*a)
    E0 = mp.atan2(esin, ecos); e = mp.sqrt(ecos**2 + esin**2)
    M1 = E0 - esin + n*dt
    E1 = mp.findroot(lambda E: E - e*mp.sin(E) - M1, M1)
    dE = E1 - E0
    r = a*(1 - e*mp.cos(E1)) if e > 0 else a
    f = 1 - a/r0*(1 - mp.cos(dE)); g = dt - (dE - mp.sin(dE))/n
    fd = -mp.sqrt(mu*a)*mp.sin(dE)/(r*r0); gd = 1 - a/r*(1 - mp.cos(dE))
    out.append([mp.nstr(f*x[k] + g*v[k], 25) for k in range(3)] + [mp.nstr(fd*x[k] + gd*v[k], 25) for k in range(3)])
print(json.dumps(out))
`
	in, _ := json.Marshal(cases)
	cmd := exec.Command(py, "-c", script)
	cmd.Stdin = bytes.NewReader(in)
	raw, err := cmd.Output()
	if err != nil {
		t.Fatalf("mpmath: %v", err)
	}
	var ref [][6]string
	if err := json.Unmarshal(raw, &ref); err != nil {
		t.Fatalf("mpmath output %q: %v", raw, err)
	}
	worst := 0.0
	for i, c := range cases {
		var want [6]float64
		for k := range want {
			fmt.Sscan(ref[i][k], &want[k])
		}
		gx, gv := Drift(mu, c.X, c.V, c.Dt)
		dx := gx.Sub(vec.V{want[0], want[1], want[2]}).Norm()
		dv := gv.Sub(vec.V{want[3], want[4], want[5]}).Norm() / (vec.V{want[3], want[4], want[5]}).Norm()
		e := math.Sqrt(math.Max(0, 1-vec.V(c.X).Cross(c.V).Norm2()))
		// rounding of the phase: a few ulp per radian travelled, times the
		// speed boost at pericentre
		tol := 2e-15 * (1 + math.Abs(c.Dt)) * math.Sqrt((1+e)/(1-e)) / (1 - e)
		worst = math.Max(worst, dx/(1+math.Abs(c.Dt)))
		if dx > tol || dv > tol {
			t.Errorf("case %d (e=%.2f dt=%.3g): position off by %.3g, velocity by %.3g relative (tol %.2g)", i, e, c.Dt, dx, dv, tol)
		}
	}
	t.Logf("largest position error against mpmath: %.2g a per radian of travel", worst)
}
