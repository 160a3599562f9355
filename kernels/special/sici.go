package special

import "math"

// EulerGamma is the Euler-Mascheroni constant (A&S 6.1.3).
const EulerGamma = 0.57721566490153286060651209008240243104215933593992

const (
	// seriesMax is where the power series of Si and Cin hand over to the
	// continued fraction for f and g: beyond it the alternating series start
	// to lose digits (30 ulp in g by x = 3), the fraction does not.
	seriesMax = 1.0
	// asymptoticMin is where the asymptotic series of f and g reach full
	// double precision (their smallest term is about x sqrt(2 pi x) e^-x).
	asymptoticMin = 48.0
	// twoOverPi converts f to the crossover potential ratio.
	twoOverPi = 2 / math.Pi
)

// Si returns the sine integral Si(x) = Int_0^x sin t / t dt. It is odd in x.
func Si(x float64) float64 {
	si, _ := SiCi(x)
	return si
}

// Ci returns the cosine integral Ci(x) = gamma + ln x + Int_0^x (cos t - 1)/t dt
// for x > 0, -Inf at 0 and NaN for x < 0 (where Ci is complex).
func Ci(x float64) float64 {
	if c, ok := ciNearZero(x); ok {
		return c
	}
	_, ci := SiCi(x)
	return ci
}

// SiCi returns Si(x) and Ci(x) together (Ci is NaN for x < 0).
func SiCi(x float64) (si, ci float64) {
	switch {
	case math.IsNaN(x):
		return x, x
	case x < 0:
		si, _ = SiCi(-x)
		return -si, math.NaN()
	case x == 0:
		return 0, math.Inf(-1)
	case math.IsInf(x, 1):
		return math.Pi / 2, 0
	}
	if x <= seriesMax {
		s, cin := siCinSeries(x)
		si, ci = s, EulerGamma+math.Log(x)-cin
	} else {
		f, g := auxDirect(x)
		sin, cos := math.Sincos(x)
		si = math.Pi/2 - (f*cos + g*sin)
		ci = f*sin - g*cos
	}
	if c, ok := ciNearZero(x); ok {
		ci = c
	}
	return si, ci
}

// AuxFG returns the auxiliary functions (A&S 5.2.6, 5.2.7)
//
//	f(x) = Ci(x) sin x + (pi/2 - Si(x)) cos x
//	g(x) = -Ci(x) cos x + (pi/2 - Si(x)) sin x
//
// for x >= 0 (NaN for x < 0). Both fall off as 1/x and 1/x^2; at large x they
// are computed directly, not from Si and Ci, which would cancel.
func AuxFG(x float64) (f, g float64) {
	switch {
	case math.IsNaN(x) || x < 0:
		return math.NaN(), math.NaN()
	case x == 0:
		return math.Pi / 2, math.Inf(1)
	case math.IsInf(x, 1):
		return 0, 0
	}
	if x > seriesMax {
		return auxDirect(x)
	}
	si, cin := siCinSeries(x)
	ci := EulerGamma + math.Log(x) - cin
	sin, cos := math.Sincos(x)
	rest := math.Pi/2 - si
	return ci*sin + rest*cos, -ci*cos + rest*sin
}

// CrossoverDeficit returns 1 - (2/pi) f(x), the fraction by which the
// induced-gravity potential falls short of Newton's at x = r/r_c.
func CrossoverDeficit(x float64) float64 {
	phi, _ := CrossoverDeficits(x)
	return phi
}

// CrossoverForceDeficit returns 1 - (2/pi) (f(x) + x g(x)), the fraction by
// which the induced-gravity force falls short of Newton's; ~ (2/pi) x at
// small x.
func CrossoverForceDeficit(x float64) float64 {
	_, force := CrossoverDeficits(x)
	return force
}

