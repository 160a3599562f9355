package kepler

import (
	"math"

	"mgorbit/kernels/vec"
)

// Stumpff returns the Stumpff functions c0..c3 of z:
//
//	c0 = cos sqrt(z), c1 = sin sqrt(z)/sqrt(z), c2 = (1 - cos sqrt(z))/z,
//	c3 = (sqrt(z) - sin sqrt(z))/z^(3/2),
//
// continued to z <= 0 by their power series (cosh and sinh for z < 0)
// (Danby, Fundamentals of Celestial Mechanics, 2nd ed., section 6.9).
// For |z| <= 1 the series (ten terms, exact to rounding there) avoids the
// cancellation of the closed forms; beyond, the closed forms lose at most a
// digit, c2 written as 2 sin^2(x/2)/z so it does not cancel at all.
func Stumpff(z float64) (c0, c1, c2, c3 float64) {
	if math.Abs(z) <= 1 {
		// c2 = sum (-z)^n/(2n+2)!, c3 = sum (-z)^n/(2n+3)!, nested.
		c2 = 1 - z*(1.0/(21*22))
		c3 = 1 - z*(1.0/(22*23))
		c2 = 1 - z*(1.0/(19*20))*c2
		c3 = 1 - z*(1.0/(20*21))*c3
		c2 = 1 - z*(1.0/(17*18))*c2
		c3 = 1 - z*(1.0/(18*19))*c3
		c2 = 1 - z*(1.0/(15*16))*c2
		c3 = 1 - z*(1.0/(16*17))*c3
		c2 = 1 - z*(1.0/(13*14))*c2
		c3 = 1 - z*(1.0/(14*15))*c3
		c2 = 1 - z*(1.0/(11*12))*c2
		c3 = 1 - z*(1.0/(12*13))*c3
		c2 = 1 - z*(1.0/(9*10))*c2
		c3 = 1 - z*(1.0/(10*11))*c3
		c2 = 1 - z*(1.0/(7*8))*c2
		c3 = 1 - z*(1.0/(8*9))*c3
		c2 = 1 - z*(1.0/(5*6))*c2
		c3 = 1 - z*(1.0/(6*7))*c3
		c2 = (1 - z*(1.0/(3*4))*c2) / 2
		c3 = (1 - z*(1.0/(4*5))*c3) / 6
		return 1 - z*c2, 1 - z*c3, c2, c3
	}
	if z > 0 {
		x := math.Sqrt(z)
		s, c := math.Sincos(x)
		sh := math.Sin(0.5 * x)
		return c, s / x, 2 * sh * sh / z, (x - s) / (z * x)
	}
	x := math.Sqrt(-z)
	sh := math.Sinh(x)
	shh := math.Sinh(0.5 * x)
	return math.Cosh(x), sh / x, 2 * shh * shh / -z, (sh - x) / (-z * x)
}

// Drift advances the relative two-body state (x, v) about a centre of
// parameter mu by time dt along the exact Kepler flow, for any conic
// (elliptic, parabolic, hyperbolic) and either sign of dt.
//
// It solves Kepler's equation in the universal variable s (ds/dt = 1/r)
// with Danby's G-functions G_n = s^n c_n(beta s^2), beta = 2 mu/r0 - v0^2:
//
//	dt = r0 G1 + eta G2 + mu G3,  eta = x0.v0,
//
// by Halley's method kept inside a bracket (the left side grows
// monotonically with s, at the rate r), then applies the f and g functions
// f = 1 - mu G2/r0, g = r0 G1 + eta G2, fdot = -mu G1/(r r0),
// gdot = 1 - mu G2/r (Danby, Fundamentals of Celestial Mechanics, 2nd ed.,
// sections 6.8-6.9). Bound orbits first drop whole periods from dt.
//
// mu must be positive and x non-zero; otherwise, or if the solution does not
// converge, the result is NaN. It does not allocate.
func Drift(mu float64, x, v vec.V, dt float64) (vec.V, vec.V) {
	r0 := x.Norm()
	if !(mu > 0) || !(r0 > 0) || math.IsNaN(dt) || math.IsInf(dt, 0) {
		return nanV, nanV
	}
	if dt == 0 {
		return x, v
	}
	v2 := v.Dot(v)
	eta := x.Dot(v)
	beta := 2*mu/r0 - v2
	zeta := mu - beta*r0
	if beta > 0 {
		// Bound: the flow has period P = 2 pi mu / beta^(3/2).
		period := 2 * math.Pi * mu / (beta * math.Sqrt(beta))
		if math.Abs(dt) > period {
			dt -= period * math.Round(dt/period)
		}
	}
	r, g1, g2, ok := solveUniversal(mu, r0, v2, eta, zeta, beta, dt)
	if !ok {
		return nanV, nanV
	}
	// Written as x0 + (f-1) x0 + g v0 to keep the small changes of a short
	// drift free of the rounding of f and gdot near 1.
	fm1 := -mu * g2 / r0
	g := r0*g1 + eta*g2
	fdot := -mu * g1 / (r * r0)
	gdm1 := -mu * g2 / r
	nx := vec.V{
		x[0] + (fm1*x[0] + g*v[0]),
		x[1] + (fm1*x[1] + g*v[1]),
		x[2] + (fm1*x[2] + g*v[2]),
	}
	nv := vec.V{
		v[0] + (fdot*x[0] + gdm1*v[0]),
		v[1] + (fdot*x[1] + gdm1*v[1]),
		v[2] + (fdot*x[2] + gdm1*v[2]),
	}
	return nx, nv
}

