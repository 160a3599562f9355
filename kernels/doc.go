// Package kernels holds the force laws: Newtonian gravity, the first
// post-Newtonian test-body correction of general relativity, and the
// alternative-gravity models, one file each.
//
// A Kernel gives the acceleration on a body from one source of gravitational
// parameter mu, and its contribution to the conserved energy. Kernels come in
// two roles. A Base kernel is a whole law of gravity (newton, gr1pn, eih). A
// Correction kernel gives only its difference from Newton, so that a Stack,
// a base plus corrections, never counts the Newtonian term twice: "GR 1PN
// plus a Yukawa term" is Stack{Base: gr1pn, Corrections: [yukawa]}, and the
// anomaly a model causes is the stack's result minus that of Stack.Reference.
//
// Kernels register themselves with Register in an init function of their own
// file; New builds one by name from SI parameter values, checking each
// against the ranges its Info declares.
//
// Kernels that implement Lensing say how their field enters the metric
// (Phi and Psi, split by what they exchange), for light deflection and the
// Shapiro delay (package integrator/lensing); base laws that implement
// NBody (eih) are not sums of pair forces.
package kernels
