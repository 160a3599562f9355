package special

import (
	"bytes"
	"encoding/json"
	"math"
	"os/exec"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/gonum/diff/fd"

	"mgorbit/testdata/external"
)

// within reports |got - want| <= abs + rel |want|.
func within(got, want, abs, rel float64) bool {
	return math.Abs(got-want) <= abs+rel*math.Abs(want)
}

func TestPhysicsCheckValues(t *testing.T) {
	// PHYSICS.md, item 4 (A&S Table 5.2 values), given to 12 significant
	// digits: the tolerance is half a unit of the 12th.
	cases := []struct {
		x, f, g float64
	}{
		{1, 0.621449624236, 0.343377961556},
		{10, 0.0981910350102, 0.00948853901635},
	}
	for _, c := range cases {
		f, g := AuxFG(c.x)
		if !within(f, c.f, 0.5e-11*digitUnit(c.f), 0) || !within(g, c.g, 0.5e-11*digitUnit(c.g), 0) {
			t.Errorf("x = %g: f, g = %.15g, %.15g; want %.12g, %.12g", c.x, f, g, c.f, c.g)
		}
	}
}

// digitUnit is the power of ten of a value's leading digit, to turn "12
// significant digits" into an absolute tolerance.
func digitUnit(v float64) float64 { return math.Pow(10, math.Floor(math.Log10(math.Abs(v)))) }

func TestHandbookValues(t *testing.T) {
	// Si and Ci to 15 digits as in A&S Table 5.1 (memory); the tolerance is
	// one unit of the 15th digit.
	cases := []struct{ x, si, ci float64 }{
		{1, 0.946083070367183, 0.337403922900968},
		{2, 1.60541297680269, 0.422980828774865},
		{5, 1.54993124494467, -0.190029749656644},
		{10, 1.65834759421887, -0.0454564330044554},
	}
	for _, c := range cases {
		si, ci := SiCi(c.x)
		if !within(si, c.si, 1e-15*10*digitUnit(c.si), 0) || !within(ci, c.ci, 1e-15*10*digitUnit(c.ci), 0) {
			t.Errorf("x = %g: Si, Ci = %.16g, %.16g; want %.15g, %.15g", c.x, si, ci, c.si, c.ci)
		}
	}
	// Si(pi) is the Wilbraham-Gibbs integral 1.851937051982466 (memory).
	if got := Si(math.Pi); !within(got, 1.851937051982466, 2e-15, 0) {
		t.Errorf("Si(pi) = %.16g, want 1.851937051982466", got)
	}
	// Limits (A&S 5.2.1, 5.2.2 definitions): Si -> pi/2, Ci -> 0 at infinity;
	// Si odd; at small x the first terms of A&S 5.2.14, 5.2.16 (memory),
	// Si = x - x^3/18 + x^5/600 and Ci = gamma + ln x - x^2/4 + x^4/96, with the
	// next terms (x^7/35280, x^6/4320) far below the tolerance.
	if si, ci := SiCi(math.Inf(1)); si != math.Pi/2 || ci != 0 {
		t.Errorf("SiCi(inf) = %g, %g", si, ci)
	}
	if Si(-2.5) != -Si(2.5) {
		t.Errorf("Si is not odd: Si(-2.5) = %g, Si(2.5) = %g", Si(-2.5), Si(2.5))
	}
	for _, x := range []float64{1e-3, 1e-8, 1e-100} {
		x2 := x * x
		want := EulerGamma + math.Log(x) - x2/4 + x2*x2/96
		if got := Ci(x); !within(got, want, 0, 4e-16) {
			t.Errorf("Ci(%g) = %.17g, want %.17g", x, got, want)
		}
		if got, want := Si(x), x-x*x2/18+x*x2*x2/600; !within(got, want, 0, 2e-16) {
			t.Errorf("Si(%g) = %.17g, want %.17g", x, got, want)
		}
	}
	if !math.IsNaN(Ci(-1)) || !math.IsInf(Ci(0), -1) {
		t.Errorf("Ci(-1) = %g, Ci(0) = %g; want NaN, -Inf", Ci(-1), Ci(0))
	}
}

