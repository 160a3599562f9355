package kernels

import (
	"bytes"
	"encoding/json"
	"math"
	"os/exec"
	"slices"
	"strings"
	"testing"

	"mgorbit/kernels/vec"
	"mgorbit/testdata/external"
)

func twNew(t testing.TB, num map[string]float64, str map[string]string) *Tower {
	t.Helper()
	k, err := New("tower", Values{Num: num, Str: str})
	if err != nil {
		t.Fatalf("New(tower, %v %v): %v", num, str, err)
	}
	return k.(*Tower)
}

// twSums returns the correction's mode sums at r: phi = -(mu/r) sp and
// a_r = -(mu/r^2) sa, so sp = t Sum w e^(-m r), sa = t Sum w (1 + m r) e^(-m r).
func twSums(tw *Tower, r float64) (sp, sa float64) {
	ar, phi := tw.Radial(1, r)
	return -phi * r, -ar * r * r
}

// r >> L: only the lightest massive modes are left, w e^(-m r) of Newton
// with m and w from the mode formulas (PHYSICS.md, finite tower). On the
// circle the next mode is e^(-60) smaller; the open chain's lightest mode is
// pi/L, half the circle's, and its second is kept; the continuum torus keeps
// the shells |k|^2 = 1, 2, 3 (4, 4 vectors for d = 2; 6, 12, 8 for d = 3),
// the fourth shell being e^(-62.8) smaller than the first. The stack's force
// is Newton's times 1 + the force sum, to the last bit.
func TestTowerLargeDistanceIsNewton(t *testing.T) {
	const l, n = 2.5, 10.0
	r := 10 * l
	type mode struct{ m, w float64 }
	m1 := 2 * n / l * math.Sin(math.Pi/n)
	k1 := 2 * math.Pi / l
	mOpen := func(p float64) mode {
		return mode{2 * n / l * math.Sin(math.Pi*p/(2*n)), 2 * math.Pow(math.Cos(math.Pi*p/(2*n)), 2)}
	}
	inf := math.Inf(1)
	cases := []struct {
		name  string
		num   map[string]float64
		str   map[string]string
		modes []mode
	}{
		{"periodic", map[string]float64{"sites": n, "circumference": l}, nil, []mode{{m1, 2}}},
		{"spin2", map[string]float64{"sites": n, "circumference": l}, map[string]string{"modes": "spin2"}, []mode{{m1, 2 * 4.0 / 3}}},
		{"separation 3", map[string]float64{"sites": n, "circumference": l, "separation": 3}, nil, []mode{{m1, 2 * math.Cos(2*math.Pi*3/n)}}},
		{"open", map[string]float64{"sites": n, "circumference": l}, map[string]string{"chain": "open"}, []mode{mOpen(1), mOpen(2)}},
		{"continuum", map[string]float64{"sites": inf, "circumference": l}, nil, []mode{{k1, 2}}},
		{"continuum d=2", map[string]float64{"sites": inf, "circumference": l, "dimensions": 2}, nil,
			[]mode{{k1, 4}, {k1 * math.Sqrt2, 4}}},
		{"continuum d=3", map[string]float64{"sites": inf, "circumference": l, "dimensions": 3}, nil,
			[]mode{{k1, 6}, {k1 * math.Sqrt2, 12}, {k1 * math.Sqrt(3), 8}}},
	}
	for _, c := range cases {
		tw := twNew(t, c.num, c.str)
		sp, sa := twSums(tw, r)
		var wantP, wantA float64
		for _, md := range c.modes {
			wantP += md.w * math.Exp(-md.m*r)
			wantA += md.w * (1 + md.m*r) * math.Exp(-md.m*r)
		}
		// the next mode left out is at most 1e-13 of these
		if e := ykwRelErr(sp, wantP); e > 1e-13 {
			t.Errorf("%s: r = 10 L: potential sum %.6g, want %.6g (rel %.2g)", c.name, sp, wantP, e)
		}
		if e := ykwRelErr(sa, wantA); e > 1e-13 {
			t.Errorf("%s: r = 10 L: force sum %.6g, want %.6g (rel %.2g)", c.name, sa, wantA, e)
		}
		x := vec.V{0, 0.6 * r, 0.8 * r}
		a, nw := MustStack(Newton{}, tw).Accel(7, x, vec.V{}), (Newton{}).Accel(7, x, vec.V{})
		if e := math.Abs(a[2]/nw[2] - 1 - wantA); e > 2.3e-16 {
			t.Errorf("%s: r = 10 L: stack force / Newton - 1 = %.3g, want %.3g", c.name, a[2]/nw[2]-1, wantA)
		}
	}
}

