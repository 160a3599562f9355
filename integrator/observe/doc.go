// Package observe measures orbital observables from an integrated
// trajectory: pericentre and apocentre passages, the apsidal precession per
// orbit with its least-squares standard error, the radial and azimuthal
// periods, and the orbit size.
//
// Passages are found where x.v of the relative orbit changes sign, then
// refined to the extremum of r on the quintic Hermite interpolant through
// the positions, velocities and accelerations at the two ends of the step
// (local error O(h^6), below the sixth-order stepper's own). Osculating
// Newtonian elements are never used for this: under a modified force they
// oscillate within an orbit.
//
// A Tracker's state can be saved (Snapshot) and rebuilt (RestoreTracker)
// for checkpoints.
package observe
