// Klein's j: mpmath reference values (mpmath's kleinj is j/1728), j(i) = 1728, j(rho) = 0,
// OEIS A000521, invariance under random group elements, bad input.
import { describe, expect, it } from 'vitest';
import { Decimal } from 'decimal.js';
import { Complex } from '../../src/numeric/complex.js';
import { withDigits } from '../../src/numeric/precision.js';
import { Random } from '../../src/numeric/random.js';
import { randomElement, randomInFundamental } from '../../src/groups/sample.js';
import { kleinJ, kleinJCoefficients } from '../../src/modular/kleinJ.js';
import { referenceCases, referenceLibrary, ulpError } from '../helpers/reference.js';
import { errorCode } from '../helpers/errors.js';


describe(`j against ${referenceLibrary} (test/reference/values.json, 1728 mpmath.kleinj)`, () => {
  for (const P of [30, 50, 100]) {
    it(`j at ${P} digits, Im tau from 0.027 to 3.5`, () => {
      for (const c of referenceCases('kleinj')) {
        const ref = withDigits(210, () => c.value.scale(1728));
        const got = withDigits(P, () => kleinJ(c.args[0]!));
        expect(ulpError(got, ref, P), c.label).toBeLessThanOrEqual(2);
      }
    });
  }
});

describe('special values (Serre, ch. VII 3.3)', () => {
  for (const P of [30, 50, 100]) {
    it(`j(i) = 1728 and j(rho) = 0 at ${P} digits`, () => {
      expect(ulpError(withDigits(P, () => kleinJ(Complex.I)), Complex.of(1728), P)).toBeLessThanOrEqual(2);
      // rho to P + 150 digits, so that the argument itself is a zero to beyond the cap;
      // the terms of j here are of size ~1/|q| ~ 230, so 0 is checked far below 10^-P
      const rho = withDigits(P + 150, () => Complex.of('-0.5', new Decimal(3).sqrt().div(2)));
      expect(withDigits(P, () => kleinJ(rho)).abs().toNumber()).toBeLessThan(10 ** -(P + 100));
    });
  }
});

describe('q-expansion', () => {
  it('matches OEIS A000521 for q^-1 .. q^10 (from memory; re-derived by an independent integer computation)', () => {
    const a000521 = [
      1n, 744n, 196884n, 21493760n, 864299970n, 20245856256n, 333202640600n, 4252023300096n, 44656994071935n,
      401490886656000n, 3176440229784420n, 22567393309593600n,
    ];
    expect(kleinJCoefficients(10)).toEqual(a000521);
  });
  it('the expansion summed at tau = 0.1 + 1.5i agrees with kleinJ there (40 terms, |q| = 8e-5)', () => {
    const P = 40;
    const tau = Complex.of('0.1', '1.5');
    const c = kleinJCoefficients(40);
    const series = withDigits(P + 10, () => {
      const q = tau.scale(new Decimal(2).times(Decimal.acos(-1))).mulI().exp();
      let s = Complex.ZERO;
      for (let m = c.length - 1; m >= 0; m--) s = s.mul(q).add(Complex.of(c[m]!.toString()));
      return s.div(q);
    });
    expect(ulpError(withDigits(P, () => kleinJ(tau)), series, P)).toBeLessThanOrEqual(2);
  });
});

describe('invariance j(gamma tau) = j(tau) at random group elements (built-ins evaluated independently)', () => {
  for (const [seed, P] of [
    [41, 30],
    [42, 50],
  ] as const) {
    it(`seed ${seed}, ${P} digits`, () => {
      const rng = new Random(seed);
      for (let s = 0; s < 10; s++) {
        const tau = randomInFundamental(rng, 1.6);
        const g = randomElement({ kind: 'SL2Z' }, rng, tau, { yMin: 0.025 });
        const gt = withDigits(P + 12, () => g.act(tau));
        const label = `seed=${seed} s=${s} tau=${tau} gamma=${g} gamma tau=${gt} P=${P}`;
        const a = withDigits(P, () => kleinJ(gt));
        const b = withDigits(P, () => kleinJ(tau));
        // j(tau) is computed to P digits; |j| ~ 1/|q| in F, so compare relative to |j(tau)|
        expect(ulpError(a, b, P), label).toBeLessThanOrEqual(3);
      }
    });
  }
});

describe('bad input (error codes)', () => {
  it("Im tau <= 0: 'domain'; below yMin: 'ymin'", () => {
    expect(errorCode(() => kleinJ(Complex.of('0', '-2')))).toBe('domain');
    expect(errorCode(() => kleinJ(Complex.of('0.4', '0.015')))).toBe('ymin');
    expect(withDigits(20, () => kleinJ(Complex.of('0.4', '0.015'), { yMin: 0.01 })).isFinite()).toBe(true);
  });
});
