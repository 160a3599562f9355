package reference

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/diff/fd"
	"gonum.org/v1/gonum/integrate/quad"

	"mgorbit/kernels/vec"
)

// Path names for Exact.Path.
const (
	PathExact        = "exact-quadrature"
	PathNearCircular = "near-circular-limit"
)

// Correction gives the radial acceleration a_r = -dPhi/dr and the potential
// dPhi of the part of a central law beyond Newton, at distance r from a
// source of parameter mu. kernels.Stack.CorrectionRadial has this form.
// A nil Correction is plain Newton.
type Correction = func(mu, r float64) (ar, phi float64)

// Exact is the apsidal advance and the periods of a bound orbit of a test
// body in the central potential Phi(r) = -mu/r + dPhi(r).
type Exact struct {
	RMin, RMax float64 // apsides (m)
	// AdvancePerOrbit is the apsidal advance per radial period,
	// Delta varpi = 2 (apsidal angle) - 2 pi (rad).
	AdvancePerOrbit float64
	RadialPeriod    float64 // pericentre to pericentre (s)
	// AzimuthalPeriod is 2 pi P_r / (2 pi + AdvancePerOrbit).
	AzimuthalPeriod float64
	// KeplerPeriod is 2 pi sqrt(a_g^3/mu) with a_g = (RMin + RMax)/2.
	KeplerPeriod float64
	Energy       float64 // specific energy E = v^2/2 + Phi
	AngMom       float64 // specific angular momentum h = |x x v|
	// Eccentricity is the geometric (RMax - RMin)/(RMax + RMin).
	Eccentricity float64
	Path         string // PathExact or PathNearCircular
	// Nodes is the Gauss-Legendre node count of the last quadrature
	// (0 on the near-circular path).
	Nodes int
	// Tolerance is the relative change of the correction integrals between
	// the last two node counts: the quadrature's error estimate. On the
	// near-circular path it is the neglected relative O(e^2).
	Tolerance float64
}

const (
	// nearCircularE: below this geometric eccentricity the apsides are too
	// close for divided differences and the limit is exact to O(e^2) = 1e-12.
	nearCircularE = 1e-6
	// quadTol is the relative agreement demanded of successive node counts.
	quadTol = 1e-12
	// plateauTol: rounding in the correction's own a_r and dPhi can stall
	// the agreement above quadTol. The anomaly is a second divided
	// difference of dPhi(1/u), so a correction close to a multiple of 1/r
	// (a Yukawa range lambda far beyond the orbit) keeps only a relative
	// ~1e-16 (lambda/r)^2 of it in float64, whatever the quadrature. A
	// stalled change below plateauTol is accepted and reported as Tolerance.
	plateauTol = 1e-4
	minNodes   = 16
	maxNodes   = 1 << 15
	// endZone: divided differences over intervals shorter than this
	// fraction of u come from the derivative, not from value differences.
	endZone = 0.05
	epsilon = 0x1p-52 // float64 machine epsilon
)

