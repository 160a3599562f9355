// Package special holds the special functions the kernels need and Go's math
// package lacks: the sine and cosine integrals Si and Ci, their auxiliary
// functions f and g (Abramowitz & Stegun 5.2.6, 5.2.7), and the crossover
// deficits 1 - (2/pi) f(x) and 1 - (2/pi) (f(x) + x g(x)) of the
// induced-gravity potential and force.
//
// Every function is meant for real x > 0. Against mpmath on 1e-15 <= x <= 1e4
// the errors stay within a few units in the last place: relative errors
// below 1e-15 for Si, f, g and the deficits, and for Ci near its first seven
// zeros; near its later zeros Ci keeps an absolute error of ~1e-17 (the
// tests hold everything to 1e-14 absolute plus 1e-13 relative). The forms
// are chosen so that nothing small is made by subtracting large numbers: Ci
// near its first zeros comes from Taylor series about the zeros, f and g
// beyond x = 1 come from a continued fraction or their asymptotic series
// rather than from Si and Ci, and the deficits at small x are sums of terms
// that do not cancel.
package special
