// The complex layer against mpmath (test/reference/values.json) and DLMF identities.
import { describe, expect, it } from 'vitest';
import { Complex } from '../../src/numeric/complex.js';
import { withDigits } from '../../src/numeric/precision.js';
import { pi, ln2, euler } from '../../src/numeric/constants.js';
import { referenceCases, ulpError } from '../helpers/reference.js';

const PRECISIONS = [30, 50, 100];
const unary: Record<string, (z: Complex) => Complex> = {
  exp: (z) => z.exp(),
  log: (z) => z.log(),
  sqrt: (z) => z.sqrt(),
  sin: (z) => z.sin(),
  cos: (z) => z.cos(),
  sinh: (z) => z.sinh(),
  cosh: (z) => z.cosh(),
};

describe('elementary functions against mpmath', () => {
  for (const [name, f] of Object.entries(unary)) {
    for (const P of PRECISIONS) {
      it(`${name} at ${P} digits`, () => {
        for (const c of referenceCases(name)) {
          const got = withDigits(P, () => f(c.args[0]!));
          expect(ulpError(got, c.value, P), c.label).toBeLessThanOrEqual(2);
        }
      });
    }
  }
  for (const P of PRECISIONS) {
    it(`pow at ${P} digits`, () => {
      for (const c of referenceCases('pow')) {
        const got = withDigits(P, () => c.args[0]!.pow(c.args[1]!));
        expect(ulpError(got, c.value, P), c.label).toBeLessThanOrEqual(2);
      }
    });
  }
});

describe('constants', () => {
  // Decimal expansions: OEIS A000796 (pi), A002162 (log 2), A001620 (Euler's gamma);
  // the 60 digits written here were cross-checked against mpmath 1.2.1 at 80 digits.
  it('pi, log 2, gamma to 60 digits', () => {
    withDigits(60, () => {
      expect(pi().toString()).toBe('3.14159265358979323846264338327950288419716939937510582097494');
      expect(ln2().toString()).toBe('0.69314718055994530941723212145817656807550013436025525412068');
      expect(euler().toString()).toBe('0.577215664901532860606512090082402431042159335939923598805767');
    });
  });
});

describe('identities and branches', () => {
  it('exp(log z) = z and log of the negative real axis has imaginary part pi (DLMF 4.2.3)', () => {
    withDigits(40, () => {
      const z = Complex.of('-2.5', '0.75');
      expect(ulpError(z.log().exp(), z, 40)).toBeLessThanOrEqual(2);
      expect(ulpError(Complex.of(-1).log(), Complex.of(0, pi()), 40)).toBeLessThanOrEqual(1);
    });
  });
  it('sin z near zero keeps its relative accuracy', () => {
    // sin(x) = x - x^3/6 + ... (DLMF 4.19.1): for x = 1e-40 the value is x to 80 digits
    withDigits(50, () => {
      expect(Complex.of('1e-40').sin().re.toString()).toBe('1e-40');
    });
  });
  it('integer powers are exact for small integers', () => {
    withDigits(30, () => {
      expect(Complex.of(3, 4).pow(2).toString()).toBe('-7 + 24i');
    });
  });
});