// FromApsides returns the exact reference for the orbit with the given
// apsides in Phi = -mu/r + dPhi. corr may be nil (Newton).
func FromApsides(mu, rmin, rmax float64, corr Correction) (Exact, error) {
	if !(mu > 0) || math.IsInf(mu, 0) {
		return Exact{}, fmt.Errorf("reference: mu must be positive and finite, got %g", mu)
	}
	if !(rmin > 0) || math.IsInf(rmax, 0) || math.IsNaN(rmax) {
		return Exact{}, fmt.Errorf("reference: apsides must be positive and finite, got rmin=%g rmax=%g", rmin, rmax)
	}
	if rmin > rmax {
		return Exact{}, fmt.Errorf("reference: rmin=%g exceeds rmax=%g", rmin, rmax)
	}
	if corr == nil {
		corr = func(float64, float64) (float64, float64) { return 0, 0 }
	}
	ag := (rmin + rmax) / 2
	res := Exact{
		RMin:         rmin,
		RMax:         rmax,
		KeplerPeriod: 2 * math.Pi * math.Sqrt(ag*ag*ag/mu),
		Eccentricity: (rmax - rmin) / (rmax + rmin),
	}
	if res.Eccentricity < nearCircularE {
		return nearCircular(mu, res, corr)
	}
	p := newPotential(mu, corr)
	u1, u2 := 1/rmin, 1/rmax
	uc, ua := (u1+u2)/2, (u1-u2)/2
	h2 := 2 * (mu - p.div1(u2, u1)) / (u1 + u2)
	if !(h2 > 0) {
		return Exact{}, fmt.Errorf("reference: no orbit has apsides %g and %g in this potential (h^2 = %g)", rmin, rmax, h2)
	}
	h := math.Sqrt(h2)
	res.AngMom = h
	res.Energy = -mu*u1 + p.d(u1) + h2*u1*u1/2

	// One pass at n nodes: the two correction integrals, both on [0, pi].
	forbidden := false
	integrals := func(n int) (adv, per float64) {
		x := make([]float64, n)
		w := make([]float64, n)
		quad.Legendre{}.FixedLocations(x, w, 0, math.Pi)
		for i, th := range x {
			u := uc + ua*math.Cos(th)
			d2 := (p.div1(u, u1) - p.div1(u2, u)) / (u1 - u2)
			rho := 2 * d2 / h2
			if !(1+rho > 0) {
				forbidden = true
				continue
			}
			s := math.Sqrt(1 + rho)
			g := -rho / (s * (1 + s)) // 1/sqrt(1+rho) - 1 without cancellation
			adv += w[i] * g
			per += w[i] * g / (u * u)
		}
		return 2 * adv, 2 / h * per
	}

	adv, per := integrals(minNodes)
	lastChange := math.Inf(1)
	for n := 2 * minNodes; ; n *= 2 {
		a2, p2 := integrals(n)
		if forbidden {
			return Exact{}, fmt.Errorf("reference: Q(u) < 0 between the apsides %g and %g: they do not bound one orbit", rmin, rmax)
		}
		change := math.Max(relChange(a2, adv), relChange(p2, per))
		adv, per = a2, p2
		res.Nodes = n
		if change <= quadTol || (change <= plateauTol && change >= lastChange/2) {
			res.Tolerance = change
			break
		}
		if n >= maxNodes {
			return Exact{}, fmt.Errorf("reference: quadrature not converged at %d nodes (relative change %.1e): e = %.6f too close to 1, "+
				"or the correction too close to a multiple of 1/r for float64 to resolve its advance", n, change, res.Eccentricity)
		}
		lastChange = change
	}
	res.Path = PathExact
	res.AdvancePerOrbit = adv
	res.RadialPeriod = 2*math.Pi/h*uc/math.Pow(u1*u2, 1.5) + per
	res.AzimuthalPeriod = 2 * math.Pi * res.RadialPeriod / (2*math.Pi + adv)
	return res, nil
}

func relChange(now, before float64) float64 {
	d := math.Abs(now - before)
	if d == 0 {
		return 0
	}
	return d / math.Abs(now)
}

// nearCircular is the e -> 0 limit of the quadrature: rho is constant,
// rho0 = D2(u0)/h^2 with D2 = d^2D/du^2, and the apsidal angle is
// pi/sqrt(1 + rho0). With
// g(r) = r^2 a_c(r) (a_c the correction's a_r), D2 = -r^2 g'(r) and
// h^2 = F r^3 (F = mu/r^2 - a_c, the attraction), so rho0 = -g'/(F r). This
// is Goldstein's pi/sqrt(3 + r F'/F), written so a tiny correction does not
// cancel against the 3 and its 1/r^2 part drops out before differencing.
func nearCircular(mu float64, res Exact, corr Correction) (Exact, error) {
	r := 2 / (1/res.RMin + 1/res.RMax)
	ac, dphi := corr(mu, r)
	f := mu/(r*r) - ac
	if !(f > 0) {
		return Exact{}, fmt.Errorf("reference: no attraction at r = %g (F = %g): no circular orbit", r, f)
	}
	g := func(s float64) float64 { a, _ := corr(mu, s); return s * s * a }
	// Five-point central difference: error O(step^4), rounding eps/step;
	// a step of 1e-3 r balances the two near 1e-12 relative.
	dg := fd.Derivative(g, r, &fd.Settings{Formula: fivePoint, Step: 1e-3 * r})
	rho := -dg / (f * r)
	if !(1+rho > 0) {
		return Exact{}, fmt.Errorf("reference: the circular orbit at r = %g is unstable (3 + r F'/F = %g)", r, 1+rho)
	}
	s := math.Sqrt(1 + rho)
	h := math.Sqrt(f * r * r * r)
	res.AngMom = h
	res.Energy = h*h/(2*r*r) - mu/r + dphi
	res.Path = PathNearCircular
	res.AdvancePerOrbit = 2 * math.Pi * (-rho / (s * (1 + s)))
	res.AzimuthalPeriod = 2 * math.Pi * r * r / h
	res.RadialPeriod = res.AzimuthalPeriod / s
	res.Tolerance = math.Max(res.Eccentricity*res.Eccentricity, 1e-12)
	return res, nil
}

var fivePoint = fd.Formula{
	Stencil:    []fd.Point{{Loc: -2, Coeff: 1.0 / 12}, {Loc: -1, Coeff: -2.0 / 3}, {Loc: 1, Coeff: 2.0 / 3}, {Loc: 2, Coeff: -1.0 / 12}},
	Derivative: 1,
	Step:       1e-3,
}

// potential is the correction as D(u) = dPhi(1/u), with D'(u) = a_r r^2.
type potential struct {
	mu   float64
	corr Correction
	// Gauss-Legendre nodes on [0, 1] for short-interval divided differences.
	x, w []float64
}

