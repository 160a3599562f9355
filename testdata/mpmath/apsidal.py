"""Apsidal advance and radial period of a test body in the Yukawa potential
Phi(r) = -(mu/r) (1 + alpha exp(-r/lambda)), straight from the definitions

    advance = 2 Int_rmin^rmax h dr / (r^2 sqrt(F(r))) - 2 pi,
    P_r     = 2 Int_rmin^rmax dr / sqrt(F(r)),   F = 2 (E - Phi) - h^2 / r^2,

at 40 significant digits (mpmath), with r = rc - ra cos(theta) to remove
the end-point singularities. Used by integrator/reference TestExternal.

Input (stdin): JSON list of cases, each {"mu", "alpha", "lambda"} plus either
{"rmin", "rmax"} or {"r", "vr", "vt"} (a state: radius, radial and transverse
speed). Numbers are taken at their exact binary value.
Output (stdout): JSON list of {"advance", "radial_period", "rmin", "rmax",
"h", "energy"} as decimal strings.
"""
import json
import sys

import mpmath as mp

mp.mp.dps = 40


def solve(case):
    mu = mp.mpf(case["mu"])
    alpha = mp.mpf(case["alpha"])
    lam = mp.mpf(case["lambda"])

    def phi(r):
        return -(mu / r) * (1 + alpha * mp.exp(-r / lam))

    if "rmin" in case:
        r1, r2 = mp.mpf(case["rmin"]), mp.mpf(case["rmax"])
        # F(r1) = F(r2) = 0: two linear equations for E and h^2.
        h2 = 2 * (phi(r2) - phi(r1)) / (1 / r1**2 - 1 / r2**2)
        energy = phi(r1) + h2 / (2 * r1**2)
    else:
        r, vr, vt = (mp.mpf(case[k]) for k in ("r", "vr", "vt"))
        energy = (vr**2 + vt**2) / 2 + phi(r)
        h2 = (r * vt) ** 2

    def F(s):
        return 2 * (energy - phi(s)) - h2 / s**2

    if "rmin" not in case:
        # Newtonian apsides as starting brackets; the correction is small.
        a = -mu / (2 * (energy - phi(r) - mu / r))
        ecc = mp.sqrt(1 - h2 / (mu * a))
        def root(guess):
            lo, hi = guess * (1 - mp.mpf("1e-4")), guess * (1 + mp.mpf("1e-4"))
            assert F(lo) * F(hi) < 0, "no sign change near the Newtonian apse"
            return mp.findroot(F, (lo, hi), solver="anderson")
        r1, r2 = root(a * (1 - ecc)), root(a * (1 + ecc))

    rc, ra = (r1 + r2) / 2, (r2 - r1) / 2
    h = mp.sqrt(h2)

    def speed(theta):
        # F nearly vanishes at the ends: evaluate it with 40 guard digits so
        # Gauss-Legendre nodes close to theta = 0, pi keep full precision.
        with mp.workdps(mp.mp.dps + 40):
            s = rc - ra * mp.cos(theta)
            return s, ra * mp.sin(theta) / mp.sqrt(F(s))

    def angle_integrand(theta):
        s, w = speed(theta)
        return h * w / s**2

    def period_integrand(theta):
        return speed(theta)[1]

    angle, err_a = mp.quad(angle_integrand, [0, mp.pi], method="gauss-legendre", error=True)
    period, err_p = mp.quad(period_integrand, [0, mp.pi], method="gauss-legendre", error=True)
    advance = 2 * angle - 2 * mp.pi
    # The quadrature must be far better than the 1e-6 test tolerance on an
    # anomaly as small as ~1e-12 rad.
    assert err_a < mp.mpf("1e-25") and err_p < mp.mpf("1e-25") * period, (err_a, err_p)
    return {
        "advance": mp.nstr(advance, 30),
        "radial_period": mp.nstr(2 * period, 30),
        "rmin": mp.nstr(r1, 30),
        "rmax": mp.nstr(r2, 30),
        "h": mp.nstr(h, 30),
        "energy": mp.nstr(energy, 30),
    }


def main():
    cases = json.load(sys.stdin)
    json.dump([solve(c) for c in cases], sys.stdout)


if __name__ == "__main__":
    main()
