// The precision context: bounds, restoration, and the fixed-point kernels' edge cases.
import { describe, expect, it } from 'vitest';
import { Decimal } from 'decimal.js';
import { digits, withDigits, withGuard } from '../../src/numeric/precision.js';
import { ModvetError } from '../../src/numeric/errors.js';
import { isqrt, bitLength } from '../../src/numeric/fixed.js';
import { fromFixed, toFixed } from '../../src/numeric/convert.js';
import { Complex } from '../../src/numeric/complex.js';

describe('precision context', () => {
  it('rejects precisions below 5 or above 2000 digits with a typed error', () => {
    for (const d of [4, 2001, 12.5]) {
      try {
        withDigits(d, () => 0);
        expect.unreachable();
      } catch (e) {
        expect((e as ModvetError).code).toBe('precision');
      }
    }
  });
  it('restores the previous precision, also when the computation throws', () => {
    const before = digits();
    expect(withDigits(77, () => withGuard(10, () => digits()))).toBe(87);
    expect(() => withDigits(60, () => Complex.ZERO.log())).toThrow(ModvetError);
    expect(digits()).toBe(before);
  });
  it('division by zero and log(0) are typed errors, not NaN or Infinity', () => {
    withDigits(20, () => {
      expect(() => Complex.ONE.div(Complex.ZERO)).toThrow(ModvetError);
      expect(() => Complex.ZERO.log()).toThrow(ModvetError);
      expect(() => Complex.ZERO.pow(Complex.of(-1, 2))).toThrow(ModvetError);
    });
  });
});

describe('fixed-point kernels', () => {
  it('isqrt is the exact integer square root (common practice: r^2 <= n < (r+1)^2)', () => {
    for (const n of [0n, 1n, 2n, 99n, 10n ** 40n, 2n ** 521n - 1n, (10n ** 60n + 7n) ** 2n]) {
      const r = isqrt(n);
      expect(r * r <= n && (r + 1n) * (r + 1n) > n).toBe(true);
    }
    expect(bitLength(2n ** 100n)).toBe(101);
  });
  it('Decimal <-> fixed conversion round-trips at the current precision', () => {
    withDigits(50, () => {
      for (const s of ['1.25', '-3.1415926535897932384626433832795028841971693993751', '1e-40', '7.5e35']) {
        const d = new Decimal(s);
        const F = 400;
        expect(fromFixed(toFixed(d, F), F).eq(d)).toBe(true);
      }
    });
  });
});
