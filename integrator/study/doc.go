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
//
// Guards: at the output cadence each isolated orbit's energy and angular
// momentum (and the massive bodies' total energy) are checked against the
// scenario's tolerances; a breach stops the run (AccuracyError) or, with
// KeepGoing, marks the rows and the summary. At every step each pair of
// bodies that can meet is checked for contact within the sum of the radii
// (CollisionError, also at the refined pericentre between steps) and, for
// fixed-step methods, for a pass the step no longer resolves
// (EncounterError, an accuracy error).
//
// Checkpoints (Checkpointing): each run saves its complete state (system,
// stepper, trackers, accumulators, trajectory so far, float64 bits exact)
// at saving points and when the context is cancelled; a study resumed from
// such a Checkpoint computes only the missing steps, and its results are
// bit for bit those of an uninterrupted one. A checkpoint of another
// scenario, build or plan is refused (ErrCheckpointMismatch).
package study
