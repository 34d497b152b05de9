// Gamma and log-Gamma against mpmath (test/reference/values.json) and DLMF chapter 5.
import { describe, expect, it } from 'vitest';
import { Decimal } from 'decimal.js';
import { Complex } from '../../src/numeric/complex.js';
import { ModvetError } from '../../src/numeric/errors.js';
import { toFixed, fromFixed } from '../../src/numeric/convert.js';
import { withDigits } from '../../src/numeric/precision.js';
import { pi } from '../../src/numeric/constants.js';
import { Random } from '../../src/numeric/random.js';
import * as fx from '../../src/numeric/fixed.js';
import * as fc from '../../src/numeric/fixedComplex.js';
import { clogFx, expSplitFx, gamma, gammaFx, logFx, logGamma, logGammaFx, sinCosFx } from '../../src/special/gamma.js';
import { referenceCases, referenceLibrary, ulpError } from '../helpers/reference.js';
import { errorCodeAndFn as codeOf } from '../helpers/errors.js';

const PRECISIONS = [30, 50, 100];

/** A random complex point with 8-decimal parts (exact as Decimals), seeded. */
function randomPoint(r: Random, reLo: number, reHi: number, imLo: number, imHi: number): Complex {
  return Complex.of(r.uniform(reLo, reHi).toFixed(8), r.uniform(imLo, imHi).toFixed(8));
}

/** Evaluate with 10 guard digits and compare at P digits (identities between computed values). */
function agree(P: number, lhs: () => Complex, rhs: () => Complex, label: string): void {
  const [a, b] = withDigits(P + 10, () => [lhs(), rhs()]);
  expect(ulpError(a!, b!, P), label).toBeLessThanOrEqual(1);
}


describe(`against ${referenceLibrary}`, () => {
  for (const P of PRECISIONS) {
    it(`gamma at ${P} digits`, () => {
      for (const c of referenceCases('gamma')) {
        const got = withDigits(P, () => gamma(c.args[0]!));
        expect(ulpError(got, c.value, P), c.label).toBeLessThanOrEqual(2);
      }
    });
    it(`loggamma at ${P} digits`, () => {
      for (const c of referenceCases('loggamma')) {
        const got = withDigits(P, () => logGamma(c.args[0]!));
        expect(ulpError(got, c.value, P), c.label).toBeLessThanOrEqual(2);
      }
    });
  }
});