// CrossoverDeficits returns both deficits at once. For x <= 1 they are
// written as sums whose terms do not cancel (see below), so they keep their
// relative accuracy as x -> 0 where both vanish.
func CrossoverDeficits(x float64) (phi, force float64) {
	switch {
	case math.IsNaN(x) || x < 0:
		return math.NaN(), math.NaN()
	case x == 0:
		return 0, 0
	}
	if math.IsInf(x, 1) {
		return 1, 1
	}
	if x > 1 {
		f, g := AuxFG(x)
		return 1 - twoOverPi*f, 1 - twoOverPi*(f+x*g)
	}
	// 1 - (2/pi) f = (1 - cos x) + (2/pi) (Si cos x - Ci sin x), and
	// 1 - (2/pi)(f + x g) = (1 - cos x - x sin x)
	//                      + (2/pi) (Si (cos x + x sin x) - Ci (sin x - x cos x)).
	// For x below the first zero of Ci every term of the first is positive;
	// in the second the (2/pi) Si term ~ (2/pi) x dominates the rest by 1/x.
	si, ci := SiCi(x)
	sin, cos := math.Sincos(x)
	half := math.Sin(x / 2)
	oneMinusCos := 2 * half * half
	phi = oneMinusCos + twoOverPi*(si*cos-ci*sin)
	force = (oneMinusCos - x*sin) + twoOverPi*(si*(cos+x*sin)-ci*sinMinusXCos(x))
	return phi, force
}

// siCinSeries sums Si(x) = Sum_k (-1)^k x^(2k+1) / ((2k+1) (2k+1)!) and
// Cin(x) = gamma + ln x - Ci(x) = Sum_k>=1 (-1)^(k+1) x^(2k) / (2k (2k)!)
// (A&S 5.2.14, 5.2.16), the two interleaved in powers x^n / n!.
func siCinSeries(x float64) (si, cin float64) {
	power := x // x^n / n!
	si = x
	for n := 2; n < 80; n++ {
		power *= x / float64(n)
		add := power / float64(n)
		if n%4 == 3 || n%4 == 0 {
			add = -add
		}
		if n%2 == 0 {
			cin += add
		} else {
			si += add
		}
		if math.Abs(add) <= 1e-18*(si+math.Abs(cin)) {
			break
		}
	}
	return si, cin
}

// sinMinusXCos returns sin x - x cos x = Sum_k>=1 (-1)^(k+1) 2k x^(2k+1)/(2k+1)!
// for |x| <= 1, where the direct difference loses the leading x^3/3.
func sinMinusXCos(x float64) float64 {
	x2 := x * x
	term := x * x2 / 6 // x^3/3!
	sum := 2 * term
	for k := 2; k < 30; k++ {
		term *= -x2 / float64((2*k)*(2*k+1))
		add := float64(2*k) * term
		sum += add
		if math.Abs(add) <= 1e-18*math.Abs(sum) {
			break
		}
	}
	return sum
}

// auxDirect returns f and g for x > seriesMax without Si and Ci.
func auxDirect(x float64) (f, g float64) {
	if x >= asymptoticMin {
		return auxAsymptotic(x)
	}
	return auxContinuedFraction(x)
}

// auxAsymptotic sums the asymptotic series (A&S 5.2.34, 5.2.35)
// f ~ (1/x) Sum (-1)^k (2k)!/x^(2k), g ~ (1/x^2) Sum (-1)^k (2k+1)!/x^(2k).
// From f = Int_0^inf e^(-xt)/(1+t^2) dt the remainder is below the first
// omitted term, so stopping at a term under 1e-17 of the sum is exact enough.
func auxAsymptotic(x float64) (f, g float64) {
	inv2 := 1 / (x * x)
	tf, tg := 1.0, 1.0
	sf, sg := 1.0, 1.0
	for k := 1; k < 200; k++ {
		nf := -tf * float64((2*k-1)*(2*k)) * inv2
		ng := -tg * float64((2*k)*(2*k+1)) * inv2
		if math.Abs(nf) > math.Abs(tf) || math.Abs(ng) > math.Abs(tg) {
			break // past the smallest term: x is too small for this form
		}
		tf, tg = nf, ng
		sf += tf
		sg += tg
		if math.Abs(tg) < 1e-18 {
			break
		}
	}
	return sf / x, sg * inv2
}

