// Bernoulli numbers against mpmath.bernfrac (test/reference/values.json) and DLMF Table 24.2.1.
import { describe, expect, it } from 'vitest';
import { bernoulli } from '../../src/special/bernoulli.js';
import { ModvetError } from '../../src/numeric/errors.js';
import { referenceBernoulli } from '../helpers/reference.js';

describe('bernoulli', () => {
  it('matches mpmath.bernfrac exactly, up to n = 300', () => {
    for (const [n, num, den] of referenceBernoulli()) {
      const b = bernoulli(n);
      expect([n, b.num, b.den]).toEqual([n, num, den]);
    }
  });
  it('matches DLMF Table 24.2.1 for small n', () => {
    // DLMF Table 24.2.1: B_0..B_14
    const table: [number, bigint, bigint][] = [
      [0, 1n, 1n], [1, -1n, 2n], [2, 1n, 6n], [3, 0n, 1n], [4, -1n, 30n], [6, 1n, 42n],
      [8, -1n, 30n], [10, 5n, 66n], [12, -691n, 2730n], [14, 7n, 6n],
    ];
    for (const [n, num, den] of table) expect(bernoulli(n)).toEqual({ num, den });
  });
  it('rejects negative and fractional n with a typed error', () => {
    for (const n of [-2, 2.5]) {
      try {
        bernoulli(n);
        expect.unreachable();
      } catch (e) {
        expect(e).toBeInstanceOf(ModvetError);
        expect((e as ModvetError).code).toBe('domain');
      }
    }
  });
});
