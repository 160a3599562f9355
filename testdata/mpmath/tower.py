"""High-precision reference sums of the tower kernel for the Go tests.

Usage: tower.py < cases.json
Reads a JSON list of cases and prints a JSON list of results, one per case,
each [phi_sum, force_sum, abs_sum] rounded once to a double:

  phi_sum   = t Sum_{modes != 0} w e^(-m r)            (the correction is -(mu/r) phi_sum)
  force_sum = t Sum_{modes != 0} w (1 + m r) e^(-m r)  (a_r is -(mu/r^2) force_sum)
  abs_sum   = t Sum_{modes != 0} |w| e^(-m r)          (the scale of phi_sum when weights alternate)

Case fields: kind ("periodic", "open", "continuum"), L, r (doubles in Go's
shortest round-trip form, so float(x) is exact), t ("1" or "4/3"), and
  periodic:  N, d, dn  -- every mode vector of Z_N^d, one by one (no pairing),
             m = (2N/L) sqrt(Sum_i sin^2(pi p_i/N)), w = cos(2 pi p_1 dn/N);
  open:      N, src, dst -- m_p = (2N/L) sin(pi p/(2N)),
             w = 2 cos(pi p (dst + 1/2)/N) cos(pi p (src + 1/2)/N);
  continuum: d -- the torus of side L, k in Z^d, m = 2 pi |k|/L:
             d = 1 from coth(pi r/L); d = 2, 3 by quadrature of the
             subordination integral
             e^(-a|k|) = Int_0^inf a/(2 sqrt(pi)) u^(-3/2) e^(-a^2/(4u)) e^(-u k^2) du
             with Sum_k e^(-u k^2) = jtheta(3, 0, e^(-u))^d (mpmath), a = 2 pi r/L
             (for u < pi through Jacobi's imaginary transformation).
All at mp.dps = 40.
"""
import itertools
import json
import sys

import mpmath as mp

mp.mp.dps = 40


def weight_t(s):
    return mp.mpf(4) / 3 if s == "4/3" else mp.mpf(1)


def periodic(c):
    n, d, dn = c["N"], c["d"], c["dn"]
    L, r = mp.mpf(c["L"]), mp.mpf(c["r"])
    sp = sa = ab = mp.mpf(0)
    for p in itertools.product(range(n), repeat=d):
        if not any(p):
            continue
        m = 2 * n / L * mp.sqrt(mp.fsum(mp.sin(mp.pi * q / n) ** 2 for q in p))
        w = mp.cos(2 * mp.pi * p[0] * dn / n)
        e = mp.exp(-m * r)
        sp += w * e
        sa += w * (1 + m * r) * e
        ab += abs(w) * e
    return sp, sa, ab


def open_chain(c):
    n, src, dst = c["N"], c["src"], c["dst"]
    L, r = mp.mpf(c["L"]), mp.mpf(c["r"])
    sp = sa = ab = mp.mpf(0)
    for p in range(1, n):
        m = 2 * n / L * mp.sin(mp.pi * p / (2 * n))
        w = 2 * mp.cos(mp.pi * p * (dst + mp.mpf(1) / 2) / n) * mp.cos(mp.pi * p * (src + mp.mpf(1) / 2) / n)
        e = mp.exp(-m * r)
        sp += w * e
        sa += w * (1 + m * r) * e
        ab += abs(w) * e
    return sp, sa, ab


def continuum(c):
    d = c["d"]
    a = 2 * mp.pi * mp.mpf(c["r"]) / mp.mpf(c["L"])
    if d == 1:
        # Sum_{k != 0} e^(-a|k|) = coth(a/2) - 1; Sum a|k| e^(-a|k|) = -a d/da of it
        s1 = mp.coth(a / 2) - 1
        dd = a / (2 * mp.sinh(a / 2) ** 2)
        return s1, s1 + dd, s1

    def kern(u):
        return a / (2 * mp.sqrt(mp.pi)) * u ** mp.mpf(-1.5) * mp.exp(-a * a / (4 * u))

    def rest(u):  # Sum_{k != 0} e^(-u k^2)
        if u < mp.pi:
            # Jacobi's imaginary transformation (DLMF 20.7.32): jtheta
            # refuses q = e^(-u) too close to 1
            th = mp.sqrt(mp.pi / u) * mp.jtheta(3, 0, mp.exp(-mp.pi ** 2 / u))
        else:
            th = mp.jtheta(3, 0, mp.exp(-u))
        return th ** d - 1

    pts = [0, a * a / 64, a * a / 16, a * a / 4, a * a, 1, 4, 16, mp.inf]
    pts = sorted(set(pts))
    s1, e1 = mp.quad(lambda u: kern(u) * rest(u), pts, error=True)
    dd, e2 = mp.quad(lambda u: kern(u) * (a * a / (2 * u) - 1) * rest(u), pts, error=True)
    if e1 > 1e-25 * abs(s1) or e2 > 1e-25 * abs(dd):
        sys.exit("quadrature error too large: %s %s" % (e1, e2))
    return s1, s1 + dd, s1


def main():
    cases = json.load(sys.stdin)
    out = []
    for c in cases:
        kind = c["kind"]
        if kind == "periodic":
            sp, sa, ab = periodic(c)
        elif kind == "open":
            sp, sa, ab = open_chain(c)
        elif kind == "continuum":
            sp, sa, ab = continuum(c)
        else:
            sys.exit("unknown kind " + kind)
        t = weight_t(c["t"])
        out.append([float(t * sp), float(t * sa), float(t * ab)])
    json.dump(out, sys.stdout)


if __name__ == "__main__":
    main()
