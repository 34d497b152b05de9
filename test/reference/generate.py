#!/usr/bin/env python3
"""Reference values for modvet's numeric layer, computed with mpmath.

Writes test/reference/values.json: for each function a fixed, seeded list of arguments
(decimal strings, exact as written) and mpmath's value at OUT_DIGITS significant digits,
computed at WORK_DIGITS. The vitest suite checks modvet against these at 30, 50 and 100
digits; OUT_DIGITS = 200 is twice the highest tested precision.

Run with Debian's python3-mpmath (the interpreter /usr/bin/python3):
    /usr/bin/python3 test/reference/generate.py > test/reference/values.json
CI regenerates the file and fails if it differs from the committed one.
"""
import json
import random
import sys

import mpmath
from mpmath import mp, mpf, mpc

WORK_DIGITS = 240
OUT_DIGITS = 200
SEED = 20261201


def num(x, digits=12):
    """A short decimal string for an argument; mpmath parses it at WORK_DIGITS, i.e. exactly enough."""
    return mpmath.nstr(mpf(x), digits, strip_zeros=True, min_fixed=-30, max_fixed=30)


def out(v):
    v = mpc(v)
    return [mpmath.nstr(v.real, OUT_DIGITS, strip_zeros=False, min_fixed=1, max_fixed=0),
            mpmath.nstr(v.imag, OUT_DIGITS, strip_zeros=False, min_fixed=1, max_fixed=0)]


def cz(pair):
    return mpc(mpf(pair[0]), mpf(pair[1]))


def cases_complex(rng, n, re_lo, re_hi, im_lo, im_hi):
    return [[num(rng.uniform(re_lo, re_hi)), num(rng.uniform(im_lo, im_hi))] for _ in range(n)]


def log_uniform(rng, lo, hi):
    return mpmath.exp(rng.uniform(float(mpmath.log(lo)), float(mpmath.log(hi))))