// auxContinuedFraction evaluates g - i f = e^(ix) E1(ix) (A&S 5.2.21 with
// 5.2.23) by the even part of the continued fraction A&S 5.1.22,
//
//	e^z E1(z) = 1/(z+1 - 1/(z+3 - 4/(z+5 - 9/(z+7 - ...)))),
//
// summed from a fixed depth upwards. Forward (Lentz) evaluation lost up to
// 100 ulp in g here, where the backward one stays within 3 ulp of mpmath.
// Against a depth of 20000, the fraction had settled to 2e-17 by depth
// 200/x to 290/x for 0.5 <= x <= 48; the depth used keeps a margin.
func auxContinuedFraction(x float64) (f, g float64) {
	// tail = n^2 / (2n+1 + ix - tail), in real arithmetic: the parts stay
	// O(1), so the textbook complex quotient is safe and needs none of the
	// scaling of Go's complex division (about 25% faster here).
	tr, ti := 0.0, 0.0
	for n := int(320/x) + 12; n >= 1; n-- {
		a, b := float64(2*n+1)-tr, x-ti
		k := float64(n*n) / (a*a + b*b)
		tr, ti = k*a, -k*b
	}
	// h = 1/(1 + ix - tail) = g - i f
	a, b := 1-tr, x-ti
	d := a*a + b*b
	return b / d, a / d
}

// ciTaylorTerms is the length of the Taylor series of Ci about its zeros:
// enough for (radius/zero)^n < 1e-18 at the first zero.
const ciTaylorTerms = 26

// ciZeroWindow is Ci expanded about one of its zeros z = hi + lo:
// Ci(z + d) = Sum_k>=1 coef[k] d^k for |d| <= radius.
type ciZeroWindow struct {
	hi, lo, radius float64
	coef           [ciTaylorTerms + 1]float64
}

// ciZeroWindows hold the first seven zeros of Ci to about 32 digits, as the
// double nearest and the remainder (mpmath 1.2.1, findroot(ci, ...) at
// mp.dps = 40). Near a zero, Ci computed as a difference of O(1) or O(1/x)
// terms keeps only its absolute accuracy; the series about the zero, in
// d = (x - hi) - lo (the first subtraction is exact), keeps the relative one.
var ciZeroWindows = buildCiZeroWindows([][2]float64{
	{0.6165054856207163, -4.209920321433186e-17},
	{3.3841804225511862, 1.972125462363411e-16},
	{6.427047744050369, -1.8747970603033628e-16},
	{9.525575457580667, -5.023806348878734e-16},
	{12.643546829711378, -8.160413116707143e-16},
	{15.770349650703585, -1.4937883748127327e-16},
	{18.901853302466318, -3.0408896367809253e-16},
})

// buildCiZeroWindows derives the Taylor coefficients from x Ci'(x) = cos x:
// matching powers of d in (z + d) Sum k c_k d^(k-1) = Sum cos^(m)(z) d^m/m!
// gives c_(m+1) = (cos^(m)(z)/m! - m c_m) / ((m+1) z).
func buildCiZeroWindows(zeros [][2]float64) []ciZeroWindow {
	out := make([]ciZeroWindow, len(zeros))
	for i, zl := range zeros {
		z := zl[0]
		w := ciZeroWindow{hi: zl[0], lo: zl[1], radius: 0.25}
		if z < 1 {
			w.radius = 0.1 // the log singularity at 0 is close
		}
		sin, cos := math.Sincos(z)
		derivs := [4]float64{cos, -sin, -cos, sin} // cos^(m), period 4
		invFact := 1.0                             // 1/m!
		for m := 0; m < ciTaylorTerms; m++ {
			if m > 0 {
				invFact /= float64(m)
			}
			w.coef[m+1] = (derivs[m%4]*invFact - float64(m)*w.coef[m]) / (float64(m+1) * z)
		}
		out[i] = w
	}
	return out
}

// ciNearZero returns Ci(x) from the series about a zero when x lies in one
// of the windows.
func ciNearZero(x float64) (float64, bool) {
	for i := range ciZeroWindows {
		w := &ciZeroWindows[i]
		if x < w.hi-w.radius {
			break
		}
		d := (x - w.hi) - w.lo
		if math.Abs(d) > w.radius {
			continue
		}
		s := w.coef[ciTaylorTerms]
		for k := ciTaylorTerms - 1; k >= 1; k-- {
			s = s*d + w.coef[k]
		}
		return s * d, true
	}
	return 0, false
}
