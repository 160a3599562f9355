package kepler

import (
	"fmt"
	"math"

	"mgorbit/kernels/vec"
)

// Elements are Keplerian orbital elements of a bound orbit.
type Elements struct {
	A    float64 // semi-major axis, m
	E    float64 // eccentricity, 0 <= E < 1
	I    float64 // inclination, rad, in [0, pi]
	Node float64 // longitude of the ascending node, rad
	Peri float64 // argument of pericentre, rad
	M    float64 // mean anomaly, rad
}

// Below these, FromState treats the orbit as circular or equatorial (see the
// package comment). Both sit a little above the round-off of e and sin i
// computed from a state in float64 (a few 1e-16), so genuine values are kept.
const (
	CircularE      = 1e-13
	EquatorialSinI = 1e-13
)

// Period returns the Keplerian period 2 pi sqrt(a^3/mu).
func Period(mu, a float64) float64 {
	return 2 * math.Pi * math.Sqrt(a/mu) * a
}

// SolveKepler returns the eccentric anomaly E with E - e sin E = M, for
// 0 <= e < 1. E lies in the same turn as M: E - M is in [-e, e].
func SolveKepler(M, e float64) float64 {
	if e == 0 || math.IsNaN(M) || math.IsInf(M, 0) {
		return M
	}
	// Reduce to [0, pi] and use the odd symmetry: the root there lies in
	// [0, pi] as well, where f(E) = E - e sin E - M is increasing.
	turn := math.Round(M / (2 * math.Pi))
	m := M - turn*2*math.Pi
	sign := 1.0
	if m < 0 {
		sign, m = -1, -m
	}
	if m > math.Pi { // round-off of the reduction
		m = math.Pi
	}
	E := solveReduced(m, e)
	return turn*2*math.Pi + sign*E
}

// solveReduced solves for m in [0, pi] by Newton's method kept inside a
// shrinking bracket [lo, hi] (bisection when Newton would leave it), so it
// converges for every e < 1, also near e = 1 and m = 0 where f' -> 0.
func solveReduced(m, e float64) float64 {
	lo, hi := 0.0, math.Pi
	// Starting value m + 0.85 e (Danby, Fundamentals of Celestial
	// Mechanics, common practice), kept in the bracket.
	x := math.Min(m+0.85*e, math.Pi)
	for iter := 0; iter < 100; iter++ {
		s, c := math.Sincos(x)
		f := x - e*s - m
		if f == 0 {
			return x
		}
		if f < 0 {
			lo = x
		} else {
			hi = x
		}
		fp := 1 - e*c
		next := x - f/fp
		if !(next > lo && next < hi) {
			next = 0.5 * (lo + hi)
		}
		if math.Abs(next-x) <= 2e-16*math.Max(1, x) || next == lo || next == hi {
			return next
		}
		x = next
	}
	return x
}

// ToState returns the position and velocity relative to the primary of the
// orbit el about a primary of gravitational parameter mu (G times the sum of
// both masses for a relative two-body orbit).
func ToState(mu float64, el Elements) (x, v vec.V, err error) {
	if err := checkElements(mu, el); err != nil {
		return x, v, err
	}
	a, e := el.A, el.E
	E := SolveKepler(el.M, e)
	sE, cE := math.Sincos(E)
	q := math.Sqrt((1 - e) * (1 + e)) // sqrt(1 - e^2) without cancellation
	// perifocal frame: x towards pericentre, y along the motion at pericentre
	px, py := a*(cE-e), a*q*sE
	eDot := math.Sqrt(mu/a) / a / (1 - e*cE)
	pvx, pvy := -a*sE*eDot, a*q*cE*eDot
	p, w := perifocalAxes(el.I, el.Node, el.Peri)
	x = p.Scale(px).AddScaled(py, w)
	v = p.Scale(pvx).AddScaled(pvy, w)
	return x, v, nil
}

// perifocalAxes returns the unit vectors towards pericentre and 90 degrees
// ahead of it in the orbit plane: the columns of R3(Node) R1(I) R3(Peri).
func perifocalAxes(inc, node, peri float64) (p, w vec.V) {
	sO, cO := math.Sincos(node)
	si, ci := math.Sincos(inc)
	sw, cw := math.Sincos(peri)
	p = vec.V{cO*cw - sO*ci*sw, sO*cw + cO*ci*sw, si * sw}
	w = vec.V{-cO*sw - sO*ci*cw, -sO*sw + cO*ci*cw, si * cw}
	return p, w
}

