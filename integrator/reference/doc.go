// Package reference computes the semi-analytic apsidal advance and periods
// that integrated orbits are checked against.
//
// Two paths, each named in its result:
//
//   - Exact ("exact-quadrature"): a test body in a central potential
//     Phi(r) = -mu/r + dPhi(r). The Newtonian part of the apsidal and period
//     integrals is taken out analytically, so only the correction is left to
//     the quadrature and effects far below float64's 1e-16 of Newton (a
//     1e-9 Yukawa term, a screened scalar) keep their relative accuracy.
//     Plain float64 quadrature of the textbook integral cannot: rounding in
//     its radicand, which vanishes at the apsides, swamps an anomaly of
//     1e-9 rad (tens of percent off, in the tests). Orbits closer than
//     a relative width 1e-6 to circular take the near-circular limit
//     ("near-circular-limit").
//
//   - Gauss (GaussAdvance): the first-order orbit average of any small
//     perturbing acceleration, velocity-dependent ones included (the 1PN
//     term), over a Kepler ellipse. Exact only to first order in the
//     perturbation.
//
// Derivation of the exact path, with u = 1/r and D(u) = dPhi(1/u): the orbit
// obeys (du/dphi)^2 h^2 = Q(u) = 2E + 2 mu u - 2 D(u) - h^2 u^2. Given the
// apsides u1 = 1/rmin > u2 = 1/rmax, Q(u1) = Q(u2) = 0 fixes
//
//	h^2 = 2 (mu - D[u1,u2]) / (u1 + u2),   E = -mu u1 + D(u1) + h^2 u1^2 / 2,
//
// and Q(u) - (-h^2 (u-u1)(u-u2)) is -2 D(u) plus a linear function vanishing
// at u1 and u2, i.e. -2 D[u1,u2,u] (u-u1)(u-u2). So, exactly,
//
//	Q(u) = h^2 (u1 - u)(u - u2) (1 + rho(u)),   rho = 2 D[u2,u1,u] / h^2,
//
// with D[.,.] and D[.,.,.] divided differences. Putting u = uc + ua cos(theta)
// (uc, ua the mean and half-difference of u1, u2) turns dphi into
// dtheta / sqrt(1 + rho), free of end-point singularities, so
//
//	advance = 2 Int_0^pi [1/sqrt(1+rho) - 1] dtheta,
//	P_r     = (2/h) Int_0^pi dtheta / (u^2 sqrt(1+rho))
//	        = (2 pi/h) uc / (u1 u2)^(3/2) + (2/h) Int_0^pi [1/sqrt(1+rho) - 1] / u^2 dtheta,
//
// the first term of P_r being Kepler's period for those apsides. The
// divided differences near an end (u close to u1 or u2) are formed from the
// derivative D'(u) = a_r(r) r^2 (a_r = -dPhi/dr), averaged by Gauss-Legendre
// over the short interval, instead of from a difference of nearly equal
// values.
package reference
