// K_nu(x) against mpmath (test/reference/values.json), closed forms and identities from DLMF
// chapter 10, and the shared-node evaluation of K_nu(n x0) against single evaluations.
import { describe, expect, it } from 'vitest';
import { Decimal } from 'decimal.js';
import { Complex } from '../../src/numeric/complex.js';
import { ModvetError } from '../../src/numeric/errors.js';
import { pi } from '../../src/numeric/constants.js';
import { withDigits } from '../../src/numeric/precision.js';
import { Random } from '../../src/numeric/random.js';
import { type BesselKMethod, besselK, besselKMultiples, besselKUsing } from '../../src/special/besselK.js';
import { referenceCases, ulpError } from '../helpers/reference.js';
import { errorCode as codeOf } from '../helpers/errors.js';

const PRECISIONS = [30, 50, 100];
const METHODS: BesselKMethod[] = ['auto', 'series', 'quadrature'];

/** |a - b| in units of the P-th digit of `scale` (for identities whose terms cancel). */
function errorAgainst(a: Complex, b: Complex, scale: Decimal, P: number): number {
  return withDigits(P + 20, () => a.sub(b).abs().div(new Decimal(10).pow(scale.e - P + 1)).toNumber());
}


describe('K_nu(x) against mpmath', () => {
  // reference values: test/reference/generate.py with mpmath 1.2.1 (besselk) at 200 digits;
  // both methods are checked on every case ('series' falls back to the quadrature at integer nu)
  for (const method of METHODS) {
    for (const P of PRECISIONS) {
      it(`${method} at ${P} digits`, () => {
        for (const c of referenceCases('besselk')) {
          const got = withDigits(P, () => besselKUsing(c.args[0]!, c.args[1]!.re, method));
          expect(ulpError(got, c.value, P), c.label).toBeLessThanOrEqual(2);
        }
      });
    }
  }
});

describe('closed forms (DLMF 10.39.2)', () => {
  const xs = ['0.01', '0.3', '1', '2.5', '6.2831853', '17', '50', '200', '1000'];
  for (const P of PRECISIONS) {
    it(`K_{1/2} and K_{3/2} at ${P} digits`, () => {
      withDigits(P, () => {
        for (const xs_ of xs) {
          const x = new Decimal(xs_);
          // K_{1/2}(x) = sqrt(pi / (2x)) e^{-x} (DLMF 10.39.2)
          const k12 = withDigits(P + 10, () => pi().div(x.times(2)).sqrt().times(x.neg().exp()));
          // K_{3/2} = K_{-1/2} + K_{1/2} / x = K_{1/2} (1 + 1/x): 10.29.1 at nu = 1/2 with 10.27.3
          // (the n = 1 case of the closed form 10.49.12, equation number from memory)
          const k32 = withDigits(P + 10, () => k12.times(Decimal.add(1, Decimal.div(1, x))));
          // beyond x = 50 the series needs thousands of terms (the cost model never picks it there)
          for (const method of x.gt(50) ? METHODS.filter((m) => m !== 'series') : METHODS) {
            const a = besselKUsing(Complex.of('0.5'), x, method);
            const b = besselKUsing(Complex.of('1.5'), x, method);
            expect(ulpError(a, new Complex(k12), P), `K_1/2(${xs_}) ${method}`).toBeLessThanOrEqual(1);
            expect(ulpError(b, new Complex(k32), P), `K_3/2(${xs_}) ${method}`).toBeLessThanOrEqual(1);
          }
        }
      });
    });
  }
});