// s << r << L: the five-dimensional law Phi = -mu L/(pi r^2) (PHYSICS.md).
// The total is -(mu/r) coth(pi x) in the continuum, x = r/L, whose relative
// excess over 1/(pi x) is (pi x)^2/3 - (pi x)^4/45 (A&S 4.5.67); the lattice
// adds 1/(4 N^2 x^2) (the leading mass deviation, see the convergence test:
// (2 pi^3 x/(3 N^2)) Sum p^3 e^(-2 pi p x) -> 1/(4 pi N^2 x^3)).
// For d extra dimensions Gauss's law in 3 + d space dimensions gives
// Phi = -mu c_d L^d/r^(d+1), c_d = Gamma((d+1)/2)/pi^((d+1)/2), matched to
// G M at r >> L; the periodic images add a relative x^(d+1) Z_d with
// Z_d = Sum_{n != 0} |n|^-(d+1) over Z^d.
func TestTowerHigherDimensionalRegime(t *testing.T) {
	const l = 3.0
	x := 1e-3
	r := x * l
	// N = 1e6: r = 1000 s
	n := 1e6
	fin := twNew(t, map[string]float64{"sites": n, "circumference": l}, nil)
	sp, _ := twSums(fin, r)
	dev := (1 + sp) * math.Pi * x
	want := 1 + math.Pow(math.Pi*x, 2)/3 + 1/(4*n*n*x*x)
	if math.Abs(dev-want) > 1e-10 {
		t.Errorf("N = 1e6, r = 1e-3 L: Phi/(-mu L/(pi r^2)) = %.12f, want %.12f", dev, want)
	}
	cont := twNew(t, map[string]float64{"sites": math.Inf(1), "circumference": l}, nil)
	sp, _ = twSums(cont, r)
	dev = (1 + sp) * math.Pi * x
	want = 1 + math.Pow(math.Pi*x, 2)/3 - math.Pow(math.Pi*x, 4)/45
	if math.Abs(dev-want) > 1e-13 {
		t.Errorf("continuum, r = 1e-3 L: Phi/(-mu L/(pi r^2)) = %.15f, want %.15f", dev, want)
	}

	// Z_2 = 4 zeta(3/2) beta(3/2) = 9.03362 (memory: Zucker's lattice sums;
	// zeta(3/2) = 2.612375 A&S Table 23.3, beta(3/2) = 0.864503 (memory)),
	// Z_3 = 16.53232 (memory: simple cubic lattice sum of |n|^-4). At
	// x = 1e-2 the next image term is O(x^2) relative.
	x = 1e-2
	r = x * l
	for d, z := range map[int]float64{2: 4 * 2.612375348685488 * 0.8645026534612, 3: 16.5323159598} {
		tw := twNew(t, map[string]float64{"sites": math.Inf(1), "circumference": l, "dimensions": float64(d)}, nil)
		sp, _ := twSums(tw, r)
		cd := math.Gamma(float64(d+1)/2) / math.Pow(math.Pi, float64(d+1)/2)
		excess := (1+sp)*math.Pow(x, float64(d))/cd - 1
		if wantEx := math.Pow(x, float64(d+1)) * z; math.Abs(excess/wantEx-1) > 1e-3 {
			t.Errorf("d = %d, r = 1e-2 L: Phi/(-mu c_d L^d/r^(d+1)) - 1 = %.6g, want %.6g", d, excess, wantEx)
		}
	}
}

