/**
 * Mathematical constants as Decimals at the current precision, each computed once per
 * precision on the fixed-point kernels (Machin's formula for pi, a Machin-like atanh
 * formula for log 2, Brent-McMillan for Euler's gamma) and cached.
 */
import { Decimal } from 'decimal.js';
import * as fx from './fixed.js';
import { fromFixed } from './convert.js';
import { bitsFor } from './precision.js';

function perPrecision(kernel: (F: number) => bigint): () => Decimal {
  const cache = new Map<number, Decimal>();
  return () => {
    const P = Decimal.precision;
    let v = cache.get(P);
    if (v === undefined) {
      const F = bitsFor(P) + 16;
      v = fromFixed(kernel(F), F);
      cache.set(P, v);
    }
    return v;
  };
}

/** pi */
export const pi = perPrecision(fx.pi);
/** log 2 */
export const ln2 = perPrecision(fx.ln2);
/** Euler-Mascheroni gamma */
export const euler = perPrecision(fx.euler);
