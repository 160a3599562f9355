"""Reference values of the sine and cosine integrals for the Go tests.

Usage: sici.py mpmath|scipy < points
Reads one x per line (Go's shortest round-trip form, so float(x) is exact)
and prints one JSON object of lists, each entry rounded once to a double.

mpmath (mp.dps = 40): si, ci, the auxiliary functions f and g of
Abramowitz & Stegun 5.2.6-7 and the crossover deficits 1 - (2/pi) f and
1 - (2/pi)(f + x g), all formed from mpmath.si and mpmath.ci at 40 digits
(the cancellations in f, g and the deficits cost at most 12 of them on the
grids the tests send).
scipy: si, ci from scipy.special.sici (double precision, a second reader).
"""
import json
import sys


def with_mpmath(xs):
    import mpmath as mp

    mp.mp.dps = 40
    out = {k: [] for k in ("si", "ci", "f", "g", "dphi", "dforce")}
    for x in xs:
        t = mp.mpf(x)  # exact: x is a double
        si, ci = mp.si(t), mp.ci(t)
        s, c = mp.sin(t), mp.cos(t)
        rest = mp.pi / 2 - si
        f = ci * s + rest * c
        g = -ci * c + rest * s
        out["si"].append(float(si))
        out["ci"].append(float(ci))
        out["f"].append(float(f))
        out["g"].append(float(g))
        out["dphi"].append(float(1 - 2 / mp.pi * f))
        out["dforce"].append(float(1 - 2 / mp.pi * (f + t * g)))
    return out


def with_scipy(xs):
    import numpy as np
    from scipy.special import sici

    si, ci = sici(np.array(xs, dtype=np.float64))
    return {"si": [float(v) for v in si], "ci": [float(v) for v in ci]}


def main():
    mode = sys.argv[1] if len(sys.argv) > 1 else "mpmath"
    xs = [float(line) for line in sys.stdin if line.strip()]
    if mode == "mpmath":
        out = with_mpmath(xs)
    elif mode == "scipy":
        out = with_scipy(xs)
    else:
        sys.exit("unknown mode " + mode)
    json.dump(out, sys.stdout)


if __name__ == "__main__":
    main()