func TestAsymptoticEnvelope(t *testing.T) {
	// f(x) = Int_0^inf e^(-xt)/(1+t^2) dt (A&S 5.2.12, memory): expanding
	// 1/(1+t^2) to n terms leaves a remainder below the first omitted term, so
	// |f - (1/x)(1 - 2/x^2 + 24/x^4)| <= 720/x^7, and the same for
	// g = Int t e^(-xt)/(1+t^2) dt: |g - (1/x^2)(1 - 6/x^2 + 120/x^4)| <= 5040/x^8.
	// The x are below and above the switch to the asymptotic series.
	for _, x := range []float64{20, 30, 47, 49, 100, 1e3} {
		f, g := AuxFG(x)
		x2 := x * x
		fs := (1 - 2/x2 + 24/(x2*x2)) / x
		gs := (1 - 6/x2 + 120/(x2*x2)) / x2
		if math.Abs(f-fs) > 720/math.Pow(x, 7)+1e-16*f {
			t.Errorf("x = %g: f = %.17g, three-term series %.17g", x, f, fs)
		}
		if math.Abs(g-gs) > 5040/math.Pow(x, 8)+1e-16*g {
			t.Errorf("x = %g: g = %.17g, three-term series %.17g", x, g, gs)
		}
	}
}

func TestDerivatives(t *testing.T) {
	// Si' = sin x / x and Ci' = cos x / x (the definitions, A&S 5.2.1-2);
	// f' = -g and g' = f - 1/x (follow from differentiating A&S 5.2.6-7
	// with the two above). A five-point stencil with step h = 1e-3 min(x, 1) has
	// error ~ h^4 |u^(5)|/30 + 1e-16 |u|/h, under 1e-12 (1 + |u'|) here.
	stencil := fd.Formula{
		Stencil: []fd.Point{
			{Loc: -2, Coeff: 1.0 / 12}, {Loc: -1, Coeff: -8.0 / 12},
			{Loc: 1, Coeff: 8.0 / 12}, {Loc: 2, Coeff: -1.0 / 12},
		},
		Derivative: 1,
	}
	deriv := func(fn func(float64) float64, x float64) float64 {
		st := stencil
		st.Step = 1e-3 * math.Min(x, 1)
		return fd.Derivative(fn, x, &fd.Settings{Formula: st})
	}
	auxF := func(x float64) float64 { f, _ := AuxFG(x); return f }
	auxG := func(x float64) float64 { _, g := AuxFG(x); return g }
	// points on both sides of each switch of method (1, 1.5, 48) and in
	// zero windows
	for _, x := range []float64{0.3, 0.62, 0.999, 1.001, 1.499, 1.501, 3.39, 5, 12, 47.99, 48.01, 200} {
		sin, cos := math.Sincos(x)
		f, g := AuxFG(x)
		checks := []struct {
			name      string
			got, want float64
		}{
			{"Si'", deriv(Si, x), sin / x},
			{"Ci'", deriv(Ci, x), cos / x},
			{"f'", deriv(auxF, x), -g},
			{"g'", deriv(auxG, x), f - 1/x},
		}
		for _, c := range checks {
			if !within(c.got, c.want, 1e-11, 1e-11) {
				t.Errorf("x = %g: %s = %.13g by differences, want %.13g", x, c.name, c.got, c.want)
			}
		}
	}
}

func TestDeficitsSmallX(t *testing.T) {
	// From the series A&S 5.2.14, 5.2.16 (memory) put into the deficit forms:
	// 1 - (2/pi) f = (2/pi) x (1 - gamma - ln x) + x^2/2 + O(x^3 ln x),
	// 1 - (2/pi)(f + x g) = (2/pi) x - x^2/2 + O(x^3 ln x): the force ratio
	// 1 - (2/pi) x of PHYSICS.md item 4 plus its next term, derived here.
	for _, x := range []float64{1e-3, 1e-5, 1e-8, 1e-12, 1e-15} {
		phi, force := CrossoverDeficits(x)
		next := x * x * x * (1 - math.Log(x))
		wantPhi := twoOverPi*x*(1-EulerGamma-math.Log(x)) + x*x/2
		wantForce := twoOverPi*x - x*x/2
		if math.Abs(phi-wantPhi) > next+2e-16*wantPhi {
			t.Errorf("x = %g: potential deficit %.17g, want %.17g", x, phi, wantPhi)
		}
		if math.Abs(force-wantForce) > next+2e-16*wantForce {
			t.Errorf("x = %g: force deficit %.17g, want %.17g", x, force, wantForce)
		}
		if CrossoverDeficit(x) != phi || CrossoverForceDeficit(x) != force {
			t.Errorf("x = %g: single deficits differ from the pair", x)
		}
	}
	if p, f := CrossoverDeficits(0); p != 0 || f != 0 {
		t.Errorf("deficits at 0 = %g, %g", p, f)
	}
	if p, f := CrossoverDeficits(math.Inf(1)); p != 1 || f != 1 {
		t.Errorf("deficits at inf = %g, %g", p, f)
	}
}

