// Package integrator advances a System of bodies under a kernel Stack.
//
// A Stepper advances the whole system by one step h. The symplectic ones
// (Leapfrog, Yoshida4, Yoshida6) are compositions of the kick-drift-kick
// leapfrog; RK45 is the embedded Dormand-Prince 5(4) pair with error
// control, kept as a non-symplectic reference for cross-checks.
//
// Velocity-dependent forces (the 1PN term) break the separable Hamiltonian
// the leapfrog relies on. Their kicks are solved implicitly: the velocity
// update v' = v + tau a(x, (v + v')/2) is the implicit midpoint rule on the
// kick sub-flow, which is symmetric, so the kick-drift-kick step stays
// time-reversible and second order and the Yoshida compositions of it reach
// orders 4 and 6 (measured in the tests). The fixed-point iteration converges
// in two or three passes for post-Newtonian terms, whose velocity derivative
// is of order (v/c)^2.
//
// Massive bodies pull on every other body through the stack; test bodies
// (GM = 0) pull on nothing.
//
// For one dominant mass, the Wisdom-Holman maps (wisdom-holman,
// wisdom-holman-4, wisdom-holman-6) advance the Kepler part exactly
// (kepler.Drift) and kick with the rest, so their error scales with the
// perturbation; Recommend picks wisdom-holman-4 where it applies. For
// eccentric orbits and close passes the logarithmic-Hamiltonian methods
// (logh-leapfrog, logh-yoshida4) shorten the physical step near pericentre
// by a time transformation (VariableStep). Both need position-only kicks:
// with gr1pn they refuse (Applicability), and gr-orbit is the position-only
// relativistic law for them.
//
// Field.Eval splits the body loop across goroutines above a few thousand
// body-source pairs, bit-identically for any worker count, and a plain
// Newton stack takes an inline loop over flat component views.
//
// Steppers that carry state from one step to the next (RK45's proposed
// substep, LogH's binding energy) implement encoding.BinaryMarshaler and
// BinaryUnmarshaler, so that a checkpointed integration resumes bit for bit;
// a new stateful stepper must do the same.
//
// A base law that is not a sum of pair forces (kernels.NBody: the
// Einstein-Infeld-Hoffmann equations, kernel eih) gives all accelerations
// at once; Field.Eval calls it and adds the stack's corrections pairwise.
package integrator
