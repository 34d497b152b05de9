// PSLQ on relations from the integer-relation literature; inputs are built with modvet's own
// pi, sqrt, atan (= arg) at higher precision than the search uses (those are tested against
// mpmath in test/numeric and test/special).
import { describe, expect, it } from 'vitest';
import { Decimal } from 'decimal.js';
import { Complex } from '../../src/numeric/complex.js';
import { pi } from '../../src/numeric/constants.js';
import { Random } from '../../src/numeric/random.js';
import { withDigits } from '../../src/numeric/precision.js';
import { pslq, pslqRun } from '../../src/diagnose/pslq.js';

/** x^0, ..., x^d */
function powers(x: Decimal, d: number): Decimal[] {
  const out: Decimal[] = [new Decimal(1)];
  for (let k = 1; k <= d; k++) out.push(out[k - 1]!.times(x));
  return out;
}

/** atan(1/k) = arg(k + i) */
function atanInv(k: number): Decimal {
  return Complex.of(k, 1).arg();
}

/** Residual sum a_i x_i relative to max |a_i x_i|, at the precision in force. */
function residual(a: bigint[], x: Decimal[]): number {
  let s = new Decimal(0);
  let big = new Decimal(0);
  a.forEach((ai, i) => {
    const t = x[i]!.times(ai.toString());
    s = s.plus(t);
    big = Decimal.max(big, t.abs());
  });
  return s.isZero() ? 0 : s.abs().div(big).toNumber();
}

describe('pslq: known relations', () => {
  it('sqrt 2 + sqrt 3 is a root of x^4 - 10 x^2 + 1 (its minimal polynomial; from memory)', () => {
    withDigits(50, () => {
      const x = new Decimal(2).sqrt().plus(new Decimal(3).sqrt());
      expect(pslq(powers(x, 4), { digits: 40, maxNorm: 1000 })).toEqual([1n, 0n, -10n, 0n, 1n]);
    });
  });

  it('(sqrt 2 + sqrt 3)^2 = 5 + 2 sqrt 6 among 1, sqrt 2, sqrt 3, sqrt 6 (from memory)', () => {
    withDigits(50, () => {
      const [r2, r3, r6] = [2, 3, 6].map((k) => new Decimal(k).sqrt()) as [Decimal, Decimal, Decimal];
      const x = [new Decimal(1), r2, r3, r6, r2.plus(r3).pow(2)];
      expect(pslq(x, { digits: 40, maxNorm: 1000 })).toEqual([5n, 0n, 0n, 2n, -1n]);
    });
  });

  it("Machin's formula pi/4 = 4 atan(1/5) - atan(1/239) as [1, -16, 4] on (pi, atan 1/5, atan 1/239)", () => {
    // J. Machin (1706); the identity fixed.ts computes pi with
    withDigits(50, () => {
      const x = [pi(), atanInv(5), atanInv(239)];
      expect(pslq(x, { digits: 40, maxNorm: 1000 })).toEqual([1n, -16n, 4n]);
    });
  });

  it('the BBP formula pi = 4 S_1 - 2 S_4 - S_5 - S_6, S_j = sum 16^-k/(8k + j)', () => {
    // Bailey, Borwein and Plouffe, Math. Comp. 66 (1997) 903-913: found by PSLQ
    withDigits(60, () => {
      const S = (j: number): Decimal => {
        let s = new Decimal(0);
        let p = new Decimal(1);
        for (let k = 0; k < 60; k++) {
          s = s.plus(p.div(8 * k + j));
          p = p.div(16);
        }
        return s;
      };
      const x = [pi(), S(1), S(4), S(5), S(6)];
      expect(pslq(x, { digits: 50, maxNorm: 1000 })).toEqual([1n, -4n, 2n, 1n, 1n]);
    });
  });

  it('3^(1/4) - 2^(1/4) is a root of x^16 - 20 x^12 - 666 x^8 - 3860 x^4 + 1', () => {
    // Bailey's degree-16 example, e.g. "Integer relation detection", Computing in Science
    // and Engineering 2 (2000) 24-28 (coefficients from memory; the test checks them)
    withDigits(170, () => {
      const a = new Decimal(3).pow(0.25).minus(new Decimal(2).pow(0.25));
      const want = new Array<bigint>(17).fill(0n);
      [want[0], want[4], want[8], want[12], want[16]] = [1n, -3860n, -666n, -20n, 1n];
      // 110 digits are too few (stops on the bound, measured); 150 suffice
      expect(pslq(powers(a, 16), { digits: 150, maxNorm: 1e5 })).toEqual(want);
    });
  });

  it('a relation holds to the digits used (residual check on each found relation)', () => {
    withDigits(60, () => {
      const x = [pi(), atanInv(5), atanInv(239)];
      const rel = pslq(x, { digits: 40, maxNorm: 1000 })!;
      expect(residual(rel, x)).toBeLessThan(1e-50);
    });
  });
});

