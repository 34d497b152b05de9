// The non-holomorphic Eisenstein series: the Fourier method against the independent
// Epstein-splitting method, a closed form at tau = i, invariance under SL(2,Z) and the
// functional equation. Normalisations: math-reference.md (coset sum E, completed E*).
import { describe, expect, it } from 'vitest';
import { Complex } from '../../src/numeric/complex.js';
import { Random } from '../../src/numeric/random.js';
import { withDigits, withGuard } from '../../src/numeric/precision.js';
import { ModvetError } from '../../src/numeric/errors.js';
import { completedE, nonholomorphicE } from '../../src/modular/nonholomorphic.js';
import { zeta } from '../../src/special/zeta.js';
import { dirichletBeta } from '../../src/special/dirichletBeta.js';
import { makeGroup } from '../../src/groups/subgroups.js';
import { randomElement, randomInFundamental } from '../../src/groups/sample.js';
import { ulpError } from '../helpers/reference.js';
import { errorCode as codeOf } from '../helpers/errors.js';

const fmt = (z: Complex) => z.toString(20);


describe('Fourier method against the Epstein method at 40 digits', () => {
  const rng = new Random('nonholomorphic-a-vs-b');
  const ss: Complex[] = [
    ...Array.from({ length: 3 }, () => Complex.of(rng.uniform(1, 6).toPrecision(10))),
    // a box crossing the critical strip
    ...Array.from({ length: 3 }, () => Complex.of(rng.uniform(-1, 2).toPrecision(10), rng.uniform(-8, 8).toPrecision(10))),
  ];
  const taus: Complex[] = [
    randomInFundamental(rng),
    randomInFundamental(rng),
    Complex.of(rng.uniform(-0.5, 0.5).toPrecision(10), rng.uniform(0.05, 0.1).toPrecision(10)),
  ];
  for (const s of ss) {
    it(`agree for s = ${s}`, () => {
      withDigits(40, () => {
        for (const tau of taus) {
          const a = completedE(s, tau, { method: 'fourier' });
          const b = completedE(s, tau, { method: 'epstein' });
          expect(ulpError(a, b, 40), `s=${s} tau=${tau}: ${fmt(a)} vs ${fmt(b)}`).toBeLessThanOrEqual(2);
        }
      });
    });
  }
});

describe('closed form at tau = i', () => {
  it('Z(s, i) = 2 zeta(2s) E(s, i) = 4 zeta(s) beta(s)', () => {
    // sum'_{(m,n)} (m^2 + n^2)^{-s} = 4 zeta(s) beta(s), from r_2(n) = 4 sum_{d|n} chi_4(d)
    // (Hardy & Wright, An Introduction to the Theory of Numbers, Theorem 278)
    withDigits(30, () => {
      for (const s of [Complex.of('1.5'), Complex.of(2), Complex.of('3.7'), Complex.of(2, 3)]) {
        const lhs = withGuard(5, () => zeta(s.scale(2)).scale(2).mul(nonholomorphicE(s, Complex.I))).round();
        const rhs = withGuard(5, () => zeta(s).mul(dirichletBeta(s)).scale(4)).round();
        expect(ulpError(lhs, rhs, 30), `s = ${s}`).toBeLessThanOrEqual(2);
      }
    });
  });
});

describe('symmetries', () => {
  it('E(s, g tau) = E(s, tau) for random g in SL(2,Z)', () => {
    const rng = new Random('nonholomorphic-invariance');
    withDigits(30, () => {
      for (let i = 0; i < 4; i++) {
        const s = Complex.of(rng.uniform(-1, 3).toPrecision(8), rng.uniform(-5, 5).toPrecision(8));
        const tau = randomInFundamental(rng);
        const g = randomElement(makeGroup('SL2Z'), rng, tau, { yMin: 0.05 });
        // g tau is formed with guard digits: E varies fast near the real axis, and a rounded
        // argument would move the value by far more than one unit of the last digit
        const gtau = withGuard(15, () => g.act(tau));
        const a = nonholomorphicE(s, gtau);
        const b = nonholomorphicE(s, tau);
        expect(ulpError(a, b, 30), `seed nonholomorphic-invariance, s=${s} tau=${tau} g=${g}`).toBeLessThanOrEqual(2);
      }
    });
  });
  it('E*(s) = E*(1 - s) (functional equation)', () => {
    withDigits(30, () => {
      const tau = Complex.of('0.21', '1.13');
      for (const s of [Complex.of('0.3', '4.1'), Complex.of('2.6', '-1.7')]) {
        const a = completedE(s, tau);
        const b = completedE(Complex.ONE.sub(s), tau);
        expect(ulpError(a, b, 30), `s = ${s}`).toBeLessThanOrEqual(2);
      }
    });
  });
});

describe('bad input', () => {
  it('poles and points below y_min give typed errors', () => {
    withDigits(20, () => {
      expect(codeOf(() => nonholomorphicE(Complex.ONE, Complex.I))).toBe('pole');
      expect(codeOf(() => completedE(Complex.ZERO, Complex.I))).toBe('pole');
      expect(codeOf(() => completedE(Complex.ONE, Complex.I))).toBe('pole');
      expect(codeOf(() => nonholomorphicE(Complex.of(2), Complex.of('0.1', '0.01')))).toBe('ymin');
      expect(codeOf(() => nonholomorphicE(Complex.of(2), Complex.of('0.1', '-1')))).toBe('domain');
    });
  });
});
