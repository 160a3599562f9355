package kepler

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"os/exec"
	"testing"

	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
	"mgorbit/testdata/external"
)

const deg = math.Pi / 180

// angleDiff is a - b reduced to (-pi, pi].
func angleDiff(a, b float64) float64 { return math.Remainder(a-b, 2*math.Pi) }

func relDiff(a, b vec.V) float64 { return a.Sub(b).Norm() / b.Norm() }

// TestRoundTrip: elements -> state -> elements -> state. The tolerance
// 1e-12 is the project's requirement; angles are compared modulo 2 pi, and
// where an angle is undefined (e = 0, i = 0 or pi) the combination that is
// defined (the package comment's conventions) is compared instead.
func TestRoundTrip(t *testing.T) {
	mu := units.GMSun * (1 + 3e-6)
	a := 0.7 * units.AU
	incs := []float64{0, 0.2, 1.1, math.Pi / 2, 2.6, math.Pi}
	angles := [][3]float64{{0.3, 1.9, 0.4}, {4.0, 5.5, 3.1}, {2.2, 0.05, 6.1}, {5.9, 3.3, 1e-3}}
	var worstX, worstV float64
	defer func() { t.Logf("worst state round trip: position %.2g, velocity %.2g relative", worstX, worstV) }()
	for _, e := range []float64{0, 0.5, 0.9, 0.99} {
		for _, inc := range incs {
			for _, ang := range angles {
				in := Elements{A: a, E: e, I: inc, Node: ang[0], Peri: ang[1], M: ang[2]}
				name := fmt.Sprintf("e=%g/i=%g/%v", e, inc, ang)
				x, v, err := ToState(mu, in)
				if err != nil {
					t.Fatalf("%s: %v", name, err)
				}
				out, err := FromState(mu, x, v)
				if err != nil {
					t.Fatalf("%s: %v", name, err)
				}
				x2, v2, err := ToState(mu, out)
				if err != nil {
					t.Fatalf("%s: %v", name, err)
				}
				worstX = math.Max(worstX, relDiff(x2, x))
				worstV = math.Max(worstV, relDiff(v2, v))
				if d := relDiff(x2, x); d > 1e-12 {
					t.Errorf("%s: position round trip off by %.2g relative", name, d)
				}
				if d := relDiff(v2, v); d > 1e-12 {
					t.Errorf("%s: velocity round trip off by %.2g relative", name, d)
				}
				if d := math.Abs(out.A-a) / a; d > 1e-12 {
					t.Errorf("%s: a off by %.2g relative", name, d)
				}
				if d := math.Abs(out.E - e); d > 1e-12 {
					t.Errorf("%s: e = %.17g", name, out.E)
				}
				if d := math.Abs(out.I - inc); d > 1e-12 {
					t.Errorf("%s: i = %.17g", name, out.I)
				}
				checkAngles(t, name, in, out)
			}
		}
	}
}

func checkAngles(t *testing.T, name string, in, out Elements) {
	t.Helper()
	type pair struct {
		what      string
		got, want float64
	}
	var checks []pair
	circular := in.E == 0
	switch {
	case in.I == 0:
		if out.Node != 0 {
			t.Errorf("%s: equatorial orbit got node %g, want the convention 0", name, out.Node)
		}
		if circular {
			checks = append(checks, pair{"true longitude node+peri+M", out.Node + out.Peri + out.M, in.Node + in.Peri + in.M})
		} else {
			checks = append(checks, pair{"longitude of pericentre node+peri", out.Node + out.Peri, in.Node + in.Peri},
				pair{"M", out.M, in.M})
		}
	case in.I == math.Pi:
		if out.Node != 0 {
			t.Errorf("%s: retrograde equatorial orbit got node %g, want the convention 0", name, out.Node)
		}
		if circular {
			checks = append(checks, pair{"peri+M-node", out.Peri + out.M - out.Node, in.Peri + in.M - in.Node})
		} else {
			checks = append(checks, pair{"peri-node", out.Peri - out.Node, in.Peri - in.Node}, pair{"M", out.M, in.M})
		}
	default:
		checks = append(checks, pair{"node", out.Node, in.Node})
		if circular {
			checks = append(checks, pair{"argument of latitude peri+M", out.Peri + out.M, in.Peri + in.M})
		} else {
			checks = append(checks, pair{"peri", out.Peri, in.Peri}, pair{"M", out.M, in.M})
		}
	}
	if circular && out.Peri != 0 {
		t.Errorf("%s: circular orbit got peri %g, want the convention 0", name, out.Peri)
	}
	for _, c := range checks {
		if d := angleDiff(c.got, c.want); math.Abs(d) > 1e-12 {
			t.Errorf("%s: %s off by %.2g rad", name, c.what, d)
		}
	}
	for _, a := range []float64{out.Node, out.Peri, out.M} {
		if a < 0 || a >= 2*math.Pi {
			t.Errorf("%s: angle %g outside [0, 2 pi)", name, a)
		}
	}
}