describe('identities at random complex order', () => {
  const rng = new Random('besselK identities');
  const samples = Array.from({ length: 24 }, () => ({
    nu: Complex.of(rng.uniform(-6, 6).toFixed(6), rng.uniform(-20, 20).toFixed(6)),
    x: new Decimal(Math.exp(rng.uniform(Math.log(0.02), Math.log(40))).toFixed(6)),
  }));

  it('K_{-nu} = K_nu (DLMF 10.27.3) and K_{conj nu}(x) = conj K_nu(x)', () => {
    for (const P of [30, 60]) {
      withDigits(P, () => {
        for (const { nu, x } of samples) {
          const k = besselK(nu, x);
          const label = `nu = ${nu}, x = ${x}, P = ${P}`;
          expect(ulpError(besselK(nu.neg(), x), k, P), label).toBeLessThanOrEqual(1);
          expect(ulpError(besselK(nu.conj(), x), k.conj(), P), label).toBeLessThanOrEqual(1);
        }
      });
    }
  });

  it('K_{nu-1}(x) - K_{nu+1}(x) = -(2 nu / x) K_nu(x) (DLMF 10.29.1)', () => {
    for (const P of [30, 60]) {
      withDigits(P, () => {
        for (const { nu, x } of samples) {
          const km = besselK(nu.sub(Complex.ONE), x);
          const kp = besselK(nu.add(Complex.ONE), x);
          const k = besselK(nu, x);
          const rhs = withDigits(P + 10, () => k.mul(nu).scale(x.div(-2).pow(-1)));
          // the two sides may cancel: measure against the largest term
          const scale = Decimal.max(km.abs(), kp.abs(), rhs.abs());
          expect(errorAgainst(km.sub(kp), rhs, scale, P), `nu = ${nu}, x = ${x}, P = ${P}`).toBeLessThanOrEqual(4);
        }
      });
    }
  });

  it('K_nu(x) is real and positive for real nu, real for imaginary nu', () => {
    withDigits(40, () => {
      for (const { nu, x } of samples) {
        // DLMF 10.37: for real nu, K_nu(x) > 0 on x > 0 (statement from memory)
        const kr = besselK(new Complex(nu.re), x);
        expect(kr.im.isZero(), `nu = ${nu.re}`).toBe(true);
        expect(kr.re.isPositive(), `nu = ${nu.re}, x = ${x}`).toBe(true);
        // K_{i b}(x) = conj K_{-i b}(x) = K_{i b}(x) by 10.27.3 and conjugation
        expect(besselK(new Complex(0, nu.im), x).im.isZero(), `nu = ${nu.im}i`).toBe(true);
      }
    });
  });

  it('the half-integer sum (DLMF 10.49.12) agrees with the quadrature', () => {
    for (const P of [30, 80]) {
      withDigits(P, () => {
        for (const n of [2, 3, 7, 20]) {
          for (const xs_ of ['0.001', '0.7', '4', '45']) {
            const nu = Complex.of(n + 0.5);
            const x = new Decimal(xs_);
            const q = besselKUsing(nu, x, 'quadrature');
            expect(ulpError(besselK(nu, x), q, P), `n = ${n}, x = ${xs_}, P = ${P}`).toBeLessThanOrEqual(2);
            expect(ulpError(besselK(nu.neg(), x), q, P), `n = ${n}, x = ${xs_}, P = ${P}`).toBeLessThanOrEqual(2);
          }
        }
      });
    }
  });

  it('both methods agree where both apply, near integer order too', () => {
    const orders = [samples[0]!.nu, Complex.of('2.000000000000001'), Complex.of('1e-20'), Complex.of('3', '1e-30')];
    withDigits(50, () => {
      for (const nu of orders) {
        for (const xs_ of ['0.01', '0.7', '4', '17']) {
          const x = new Decimal(xs_);
          const s = besselKUsing(nu, x, 'series');
          const q = besselKUsing(nu, x, 'quadrature');
          expect(ulpError(s, q, 50), `nu = ${nu}, x = ${xs_}`).toBeLessThanOrEqual(2);
        }
      }
    });
  });
});

describe('K_nu(n x0) for n = 1..N on shared nodes', () => {
  const cases: [string, string, string, number][] = [
    ['0.7', '3.1', '6.2831853', 40],
    ['0', '9.5', '0.5', 60],
    ['0.5', '0', '3', 25],
    ['2.5', '0', '0.4', 25],
    ['1.3', '0', '2', 25],
    ['-2.5', '1', '1.3', 30],
    ['0', '20', '0.05', 40],
  ];
  for (const P of [30, 50]) {
    it(`matches single evaluations at ${P} digits`, () => {
      withDigits(P, () => {
        for (const [a, b, x0s, N] of cases) {
          const nu = Complex.of(a, b);
          const x0 = new Decimal(x0s);
          const all = besselKMultiples(nu, x0, N);
          expect(all.length).toBe(N);
          for (let n = 1; n <= N; n++) {
            const one = besselK(nu, x0.times(n));
            expect(ulpError(all[n - 1]!, one, P), `nu = ${nu}, x = ${n} * ${x0s}`).toBeLessThanOrEqual(2);
          }
        }
      });
    });
  }
  it('N = 0 gives no values', () => {
    expect(withDigits(30, () => besselKMultiples(Complex.ONE, new Decimal(1), 0))).toEqual([]);
  });
});

describe('bad input', () => {
  it('x <= 0 is a domain error', () => {
    withDigits(30, () => {
      for (const x of ['0', '-1', '-1e-30', 'NaN']) {
        expect(codeOf(() => besselK(Complex.of('0.5'), new Decimal(x))), `x = ${x}`).toBe('domain');
        expect(codeOf(() => besselKMultiples(Complex.of('0.5'), new Decimal(x), 3)), `x0 = ${x}`).toBe('domain');
      }
    });
  });
  it('N must be a non-negative integer', () => {
    withDigits(30, () => {
      for (const N of [-1, 2.5, Number.NaN]) {
        expect(codeOf(() => besselKMultiples(Complex.ONE, new Decimal(1), N)), `N = ${N}`).toBe('domain');
      }
    });
  });
});
