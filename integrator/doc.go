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
package integrator
