// Package kepler converts between Keplerian orbital elements and Cartesian
// states of the two-body problem, and solves Kepler's equation. Drift
// advances a state along the exact Kepler flow in universal variables, for
// any conic (the element conversions below handle bound orbits only).
//
// Elements refer to the x-y plane as reference plane and the x axis as
// reference direction: the inclination is measured from +z, the longitude of
// the ascending node from +x in the x-y plane, the argument of pericentre
// from the ascending node in the direction of motion. Only bound elliptic
// orbits (0 <= e < 1) are handled: scenarios start on bound orbits, and the
// observables measure pericentres of bound orbits.
//
// Conventions where an angle is undefined (used by FromState):
//
//   - Equatorial orbits (i = 0 or i = pi, no node line): Node = 0, so the
//     x axis stands in for the node. For i = 0, Peri is then the longitude
//     of pericentre measured from +x; for i = pi it is measured from +x in
//     the orbit's own (retrograde) sense.
//   - Circular orbits (e = 0, no pericentre): Peri = 0, so the pericentre is
//     placed at the ascending node (at +x when also equatorial) and M is the
//     angle travelled from there, the argument of latitude.
//
// "Equatorial" and "circular" mean below CircularE and EquatorialSinI, the
// round-off level of e and sin i recovered from a state.
package kepler