describe('DLMF chapter 5', () => {
  it('Gamma(1/2) = sqrt(pi) (DLMF 5.4.6)', () => {
    for (const P of PRECISIONS) {
      const [g, s] = withDigits(P, () => [gamma(Complex.of('0.5')), new Complex(pi().sqrt())]);
      expect(ulpError(g!, s!, P), `P = ${P}`).toBeLessThanOrEqual(1);
    }
  });

  it('Gamma(n + 1) = n! exactly for n <= 40 at 60 digits, and to 1 ulp for n up to 400 (DLMF 5.4.1)', () => {
    // n + 1 <= 300 takes the exact path, beyond it the Stirling kernel
    let f = 1n;
    for (let n = 0; n <= 400; n++) {
      if (n > 0) f *= BigInt(n);
      const g = withDigits(60, () => gamma(Complex.of(n + 1)));
      if (n <= 40) expect(g.re.toFixed(), `n = ${n}`).toBe(f.toString());
      else expect(ulpError(g, new Complex(f.toString()), 60), `n = ${n}`).toBeLessThanOrEqual(1);
      expect(g.im.isZero()).toBe(true);
    }
  });

  it('exact integers and half-integers agree with the kernels (DLMF 5.4.1, 5.4.6)', () => {
    // exp(log Gamma(x)) and the complex kernel (an imaginary part below the precision) never
    // take the exact path
    for (const x of ['1', '2', '7', '30', '0.5', '7.5', '-0.5', '-3.5', '-79.5', '150.5', '-150.5', '299.5']) {
      agree(50, () => gamma(Complex.of(x)), () => logGamma(Complex.of(x)).exp(), x);
      const viaComplex = withDigits(50, () => gamma(Complex.of(x, '1e-300')));
      const exact = withDigits(50, () => gamma(Complex.of(x)));
      expect(ulpError(viaComplex, exact, 50), x).toBeLessThanOrEqual(1);
    }
  });

  it('the real kernel agrees with the complex kernel at random real points', () => {
    const r = new Random('gamma-real-vs-complex');
    for (let i = 0; i < 20; i++) {
      const x = r.uniform(-120, 120).toFixed(8);
      const P = r.int(20, 80);
      const a = withDigits(P, () => gamma(Complex.of(x)));
      const b = withDigits(P, () => gamma(Complex.of(x, '1e-300')));
      expect(ulpError(a, b, P), `x = ${x}, P = ${P}`).toBeLessThanOrEqual(1);
    }
  });

  it('reflection Gamma(z) Gamma(1 - z) = pi / sin(pi z) at random points (DLMF 5.5.3)', () => {
    const r = new Random('gamma-reflection');
    for (let i = 0; i < 12; i++) {
      const z = randomPoint(r, -120, 120, -40, 40);
      const P = r.int(20, 80);
      agree(P, () => gamma(z).mul(gamma(Complex.ONE.sub(z))), () => new Complex(pi()).div(z.scale(pi()).sin()), `z = ${z}, P = ${P}`);
    }
  });

  it('duplication Gamma(2z) = pi^{-1/2} 2^{2z-1} Gamma(z) Gamma(z + 1/2) at random points (DLMF 5.5.5)', () => {
    const r = new Random('gamma-duplication');
    for (let i = 0; i < 12; i++) {
      const z = randomPoint(r, -60, 60, -30, 30);
      const P = r.int(20, 80);
      agree(
        P,
        () => gamma(z.scale(2)),
        () =>
          Complex.of(2)
            .pow(z.scale(2).sub(Complex.ONE))
            .mul(gamma(z))
            .mul(gamma(z.add(Complex.of('0.5'))))
            .scale(new Decimal(1).div(pi().sqrt())),
        `z = ${z}, P = ${P}`,
      );
    }
  });

  it('recurrence Gamma(z + 1) = z Gamma(z) across the switch to reflection at Re z = -80 (DLMF 5.5.1)', () => {
    for (const z of [Complex.of('-80.5', '1.25'), Complex.of('-80.3', '-0.5'), Complex.of('-80.75'), Complex.of('-81.1', '30')]) {
      agree(50, () => gamma(z.add(Complex.ONE)), () => z.mul(gamma(z)), `z = ${z}`);
    }
  });

  it('log Gamma(z + 1) = log Gamma(z) + Log z off the cut, branch included (DLMF 5.5.1)', () => {
    // both sides are analytic in C minus (-inf, 0] and agree for z > 0, so they agree there
    const r = new Random('loggamma-recurrence');
    const pts = [Complex.of('-80.5', '1.25'), Complex.of('-80.5', '-1.25'), Complex.of('-3.9', '1e-30'), Complex.of('-200.2', '-7')];
    for (let i = 0; i < 10; i++) pts.push(randomPoint(r, -150, 60, -60, 60));
    for (const z of pts) {
      agree(40, () => logGamma(z.add(Complex.ONE)), () => logGamma(z).add(z.log()), `z = ${z}`);
    }
  });

  it('exp(log Gamma(z)) = Gamma(z) and conjugate symmetry (DLMF 5.4(i), 5.5.3)', () => {
    const r = new Random('loggamma-exp');
    for (let i = 0; i < 10; i++) {
      const z = randomPoint(r, -150, 60, -60, 60);
      agree(40, () => logGamma(z).exp(), () => gamma(z), `z = ${z}`);
      agree(40, () => logGamma(z.conj()), () => logGamma(z).conj(), `z = ${z}`);
    }
  });

  it('on the cut log Gamma(x) = log|Gamma(x)| + i pi floor(x), the limit from above (module convention)', () => {
    withDigits(40, () => {
      for (const x of ['-3.5', '-0.25', '-10.0001', '-99.5', '-150.25']) {
        const z = Complex.of(x);
        const lg = logGamma(z);
        const g = gamma(z);
        const want = new Complex(g.re.abs().ln(), pi().times(new Decimal(x).floor()));
        expect(ulpError(lg, want, 38), x).toBeLessThanOrEqual(1);
        // from above and below: continuous from above, conjugate from below
        const above = logGamma(Complex.of(x, '1e-60'));
        const below = logGamma(Complex.of(x, '-1e-60'));
        expect(ulpError(above, lg, 38), x).toBeLessThanOrEqual(1);
        expect(ulpError(below, lg.conj(), 38), x).toBeLessThanOrEqual(1);
      }
    });
  });

  it('keeps relative accuracy near the poles and near the zeros of log Gamma', () => {
    // Gamma(-n + e) = (-1)^n / (n! e) (1 + O(e)) (DLMF 5.2.1 with 5.5.1); with e = 1e-40 the
    // O(e) term is below 50 digits only after its first order, so compare with z Gamma(z) instead
    withDigits(50, () => {
      const z = Complex.of('-3.0000000000000000000000000000000000000001');
      expect(ulpError(gamma(z).mul(z), gamma(z.add(Complex.ONE)), 50)).toBeLessThanOrEqual(2);
      // log Gamma(1 + e) = -gamma_E e + O(e^2) (DLMF 5.7.3): relative accuracy at e = 1e-30
      const lg = withDigits(80, () => logGamma(Complex.of('1.000000000000000000000000000001')));
      const g = logGamma(Complex.of('1.000000000000000000000000000001'));
      expect(ulpError(g, lg, 50)).toBeLessThanOrEqual(1);
    });
  });

  it('the fixed-point kernels agree with the Complex functions', () => {
    withDigits(50, () => {
      const F = 200;
      const z = Complex.of('3.7', '-2.3');
      const lg = logGammaFx({ re: toFixed(z.re, F), im: toFixed(z.im, F) }, F);
      expect(ulpError(new Complex(fromFixed(lg.re, F), fromFixed(lg.im, F)), logGamma(z), 50)).toBeLessThanOrEqual(1);
      const [m, k] = gammaFx({ re: toFixed(z.re, F), im: toFixed(z.im, F) }, F);
      expect(ulpError(new Complex(fromFixed(m.re, F - k), fromFixed(m.im, F - k)), gamma(z), 50)).toBeLessThanOrEqual(1);
    });
  });
});