describe('pslq: bounds and edge cases', () => {
  it('no relation among seeded random numbers within a small norm bound: stops on the bound', () => {
    const rnd = new Random('pslq-none');
    withDigits(40, () => {
      for (let t = 0; t < 20; t++) {
        const x = Array.from({ length: 5 }, () => new Decimal(rnd.next()).plus(new Decimal(rnd.next()).times('1e-16')).plus(new Decimal(rnd.next()).times('1e-32')));
        const r = pslqRun(x, { digits: 40, maxNorm: 100 });
        expect(r.relation, `seed pslq-none, trial ${t}`).toBeNull();
        expect(r.stop).toBe('norm-bound');
        expect(r.normLowerBound).toBeGreaterThan(100);
      }
    });
  });

  it('the iteration cap is honoured', () => {
    withDigits(170, () => {
      const a = new Decimal(3).pow(0.25).minus(new Decimal(2).pow(0.25));
      const r = pslqRun(powers(a, 16), { digits: 150, maxNorm: 1e5, maxIterations: 10 });
      expect(r).toMatchObject({ relation: null, stop: 'iteration-cap', iterations: 10 });
    });
  });

  it('too few digits: no relation, or a spurious one that fails at higher precision', () => {
    const x = withDigits(170, () => powers(new Decimal(3).pow(0.25).minus(new Decimal(2).pow(0.25)), 16));
    for (const P of [20, 40, 110]) {
      const got = withDigits(P + 10, () => pslq(x.map((d) => d.toSD(P + 10)), { digits: P, maxNorm: 1e5 }));
      if (got === null) continue;
      // a fit at P digits of |x| = 1: the residual, exact at 170 digits, is far from zero
      const res = withDigits(170, () => got.reduce((s, a, i) => s.plus(x[i]!.times(a.toString())), new Decimal(0)).abs());
      expect(res.toNumber(), `digits ${P}`).toBeGreaterThan(1e-150);
    }
  });

  it('an entry that is zero to the digits used gives the unit relation', () => {
    withDigits(40, () => {
      expect(pslq([pi(), new Decimal('1e-45'), new Decimal(2)], { digits: 30, maxNorm: 10 })).toEqual([0n, 1n, 0n]);
    });
  });

  it('the scale of x does not matter: digits are relative to max |x_i|', () => {
    withDigits(60, () => {
      const x = [pi(), atanInv(5), atanInv(239)];
      for (const s of ['1e-30', '1e-3', '1e25']) {
        expect(pslq(x.map((d) => d.times(s)), { digits: 40, maxNorm: 1000 }), `scale ${s}`).toEqual([1n, -16n, 4n]);
      }
    });
  });

  it('exact integer relations, signs normalised and primitive', () => {
    withDigits(30, () => {
      expect(pslq([new Decimal(2), new Decimal(-4)], { digits: 25, maxNorm: 10 })).toEqual([2n, 1n]);
      expect(pslq([new Decimal(-3), new Decimal(6), new Decimal(1)].map((d) => d.times(pi())), { digits: 25, maxNorm: 10 })?.[0]).toBeGreaterThan(0n);
    });
  });

  it('rejects fewer than two numbers and bad options', () => {
    expect(() => pslq([new Decimal(1)], { digits: 20, maxNorm: 10 })).toThrow(RangeError);
    expect(() => pslq([new Decimal(1), new Decimal(2)], { digits: 20, maxNorm: 0 })).toThrow(RangeError);
  });
});