// r << s: -N mu/r, four-dimensional again, and -(1 + 4(N-1)/3) mu/r for
// spin-2 modes (PHYSICS.md). To first order in r every e^(-m r) is
// 1 - m r, and Sum_p |sin(pi p/N)| = cot(pi/(2N)) (sum of a sine series),
// so the mode sum is N - r (2/s) cot(pi/(2N)) for t = 1.
func TestTowerShortDistance(t *testing.T) {
	const l, n = 1.7, 10.0
	s := l / n
	r := 1e-9 * s
	lin := r * 2 / s / math.Tan(math.Pi/(2*n)) // r Sum_p m_p
	for _, c := range []struct {
		modes string
		tf    float64
	}{{"scalar", 1}, {"spin2", 4.0 / 3}} {
		tw := twNew(t, map[string]float64{"sites": n, "spacing": s}, map[string]string{"modes": c.modes})
		sp, sa := twSums(tw, r)
		want := 1 + c.tf*(n-1) - c.tf*lin
		if math.Abs(1+sp-want) > 1e-14*n {
			t.Errorf("%s: r = 1e-9 s: Phi/(-mu/r) = %.16g, want %.16g", c.modes, 1+sp, want)
		}
		// (1 + m r) e^(-m r) = 1 - (m r)^2/2: the force is the short-distance law to 1e-17
		if math.Abs(1+sa-(1+c.tf*(n-1))) > 1e-14*n {
			t.Errorf("%s: r = 1e-9 s: a_r/(-mu/r^2) = %.16g, want %.16g", c.modes, 1+sa, 1+c.tf*(n-1))
		}
	}
	// two dimensions: N^2 sites act together
	tw := twNew(t, map[string]float64{"sites": 6, "circumference": l, "dimensions": 2}, nil)
	if sp, _ := twSums(tw, 1e-9*l/6); math.Abs(1+sp-36) > 1e-7 {
		t.Errorf("d = 2, N = 6, r = 1e-9 s: Phi/(-mu/r) = %.12g, want 36", 1+sp)
	}
	// r = 0: the short-distance law's infinities, never NaN
	for _, c := range []struct {
		num  map[string]float64
		want float64
	}{
		{map[string]float64{"sites": 10, "circumference": 1}, math.Inf(-1)},
		{map[string]float64{"sites": 4, "circumference": 1, "separation": 2}, math.Inf(1)}, // correction -1: total 0
		{map[string]float64{"sites": 1, "circumference": 1}, 0},
		{map[string]float64{"sites": math.Inf(1), "circumference": 1}, math.Inf(-1)},
		{map[string]float64{"sites": math.Inf(1), "circumference": 1, "dimensions": 3}, math.Inf(-1)},
	} {
		tw := twNew(t, c.num, nil)
		ar, phi := tw.Radial(1, 0)
		if ar != c.want || phi != c.want {
			t.Errorf("%v at r = 0: (%g, %g), want %g", c.num, ar, phi, c.want)
		}
		for _, r := range []float64{1e-300, 1e-160, 1e-30} {
			if ar, phi := tw.Radial(1, r); math.IsNaN(ar) || math.IsNaN(phi) {
				t.Errorf("%v at r = %g: NaN (%g, %g)", c.num, r, ar, phi)
			}
		}
	}
}

// The finite tower converges to the continuum coth(pi x) as N grows at
// fixed L. The mode masses fall short of 2 pi p/L by the factor
// f = sin(theta)/theta = 1 - theta^2/6 + theta^4/120 - theta^6/5040,
// theta = pi p/N, so with beta = 2 pi p x each pair of modes gains
// 2 e^-beta (e^g - 1), g = beta (1 - f), which expands to
// 2 e^-beta [theta^2 beta/6 + theta^4 (beta^2/72 - beta/120)
// + theta^6 (beta^3/1296 - beta^2/720 + beta/5040) + O(theta^8)]:
// the error falls as 1/N^2, with coefficient
// E1 = (2 pi^3 x/3) Sum_p p^3 e^(-2 pi p x), and the series gives the
// 1/N^4 and 1/N^6 terms too. It is asymptotic: the coefficients' ratios
// grow (9, 25 at x = 0.5), so its error is bounded by the last term kept
// times 100/N^2. At x = 0.5 the modes past N/2, absent from the lattice,
// are e^(-pi N/2) of the sum: 1.5e-7 at N = 10, nothing beyond.
func TestTowerContinuumConvergence(t *testing.T) {
	const l, x = 4.0, 0.5
	r := x * l
	cont := twNew(t, map[string]float64{"sites": math.Inf(1), "circumference": l}, nil)
	ref, _ := twSums(cont, r)
	// closed form, from Sum_{k in Z} e^(-2 pi |k| x) = coth(pi x)
	if e := ykwRelErr(1+ref, 1/math.Tanh(math.Pi*x)); e > 1e-15 {
		t.Fatalf("continuum: 1 + sum = %.17g, coth(pi x) = %.17g", 1+ref, 1/math.Tanh(math.Pi*x))
	}
	// the series' coefficients, summed far past convergence
	var e1, e2, e3 float64
	for p := 1.0; p < 200; p++ {
		b := 2 * math.Pi * p * x
		g := 2 * math.Exp(-b)
		th := math.Pi * p
		e1 += g * th * th * b / 6
		e2 += g * math.Pow(th, 4) * (b*b/72 - b/120)
		e3 += g * math.Pow(th, 6) * (b*b*b/1296 - b*b/720 + b/5040)
	}
	var prev, prevPred, prevBound float64
	for i, n := range []float64{10, 100, 1000, 10000} {
		tw := twNew(t, map[string]float64{"sites": n, "circumference": l}, nil)
		sp, _ := twSums(tw, r)
		err := sp - ref
		n2 := n * n
		pred := e1/n2 + e2/(n2*n2) + e3/(n2*n2*n2)
		// series bound, plus the lattice's missing modes at N = 10 and
		// rounding of the two sums (about 0.09, ulp 1.4e-17) in sp - ref
		bound := math.Abs(e3/(n2*n2*n2))*100/n2 + 2*math.Exp(-math.Pi*n/2) + 1e-16
		if math.Abs(err-pred) > bound {
			t.Errorf("N = %g: error %.10g, predicted %.10g (+- %.2g)", n, err, pred, bound)
		}
		t.Logf("N = %5g: error %.6g, N^2 error %.8f (leading coefficient %.8f), error/predicted - 1 = %.2g",
			n, err, n2*err, e1, err/pred-1)
		if i > 0 {
			// from N/10 to N: 2 plus what the higher terms change, within
			// the two values' bounds
			order := math.Log10(prev / err)
			want := math.Log10(prevPred / pred)
			tol := math.Log10(1+prevBound/prevPred) + math.Log10(1+bound/pred)
			t.Logf("           measured order %.6f (series: %.6f +- %.2g)", order, want, tol)
			if math.Abs(order-want) > tol || (n >= 1000 && math.Abs(order-2) > 1e-3) {
				t.Errorf("N = %g: measured order %.6f, want %.6f +- %.2g (mass deviation ~ (p/N)^2)", n, order, want, tol)
			}
		}
		prev, prevPred, prevBound = err, pred, bound
	}
}

