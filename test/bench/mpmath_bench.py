#!/usr/bin/env python3
"""The mpmath side of `npm run bench`: same arguments, same timing method as test/bench/harness.ts.

Reads a JSON spec (jobs: name, digits, argument tuples as [re, im] decimal strings) and
writes SPEC.out with the median microseconds per call for each job key.
"""
import json
import sys
import time

import mpmath
from mpmath import mp, mpc, mpf


def c(a):
    return mpc(mpf(a[0]), mpf(a[1]))


def r(a):
    return mpf(a[0])


# name -> (argument converter, function); the computation each modvet row times
COMPUTATIONS = {
    'exp': lambda a: mpmath.exp(c(a[0])),
    'log': lambda a: mpmath.log(c(a[0])),
    'gamma': lambda a: mpmath.gamma(c(a[0])),
    'loggamma': lambda a: mpmath.loggamma(c(a[0])),
    'zeta': lambda a: mpmath.zeta(c(a[0])),
    'besselk': lambda a: mpmath.besselk(c(a[0]), r(a[1])),
    'gammainc': lambda a: mpmath.gammainc(c(a[0]), r(a[1])),
    'dirichletbeta': lambda a: mpmath.dirichlet(c(a[0]), [0, 1, 0, -1]),
}


SIEVE_N = 6000
_sigma_cache = {}


def sigma_table(k):
    """sigma_k(n) for n <= SIEVE_N as Python integers, built once (modvet sieves too)."""
    if k not in _sigma_cache:
        t = [0] * (SIEVE_N + 1)
        for d in range(1, SIEVE_N + 1):
            p = d ** k
            for m in range(d, SIEVE_N + 1, d):
                t[m] += p
        _sigma_cache[k] = t
    return _sigma_cache[k]


def eisenstein_qseries(k, tau):
    """E_k(tau) = 1 - (2k/B_k) sum sigma_{k-1}(n) q^n, summed term by term in mpmath."""
    sig = sigma_table(k - 1)
    q = mpmath.exp(2j * mpmath.pi * tau)
    eps = mpf(2) ** (-mp.prec - 10)
    total = mpc(0)
    qn = mpc(1)
    n = 1
    while True:
        qn *= q
        t = sig[n] * qn
        total += t
        if abs(t) < eps * abs(total) and n > 3:
            break
        n += 1
    return 1 - 2 * k / mpmath.bernoulli(k) * total


def xi(s):
    return mpmath.pi ** (-s / 2) * mpmath.gamma(s / 2) * mpmath.zeta(s)


def nonholomorphic_fourier(s, tau):
    """E(s, tau) by its Fourier expansion with mpmath's besselk, term by term."""
    x, y = tau.real, tau.imag
    nu = s - mpf(1) / 2
    star = xi(2 * s) * y ** s + xi(2 * s - 1) * y ** (1 - s)
    eps = mpf(2) ** (-mp.prec - 10)
    total = mpc(0)
    small = 0
    n = 1
    while True:
        sig = mpmath.fsum(mpmath.power(d, 1 - 2 * s) for d in range(1, n + 1) if n % d == 0)
        t = mpmath.power(n, nu) * sig * mpmath.besselk(nu, 2 * mpmath.pi * n * y) * mpmath.cos(2 * mpmath.pi * n * x)
        total += t
        if 2 * mpmath.pi * n * y > abs(nu) ** 2 and abs(t) < eps * abs(total):
            small += 1
            if small >= 2:
                break
        else:
            small = 0
        n += 1
    return (star + 4 * mpmath.sqrt(y) * total) / xi(2 * s)


COMPUTATIONS.update({
    'E4': lambda a: eisenstein_qseries(4, c(a[0])),
    'E12': lambda a: eisenstein_qseries(12, c(a[0])),
    'eta': lambda a: mpmath.eta(c(a[0])),
    'j': lambda a: 1728 * mpmath.kleinj(c(a[0])),
    'Efourier': lambda a: nonholomorphic_fourier(c(a[0]), c(a[1])),
})


def time_one(f, min_ms, min_reps):
    f()
    reps = 0
    t0 = time.perf_counter()
    elapsed = 0.0
    while reps < min_reps or elapsed < min_ms / 1000.0:
        f()
        reps += 1
        elapsed = time.perf_counter() - t0
    return elapsed / reps * 1e6


def median(xs):
    s = sorted(xs)
    m = len(s) // 2
    return s[m] if len(s) % 2 else (s[m - 1] + s[m]) / 2


def main():
    spec = json.load(open(sys.argv[1]))
    out = {}
    for job in spec['jobs']:
        mp.dps = job['digits']
        f = COMPUTATIONS[job['name']]
        out[job['key']] = median([time_one(lambda a=a: f(a), spec['minMs'], spec['minReps']) for a in job['args']])
    json.dump(out, open(sys.argv[1] + '.out', 'w'))


if __name__ == '__main__':
    main()
