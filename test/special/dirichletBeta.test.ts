// Dirichlet beta against mpmath (test/reference/values.json), closed forms and OEIS.
import { describe, expect, it } from 'vitest';
import { Decimal } from 'decimal.js';
import { Complex } from '../../src/numeric/complex.js';
import { pi } from '../../src/numeric/constants.js';
import { Random } from '../../src/numeric/random.js';
import { withDigits } from '../../src/numeric/precision.js';
import { dirichletBeta } from '../../src/special/dirichletBeta.js';
import { gamma } from '../../src/special/gamma.js';
import { referenceCases, ulpError } from '../helpers/reference.js';

const PRECISIONS = [30, 50, 100];

describe('dirichletBeta against mpmath', () => {
  for (const P of PRECISIONS) {
    it(`dirichletBeta at ${P} digits`, () => {
      for (const c of referenceCases('dirichletbeta')) {
        const got = withDigits(P, () => dirichletBeta(c.args[0]!));
        expect(ulpError(got, c.value, P), c.label).toBeLessThanOrEqual(2);
      }
    });
  }
});

describe('dirichletBeta: closed forms', () => {
  // beta(2k+1) = (-1)^k E_{2k} pi^{2k+1} / (4^{k+1} (2k)!) (Euler): pi/4 (Leibniz), pi^3/32
  it('beta(1) = pi/4 (Leibniz series) and beta(3) = pi^3/32', () => {
    withDigits(60, () => {
      const quarter = withDigits(70, () => pi().div(4));
      const cube = withDigits(70, () => pi().pow(3).div(32));
      expect(ulpError(dirichletBeta(Complex.of(1)), Complex.of(quarter), 60)).toBeLessThanOrEqual(1);
      expect(ulpError(dirichletBeta(Complex.of(3)), Complex.of(cube), 60)).toBeLessThanOrEqual(1);
    });
  });
  it("beta(2) is Catalan's constant (OEIS A006752)", () => {
    // 0.915965594177219015054603514932384110774...: OEIS A006752 as given in the task brief
    // (also recalled from memory), equal to mpmath 1.2.1's catalan at 60 digits
    withDigits(39, () => {
      expect(dirichletBeta(Complex.of(2)).toString()).toBe('0.915965594177219015054603514932384110774');
    });
  });
  it('beta(-n) = E_n / 2 exactly: 0 at odd n, 1/2, -1/2, 5/2, -61/2 at n = 0, 2, 4, 6 (DLMF 24.2.6)', () => {
    withDigits(30, () => {
      for (const n of [-1, -3, -5, -51]) expect(dirichletBeta(Complex.of(n)).isZero(), `s = ${n}`).toBe(true);
      expect(dirichletBeta(Complex.of(0)).toString()).toBe('0.5');
      expect(dirichletBeta(Complex.of(-2)).toString()).toBe('-0.5');
      expect(dirichletBeta(Complex.of(-4)).toString()).toBe('2.5');
      expect(dirichletBeta(Complex.of(-6)).toString()).toBe('-30.5');
    });
  });
  it('matches the alternating series where it converges fast', () => {
    // at Re s = 40 the terms (2n+1)^-s fall below 1e-35 from 2n+1 = 9 on
    withDigits(30, () => {
      const s = Complex.of('40', '-3.25');
      const sum = withDigits(40, () => {
        let acc = Complex.ZERO;
        for (let n = 0; n <= 12; n++) {
          const term = Complex.of(2 * n + 1).pow(s.neg());
          acc = n % 2 === 0 ? acc.add(term) : acc.sub(term);
        }
        return acc;
      });
      expect(ulpError(dirichletBeta(s), sum, 30)).toBeLessThanOrEqual(1);
    });
  });
});

describe('dirichletBeta: identities at random points', () => {
  it('functional equation beta(s) = (2/pi)^{1-s} cos(pi s/2) Gamma(1-s) beta(1-s)', () => {
    const r = new Random('beta-functional-equation');
    for (let i = 0; i < 8; i++) {
      const P = r.int(20, 60);
      // in the critical strip both sides are summed directly, not by the reflection
      const s = Complex.of(r.uniform(0.05, 0.95).toFixed(9), r.uniform(-40, 40).toFixed(9));
      const lhs = withDigits(P, () => dirichletBeta(s));
      const rhs = withDigits(P + 10, () => {
        const oms = Complex.ONE.sub(s);
        return Complex.of(new Decimal(2).div(pi()))
          .pow(oms)
          .mul(s.mul(Complex.of(pi().div(2))).cos())
          .mul(gamma(oms))
          .mul(dirichletBeta(oms));
      });
      expect(ulpError(lhs, rhs, P), `s = ${s.toString()}, P = ${P}`).toBeLessThanOrEqual(2);
    }
  });
  it('conjugate symmetry and the entire continuation through s = 1 (no pole)', () => {
    withDigits(40, () => {
      const s = Complex.of('-2.75', '9.5');
      expect(dirichletBeta(s.conj()).equals(dirichletBeta(s).conj())).toBe(true);
      const near = dirichletBeta(Complex.of('1.000000000000000000001'));
      const quarter = pi().div(4);
      expect(near.re.minus(quarter).abs().lt('1e-20')).toBe(true);
    });
  });
});