// The stored modes against the mass formula m_p = (2/s)|sin(pi p/N)| with
// every p = 0..N-1 listed one by one (PHYSICS.md), for d = 1 and for the
// torus, m^2 = Sum_i (2/s)^2 sin^2(pi p_i/N); with dn = 0 the weights are
// the multiplicities. The lightest mode is the continuum's 2 pi/L to
// O(1/N^2); the heaviest is the lattice cutoff 2/s (N even).
func TestTowerModeMasses(t *testing.T) {
	const l = 5.0
	for _, c := range []struct{ n, d int }{{12, 1}, {13, 1}, {10, 2}, {7, 2}, {6, 3}, {5, 3}} {
		tw := twNew(t, map[string]float64{"sites": float64(c.n), "circumference": l, "dimensions": float64(c.d)}, nil)
		s := l / float64(c.n)
		var want []float64
		var idx [3]int
		total := int(math.Pow(float64(c.n), float64(c.d)))
		for code := 1; code < total; code++ {
			k, m2 := code, 0.0
			for i := 0; i < c.d; i++ {
				idx[i] = k % c.n
				k /= c.n
				sn := 2 / s * math.Sin(math.Pi*float64(idx[i])/float64(c.n))
				m2 += sn * sn
			}
			want = append(want, math.Sqrt(m2))
		}
		slices.Sort(want)
		var got []float64
		for i, m := range tw.masses {
			w := tw.weights[i]
			if w != math.Round(w) || w < 1 {
				t.Fatalf("N = %d d = %d: weight %g of mass %g is not a multiplicity", c.n, c.d, w, m)
			}
			for range int(w) {
				got = append(got, m)
			}
		}
		if len(got) != len(want) {
			t.Fatalf("N = %d d = %d: %d modes, want %d", c.n, c.d, len(got), len(want))
		}
		for i := range want {
			if math.Abs(got[i]-want[i]) > 1e-14*want[i] {
				t.Errorf("N = %d d = %d: mode %d mass %.17g, want %.17g", c.n, c.d, i, got[i], want[i])
			}
		}
		if c.d == 1 && c.n%2 == 0 {
			if top := tw.masses[len(tw.masses)-1]; math.Abs(top-2/s) > 1e-15*top {
				t.Errorf("N = %d: heaviest mass %g, want 2/s = %g", c.n, top, 2/s)
			}
		}
	}
	// m_1 = (2N/L) sin(pi/N) = (2 pi/L)(1 - pi^2/(6 N^2) + ...)
	tw := twNew(t, map[string]float64{"sites": 1000, "circumference": l}, nil)
	if e := tw.masses[0]/(2*math.Pi/l) - 1; math.Abs(e+math.Pi*math.Pi/6e6) > 1e-12 {
		t.Errorf("N = 1000: m_1 L/(2 pi) - 1 = %.6g, want -pi^2/(6 N^2) = %.6g", e, -math.Pi*math.Pi/6e6)
	}
}

