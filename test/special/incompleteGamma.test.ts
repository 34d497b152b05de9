// The upper incomplete gamma function against mpmath (test/reference/values.json) and DLMF chapter 8.
import { describe, expect, it } from 'vitest';
import { Decimal } from 'decimal.js';
import { Complex } from '../../src/numeric/complex.js';
import { ModvetError } from '../../src/numeric/errors.js';
import { withDigits } from '../../src/numeric/precision.js';
import { pi } from '../../src/numeric/constants.js';
import { Random } from '../../src/numeric/random.js';
import { gammaUpper, gammaUpperScaled } from '../../src/special/incompleteGamma.js';
import { referenceCases, referenceLibrary, ulpError } from '../helpers/reference.js';
import { errorCodeAndFn as codeOf } from '../helpers/errors.js';

const PRECISIONS = [30, 50, 100];


/** x^a e^{-x}, principal branch, at the current precision. */
function powExp(a: Complex, x: Decimal): Complex {
  return Complex.of(x).pow(a).scale(x.neg().exp());
}

/** Evaluate with 10 guard digits and compare at P digits (identities between computed values). */
function agree(P: number, lhs: () => Complex, rhs: () => Complex, label: string): void {
  const [l, r] = withDigits(P + 10, () => [lhs(), rhs()]);
  expect(ulpError(l!, r!, P), label).toBeLessThanOrEqual(1);
}

/**
 * erfc(z) = 1 - (2/sqrt(pi)) sum_n (-1)^n z^{2n+1} / (n! (2n+1)) (DLMF 7.2.2 with 7.6.1), summed
 * in plain Decimal arithmetic with enough guard digits for the alternating series and for
 * the smallness of erfc: independent of the code under test.
 */
function erfcBySeries(z: Decimal, P: number): Decimal {
  const z2 = z.times(z).toNumber();
  const guard = Math.ceil((2 * z2) / Math.LN10) + 10;
  return withDigits(P + guard, () => {
    const zz = z.times(z);
    let term = z; // z^{2n+1} / n! with sign
    let sum = new Decimal(0);
    const eps = new Decimal(10).pow(-(P + guard));
    for (let n = 0; ; n++) {
      const t = term.div(2 * n + 1);
      sum = sum.plus(t);
      if (t.abs().lt(eps) && n > z2) break;
      term = term.times(zz).neg().div(n + 1);
    }
    return new Decimal(1).minus(sum.times(2).div(pi().sqrt()));
  });
}

describe(`against ${referenceLibrary}`, () => {
  for (const P of PRECISIONS) {
    it(`gammainc at ${P} digits`, () => {
      for (const c of referenceCases('gammainc')) {
        const got = withDigits(P, () => gammaUpper(c.args[0]!, c.args[1]!.re));
        expect(ulpError(got, c.value, P), c.label).toBeLessThanOrEqual(2);
      }
    });
  }
});