func checkElements(mu float64, el Elements) error {
	switch {
	case !(mu > 0) || math.IsInf(mu, 0):
		return fmt.Errorf("kepler: gravitational parameter mu = %g must be positive and finite", mu)
	case !(el.A > 0) || math.IsInf(el.A, 0):
		return fmt.Errorf("kepler: semi-major axis a = %g must be positive and finite", el.A)
	case !(el.E >= 0 && el.E < 1):
		return fmt.Errorf("kepler: eccentricity e = %g must be in [0, 1) (bound elliptic orbit)", el.E)
	}
	for _, ang := range []struct {
		name string
		v    float64
	}{{"inclination", el.I}, {"node", el.Node}, {"argument of pericentre", el.Peri}, {"mean anomaly", el.M}} {
		if math.IsNaN(ang.v) || math.IsInf(ang.v, 0) {
			return fmt.Errorf("kepler: %s = %g is not finite", ang.name, ang.v)
		}
	}
	return nil
}

// FromState returns the elements of the bound orbit with relative position
// x and velocity v about a primary of parameter mu. Angles are returned in
// [0, 2 pi) (I in [0, pi]); see the package comment for circular and
// equatorial orbits. Unbound or degenerate (radial) states are errors.
func FromState(mu float64, x, v vec.V) (Elements, error) {
	if !(mu > 0) || math.IsInf(mu, 0) {
		return Elements{}, fmt.Errorf("kepler: gravitational parameter mu = %g must be positive and finite", mu)
	}
	for k := 0; k < 3; k++ {
		if math.IsNaN(x[k]) || math.IsInf(x[k], 0) || math.IsNaN(v[k]) || math.IsInf(v[k], 0) {
			return Elements{}, fmt.Errorf("kepler: state %v, %v is not finite", x, v)
		}
	}
	r := x.Norm()
	if r == 0 {
		return Elements{}, fmt.Errorf("kepler: the body is at the primary (r = 0)")
	}
	energy := 0.5*v.Norm2() - mu/r
	if !(energy < 0) {
		return Elements{}, fmt.Errorf("kepler: orbit is not bound (specific energy %g >= 0)", energy)
	}
	h := x.Cross(v)
	hn := h.Norm()
	if hn == 0 {
		return Elements{}, fmt.Errorf("kepler: radial orbit (zero angular momentum) has no ellipse")
	}
	var el Elements
	el.A = -mu / (2 * energy)
	ev := v.Cross(h).Scale(1 / mu).Sub(x.Scale(1 / r))
	el.E = ev.Norm()

	hxy := math.Hypot(h[0], h[1])
	el.I = math.Atan2(hxy, h[2])
	if hxy > EquatorialSinI*hn {
		el.Node = math.Atan2(h[0], -h[1]) // node line along z x h
	}
	// In-plane axes: n along the node line (x for equatorial orbits) and m
	// 90 degrees ahead of it in the direction of motion (m = h^ x n).
	sO, cO := math.Sincos(el.Node)
	n := vec.V{cO, sO, 0}
	m := h.Scale(1 / hn).Cross(n)
	u := math.Atan2(x.Dot(m), x.Dot(n)) // argument of latitude
	var f float64                       // true anomaly
	if el.E > CircularE {
		el.Peri = math.Atan2(ev.Dot(m), ev.Dot(n))
		f = u - el.Peri
	} else {
		f = u
	}
	e := el.E
	eccAnom := 2 * math.Atan2(math.Sqrt(1-e)*math.Sin(f/2), math.Sqrt(1+e)*math.Cos(f/2))
	el.M = eccAnom - e*math.Sin(eccAnom)
	el.Node = wrap(el.Node)
	el.Peri = wrap(el.Peri)
	el.M = wrap(el.M)
	return el, nil
}

// wrap maps an angle into [0, 2 pi).
func wrap(a float64) float64 {
	a = math.Mod(a, 2*math.Pi)
	if a < 0 {
		a += 2 * math.Pi
	}
	if a >= 2*math.Pi {
		a = 0
	}
	return a
}