// Completeness of the mode functions: at r -> 0 every e^(-m r) -> 1, and
// Sum_p (2 - delta_p0) cos(pi p (n + 1/2)/N) cos(pi p (n' + 1/2)/N) =
// N delta_nn' (orthonormality of the DCT-II basis
// sqrt((2 - delta_p0)/N) cos(pi p (n + 1/2)/N)); on the circle
// Sum_p cos(2 pi p dn/N) = N delta_dn0 (discrete Fourier orthogonality).
func TestTowerCompleteness(t *testing.T) {
	const n = 7
	for src := 0; src < n; src++ {
		for dst := 0; dst < n; dst++ {
			tw := twNew(t, map[string]float64{"sites": n, "circumference": 1, "source_site": float64(src), "test_site": float64(dst)},
				map[string]string{"chain": "open"})
			sum := 1.0 // the zero mode
			for _, w := range tw.weights {
				sum += w
			}
			want := 0.0
			if src == dst {
				want = n
			}
			if math.Abs(sum-want) > 1e-13 {
				t.Errorf("open chain n' = %d, n = %d: weight sum %.16g, want %g", src, dst, sum, want)
			}
			// the same through Radial at r = 1e-10 s: corrections m r < 2e-9
			sp, _ := twSums(tw, 1e-10/n)
			if math.Abs(1+sp-want) > 2e-9*n {
				t.Errorf("open chain n' = %d, n = %d, r -> 0: Phi/(-mu/r) = %.12g, want %g", src, dst, 1+sp, want)
			}
		}
	}
	for _, nn := range []int{7, 8} {
		for dn := 0; dn < nn; dn++ {
			for d := 1; d <= 2; d++ {
				tw := twNew(t, map[string]float64{"sites": float64(nn), "circumference": 1, "separation": float64(dn), "dimensions": float64(d)}, nil)
				sum := 1.0
				for _, w := range tw.weights {
					sum += w
				}
				want := 0.0
				if dn == 0 {
					want = math.Pow(float64(nn), float64(d))
				}
				if math.Abs(sum-want) > 1e-13*math.Max(want, 1) {
					t.Errorf("periodic N = %d d = %d dn = %d: weight sum %.16g, want %g", nn, d, dn, sum, want)
				}
			}
		}
	}
}

// twShellSum is a plain mode sum over the continuum torus, k in Z^d with
// |k| <= 45/a, grouped by |k|^2 and added in ascending order: S - 1 and
// D = Sum a|k| e^(-a|k|).
func twShellSum(d int, a float64) (s1, dd float64) {
	kmax := int(45/a) + 1
	counts := map[int]float64{}
	var k [3]int
	var walk func(i, sum int)
	walk = func(i, sum int) {
		if i == d {
			counts[sum]++
			return
		}
		for k[i] = -kmax; k[i] <= kmax; k[i]++ {
			walk(i+1, sum+k[i]*k[i])
		}
	}
	walk(0, 0)
	var js []int
	for j := range counts {
		if j > 0 {
			js = append(js, j)
		}
	}
	slices.Sort(js)
	for _, j := range js {
		ak := a * math.Sqrt(float64(j))
		e := counts[j] * math.Exp(-ak)
		s1 += e
		dd += ak * e
	}
	return s1, dd
}

// The continuum torus in d = 2, 3: the image sum (Ewald-split Poisson
// resummation) against the plain mode sum, where both are cheap, and the
// kernel (which switches at r = L) against it on both sides of the switch.
// The two are the same series by Poisson's summation formula.
func TestTowerTorusImageVsModeSum(t *testing.T) {
	for d := 2; d <= 3; d++ {
		for _, x := range []float64{0.15, 0.4, 0.8, 0.999, 1, 1.001, 1.6, 3} {
			a := 2 * math.Pi * x
			ws, wd := twShellSum(d, a)
			es, ed := torusEwald(d, a)
			if ykwRelErr(es, ws) > 1e-13 || ykwRelErr(ed, wd) > 1e-13 {
				t.Errorf("d = %d x = %g: image sum (%.16g, %.16g), mode sum (%.16g, %.16g), rel (%.2g, %.2g)",
					d, x, es, ed, ws, wd, ykwRelErr(es, ws), ykwRelErr(ed, wd))
			}
			tw := twNew(t, map[string]float64{"sites": math.Inf(1), "circumference": 2, "dimensions": float64(d)}, nil)
			sp, sa := twSums(tw, 2*x)
			if ykwRelErr(sp, ws) > 1e-13 || ykwRelErr(sa, ws+wd) > 1e-13 {
				t.Errorf("d = %d x = %g: kernel (%.16g, %.16g), mode sum (%.16g, %.16g)", d, x, sp, sa, ws, ws+wd)
			}
		}
	}
}