describe('DLMF chapter 8', () => {
  const xs = ['0.01', '0.3', '1', '2.5', '7.25', '20', '49.5', '150.125'];

  it('Gamma(1, x) = e^{-x} (DLMF 8.4.5)', () => {
    for (const P of PRECISIONS) {
      for (const xs1 of xs) {
        const x = new Decimal(xs1);
        const [g, e] = withDigits(P, () => [gammaUpper(Complex.ONE, x), new Complex(x.neg().exp())]);
        expect(ulpError(g!, e!, P), `x = ${xs1}, P = ${P}`).toBeLessThanOrEqual(1);
      }
    }
  });

  it('Gamma(1/2, x) = sqrt(pi) erfc(sqrt x), erfc by its Maclaurin series (DLMF 8.4.6, 7.6.1)', () => {
    for (const P of [30, 50]) {
      for (const xs1 of ['0.01', '0.3', '1', '2.5', '7.25', '20']) {
        const x = new Decimal(xs1);
        const want = withDigits(P + 5, () => new Complex(pi().sqrt().times(erfcBySeries(x.sqrt(), P + 5))));
        const got = withDigits(P, () => gammaUpper(Complex.of('0.5'), x));
        expect(ulpError(got, want, P), `x = ${xs1}, P = ${P}`).toBeLessThanOrEqual(1);
      }
    }
  });

  it('Gamma(n, x) = (n-1)! e^{-x} sum_{k<n} x^k/k! for n = 1..60 (DLMF 8.4.8)', () => {
    for (const xs1 of xs) {
      const x = new Decimal(xs1);
      withDigits(60, () => {
        let fact = new Decimal(1); // (n-1)!
        let partial = new Decimal(0); // sum_{k<n} x^k/k!
        let term = new Decimal(1); // x^{n-1}/(n-1)!
        for (let n = 1; n <= 60; n++) {
          partial = withDigits(90, () => partial.plus(term));
          const want = withDigits(90, () => new Complex(fact.times(x.neg().exp()).times(partial)));
          const got = gammaUpper(Complex.of(n), x);
          expect(ulpError(got, want, 60), `n = ${n}, x = ${xs1}`).toBeLessThanOrEqual(1);
          fact = withDigits(90, () => fact.times(n)); // exact: 59! has 81 digits
          term = withDigits(90, () => term.times(x).div(n));
        }
      });
    }
  });

  it('recurrence Gamma(a + 1, x) = a Gamma(a, x) + x^a e^{-x} at random a, x (DLMF 8.8.2)', () => {
    const r = new Random('gammainc-recurrence');
    for (let i = 0; i < 40; i++) {
      const a = Complex.of(r.uniform(-8, 12).toFixed(6), r.uniform(-15, 15).toFixed(6));
      const x = new Decimal(Math.exp(r.uniform(Math.log(0.01), Math.log(160))).toFixed(6));
      const P = r.int(20, 80);
      agree(P, () => gammaUpper(a.add(Complex.ONE), x), () => a.mul(gammaUpper(a, x)).add(powExp(a, x)), `a = ${a}, x = ${x}, P = ${P}`);
    }
  });

  it('recurrence at the poles of Gamma(a): a = 0, -1, ..., -12 (DLMF 8.8.2)', () => {
    for (const xs1 of xs) {
      const x = new Decimal(xs1);
      for (let n = 0; n <= 12; n++) {
        const a = Complex.of(-n);
        agree(40, () => gammaUpper(a.add(Complex.ONE), x), () => a.mul(gammaUpper(a, x)).add(powExp(a, x)), `a = ${-n}, x = ${xs1}`);
      }
    }
  });

  it('is continuous in a at a = -3 (near-pole series with cancellation against the exact-integer path)', () => {
    // d/da Gamma(a, x) is finite at a = -3 (DLMF 8.2.2 is entire in a), so a shift of 1e-40 in a
    // moves the value by about 1e-40 relative: 35 digits must agree
    for (const xs1 of ['0.01', '0.3', '2.5', '20']) {
      const x = new Decimal(xs1);
      const exact = withDigits(40, () => gammaUpper(Complex.of(-3), x));
      const near = withDigits(40, () => gammaUpper(Complex.of('-3.0000000000000000000000000000000000000001'), x));
      const nearC = withDigits(40, () => gammaUpper(Complex.of('-3', '1e-40'), x));
      expect(ulpError(near, exact, 35), xs1).toBeLessThanOrEqual(1);
      expect(ulpError(nearC, exact, 35), xs1).toBeLessThanOrEqual(1);
    }
  });

  it('large x: Gamma(a, x) ~ x^{a-1} e^{-x} sum_k (1-a)_k (-1/x)^k ... (DLMF 8.11.2) at x = 150', () => {
    // the divergent series, stopped at its smallest term, is good to about e^{-x} relative
    const x = new Decimal('150');
    for (const a of [Complex.of('0.5', '14.134725'), Complex.of('-2.25', '-6'), Complex.of('3', '0.5')]) {
      withDigits(50, () => {
        const want = withDigits(80, () => {
          let term = Complex.ONE;
          let sum = Complex.ZERO;
          let prev = Infinity;
          for (let k = 0; k < 400; k++) {
            const t = term.abs().toNumber();
            if (t > prev) break;
            prev = t;
            sum = sum.add(term);
            // u_{k+1} = u_k (a - 1 - k) / x
            term = term.mul(a.sub(Complex.of(k + 1))).scale(new Decimal(1).div(x));
          }
          return powExp(a.sub(Complex.ONE), x).mul(sum);
        });
        expect(ulpError(gammaUpper(a, x), want, 50), a.toString()).toBeLessThanOrEqual(1);
      });
    }
  });
});

describe('the scaled function', () => {
  it('gammaUpperScaled(a, x) = e^x x^{-a} Gamma(a, x) (its definition)', () => {
    const r = new Random('gammainc-scaled');
    for (let i = 0; i < 10; i++) {
      const a = Complex.of(r.uniform(-6, 10).toFixed(6), r.uniform(-20, 20).toFixed(6));
      const x = new Decimal(Math.exp(r.uniform(Math.log(0.05), Math.log(150))).toFixed(6));
      agree(40, () => gammaUpperScaled(a, x), () => gammaUpper(a, x).div(powExp(a, x)), `a = ${a}, x = ${x}`);
    }
  });
});

describe('bad input', () => {
  it('x <= 0 throws ModvetError domain', () => {
    for (const x of ['0', '-1', '-0.5']) {
      expect(codeOf(() => gammaUpper(Complex.of('0.5', '1'), new Decimal(x))), x).toBe('domain:Gamma(a, x)');
      expect(codeOf(() => gammaUpperScaled(Complex.of('-2'), new Decimal(x))), x).toBe('domain:Gamma(a, x)');
    }
  });
});