describe('table-driven elementary kernels', () => {
  it('agree with the kernels of fixed.ts to a few units of 2^-F (common practice: two methods)', () => {
    const r = new Random('gamma-kernels');
    const units = (a: bigint, b: bigint): number => Math.abs(Number(a - b));
    let worst = 0;
    for (let i = 0; i < 400; i++) {
      const F = r.int(40, 1500);
      const scale = [1e-30, 1e-8, 0.01, 1, 3, 50, 1e4, 1e9][r.int(0, 7)]!;
      const a = fx.fromFloat(r.uniform(-1, 1) * scale, F) + BigInt(r.int(0, 1000));
      const b = fx.fromFloat(r.uniform(-1, 1) * scale, F);
      // e^a = m 2^k: compare m 2^(k - k') with the other m'
      const [m1, k1] = expSplitFx(a, F);
      const [m2, k2] = fx.expSplit(a, F);
      const m1s = k1 >= k2 ? m1 << BigInt(k1 - k2) : m1 >> BigInt(k2 - k1);
      worst = Math.max(worst, units(m1s, m2));
      const [s1, c1] = sinCosFx(a, F);
      const [s2, c2] = fx.sincos(a, F);
      worst = Math.max(worst, units(s1, s2), units(c1, c2));
      if (a > 0n) worst = Math.max(worst, units(logFx(a, F), fx.log(a, F)));
      if (a !== 0n || b !== 0n) {
        const l1 = clogFx({ re: a, im: b }, F);
        const l2 = fc.clog({ re: a, im: b }, F);
        worst = Math.max(worst, units(l1.re, l2.re), units(l1.im, l2.im));
      }
    }
    expect(worst).toBeLessThanOrEqual(8);
  });
});

describe('bad input', () => {
  it('poles throw ModvetError pole naming the function', () => {
    for (const n of ['0', '-1', '-2', '-37', '-100']) {
      expect(codeOf(() => gamma(Complex.of(n))), n).toBe('pole:Gamma');
      expect(codeOf(() => logGamma(Complex.of(n))), n).toBe('pole:logGamma');
    }
  });
  it('a result outside the exponent range throws overflow', () => {
    expect(codeOf(() => gamma(Complex.of('1e20')))).toBe('overflow:Gamma');
  });
});