// Finite torus lattices converge to the continuum torus like the chain:
// m = (2N/L) sqrt(Sum_i sin^2(pi k_i/N)) = (2 pi |k|/L)(1 - pi^2 Sum_i k_i^4/(6 N^2 |k|^2) + ...),
// so N^2 (S_N - S) -> Sum_k e^(-a|k|) a pi^2 Sum_i k_i^4/(6 |k|), a = 2 pi x.
// The next order is (pi k/N)^2 smaller, 1e-3 to 1e-2 at N = 100 for the
// modes that matter at x = 0.5, 1e-5 to 1e-4 at N = 1000.
func TestTowerTorusLatticeConvergence(t *testing.T) {
	const x = 0.5
	a := 2 * math.Pi * x
	for _, c := range []struct {
		d   int
		n   float64
		tol float64
	}{{2, 1000, 2e-4}, {3, 100, 2e-2}} {
		var lead float64
		km := 20
		var k [3]int
		var walk func(i int)
		walk = func(i int) {
			if i == c.d {
				var k2, k4 float64
				for j := 0; j < c.d; j++ {
					f := float64(k[j] * k[j])
					k2 += f
					k4 += f * f
				}
				if k2 > 0 {
					kk := math.Sqrt(k2)
					lead += math.Exp(-a*kk) * a * math.Pi * math.Pi * k4 / (6 * kk)
				}
				return
			}
			for k[i] = -km; k[i] <= km; k[i]++ {
				walk(i + 1)
			}
		}
		walk(0)
		cont := twNew(t, map[string]float64{"sites": math.Inf(1), "circumference": 1, "dimensions": float64(c.d)}, nil)
		fin := twNew(t, map[string]float64{"sites": c.n, "circumference": 1, "dimensions": float64(c.d)}, nil)
		s0, _ := twSums(cont, x)
		s1, _ := twSums(fin, x)
		got := (s1 - s0) * c.n * c.n
		t.Logf("d = %d N = %g: N^2 (S_N - S) = %.8f, predicted %.8f", c.d, c.n, got, lead)
		if ykwRelErr(got, lead) > c.tol {
			t.Errorf("d = %d N = %g: N^2 (S_N - S) = %.8f, want %.8f (rel %.2g > %.2g)", c.d, c.n, got, lead, ykwRelErr(got, lead), c.tol)
		}
	}
}

// a_r = -dPhi/dr by gonum finite differences, in every evaluation path.
func TestTowerSlope(t *testing.T) {
	inf := math.Inf(1)
	const l = 2.0
	type cs struct {
		num map[string]float64
		str map[string]string
		xs  []float64 // r/L
	}
	cases := []cs{
		{map[string]float64{"sites": 10, "circumference": l}, nil, []float64{1e-3, 0.1, 0.3, 2}},
		{map[string]float64{"sites": 10, "circumference": l, "separation": 3}, map[string]string{"modes": "spin2"}, []float64{0.05, 0.3, 1}},
		{map[string]float64{"sites": 9, "circumference": l, "source_site": 2, "test_site": 5}, map[string]string{"chain": "open"}, []float64{0.01, 0.2, 1.5}},
		{map[string]float64{"sites": 8, "circumference": l, "dimensions": 2, "separation": 1}, nil, []float64{0.02, 0.4}},
		{map[string]float64{"sites": 6, "circumference": l, "dimensions": 3}, nil, []float64{0.02, 0.4}},
		{map[string]float64{"sites": inf, "circumference": l}, map[string]string{"modes": "spin2"}, []float64{1e-3, 0.05, 0.5, 3}},
		{map[string]float64{"sites": inf, "circumference": l, "dimensions": 2}, nil, []float64{0.01, 0.3, 0.9, 1.2, 2}},
		{map[string]float64{"sites": inf, "circumference": l, "dimensions": 3}, nil, []float64{0.01, 0.3, 0.9, 1.2, 2}},
	}
	for _, c := range cases {
		tw := twNew(t, c.num, c.str)
		scale := l / (2 * math.Pi)
		if !math.IsInf(tw.Sites(), 1) {
			scale = tw.Spacing() / 2
		}
		for _, x := range c.xs {
			r := x * l
			ar, _ := tw.Radial(3, r)
			if e := ykwRelErr(ar, ykwPotentialSlope(tw, 3, r, scale)); e > 1e-9 {
				t.Errorf("%v %v r = %g L: a_r = %g differs from -dPhi/dr by %.2g", c.num, c.str, x, ar, e)
			}
		}
	}
}

