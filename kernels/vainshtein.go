package kernels

import (
	"fmt"
	"math"

	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

// Vainshtein is a conformally coupled cubic-galileon scalar, screened inside
// the Vainshtein radius r_V:
//
//	a_r = -(mu/r^2) [1 + sigma 2 beta^2 xi(r/r_V)],  xi(x) = 2 / (1 + sqrt(1 + x^-3))
//
// (xi = 2 x^3 (sqrt(1 + x^-3) - 1) rewritten without cancellation). Far
// outside r_V, xi -> 1 and the scalar adds sigma 2 beta^2 of Newton; deep
// inside, xi -> 2 x^(3/2) and the extra force fades. mu is the bare value:
// the force is mu/r^2 when fully screened and (1 + sigma 2 beta^2) mu/r^2
// unscreened. The branch sign sigma = +1 is an extra attraction, -1 a
// repulsion. As a correction it returns the sigma 2 beta^2 term, and the
// potential
//
//	phi = -(mu sigma 2 beta^2 / r_V) Int_x^inf xi(y)/y^2 dy   (phi(inf) = 0),
//
// summed as a hypergeometric series in closed form (see vainshteinShape).
//
// r_V is given directly (r_v) or derived from the crossover radius with the
// induced-gravity parameterisation r_V^3 = (8/9) r_g r_c^2, r_g = 2 mu/c^2,
// which pairs with 2 beta^2 = 1/3 (the default coupling): then r_V depends on
// each source's mu (about 100 pc for a Sun-like star at r_c ~ 4 Gpc), and
// deep inside it the force changes by the fraction sigma (r^3/(2 r_g r_c^2))^(1/2).
//
// Screening is not additive: each source's field is screened by that source
// alone, so with several massive bodies the per-source sum is an
// approximation that holds when one body dominates.
type Vainshtein struct {
	coupling  float64 // 2 beta^2
	beta      float64 // NaN unless beta was given
	rv        float64 // NaN when derived from rc
	rc        float64 // NaN when rv was given
	sigmaWord string
	strength  float64 // sigma 2 beta^2
	rvPerCbrt float64 // r_V / mu^(1/3) in the r_c parameterisation
}

// vainshteinDefaultCoupling is 2 beta^2 of the induced-gravity model (PHYSICS.md).
const vainshteinDefaultCoupling = 1.0 / 3

func init() {
	Register(vainshteinInfo(), newVainshtein)
}

func vainshteinInfo() Info {
	positive := func(name string, dim units.Dim, unit, doc string) Param {
		return Param{Name: name, Kind: Number, Dim: dim, Unit: unit, Doc: doc,
			Default: math.NaN(), Min: 0, MinOpen: true, Max: math.Inf(1)}
	}
	return Info{
		Name:    "vainshtein",
		Role:    Correction,
		Summary: "Vainshtein-screened cubic-galileon scalar, a_r = -(mu/r^2) sigma 2 beta^2 xi(r/r_V); returns that term",
		Mu:      "bare G M: the force is mu/r^2 deep inside r_V and (1 + sigma 2 beta^2) mu/r^2 far outside",
		Params: []Param{
			positive("coupling", units.Dimensionless, "",
				"2 beta^2, the scalar's strength relative to Newton unscreened; give this or beta (default 1/3)"),
			positive("beta", units.Dimensionless, "", "conformal coupling beta; give this or coupling"),
			positive("r_v", units.Length, "m", "Vainshtein radius; give this or r_c"),
			positive("r_c", units.Length, "m",
				"crossover radius, for r_V^3 = (8/9) (2 mu/c^2) r_c^2 per source; give this or r_v"),
			{Name: "sigma", Kind: Choice, Choices: []string{"+1", "-1"}, DefaultChoice: "+1",
				Doc: "branch sign: +1 extra attraction, -1 repulsion"},
		},
	}
}

func newVainshtein(v Values) (Kernel, error) {
	k := &Vainshtein{beta: math.NaN(), rv: math.NaN(), rc: math.NaN()}
	coupling, haveCoupling := v.Num["coupling"]
	beta, haveBeta := v.Num["beta"]
	switch {
	case haveCoupling && haveBeta:
		return nil, fmt.Errorf("kernel vainshtein: give either coupling (= 2 beta^2) or beta, not both")
	case haveBeta:
		if !(beta > 0) || math.IsInf(beta, 0) {
			return nil, fmt.Errorf("kernel vainshtein: beta = %g must be finite and > 0", beta)
		}
		k.beta, k.coupling = beta, 2*beta*beta
	case haveCoupling:
		if !(coupling > 0) || math.IsInf(coupling, 0) {
			return nil, fmt.Errorf("kernel vainshtein: coupling = %g must be finite and > 0", coupling)
		}
		k.coupling = coupling
	default:
		k.coupling = vainshteinDefaultCoupling
	}

	rv, haveRV := v.Num["r_v"]
	rc, haveRC := v.Num["r_c"]
	switch {
	case haveRV && haveRC:
		return nil, fmt.Errorf("kernel vainshtein: give either r_v (the Vainshtein radius) or r_c (to derive it), not both")
	case haveRV:
		if !(rv > 0) || math.IsInf(rv, 0) {
			return nil, fmt.Errorf("kernel vainshtein: r_v = %g must be a finite length > 0", rv)
		}
		k.rv = rv
	case haveRC:
		if !(rc > 0) || math.IsInf(rc, 0) {
			return nil, fmt.Errorf("kernel vainshtein: r_c = %g must be a finite length > 0", rc)
		}
		k.rc = rc
		// r_V^3 = (8/9) (2 mu/c^2) r_c^2 = mu (16/9) (r_c/c)^2
		k.rvPerCbrt = math.Cbrt(16.0 / 9 * (rc / units.C) * (rc / units.C))
	default:
		return nil, fmt.Errorf("kernel vainshtein: the Vainshtein radius is missing: give r_v (a length) or r_c (the crossover radius, to derive it)")
	}

	k.sigmaWord = v.Str["sigma"]
	switch k.sigmaWord {
	case "", "+1":
		k.sigmaWord, k.strength = "+1", k.coupling
	case "-1":
		k.strength = -k.coupling
	default:
		return nil, fmt.Errorf("kernel vainshtein: sigma = %q is not allowed (one of +1, -1)", k.sigmaWord)
	}
	return k, nil
}

// Info implements Kernel.
func (*Vainshtein) Info() Info { return vainshteinInfo() }

// Values implements Kernel: the parameters as given (coupling or beta, r_v
// or r_c); the default coupling is reported as coupling.
func (k *Vainshtein) Values() Values {
	v := Values{Num: map[string]float64{}, Str: map[string]string{"sigma": k.sigmaWord}}
	if math.IsNaN(k.beta) {
		v.Num["coupling"] = k.coupling
	} else {
		v.Num["beta"] = k.beta
	}
	if math.IsNaN(k.rc) {
		v.Num["r_v"] = k.rv
	} else {
		v.Num["r_c"] = k.rc
	}
	return v
}

// radius returns r_V for a source of parameter mu. In the r_c
// parameterisation it is one cube root per call: cheaper than a cache of the
// last mu would be once several sources alternate, and safe to share
// between goroutines.
func (k *Vainshtein) radius(mu float64) float64 {
	if math.IsNaN(k.rc) {
		return k.rv
	}
	return k.rvPerCbrt * math.Cbrt(mu)
}

// Radial implements Central: the scalar's part of a_r and Phi.
func (k *Vainshtein) Radial(mu, r float64) (ar, phi float64) {
	if mu == 0 {
		return 0, 0 // no source, no scalar (and no r_V to divide by)
	}
	rv := k.radius(mu)
	x := r / rv
	ar = -(mu / (r * r)) * k.strength * vainshteinXi(x)
	phi = -(mu * k.strength / rv) * vainshteinShape(x)
	return ar, phi
}

// Accel implements Kernel. It skips the potential, which the force does not need.
func (k *Vainshtein) Accel(mu float64, x, _ vec.V) vec.V {
	if mu == 0 {
		return vec.V{}
	}
	r2 := x.Dot(x)
	r := math.Sqrt(r2)
	ar := -(mu / r2) * k.strength * vainshteinXi(r/k.radius(mu))
	return x.Scale(ar / r)
}

// Energy implements Kernel: the scalar's potential.
func (k *Vainshtein) Energy(mu float64, x, _ vec.V) float64 {
	_, phi := k.Radial(mu, x.Norm())
	return phi
}

// vainshteinXi is xi(x) = 2/(1 + sqrt(1 + x^-3)); below x = 1 as
// 2 t/(t + sqrt(1 + t^2)), t = x^(3/2), which neither overflows nor loses
// the 2 x^(3/2) of deep screening.
func vainshteinXi(x float64) float64 {
	if x >= 1 {
		return 2 / (1 + math.Sqrt(1+1/(x*x*x)))
	}
	t := x * math.Sqrt(x)
	return 2 * t / (t + math.Sqrt(1+t*t))
}

// vainshteinShape returns I(x) = Int_x^inf xi(y)/y^2 dy, so phi = -(mu s/r_V) I.
//
// With s = y^-3 and then u = s/(1+s),
//
//	I(x) = (2/3) Int_0^U u^(-5/3) [(1-u)^(-5/6) - (1-u)^(-1/3)] du,  U = 1/(1 + x^3).
//
// For x >= 1 (U <= 1/2) the binomial series of the bracket integrates term by
// term: I = U^(1/3) Sum_j A_j U^j. For x < 1, I = I(0) - tail with w = 1 - u,
// W = x^3/(1 + x^3) <= 1/2:
//
//	tail = (2/3) Int_0^W (1-w)^(-5/3) [w^(-5/6) - w^(-1/3)] dw
//	     = W^(1/6) [Sum_k B_k W^k - W^(1/2) Sum_k C_k W^k],
//
// and I(0) = Gamma(1/3) Gamma(1/6) / (2 sqrt(pi)) from the beta integral
// Int_0^inf s^(a-1) ((1+s)^(1/2) - 1) ds = B(a, -1/2 - a) at a = -2/3.
// All terms of each sum are positive and fall at least as 2^-k.
func vainshteinShape(x float64) float64 {
	if math.IsInf(x, 1) {
		return 0
	}
	if x >= 1 {
		inv3 := 1 / (x * x * x)
		u := inv3 / (1 + inv3) // 1/(1 + x^3) without overflow
		// U^(1/3) = 1/(x (1 + x^-3)^(1/3))
		return vainshteinHorner(vainshteinA[:], u) / (x * math.Cbrt(1+inv3))
	}
	x3 := x * x * x
	w := x3 / (1 + x3)
	root := math.Sqrt(1 + x3)
	sqrtW := x * math.Sqrt(x) / root         // W^(1/2)
	sixthW := math.Sqrt(x) / math.Cbrt(root) // W^(1/6)
	tail := sixthW * (vainshteinHorner(vainshteinB[:], w) - sqrtW*vainshteinHorner(vainshteinC[:], w))
	return vainshteinShapeAtZero - tail
}

// vainshteinShapeAtZero is Gamma(1/3) Gamma(1/6) / (2 sqrt(pi)), from mpmath
// 1.2.1 at 40 digits: 4.206546315976362783525057...
const vainshteinShapeAtZero = 4.2065463159763627835

const vainshteinTerms = 60 // (1/2)^60 < 1e-18: full precision at U or W = 1/2

// vainshteinA, B, C are the series coefficients of vainshteinShape:
// A_j = (2/3) d_(j+1)/(j + 1/3), d_k = [(5/6)_k - (1/3)_k]/k!,
// B_k = (2/3) e_k/(k + 1/6), C_k = (2/3) e_k/(k + 2/3), e_k = (5/3)_k/k!.
var vainshteinA, vainshteinB, vainshteinC = vainshteinCoefficients()

func vainshteinCoefficients() (a, b, c [vainshteinTerms]float64) {
	p, q, e := 1.0, 1.0, 1.0 // (5/6)_k/k!, (1/3)_k/k!, (5/3)_k/k!
	for k := 0; k < vainshteinTerms; k++ {
		b[k] = 2.0 / 3 * e / (float64(k) + 1.0/6)
		c[k] = 2.0 / 3 * e / (float64(k) + 2.0/3)
		e *= (float64(k) + 5.0/3) / float64(k+1)
		p *= (float64(k) + 5.0/6) / float64(k+1)
		q *= (float64(k) + 1.0/3) / float64(k+1)
		a[k] = 2.0 / 3 * (p - q) / (float64(k) + 1.0/3) // d_(k+1)
	}
	return a, b, c
}

// vainshteinHorner sums coef[k] z^k for 0 <= z <= 1/2, with only as many
// terms as z needs for 1e-18.
func vainshteinHorner(coef []float64, z float64) float64 {
	n := vainshteinTerms
	switch {
	case z <= 1.0/64:
		n = 10
	case z <= 1.0/8:
		n = 20
	case z <= 1.0/4:
		n = 31
	}
	s := coef[n-1]
	for k := n - 2; k >= 0; k-- {
		s = s*z + coef[k]
	}
	return s
}
