package kernels

import (
	"fmt"
	"math"
	"sort"

	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

// Tower is the finite tower of massive modes of a deconstructed extra
// dimension: N sites on a circle of circumference L (spacing s = L/N),
// mode masses m_p = (2/s)|sin(pi p/N)|. For source and test body dn sites
// apart,
//
//	Phi = -(mu/r) Sum_p w_p cos(2 pi p dn/N) e^(-m_p r),  w_0 = 1, w_p = t (p >= 1),
//
// with t = 1 for scalar (Newtonian) modes and t = 4/3 for massive spin-2
// modes. The p = 0 term is Newton, so the correction is the sum over
// p >= 1; each mode adds a_r = -(mu/r^2) w (1 + m r) e^(-m r).
//
// mu is the large-distance value (G M at r >> L). At r << s the force is
// N times Newton's (1 + t (N - 1) with t = 4/3), four-dimensional again; at
// s << r << L it is five-dimensional, Phi ~ -mu L/(pi r^2).
//
// Variants: the open chain (an interval of N sites with Neumann ends, length
// L = N s), m_p = (2/s) sin(pi p/(2N)), with source site n' and test site n,
//
//	Phi = -(mu/r) Sum_p w_p (2 - delta_p0) cos(pi p (n + 1/2)/N) cos(pi p (n' + 1/2)/N) e^(-m_p r);
//
// d = 2 or 3 extra dimensions as a periodic torus lattice of N^d sites, with
// m^2 summed over the dimensions' (2/s)^2 sin^2 terms and the separation
// along the first one; and the continuum N = inf (periodic, dn = 0), where
// Sum over the modes of e^(-2 pi |k| r/L) is coth(pi r/L) for d = 1.
//
// How it is evaluated:
//   - finite N: the exact mode sum. Modes are sorted by mass once; a call
//     sums those with e^(-m r) >= 1e-17 e^(-m_1 r), m_1 the lightest massive
//     mode (so the correction keeps its own relative accuracy at r >> L,
//     where it is far below Newton), so it costs the number of modes
//     lighter than m_1 + 39.1/r, at most about (N/2 + 1)^d since the modes
//     p and N - p are summed together.
//   - N = inf, d = 1: the closed form coth(pi r/L), at every r.
//   - N = inf, d = 2, 3: at r >= L the mode sum over shells |k|^2 = j (at most
//     53 shells); at r < L the image sum (Poisson resummation: the
//     (4 + d)-dimensional potential summed over periodic images), made to
//     converge by Ewald's split into a screened image part and a mode part,
//     21 shells of each whatever r is. See tower_continuum.go.
//
// At r -> 0 a finite tower goes as the short-distance -(1 + t (N - 1)) mu/r
// (for dn = 0) and stays finite for r > 0; the continuum grows as
// -mu L/(pi r^2) for d = 1 (L^d/r^(d+1) in general). Neither is softened:
// r = 0 returns infinities (as Newton does), never NaN.
type Tower struct {
	vals Values

	sites     float64 // N, +Inf for the continuum
	length    float64 // L: circumference, or the open chain's length N s
	spacing   float64 // s = L/N (0 in the continuum)
	dims      int
	t         float64
	open      bool
	continuum bool

	// finite towers: the modes p >= 1, ascending in mass, weights times t
	masses  []float64
	weights []float64
	// shortSum is the correction's weight sum, its r -> 0 coefficient
	shortSum float64
}

// towerModeLimit bounds N^d: building and storing the modes must stay cheap.
const towerModeLimit = 1e7

// towerTail is -ln(1e-17): modes below 1e-17 of the lightest are left out.
var towerTail = 17 * math.Ln10

func init() {
	Register(towerInfo(), newTower)
}

func towerInfo() Info {
	site := func(name, doc string) Param {
		return Param{Name: name, Kind: Number, Dim: units.Dimensionless, Doc: doc,
			Default: 0, Min: 0, Max: math.Inf(1), Integer: true}
	}
	return Info{
		Name: "tower",
		Role: Correction,
		Summary: "finite tower of massive modes of a deconstructed extra dimension (N sites, circumference L); " +
			"returns the massive modes, the zero mode being Newton",
		Mu: "G M at large distance (r >> L, the zero mode); at r << s the force is 1 + t (N - 1) times that",
		Params: []Param{
			{Name: "sites", Kind: Number, Dim: units.Dimensionless,
				Doc:      "number of sites N per dimension; inf selects the continuum (periodic, separation 0)",
				Required: true, Min: 1, Max: towerModeLimit, Integer: true, AllowInf: true},
			rangeLengthParam("circumference", "circumference L of the circle (for the open chain its length N s); give this or spacing"),
			rangeLengthParam("spacing", "site spacing s = L/N; give this or circumference (finite N only)"),
			{Name: "chain", Kind: Choice, Choices: []string{"periodic", "open"}, DefaultChoice: "periodic",
				Doc: "periodic: sites on a circle; open: an interval with Neumann ends (one dimension)"},
			site("separation", "periodic chain: sites between source and test body along the first dimension, 0..N-1"),
			site("source_site", "open chain: the source's site n', 0..N-1"),
			site("test_site", "open chain: the test body's site n, 0..N-1"),
			{Name: "modes", Kind: Choice, Choices: []string{"scalar", "spin2"}, DefaultChoice: "scalar",
				Doc: "scalar: massive modes weighted t = 1; spin2: massive spin-2 modes, t = 4/3"},
			{Name: "dimensions", Kind: Number, Dim: units.Dimensionless,
				Doc:     "number d of extra dimensions: a torus lattice of N^d sites, the same N and L in each",
				Default: 1, Min: 1, Max: 3, Integer: true},
		},
	}
}

func newTower(v Values) (Kernel, error) {
	fail := func(format string, a ...any) (Kernel, error) {
		return nil, fmt.Errorf("kernel tower: "+format, a...)
	}
	n, ok := v.Num["sites"]
	if !ok || math.IsNaN(n) || n < 1 || (!math.IsInf(n, 1) && n != math.Trunc(n)) {
		return fail("sites must be a whole number >= 1 or inf")
	}
	tw := &Tower{vals: cloneKernelValues(v), sites: n, continuum: math.IsInf(n, 1), t: 1, dims: 1}
	if v.Str["modes"] == "spin2" {
		tw.t = 4.0 / 3
	}
	tw.open = v.Str["chain"] == "open"
	if d, ok := v.Num["dimensions"]; ok {
		if d != 1 && d != 2 && d != 3 {
			return fail("dimensions = %g: allowed are 1, 2 and 3", d)
		}
		tw.dims = int(d)
	}

	l, haveL := v.Num["circumference"]
	s, haveS := v.Num["spacing"]
	switch {
	case haveL && haveS:
		return fail("give either circumference or spacing, not both")
	case !haveL && !haveS:
		return fail("the size is missing: give circumference (L) or spacing (s = L/N)")
	case haveS && tw.continuum:
		return fail("sites = inf is the continuum, where the spacing vanishes: give circumference instead")
	case haveS:
		l = n * s
	case !tw.continuum:
		s = l / n
	}
	if !(l > 0) || math.IsInf(l, 0) || (!tw.continuum && !(s > 0)) {
		return fail("circumference and spacing must be positive and finite")
	}
	tw.length, tw.spacing = l, s

	sep, src, dst := v.Num["separation"], v.Num["source_site"], v.Num["test_site"]
	for name, x := range map[string]float64{"separation": sep, "source_site": src, "test_site": dst} {
		if x < 0 || x != math.Trunc(x) || math.IsNaN(x) {
			return fail("%s = %g must be a whole number >= 0", name, x)
		}
	}
	if tw.continuum {
		switch {
		case tw.open:
			return fail("the continuum (sites = inf) is available for the periodic chain only")
		case sep != 0:
			return fail("sites = inf takes separation = 0 only (a site separation has no meaning in the continuum)")
		}
	}
	if tw.open {
		if tw.dims != 1 {
			return fail("the open chain is one-dimensional; use chain = periodic for dimensions = %d", tw.dims)
		}
		if sep != 0 {
			return fail("separation applies to the periodic chain; the open chain takes source_site and test_site")
		}
	} else if src != 0 || dst != 0 {
		return fail("source_site and test_site apply to the open chain; the periodic chain takes separation")
	}
	if tw.continuum {
		return tw, nil
	}

	if count := math.Pow(n, float64(tw.dims)); count > towerModeLimit {
		return fail("sites^dimensions = %.4g modes is above the limit of %.0e; use sites = inf for the continuum", count, towerModeLimit)
	}
	sites := int(n)
	for name, x := range map[string]float64{"separation": sep, "source_site": src, "test_site": dst} {
		if x > n-1 {
			return fail("%s = %g is outside 0..%d (sites = %d)", name, x, sites-1, sites)
		}
	}
	if tw.open {
		tw.masses, tw.weights = openChainModes(sites, s, int(src), int(dst))
	} else {
		tw.masses, tw.weights = periodicModes(sites, tw.dims, s, int(sep))
	}
	for i := range tw.weights {
		tw.weights[i] *= tw.t
		tw.shortSum += tw.weights[i]
	}
	return tw, nil
}

// Info implements Kernel.
func (*Tower) Info() Info { return towerInfo() }

// Values implements Kernel: the parameters as given.
func (tw *Tower) Values() Values { return cloneKernelValues(tw.vals) }

// Sites returns N (+Inf for the continuum).
func (tw *Tower) Sites() float64 { return tw.sites }

// Circumference returns L (the open chain's length N s).
func (tw *Tower) Circumference() float64 { return tw.length }

// Spacing returns s = L/N (0 in the continuum).
func (tw *Tower) Spacing() float64 { return tw.spacing }

// Factor returns the massive modes' weight t: 1 (scalar) or 4/3 (spin2).
func (tw *Tower) Factor() float64 { return tw.t }

// Dimensions returns d.
func (tw *Tower) Dimensions() int { return tw.dims }

// Modes returns the number of stored massive mode groups (0 in the
// continuum): the most terms a call sums.
func (tw *Tower) Modes() int { return len(tw.masses) }

// Radial implements Central: the massive modes only.
func (tw *Tower) Radial(mu, r float64) (ar, phi float64) {
	if tw.continuum {
		return tw.continuumRadial(mu, r)
	}
	if r <= 0 {
		// the short-distance law -shortSum mu/r at r = 0, without 0 * Inf
		switch {
		case tw.shortSum > 0:
			return math.Inf(-1), math.Inf(-1)
		case tw.shortSum < 0:
			return math.Inf(1), math.Inf(1)
		}
		return 0, 0
	}
	if len(tw.masses) == 0 {
		return 0, 0
	}
	// modes down to 1e-17 of the lightest massive one, so that the
	// correction keeps its own relative accuracy even where it is far below
	// Newton; Neumaier-compensated sums
	keep := sort.SearchFloat64s(tw.masses, tw.masses[0]+towerTail/r)
	var sp, cp, sa, ca float64
	for i, m := range tw.masses[:keep] {
		mr := m * r
		e := tw.weights[i] * math.Exp(-mr)
		sp, cp = neumaierAdd(sp, cp, e)
		sa, ca = neumaierAdd(sa, ca, e*(1+mr))
	}
	phi = -mu / r * (sp + cp)
	ar = -mu / r * ((sa + ca) / r) // not mu/(r r): r r underflows first
	return ar, phi
}

// neumaierAdd adds x to the sum s with running compensation c.
func neumaierAdd(s, c, x float64) (float64, float64) {
	t := s + x
	if math.Abs(s) >= math.Abs(x) {
		c += (s - t) + x
	} else {
		c += (x - t) + s
	}
	return t, c
}

// Accel implements Kernel.
func (tw *Tower) Accel(mu float64, x, _ vec.V) vec.V {
	r := x.Norm()
	ar, _ := tw.Radial(mu, r)
	return x.Scale(ar / r)
}

// Energy implements Kernel.
func (tw *Tower) Energy(mu float64, x, _ vec.V) float64 {
	_, phi := tw.Radial(mu, x.Norm())
	return phi
}