func TestTowerValidation(t *testing.T) {
	inf := math.Inf(1)
	cases := []struct {
		num  map[string]float64
		str  map[string]string
		want string
	}{
		{map[string]float64{"circumference": 1}, nil, "sites is required"},
		{map[string]float64{"sites": 10}, nil, "give circumference"},
		{map[string]float64{"sites": 10, "circumference": 1, "spacing": 0.1}, nil, "not both"},
		{map[string]float64{"sites": 2.5, "circumference": 1}, nil, "whole number"},
		{map[string]float64{"sites": 0, "circumference": 1}, nil, "out of range"},
		{map[string]float64{"sites": inf, "spacing": 1}, nil, "give circumference instead"},
		{map[string]float64{"sites": inf, "circumference": 1, "separation": 1}, nil, "separation = 0 only"},
		{map[string]float64{"sites": inf, "circumference": 1}, map[string]string{"chain": "open"}, "periodic chain only"},
		{map[string]float64{"sites": 5, "circumference": 1, "dimensions": 2}, map[string]string{"chain": "open"}, "one-dimensional"},
		{map[string]float64{"sites": 5, "circumference": 1, "separation": 5}, nil, "outside 0..4"},
		{map[string]float64{"sites": 5, "circumference": 1, "test_site": 7}, map[string]string{"chain": "open"}, "outside 0..4"},
		{map[string]float64{"sites": 5, "circumference": 1, "separation": 1}, map[string]string{"chain": "open"}, "source_site and test_site"},
		{map[string]float64{"sites": 5, "circumference": 1, "source_site": 1}, nil, "periodic chain takes separation"},
		{map[string]float64{"sites": 5, "circumference": 1, "separation": -1}, nil, "out of range"},
		{map[string]float64{"sites": 5, "circumference": 1, "dimensions": 4}, nil, "out of range"},
		{map[string]float64{"sites": 3163, "circumference": 1, "dimensions": 2}, nil, "use sites = inf"},
		{map[string]float64{"sites": 216, "circumference": 1, "dimensions": 3}, nil, "above the limit"},
		{map[string]float64{"sites": 5, "circumference": 1}, map[string]string{"modes": "vector"}, "not allowed"},
	}
	for _, c := range cases {
		_, err := New("tower", Values{Num: c.num, Str: c.str})
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("New(tower, %v %v): error %v, want one containing %q", c.num, c.str, err, c.want)
		}
	}
	// spacing and circumference describe the same tower
	a := twNew(t, map[string]float64{"sites": 8, "spacing": 0.25}, nil)
	b := twNew(t, map[string]float64{"sites": 8, "circumference": 2}, nil)
	for _, r := range []float64{0.01, 0.3, 5} {
		a1, p1 := a.Radial(1, r)
		a2, p2 := b.Radial(1, r)
		if ykwRelErr(a1, a2) > 1e-15 || ykwRelErr(p1, p2) > 1e-15 {
			t.Errorf("r = %g: spacing route (%g, %g), circumference route (%g, %g)", r, a1, p1, a2, p2)
		}
	}
	if info := a.Info(); info.Role != Correction || !strings.Contains(info.Mu, "large distance") {
		t.Errorf("Info: role %v, Mu %q; want a correction with mu at large distance (PHYSICS.md, Which mu)", info.Role, info.Mu)
	}
}