var nanV = vec.V{math.NaN(), math.NaN(), math.NaN()}

// gFuncs returns Danby's G1, G2, G3 at s and G0.
func gFuncs(beta, s float64) (g0, g1, g2, g3 float64) {
	c0, c1, c2, c3 := Stumpff(beta * s * s)
	s2 := s * s
	return c0, s * c1, s2 * c2, s2 * s * c3
}

// solveUniversal finds s with r0 G1 + eta G2 + mu G3 = dt and returns the
// radius there (the derivative r0 G0 + eta G1 + mu G2) and G1, G2.
func solveUniversal(mu, r0, v2, eta, zeta, beta, dt float64) (r, g1, g2 float64, ok bool) {
	// kepEq returns F(s), F', F'' and the G-functions the caller needs.
	kepEq := func(s float64) (f, fp, fpp, g1, g2, scale float64) {
		g0, g1, g2, g3 := gFuncs(beta, s)
		f = r0*g1 + eta*g2 + mu*g3 - dt
		fp = r0*g0 + eta*g1 + mu*g2
		fpp = eta*g0 + zeta*g1
		scale = math.Abs(r0*g1) + math.Abs(eta*g2) + math.Abs(mu*g3) + math.Abs(dt)
		return f, fp, fpp, g1, g2, scale
	}
	// Work with u = |s| in the direction of dt, where F is increasing from
	// F(0) = -|dt|. For bound orbits (|dt| at most half a period after the
	// reduction) the eccentric anomaly changes by less than pi + 2e < 2 pi,
	// so u < 2 pi/sqrt(beta) brackets the root.
	sign := 1.0
	if dt < 0 {
		sign = -1
	}
	tau := math.Abs(dt)
	lo, hi := 0.0, math.Inf(1)
	if beta > 0 {
		hi = 2 * math.Pi / math.Sqrt(beta)
	}
	// Start: the Taylor series s = dt/r0 - eta dt^2/(2 r0^3) for short
	// drifts (ds/dt = 1/r), the mean rate beta/mu = 1/a for long bound ones.
	u := tau/r0 - sign*eta*tau*tau/(2*r0*r0*r0)
	if tau*math.Sqrt(v2) > 0.5*r0 {
		u = tau / r0
		if beta > 0 {
			u = tau * beta / mu
		}
	}
	if math.IsInf(hi, 1) {
		// Unbound: double until F changes sign (F grows at least like u r_min).
		h := math.Max(u, tau/r0)
		for i := 0; ; i++ {
			f, _, _, _, _, _ := kepEq(sign * h)
			if sign*f > 0 {
				break
			}
			lo, h = h, 2*h
			if i > 200 || math.IsInf(h, 0) {
				return 0, 0, 0, false
			}
		}
		hi = h
	}
	if !(u > lo && u < hi) {
		u = 0.5 * (lo + hi)
	}
	for it := 0; it < 80; it++ {
		f, fp, fpp, gg1, gg2, scale := kepEq(sign * u)
		f *= sign
		fpp *= sign
		// Converged when F is at its rounding level.
		if math.Abs(f) <= 2e-16*scale {
			return fp, gg1, gg2, true
		}
		if f < 0 {
			lo = u
		} else {
			hi = u
		}
		// Halley: u - 2 f f'/(2 f'^2 - f f''); Newton, then bisection, when
		// a step would leave the bracket.
		next := u - 2*f*fp/(2*fp*fp-f*fpp)
		if !(next > lo && next < hi) {
			next = u - f/fp
			if !(next > lo && next < hi) {
				next = 0.5 * (lo + hi)
			}
		}
		if next == u || math.Abs(next-u) <= 1e-16*u {
			_, fp, _, gg1, gg2, _ = kepEq(sign * next)
			return fp, gg1, gg2, true
		}
		u = next
	}
	return 0, 0, 0, false
}