// TestKeplerResidual: the returned E satisfies Kepler's equation
// E - e sin E = M to round-off, including e close to 1 and M near 0.
func TestKeplerResidual(t *testing.T) {
	Ms := []float64{0, 1e-12, 1e-6, 1e-3, 0.1, 1, 2, 3, math.Pi, 3.2, 5, 6.2, -0.5, -3, 12.5, -40, 1000}
	for _, e := range []float64{0, 1e-8, 0.1, 0.5, 0.9, 0.99, 0.999, 0.999999} {
		for _, M := range Ms {
			E := SolveKepler(M, e)
			res := E - e*math.Sin(E) - M
			// a few ulp of the terms: |E| and |M|
			if tol := 4e-16 * (1 + math.Abs(E)); math.Abs(res) > tol {
				t.Errorf("e=%g M=%g: E=%.17g residual %.3g > %.3g", e, M, E, res, tol)
			}
			// the root lies within e of M (|sin E| <= 1)
			if math.Abs(E-M) > e+1e-15*(1+math.Abs(M)) {
				t.Errorf("e=%g M=%g: E=%g is more than e from M", e, M, E)
			}
		}
	}
}

// TestKeplerPublished compares with solved textbook examples of Kepler's
// equation; each tolerance is half a unit of the last printed digit.
func TestKeplerPublished(t *testing.T) {
	cases := []struct {
		src     string
		M, e    float64
		E, half float64 // rad
	}{
		// Meeus, Astronomical Algorithms (2nd ed.), Example 30.a:
		// e = 0.1, M = 5 deg -> E = 5.554 589 deg (memory).
		{"Meeus Example 30.a", 5 * deg, 0.1, 5.554589 * deg, 0.5e-6 * deg},
		// Meeus, Astronomical Algorithms, Chapter 30, the e = 0.99, M = 2 deg
		// case that defeats plain iteration: E = 32.361 007 deg (memory).
		{"Meeus ch. 30, e = 0.99", 2 * deg, 0.99, 32.361007 * deg, 0.5e-6 * deg},
		// Vallado, Fundamentals of Astrodynamics and Applications,
		// Example 2-1: M = 235.4 deg, e = 0.4 -> E = 220.512 074 767 522 deg (memory).
		{"Vallado Example 2-1", 235.4 * deg, 0.4, 220.512074767522 * deg, 0.5e-12 * deg},
		// Curtis, Orbital Mechanics for Engineering Students, Example 3.2:
		// e = 0.37255, M = 3.6029 rad -> E = 3.4794 rad (memory).
		{"Curtis Example 3.2", 3.6029, 0.37255, 3.4794, 0.5e-4},
	}
	for _, c := range cases {
		E := SolveKepler(c.M, c.e)
		if math.Abs(E-c.E) > c.half {
			t.Errorf("%s: E = %.15g rad (%.12g deg), published %.15g rad", c.src, E, E/deg, c.E)
		}
	}
}