// referenceGrid is where the outside readers are compared: log-spaced over
// 1e-6..1e4, a fine linear grid over 0..60 through every switch of method,
// points closing in on the first zeros of Ci, and small x for the deficits.
func referenceGrid() (xs []float64, nearZero []bool) {
	add := func(x float64, near bool) {
		xs = append(xs, x)
		nearZero = append(nearZero, near)
	}
	for i := 0; i <= 400; i++ {
		add(1e-6*math.Pow(1e10, float64(i)/400), false)
	}
	for i := 1; i <= 1200; i++ {
		add(0.05*float64(i)+0.0123, false)
	}
	for _, w := range ciZeroWindows {
		z := w.hi
		add(z, true)
		add(math.Nextafter(z, 0), true)
		add(math.Nextafter(z, 100), true)
		for j := 1; j <= 15; j++ {
			d := math.Pow(10, -float64(j))
			add(z*(1+d), true)
			add(z*(1-d), true)
			add(z+0.9*w.radius*d*10, true)
		}
	}
	for i := 0; i <= 40; i++ {
		add(1e-15*math.Pow(1e9, float64(i)/40), false)
	}
	return xs, nearZero
}

// reference runs testdata/mpmath/sici.py in the given mode on xs.
func reference(t *testing.T, mode string, xs []float64) map[string][]float64 {
	t.Helper()
	py := external.Python(t)
	var in strings.Builder
	for _, x := range xs {
		in.WriteString(strconv.FormatFloat(x, 'g', -1, 64))
		in.WriteByte('\n')
	}
	cmd := exec.Command(py, "../../testdata/mpmath/sici.py", mode)
	cmd.Stdin = strings.NewReader(in.String())
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("sici.py %s: %v\n%s", mode, err, stderr.String())
	}
	ref := map[string][]float64{}
	if err := json.Unmarshal(out, &ref); err != nil {
		t.Fatalf("sici.py %s output: %v", mode, err)
	}
	for k, v := range ref {
		if len(v) != len(xs) {
			t.Fatalf("sici.py %s: %d values of %s for %d points", mode, len(v), k, len(xs))
		}
	}
	return ref
}

func TestExternalMpmath(t *testing.T) {
	xs, nearZero := referenceGrid()
	ref := reference(t, "mpmath", xs)
	const abs, rel = 1e-14, 1e-13 // the accuracy this package promises
	ours := map[string]func(x float64) float64{
		"si":     Si,
		"ci":     Ci,
		"f":      func(x float64) float64 { f, _ := AuxFG(x); return f },
		"g":      func(x float64) float64 { _, g := AuxFG(x); return g },
		"dphi":   CrossoverDeficit,
		"dforce": CrossoverForceDeficit,
	}
	for name, fn := range ours {
		want := ref[name]
		worst, worstX := 0.0, 0.0 // error in units of the tolerance
		maxRel, maxRelX := 0.0, 0.0
		for i, x := range xs {
			got := fn(x)
			e := math.Abs(got-want[i]) / (abs + rel*math.Abs(want[i]))
			if e > worst {
				worst, worstX = e, x
			}
			if r := math.Abs(got-want[i]) / math.Abs(want[i]); r > maxRel {
				maxRel, maxRelX = r, x
			}
			if e > 1 {
				t.Errorf("%s(%v) = %.17g, mpmath %.17g", name, x, got, want[i])
			}
		}
		t.Logf("%-6s worst error %.3g of the tolerance at x = %g; largest relative error %.3g at x = %g",
			name, worst, worstX, maxRel, maxRelX)
	}
	// Near its zeros Ci keeps its relative accuracy (the series about the zeros).
	maxRel := 0.0
	for i, x := range xs {
		if !nearZero[i] {
			continue
		}
		r := math.Abs(Ci(x)-ref["ci"][i]) / math.Abs(ref["ci"][i])
		maxRel = math.Max(maxRel, r)
		if r > rel {
			t.Errorf("Ci(%v) = %.17g, mpmath %.17g: relative error %.3g near a zero", x, Ci(x), ref["ci"][i], r)
		}
	}
	t.Logf("Ci near its first seven zeros: largest relative error %.3g", maxRel)
}

func TestExternalSciPy(t *testing.T) {
	xs, _ := referenceGrid()
	ref := reference(t, "scipy", xs)
	// SciPy's sici is a double-precision code good to ~1e-14 (its own
	// documentation and common practice): a looser second reader.
	const abs, rel = 1e-14, 1e-13
	worst := 0.0
	for i, x := range xs {
		si, ci := SiCi(x)
		for _, c := range []struct {
			name      string
			got, want float64
		}{{"Si", si, ref["si"][i]}, {"Ci", ci, ref["ci"][i]}} {
			e := math.Abs(c.got-c.want) / (abs + rel*math.Abs(c.want))
			worst = math.Max(worst, e)
			if e > 1 {
				t.Errorf("%s(%v) = %.17g, SciPy %.17g", c.name, x, c.got, c.want)
			}
		}
	}
	t.Logf("largest difference from SciPy: %.3g of the tolerance", worst)
}