def build():
    rng = random.Random(SEED)
    funcs = {}

    # Elementary complex functions (numeric layer)
    elem = cases_complex(rng, 8, -30, 30, -30, 30) + [["0.5", "0"], ["-2", "1e-20"], ["1e-25", "3"], ["700", "-1"]]
    funcs['exp'] = [{"args": [z], "value": out(mpmath.exp(cz(z)))} for z in elem]
    funcs['log'] = [{"args": [z], "value": out(mpmath.log(cz(z)))} for z in elem + [["-3", "0"], ["1.0000000001", "0"]]]
    funcs['sqrt'] = [{"args": [z], "value": out(mpmath.sqrt(cz(z)))} for z in elem + [["-3", "0"]]]
    trig = cases_complex(rng, 8, -20, 20, -5, 5) + [["100", "0.5"], ["1e-15", "0"], ["0", "40"]]
    for name, f in [('sin', mpmath.sin), ('cos', mpmath.cos), ('sinh', mpmath.sinh), ('cosh', mpmath.cosh)]:
        funcs[name] = [{"args": [z], "value": out(f(cz(z)))} for z in trig]
    pw = [[z, w] for z, w in zip(cases_complex(rng, 6, -5, 5, -5, 5), cases_complex(rng, 6, -4, 4, -4, 4))]
    pw += [[["-2", "0"], ["0.5", "0"]], [["3", "4"], ["7", "0"]], [["0.25", "0"], ["-0.5", "2"]]]
    funcs['pow'] = [{"args": [z, w], "value": out(mpmath.power(cz(z), cz(w)))} for z, w in pw]

    # Gamma and log-Gamma: random, large imaginary parts, near poles, tiny and large arguments
    g = cases_complex(rng, 10, -20, 30, -60, 60)
    g += [["0.5", "0"], ["1e-5", "0"], ["-3.5", "0"], ["-10.0001", "0"], ["2", "100"],
          ["0.25", "-500"], ["150.5", "0"], ["-40.3", "2.5"], ["7", "0"], ["1", "1"]]
    funcs['gamma'] = [{"args": [z], "value": out(mpmath.gamma(cz(z)))} for z in g]
    lg = [z for z in g if not (mpf(z[1]) == 0 and mpf(z[0]) < 0)]
    funcs['loggamma'] = [{"args": [z], "value": out(mpmath.loggamma(cz(z)))} for z in lg]

    # Riemann zeta: random, near the critical line up to |Im s| = 50, Re s < 0, near the pole
    zs = cases_complex(rng, 8, -20, 20, -30, 30)
    zs += [["0.5", num(rng.uniform(-50, 50))] for _ in range(4)]
    zs += [["0.5", "14.1347251417346937904572519836"], ["0.5", "50"], ["2", "0"], ["-1", "0"],
           ["-7.5", "0"], ["1.0000001", "0"], ["0.999", "0.001"], ["3", "-45"], ["-15", "20"]]
    funcs['zeta'] = [{"args": [z], "value": out(mpmath.zeta(cz(z)))} for z in zs]

    # Modified Bessel K_nu(x): complex order |Im nu| <= 20, x from 0.01 to 50
    kb = []
    for _ in range(14):
        nu = [num(rng.uniform(-5, 5)), num(rng.uniform(-20, 20))]
        kb.append([nu, [num(log_uniform(rng, mpf('0.01'), mpf(50))), "0"]])
    kb += [[["0.5", "0"], ["1", "0"]], [["0", "0"], ["0.01", "0"]], [["0", "20"], ["0.01", "0"]],
           [["3.5", "-20"], ["50", "0"]], [["2", "0"], ["20", "0"]], [["0.2", "3.1"], ["6.2831853", "0"]],
           [["12", "0"], ["0.5", "0"]], [["0", "10"], ["15", "0"]]]
    funcs['besselk'] = [{"args": [nu, x], "value": out(mpmath.besselk(cz(nu), mpf(x[0])))} for nu, x in kb]

    # Upper incomplete gamma Gamma(a, x): complex a, x from 0.01 to 50
    ig = []
    for _ in range(12):
        a = [num(rng.uniform(-5, 10)), num(rng.uniform(-10, 10))]
        ig.append([a, [num(log_uniform(rng, mpf('0.01'), mpf(50))), "0"]])
    ig += [[["0.5", "0"], ["2", "0"]], [["-2", "0"], ["1.5", "0"]], [["0", "0"], ["0.3", "0"]],
           [["3", "0"], ["40", "0"]], [["-0.7", "3.1"], ["0.05", "0"]], [["2.5", "-8"], ["9.5", "0"]]]
    funcs['gammainc'] = [{"args": [a, x], "value": out(mpmath.gammainc(cz(a), mpf(x[0])))} for a, x in ig]

    # Dirichlet beta(s) = sum (-1)^n (2n+1)^-s, chi the character mod 4
    bs = cases_complex(rng, 8, -5, 10, -30, 30) + [["1", "0"], ["2", "0"], ["0", "0"], ["-3", "0"], ["0.5", "21"]]
    funcs['dirichletbeta'] = [{"args": [s], "value": out(mpmath.dirichlet(cz(s), [0, 1, 0, -1]))} for s in bs]

    # Modular functions at points tau = x + iy: in and near the fundamental domain, and
    # close to the real axis (the built-ins must be right there without reduction).
    taus = [[num(rng.uniform(-0.5, 0.5)), num(rng.uniform(0.87, 2))] for _ in range(6)]
    taus += [[num(rng.uniform(-0.5, 0.5)), num(rng.uniform(0.1, 0.5))] for _ in range(4)]
    taus += [[num(rng.uniform(-0.5, 0.5)), num(rng.uniform(0.02, 0.1))] for _ in range(6)]
    taus += [["0", "1"], ["0", "2"], ["0.5", "0.5"], ["-0.25", "3.5"], ["2.3", "0.7"]]
    funcs['eta'] = [{"args": [t], "value": out(mpmath.eta(cz(t)))} for t in taus]
    # mpmath normalises Klein's j as j/1728
    funcs['kleinj'] = [{"args": [t], "value": out(mpmath.kleinj(cz(t)))} for t in taus]
    # theta constants with nome exp(i pi tau); for |Re tau| <= 1 mpmath's principal
    # q^(1/4) in theta_2 equals exp(i pi tau / 4)
    for n in (2, 3, 4):
        funcs['jtheta%d' % n] = [{"args": [t], "value": out(mpmath.jtheta(n, 0, mpmath.exp(1j * mpmath.pi * cz(t))))}
                                 for t in taus if abs(mpf(t[0])) <= 1]
    # Hard cases added after the first implementations (fixed values, no random draws, so
    # the cases above are unchanged): far up the critical line, deep in Re s < 0, next to
    # trivial zeros and poles, the Eisenstein range of Gamma(a, x), near-integer orders of K.
    funcs['zeta'] += [{"args": [z], "value": out(mpmath.zeta(cz(z)))}
                      for z in [["0.5", "1000"], ["-40.5", "3"], ["-2", "1e-12"], ["-0.000001", "20"]]]
    funcs['dirichletbeta'] += [{"args": [z], "value": out(mpmath.dirichlet(cz(z), [0, 1, 0, -1]))}
                               for z in [["-2.5", "0"], ["0.5", "6.0209489046975965"]]]
    hard_g = [["-150.3", "2.5"], ["0.5", "1000000"], ["-3.9", "1e-30"], ["1.0000000000001", "0"], ["350.5", "0"]]
    funcs['gamma'] += [{"args": [z], "value": out(mpmath.gamma(cz(z)))} for z in hard_g + [["-1000.25", "0"]]]
    funcs['loggamma'] += [{"args": [z], "value": out(mpmath.loggamma(cz(z)))} for z in hard_g]
    hard_ig = [[["0.5", "14.13"], "60"], [["2.5", "-3"], "95.5"], [["-0.3", "7"], "150"], [["-3", "1e-12"], "2"],
               [["-15", "0"], "14"], [["-15", "0"], "16"], [["40", "0"], "0.3"], [["3", "30"], "5"]]
    funcs['gammainc'] += [{"args": [a, [x, "0"]], "value": out(mpmath.gammainc(cz(a), mpf(x)))} for a, x in hard_ig]
    hard_k = [[["2.000000000000001", "0"], "1.5"], [["1e-20", "0"], "0.7"], [["3", "1e-30"], "2"],
              [["7.5", "0"], "0.05"], [["20.5", "0"], "3"], [["1.3", "0.4"], "200"], [["0", "0"], "1e-10"],
              [["2", "0"], "1e-10"], [["0", "30"], "29.5"], [["0.5", "100"], "10"]]
    funcs['besselk'] += [{"args": [nu, [x, "0"]], "value": out(mpmath.besselk(cz(nu), mpf(x)))} for nu, x in hard_k]
    return funcs


def main():
    mp.dps = WORK_DIGITS
    data = {
        "generator": "test/reference/generate.py",
        "library": "mpmath " + mpmath.__version__,
        "digits": OUT_DIGITS,
        "seed": SEED,
        "functions": build(),
        # exact Bernoulli numbers B_n as "num/den" (mpmath.bernfrac)
        "bernoulli": [[n, "%d/%d" % tuple(int(x) for x in mpmath.bernfrac(n))]
                      for n in list(range(0, 41)) + [50, 76, 100, 150, 200, 256, 300]],
    }
    json.dump(data, sys.stdout, indent=1)
    sys.stdout.write("\n")


if __name__ == '__main__':
    main()