// TestFromStatePublished: Vallado, Fundamentals of Astrodynamics and
// Applications, Example 2-5 (state to elements, Earth mu = 398 600.4418
// km^3/s^2): r = (6524.834, 6862.875, 6448.296) km, v = (4.901327, 5.533756,
// -1.976341) km/s give e = 0.832 853, i = 87.87 deg, node = 227.89 deg,
// argument of perigee = 53.38 deg, true anomaly = 92.335 deg, p = 11 067.8 km
// (memory). The trailing digits of i, p and a are not recalled reliably, so
// those are checked to four or five significant figures only.
func TestFromStatePublished(t *testing.T) {
	mu := 398600.4418e9
	x := vec.V{6524.834e3, 6862.875e3, 6448.296e3}
	v := vec.V{4.901327e3, 5.533756e3, -1.976341e3}
	el, err := FromState(mu, x, v)
	if err != nil {
		t.Fatal(err)
	}
	E := SolveKepler(el.M, el.E)
	// true anomaly from E: tan(f/2) = sqrt((1+e)/(1-e)) tan(E/2) (standard)
	f := 2 * math.Atan2(math.Sqrt(1+el.E)*math.Sin(E/2), math.Sqrt(1-el.E)*math.Cos(E/2))
	p := el.A * (1 - el.E*el.E)
	checks := []struct {
		what            string
		got, want, half float64
	}{
		{"e", el.E, 0.832853, 0.5e-6},
		{"i (deg)", el.I / deg, 87.87, 0.005},
		{"node (deg)", el.Node / deg, 227.89, 0.005 + 0.005}, // printed 227.89 or 227.898
		{"argument of perigee (deg)", el.Peri / deg, 53.38, 0.005},
		{"true anomaly (deg)", wrap(f) / deg, 92.335, 0.0005},
		{"p (km)", p / 1e3, 11067.8, 0.05},
	}
	for _, c := range checks {
		if math.Abs(c.got-c.want) > c.half {
			t.Errorf("Vallado Example 2-5: %s = %.8g, published %g", c.what, c.got, c.want)
		}
	}
}

// TestConservedQuantities checks the state against the two-body formulas:
// vis-viva v^2 = mu (2/r - 1/a), specific energy -mu/(2a), angular momentum
// sqrt(mu a (1 - e^2)) and r = a (1 - e cos E) (standard formulas).
func TestConservedQuantities(t *testing.T) {
	mu := 3.986004418e14
	for _, e := range []float64{0, 0.2, 0.5, 0.9, 0.99} {
		for _, M := range []float64{0, 0.7, 2.0, math.Pi, 4.5} {
			el := Elements{A: 2.5e7, E: e, I: 0.9, Node: 1.3, Peri: 2.1, M: M}
			x, v, err := ToState(mu, el)
			if err != nil {
				t.Fatal(err)
			}
			r := x.Norm()
			E := SolveKepler(M, e)
			if d := math.Abs(r-el.A*(1-e*math.Cos(E))) / r; d > 1e-14 {
				t.Errorf("e=%g M=%g: r off by %.2g relative", e, M, d)
			}
			// round-off bound: a few ulp of the larger terms over the result
			// (mu (2/r - 1/a) cancels by up to 1/200 at apocentre for e = 0.99)
			if d, tol := math.Abs(v.Norm2()-mu*(2/r-1/el.A)), 8e-16*mu*(2/r+1/el.A); d > tol {
				t.Errorf("e=%g M=%g: vis-viva off by %.2g > %.2g", e, M, d, tol)
			}
			want := -mu / (2 * el.A)
			// v^2/2 - mu/r cancels by up to (1-e)/2 near pericentre
			if d, tol := math.Abs(0.5*v.Norm2()-mu/r-want), 8e-16*(0.5*v.Norm2()+mu/r); d > tol {
				t.Errorf("e=%g M=%g: energy off by %.2g > %.2g", e, M, d, tol)
			}
			h := math.Sqrt(mu * el.A * (1 - e*e))
			if d := math.Abs(x.Cross(v).Norm()-h) / h; d > 1e-14 {
				t.Errorf("e=%g M=%g: angular momentum off by %.2g relative", e, M, d)
			}
		}
	}
}