func newPotential(mu float64, corr Correction) *potential {
	p := &potential{mu: mu, corr: corr, x: make([]float64, 8), w: make([]float64, 8)}
	quad.Legendre{}.FixedLocations(p.x, p.w, 0, 1)
	return p
}

func (p *potential) d(u float64) float64 {
	_, phi := p.corr(p.mu, 1/u)
	return phi
}

func (p *potential) dprime(u float64) float64 {
	ar, _ := p.corr(p.mu, 1/u)
	return ar / (u * u)
}

// div1 is the divided difference D[a,b] = (D(b) - D(a))/(b - a). When b is
// within endZone of a (relative to u) the value difference would cancel, so
// it is the mean of D' over [a,b] instead (8-point Gauss-Legendre: far below
// rounding over such short intervals of a smooth D).
func (p *potential) div1(a, b float64) float64 {
	if a == b {
		return p.dprime(a)
	}
	span := math.Abs(b - a)
	if span > endZone*math.Max(a, b) {
		return (p.d(b) - p.d(a)) / (b - a)
	}
	var s float64
	for i, t := range p.x {
		s += p.w[i] * p.dprime(a+t*(b-a))
	}
	return s
}

// FromState returns the exact reference for the orbit through relative
// position x with velocity v. The apsides are the roots of Q(u) on either
// side of u = 1/|x|, found by bracketing outwards and bisection; the
// advance is then computed for those apsides (FromApsides), so a root error
// moves it only by a relative amount of the same order. Orbits within a
// relative width ~1e-6 of circular have ill-conditioned (near-double) roots:
// expect the near-circular limit and root errors near sqrt(1e-16).
func FromState(mu float64, x, v vec.V, corr Correction) (Exact, error) {
	if !(mu > 0) || math.IsInf(mu, 0) {
		return Exact{}, fmt.Errorf("reference: mu must be positive and finite, got %g", mu)
	}
	if corr == nil {
		corr = func(float64, float64) (float64, float64) { return 0, 0 }
	}
	r := x.Norm()
	if !(r > 0) || math.IsInf(r, 0) {
		return Exact{}, fmt.Errorf("reference: position must be finite and non-zero, got %v", x)
	}
	h := x.Cross(v).Norm()
	if !(h > 0) {
		return Exact{}, errors.New("reference: radial orbit (zero angular momentum) has no apsidal advance")
	}
	_, dphi0 := corr(mu, r)
	energy := 0.5*v.Dot(v) - mu/r + dphi0
	q := func(u float64) float64 {
		_, dphi := corr(mu, 1/u)
		return 2*energy + 2*mu*u - 2*dphi - h*h*u*u
	}
	// Rounding in Q: its terms' size times a few ulps. Near an apse Q is
	// smaller than this, so its sign there means nothing.
	noise := func(u float64) float64 {
		_, dphi := corr(mu, 1/u)
		return 8 * epsilon * (2*math.Abs(energy) + 2*mu*u + 2*math.Abs(dphi) + h*h*u*u)
	}
	us := 1 / r
	// Pericentre: outwards in u (towards the centre).
	u1, ok := bracketRoot(q, noise, us, func(d float64) float64 { return us * (1 + d) })
	if !ok {
		return Exact{}, fmt.Errorf("reference: no pericentre (the orbit falls to the centre), E = %g, h = %g", energy, h)
	}
	u2, ok := bracketRoot(q, noise, us, func(d float64) float64 { return us / (1 + d) })
	if !ok {
		return Exact{}, fmt.Errorf("reference: unbound orbit (no apocentre), E = %g, h = %g", energy, h)
	}
	return FromApsides(mu, 1/u1, 1/u2, corr)
}

// bracketRoot walks from u0 (where Q = v_r^2 >= 0) through at(d),
// d = 1e-13, 2e-13, ... up to 1e12, to the first point where Q is negative
// beyond its rounding noise, and bisects from the last point before it.
// Steps start tiny so a start near an apse, or a nearly circular orbit, is
// not stepped over. A forbidden band narrower than the step can be missed:
// only for potentials with several wells.
func bracketRoot(q, noise func(float64) float64, u0 float64, at func(d float64) float64) (float64, bool) {
	lo := u0
	for d := 1e-13; d < 1e12; d *= 2 {
		hi := at(d)
		if q(hi) < -noise(hi) {
			return bisect(q, lo, hi), true
		}
		lo = hi
	}
	return 0, false
}

// bisect narrows a bracket with q(lo) >= 0 > q(hi) to adjacent floats.
// Bisection rather than a faster method: Q is cheap, and at most ~60 halvings
// cannot fail.
func bisect(q func(float64) float64, lo, hi float64) float64 {
	for range 200 {
		mid := lo + (hi-lo)/2
		if mid == lo || mid == hi {
			break
		}
		if q(mid) < 0 {
			hi = mid
		} else {
			lo = mid
		}
	}
	return lo + (hi-lo)/2
}