// TestExternalTowerMpmath compares the mode sums with mpmath at 40 digits
// (testdata/mpmath/tower.py: every mode one by one for finite towers, coth
// for the continuum circle, quadrature over Jacobi theta functions for the
// continuum torus) to 1e-13 of the sum of the terms' magnitudes.
func TestExternalTowerMpmath(t *testing.T) {
	py := external.Python(t)
	type tc struct {
		Kind string  `json:"kind"`
		N    int     `json:"N,omitempty"`
		D    int     `json:"d,omitempty"`
		Dn   int     `json:"dn"`
		Src  int     `json:"src"`
		Dst  int     `json:"dst"`
		L    float64 `json:"L"`
		R    float64 `json:"r"`
		T    string  `json:"t"`
	}
	const l = 2.5
	var cases []tc
	for _, x := range []float64{1e-3, 0.05, 0.6, 3} {
		for _, dn := range []int{0, 3} {
			cases = append(cases, tc{Kind: "periodic", N: 10, D: 1, Dn: dn, L: l, R: x * l, T: "1"})
		}
		cases = append(cases, tc{Kind: "periodic", N: 10, D: 1, L: l, R: x * l, T: "4/3"})
	}
	cases = append(cases,
		tc{Kind: "periodic", N: 1000, D: 1, L: l, R: 0.01 * l, T: "1"},
		tc{Kind: "periodic", N: 1000, D: 1, Dn: 250, L: l, R: 0.01 * l, T: "1"},
		tc{Kind: "periodic", N: 7, D: 1, Dn: 2, L: l, R: 0.2 * l, T: "4/3"},
		tc{Kind: "periodic", N: 12, D: 2, L: l, R: 0.05 * l, T: "1"},
		tc{Kind: "periodic", N: 12, D: 2, Dn: 5, L: l, R: 0.4 * l, T: "1"},
		tc{Kind: "periodic", N: 8, D: 3, L: l, R: 0.1 * l, T: "4/3"},
		tc{Kind: "periodic", N: 7, D: 3, Dn: 3, L: l, R: 0.7 * l, T: "1"},
		tc{Kind: "open", N: 9, Src: 0, Dst: 0, L: l, R: 0.01 * l, T: "1"},
		tc{Kind: "open", N: 9, Src: 2, Dst: 6, L: l, R: 0.3 * l, T: "1"},
		tc{Kind: "open", N: 9, Src: 8, Dst: 8, L: l, R: 0.3 * l, T: "4/3"},
		tc{Kind: "open", N: 200, Src: 0, Dst: 199, L: l, R: 0.02 * l, T: "1"},
	)
	for _, x := range []float64{1e-4, 0.02, 0.7, 4} {
		cases = append(cases, tc{Kind: "continuum", D: 1, L: l, R: x * l, T: "1"})
	}
	cases = append(cases, tc{Kind: "continuum", D: 1, L: l, R: 0.3 * l, T: "4/3"})
	for d := 2; d <= 3; d++ {
		for _, x := range []float64{1e-3, 0.05, 0.3, 0.8, 1, 1.3, 2.5} {
			cases = append(cases, tc{Kind: "continuum", D: d, L: l, R: x * l, T: "1"})
		}
	}
	in, err := json.Marshal(cases)
	if err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(py, "../testdata/mpmath/tower.py")
	cmd.Stdin = bytes.NewReader(in)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("tower.py: %v\n%s", err, stderr.String())
	}
	var ref [][3]float64
	if err := json.Unmarshal(out, &ref); err != nil || len(ref) != len(cases) {
		t.Fatalf("tower.py output (%v): %d results for %d cases", err, len(ref), len(cases))
	}
	worst := 0.0
	for i, c := range cases {
		num := map[string]float64{"sites": float64(c.N), "circumference": c.L}
		str := map[string]string{"modes": "scalar"}
		if c.T == "4/3" {
			str["modes"] = "spin2"
		}
		switch c.Kind {
		case "periodic":
			num["dimensions"] = float64(c.D)
			num["separation"] = float64(c.Dn)
		case "open":
			str["chain"] = "open"
			num["source_site"], num["test_site"] = float64(c.Src), float64(c.Dst)
		case "continuum":
			num["sites"] = math.Inf(1)
			num["dimensions"] = float64(c.D)
		}
		tw := twNew(t, num, str)
		sp, sa := twSums(tw, c.R)
		scale := ref[i][2]
		ep := math.Abs(sp-ref[i][0]) / scale
		// the force terms carry (1 + m r) <= 40 over the potential's
		ea := math.Abs(sa-ref[i][1]) / math.Max(scale, math.Abs(ref[i][1]))
		worst = math.Max(worst, math.Max(ep, ea))
		if ep > 1e-13 || ea > 1e-13 {
			t.Errorf("%+v: Go (%.16g, %.16g), mpmath (%.16g, %.16g): errors %.2g, %.2g of the term scale",
				c, sp, sa, ref[i][0], ref[i][1], ep, ea)
		}
	}
	t.Logf("%d cases, worst relative difference from mpmath %.2g", len(cases), worst)
}

func BenchmarkTowerRadial(b *testing.B) {
	inf := math.Inf(1)
	for _, c := range []struct {
		name string
		num  map[string]float64
		x    float64
	}{
		{"N=100/r=0.1L", map[string]float64{"sites": 100, "circumference": 1}, 0.1},
		{"N=10000/r=0.01L", map[string]float64{"sites": 10000, "circumference": 1}, 0.01},
		{"N=50,d=2/r=0.1L", map[string]float64{"sites": 50, "circumference": 1, "dimensions": 2}, 0.1},
		{"continuum/r=0.1L", map[string]float64{"sites": inf, "circumference": 1}, 0.1},
		{"continuum,d=3/r=0.1L", map[string]float64{"sites": inf, "circumference": 1, "dimensions": 3}, 0.1},
		{"continuum,d=3/r=2L", map[string]float64{"sites": inf, "circumference": 1, "dimensions": 3}, 2},
	} {
		tw := twNew(b, c.num, nil)
		b.Run(c.name, func(b *testing.B) {
			sum := 0.0
			for b.Loop() {
				ar, _ := tw.Radial(1, c.x)
				sum += ar
			}
			_ = sum
		})
	}
}