// TestPeriod: for the nominal solar GM and 1 au, Kepler's third law gives the
// Gaussian year 2 pi / k = 365.256 898 3 d (k = 0.017 202 098 95, IAU;
// memory). The nominal GM equals k^2 au^3/d^2 to 1.4e-10, hence the tolerance.
func TestPeriod(t *testing.T) {
	P := Period(units.GMSun, units.AU) / units.Day
	if math.Abs(P-365.2568983)/365.2568983 > 3e-10 {
		t.Errorf("Period(GMSun, 1 au) = %.10f d, want 365.2568983 d", P)
	}
}

func TestErrors(t *testing.T) {
	mu := 1e20
	bad := []Elements{
		{A: 1e11, E: 1},
		{A: 1e11, E: -0.1},
		{A: 0, E: 0.1},
		{A: -1e11, E: 0.1},
		{A: 1e11, E: math.NaN()},
		{A: 1e11, E: 0.1, M: math.Inf(1)},
	}
	for _, el := range bad {
		if _, _, err := ToState(mu, el); err == nil {
			t.Errorf("ToState(%+v) accepted", el)
		}
	}
	if _, _, err := ToState(0, Elements{A: 1, E: 0}); err == nil {
		t.Error("ToState with mu = 0 accepted")
	}
	// escape speed sqrt(2 mu/r) and above are unbound
	r := 1e11
	vesc := math.Sqrt(2 * mu / r)
	if _, err := FromState(mu, vec.V{r, 0, 0}, vec.V{0, vesc * 1.0001, 0}); err == nil {
		t.Error("FromState accepted a hyperbolic state")
	}
	if _, err := FromState(mu, vec.V{r, 0, 0}, vec.V{-1000, 0, 0}); err == nil {
		t.Error("FromState accepted a radial state")
	}
}

// TestExternalKeplerMpmath compares SolveKepler with mpmath's root finder at
// 40 digits over a grid of e and M.
func TestExternalKeplerMpmath(t *testing.T) {
	py := external.Python(t)
	es := []float64{0.01, 0.3, 0.7, 0.95, 0.99, 0.9999}
	Ms := []float64{1e-9, 1e-4, 0.01, 0.3, 1.5, 2.9, 3.14, 4.0, 6.0}
	script := `
import json, sys, mpmath as mp
mp.mp.dps = 40
es, Ms = json.load(sys.stdin)
out = []
for e in es:
    row = []
    for M in Ms:
        e_, M_ = mp.mpf(e), mp.mpf(M)
        E = mp.findroot(lambda x: x - e_*mp.sin(x) - M_, (mp.mpf(0), 2*mp.pi), solver='anderson')
        row.append(mp.nstr(E, 25))
    out.append(row)
print(json.dumps(out))
`
	in, _ := json.Marshal([2][]float64{es, Ms})
	cmd := exec.Command(py, "-c", script)
	cmd.Stdin = bytes.NewReader(in)
	raw, err := cmd.Output()
	if err != nil {
		t.Fatalf("mpmath: %v", err)
	}
	var ref [][]string
	if err := json.Unmarshal(raw, &ref); err != nil {
		t.Fatalf("mpmath output %q: %v", raw, err)
	}
	worst := 0.0
	for i, e := range es {
		for j, M := range Ms {
			var want float64
			fmt.Sscan(ref[i][j], &want)
			got := SolveKepler(M, e)
			d := math.Abs(got - want)
			worst = math.Max(worst, d/(1+want))
			if d > 2e-15*(1+want) {
				t.Errorf("e=%g M=%g: E = %.17g, mpmath %s", e, M, got, ref[i][j])
			}
		}
	}
	t.Logf("largest difference from mpmath: %.2g (relative to 1+E)", worst)
}
