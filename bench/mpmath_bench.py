#!/usr/bin/env python3
"""The mpmath side of `npm run bench`: same arguments, same timing method as bench/harness.ts.

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
