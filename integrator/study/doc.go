// Package study turns a scenario into results: it integrates the system
// (and the companion runs that every result needs), measures each body's
// orbit, and sets the semi-analytic reference beside it.
//
// One study is up to five integrations of the same initial state:
//
//   - the scenario's stack at its step h (the reported values),
//   - the same at h/2 (the integration-error estimate; for rk45 a tighter
//     tolerance instead),
//   - the reference stack (the stack without its corrections, or Newton
//     for a bare base law) at h and at h/2: the anomaly is the difference,
//     which cancels most of the integrator's own spurious precession,
//   - plain Newton at h, for the period shift against a Newtonian run from
//     the same state (when the reference stack is not already Newton).
//
// The runs are independent and go in parallel.
package study
