package reference

import (
	"bytes"
	"encoding/json"
	"math"
	"os/exec"
	"strconv"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"

	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
	"mgorbit/testdata/external"
)

type mpCase struct {
	Mu     float64 `json:"mu"`
	Alpha  float64 `json:"alpha"`
	Lambda float64 `json:"lambda"`
	RMin   float64 `json:"rmin,omitempty"`
	RMax   float64 `json:"rmax,omitempty"`
	R      float64 `json:"r,omitempty"`
	VR     float64 `json:"vr,omitempty"`
	VT     float64 `json:"vt,omitempty"`
}

type mpResult struct {
	Advance      string `json:"advance"`
	RadialPeriod string `json:"radial_period"`
	RMin         string `json:"rmin"`
	RMax         string `json:"rmax"`
}

// runMpmath evaluates the apsidal integrals from their definition at 40
// digits (testdata/mpmath/apsidal.py).
func runMpmath(t *testing.T, cases []mpCase) []mpResult {
	t.Helper()
	py := external.Python(t)
	in, err := json.Marshal(cases)
	if err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(py, "../../testdata/mpmath/apsidal.py")
	cmd.Stdin = bytes.NewReader(in)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("apsidal.py: %v\n%s", err, stderr.String())
	}
	var res []mpResult
	if err := json.Unmarshal(out, &res); err != nil {
		t.Fatalf("apsidal.py output %q: %v", out, err)
	}
	if len(res) != len(cases) {
		t.Fatalf("apsidal.py returned %d results for %d cases", len(res), len(cases))
	}
	return res
}

func num(t *testing.T, s string) float64 {
	t.Helper()
	f, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatal(err)
	}
	return f
}

// naiveAdvance is the textbook quadrature in plain float64, the Newtonian
// part included: 2 Int h dr/(r^2 sqrt(2(E - Phi) - h^2/r^2)) - 2 pi with
// r = rc - ra cos(theta), n-point Gauss-Legendre. Kept only to show what
// the package exists to avoid.
func naiveAdvance(mu, rmin, rmax float64, corr Correction, n int) float64 {
	phi := func(r float64) float64 { _, p := corr(mu, r); return -mu/r + p }
	h2 := 2 * (phi(rmax) - phi(rmin)) / (1/(rmin*rmin) - 1/(rmax*rmax))
	energy := phi(rmin) + h2/(2*rmin*rmin)
	rc, ra := (rmin+rmax)/2, (rmax-rmin)/2
	f := func(th float64) float64 {
		r := rc - ra*math.Cos(th)
		q := 2*(energy-phi(r)) - h2/(r*r)
		return math.Sqrt(h2) * ra * math.Sin(th) / (r * r * math.Sqrt(math.Max(q, 0)))
	}
	return 2*quad.Fixed(f, 0, math.Pi, n, quad.Legendre{}, 0) - 2*math.Pi
}

// TestExternalYukawaMpmath: a 1e-9 Yukawa term, 1e-9 of Newton, against
// mpmath's 40-digit quadrature of the defining integrals.
func TestExternalYukawaMpmath(t *testing.T) {
	mu, a := units.GMSun, units.AU
	const alpha = 1e-9
	type orbit struct{ lambda, e float64 }
	orbits := []orbit{{1, 0.1}, {1, 0.6}, {0.3, 0.6}, {5, 0.1}, {0.5, 0.9}}
	var cases []mpCase
	for _, o := range orbits {
		cases = append(cases, mpCase{Mu: mu, Alpha: alpha, Lambda: o.lambda * a, RMin: a * (1 - o.e), RMax: a * (1 + o.e)})
	}
	// One orbit given by a state, neither apse: FromState's roots too.
	stateR, stateVR, stateVT := a, 9e3, 3.6e4
	cases = append(cases, mpCase{Mu: mu, Alpha: alpha, Lambda: a, R: stateR, VR: stateVR, VT: stateVT})

	want := runMpmath(t, cases)
	worstNaive := 0.0
	for i, c := range cases {
		corr := yukawa(c.Alpha, c.Lambda)
		var ex Exact
		var err error
		if c.R == 0 {
			ex, err = FromApsides(c.Mu, c.RMin, c.RMax, corr)
		} else {
			ex, err = FromState(c.Mu, vec.V{c.R, 0, 0}, vec.V{c.VR, c.VT, 0}, corr)
		}
		if err != nil {
			t.Fatal(err)
		}
		wantAdv := num(t, want[i].Advance)
		wantP := num(t, want[i].RadialPeriod)
		relAdv := ex.AdvancePerOrbit/wantAdv - 1
		relP := ex.RadialPeriod/wantP - 1
		naive := naiveAdvance(c.Mu, ex.RMin, ex.RMax, corr, 256)
		t.Logf("lambda=%.2f au e=%.3f: advance %.6e rad, rel err %.1e; P_r rel err %.1e (%d nodes, tol %.0e); naive float64 advance %.3e (rel err %.1e)",
			c.Lambda/a, ex.Eccentricity, ex.AdvancePerOrbit, relAdv, relP, ex.Nodes, ex.Tolerance, naive, naive/wantAdv-1)
		worstNaive = math.Max(worstNaive, math.Abs(naive/wantAdv-1))
		// 1e-10: the accuracy the package claims for the anomaly (the brief
		// asked for 1e-6; measured here ~1e-13).
		if math.Abs(relAdv) > 1e-10 {
			t.Errorf("case %d: anomalous advance %.12e, mpmath %.12e (rel %.1e)", i, ex.AdvancePerOrbit, wantAdv, relAdv)
		}
		if math.Abs(relP) > 1e-13 {
			t.Errorf("case %d: radial period %.16e s, mpmath %.16e (rel %.1e)", i, ex.RadialPeriod, wantP, relP)
		}
		if c.R != 0 {
			// Roots from a state: bisected to rounding, ~1e-16 relative
			// (common practice: 1e-12 leaves room for Q's rounding near a
			// simple root).
			for _, p := range []struct {
				got  float64
				want string
			}{{ex.RMin, want[i].RMin}, {ex.RMax, want[i].RMax}} {
				if rel := math.Abs(p.got/num(t, p.want) - 1); rel > 1e-12 {
					t.Errorf("state case: apse %.16e, mpmath %s (rel %.1e)", p.got, p.want, rel)
				}
			}
		}
	}
	// Plain float64 quadrature of the same integral loses the anomaly to
	// rounding in the radicand, which vanishes at the apsides: here it was
	// off by 3% to 260% (measured). Asserted loosely, since its error is
	// rounding and may move with the platform: more than 1% somewhere.
	if worstNaive < 1e-2 {
		t.Errorf("naive float64 quadrature came within %.1e of mpmath on every orbit: the exact path's reason to exist is gone?", worstNaive)
	}
}
