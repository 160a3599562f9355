// Package lensing computes what a kernel stack does to light passing a
// source: the deflection angle, the Shapiro delay, and the effective PPN
// parameter gamma, from the metric potentials Phi (time-time) and Psi
// (space-space) each kernel declares (kernels.Lensing).
//
// Everything is a line integral along the unperturbed straight ray at impact
// parameter b (weak field, first order in mu/c^2):
//
//	deflection  theta   = (1/c^2) Int grad_perp (Phi + Psi) dz   (positive: towards the source)
//	delay       Delta t = -(1/c^3) Int (Phi + Psi) dz            (from the emitter to the receiver)
//
// integrated numerically (Gauss-Legendre panels from gonum, refined until
// they agree) after the substitution z = b sinh t, which maps every length
// scale of a kernel (range, Vainshtein or crossover radius) to an interval
// of width about one in t, and makes Newton's integrand a smooth sech^2 t
// (deflection) or a constant (delay). The base law and the corrections are
// integrated apart, so that a small correction keeps its own digits.
//
// gamma is reported two ways: from the potentials at r = b, gamma = Psi/Phi,
// and from the deflection, theta = 2 (1 + gamma) mu_dyn/(c^2 b), where
// mu_dyn = b^2 dPhi/dr(b) is the gravitational parameter an orbit at r = b
// would measure (Kepler's third law). For kernels whose mu is not the
// dynamical one (the coupling-fixed massive graviton's static force is
// 4/3 of Newton's, an unscreened scalar adds 2 beta^2) this is what makes
// the deflection-based gamma comparable with the bound from light bending
// and ranging, gamma - 1 = (2.1 +- 2.3)e-5 (Bertotti, Iess & Tortora,
// Nature 425, 374 (2003)). The ratio to general relativity is given for
// both mus: the one the scenario gives (the kernels' mu) and mu_dyn.
package lensing
