package kernels

import "math"

// The continuum tower (N = inf, periodic, dn = 0) on a torus of side L in
// d extra dimensions. With x = r/L and a = 2 pi x the potential is
//
//	Phi = -(mu/r) S(a),  S(a) = Sum_{k in Z^d} e^(-a |k|),
//
// the correction is t (S - 1) and a_r = -(mu t/r^2) (S - 1 + D) with
// D = -a dS/da = Sum_k a |k| e^(-a |k|).
//
// d = 1: S = coth(a/2) (geometric series), so S - 1 = 2/expm1(a) and
// D = 2 a e^(-a)/expm1(-a)^2, exact at every r.
//
// d = 2, 3: Poisson resummation turns S into the image sum
// S = c_d Sum_{n in Z^d} x/(x^2 + |n|^2)^((d+1)/2), c_d = Gamma((d+1)/2)/pi^((d+1)/2),
// the (4 + d)-dimensional potential of the source and its periodic images.
// Its terms fall only as |n|^-(d+1) (a remainder of order 1/R after R
// shells), so it is split as Ewald did: with
// e^(-a|k|) = Int_0^inf a/(2 sqrt(pi)) t^(-3/2) e^(-a^2/(4t)) e^(-t k^2) dt
// the part t < T is resummed into images screened by incomplete gamma
// functions, the part t > T stays a mode sum screened by erfc. Both fall as
// e^(-pi j) for shells |n|^2 = j or |k|^2 = j at T = pi, so 21 shells of
// each reach 1e-28 of the leading term at every x < 1. For x >= 1 the plain
// mode sum needs at most 53 shells and is used instead.

// continuumShells is the number of shells j = |k|^2 = 0..continuumShells-1
// tabulated; 64 covers the plain mode sum at x >= 1 (j <= (1 + 39.1/(2 pi))^2 = 52.3).
const continuumShells = 64

// ewaldShells is the shells each half of the Ewald split sums (j <= 20).
const ewaldShells = 21

// latticeShells[d][j] is the number of k in Z^d with |k|^2 = j.
var latticeShells = func() [4][continuumShells]float64 {
	var c [4][continuumShells]float64
	const kmax = 8 // 8^2 = 64 covers every shell tabulated
	for d := 1; d <= 3; d++ {
		var k [3]int
		var walk func(i, sum int)
		walk = func(i, sum int) {
			if sum >= continuumShells {
				return
			}
			if i == d {
				c[d][sum]++
				return
			}
			for k[i] = -kmax; k[i] <= kmax; k[i]++ {
				walk(i+1, sum+k[i]*k[i])
			}
		}
		walk(0, 0)
	}
	return c
}()

func (tw *Tower) continuumRadial(mu, r float64) (ar, phi float64) {
	if r <= 0 {
		// the potential diverges faster than Newton's: L^d/r^(d+1)
		return math.Inf(-1), math.Inf(-1)
	}
	a := 2 * math.Pi * r / tw.length
	var s1, dd float64 // S - 1 and D
	switch {
	case tw.dims == 1:
		s1 = 2 / math.Expm1(a)
		em := math.Expm1(-a)
		dd = 2 * a * math.Exp(-a) / (em * em)
	case a >= 2*math.Pi:
		s1, dd = torusModeSum(tw.dims, a)
	default:
		s1, dd = torusEwald(tw.dims, a)
	}
	phi = -mu / r * tw.t * s1
	ar = -mu / r * (tw.t * (s1 + dd) / r)
	return ar, phi
}

// torusModeSum returns S - 1 and D by the mode sum over shells, down to
// 1e-17 of the first shell: a (sqrt(j) - 1) <= 39.1, j <= 53 for a >= 2 pi.
func torusModeSum(d int, a float64) (s1, dd float64) {
	for j := 1; j < continuumShells; j++ {
		ak := a * math.Sqrt(float64(j))
		if ak-a > towerTail {
			break
		}
		e := latticeShells[d][j] * math.Exp(-ak)
		s1 += e
		dd += ak * e
	}
	return s1, dd
}

// torusEwald returns S - 1 and D for d = 2, 3 by the Ewald-split image sum
// with T = pi (see the file comment).
//
// Image shell j (b = a^2/4 + pi^2 j, z = b/T, s = (d+1)/2):
//
//	a pi^((d-1)/2)/2 b^-s Gamma(s, z)
//	and for D: a pi^((d-1)/2)/2 b^-s [(a^2/(2b)) Gamma(s+1, z) - Gamma(s, z)];
//
// mode shell j >= 1 (kappa = sqrt j, tau = sqrt T, alpha = a/(2 tau)),
// the part t > T of e^(-a kappa):
//
//	[e^(-a kappa) erfc(kappa tau - alpha) - e^(a kappa) erfc(kappa tau + alpha)]/2
//	and for D: (a kappa/2)[e^(-a kappa) erfc(kappa tau - alpha) + e^(a kappa) erfc(kappa tau + alpha)]
//	           - a e^(-j T - alpha^2)/sqrt(pi T);
//
// and the zero mode's part t > T, erf(alpha), less the 1 of Newton:
// -erfc(alpha), with -a e^(-alpha^2)/sqrt(pi T) for D.
func torusEwald(d int, a float64) (s1, dd float64) {
	const T = math.Pi
	tau := math.Sqrt(T)
	alpha := a / (2 * tau)
	pref := a / 2 // times pi^((d-1)/2)
	if d == 3 {
		pref *= math.Pi
	} else {
		pref *= math.Sqrt(math.Pi)
	}
	gauss := math.Exp(-alpha*alpha) / math.Sqrt(math.Pi*T)

	s1 = -math.Erfc(alpha)
	dd = -a * gauss
	for j := 0; j < ewaldShells; j++ {
		count := latticeShells[d][j]
		if count == 0 {
			continue
		}
		// image shell j
		b := a*a/4 + math.Pi*math.Pi*float64(j)
		z := b / T
		gs, gs1 := upperGammaHalf(d, z)
		bs := 1 / (b * b) // b^-s
		if d == 2 {
			bs = 1 / (b * math.Sqrt(b))
		}
		ratio := 2.0 // a^2/(2b) exactly, for the direct image
		if j > 0 {
			ratio = a * a / (2 * b)
		}
		s1 += count * pref * bs * gs
		dd += count * pref * bs * (ratio*gs1 - gs)
		if j == 0 {
			continue
		}
		// mode shell j
		kappa := math.Sqrt(float64(j))
		lo := math.Exp(-a*kappa) * math.Erfc(kappa*tau-alpha)
		hi := math.Exp(a*kappa) * math.Erfc(kappa*tau+alpha)
		s1 += count * (lo - hi) / 2
		dd += count * (a*kappa/2*(lo+hi) - a*gauss*math.Exp(-float64(j)*T))
	}
	return s1, dd
}

// upperGammaHalf returns Gamma(s, z) and Gamma(s+1, z) for s = (d+1)/2,
// d = 2 or 3, in closed form (A&S 6.5.19 recurrence
// Gamma(s+1, z) = s Gamma(s, z) + z^s e^(-z), with Gamma(1/2, z) =
// sqrt(pi) erfc(sqrt z) and Gamma(1, z) = e^(-z)).
func upperGammaHalf(d int, z float64) (gs, gs1 float64) {
	ez := math.Exp(-z)
	if d == 3 { // s = 2
		gs = (1 + z) * ez
		return gs, 2*gs + z*z*ez
	}
	// s = 3/2
	rz := math.Sqrt(z)
	gs = math.Sqrt(math.Pi)/2*math.Erfc(rz) + rz*ez
	return gs, 1.5*gs + z*rz*ez
}
