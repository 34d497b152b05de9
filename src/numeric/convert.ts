/**
 * Conversion between decimal.js values and the BigInt fixed-point kernels.
 *
 * Convention: `toFixed(d, F)` gives round(d * 2^F) (F may be negative or exceed the
 * precision; the caller picks F from the size of d); `fromFixed(X, F)` gives the Decimal
 * nearest X / 2^F, rounded to the current precision. Both are exact up to that rounding.
 */
import { Decimal } from 'decimal.js';
import { ModvetError } from './errors.js';
import { bitLength, roundDiv } from './fixed.js';

const pow10Cache: bigint[] = [1n];
export function pow10(k: number): bigint {
  if (k < 0) throw new RangeError('pow10 of a negative exponent');
  if (k < 4096) {
    let c = pow10Cache[k];
    if (c === undefined) {
      c = 10n ** BigInt(k);
      pow10Cache[k] = c;
    }
    return c;
  }
  return 10n ** BigInt(k);
}

/** The decimal exponent of a nonzero finite Decimal: d = m * 10^e10 with 1 <= |m| < 10. */
export function decimalExponent(d: Decimal): number {
  return d.e;
}

/** round(d * 2^F) as a bigint. */
export function toFixed(d: Decimal, F: number): bigint {
  if (!d.isFinite()) throw new ModvetError('overflow', 'convert', `non-finite value ${d}`);
  if (d.isZero()) return 0n;
  // d = M * 10^E with M an integer made of d's significant digits
  const digitsStr = d.abs().toExponential();
  const ePos = digitsStr.indexOf('e');
  const mant = digitsStr.slice(0, ePos).replace('.', '');
  const E = Number(digitsStr.slice(ePos + 1)) - (mant.length - 1);
  let M = BigInt(mant);
  if (d.isNegative()) M = -M;
  if (E >= 0) {
    const v = M * pow10(E);
    return F >= 0 ? v << BigInt(F) : roundDiv(v, 1n << BigInt(-F));
  }
  return F >= 0 ? roundDiv(M << BigInt(F), pow10(-E)) : roundDiv(M, pow10(-E) << BigInt(-F));
}

const LOG10_2 = 0.30102999566398120;

/** The Decimal nearest X / 2^F at the current precision (F may be negative). */
export function fromFixed(X: bigint, F: number): Decimal {
  if (X === 0n) return new Decimal(0);
  const P = Decimal.precision;
  // decimal digits before the point of |X| / 2^F, estimated from the bit length
  const intDigits = Math.floor((bitLength(X) - F) * LOG10_2) + 1;
  const K = P + 4 - intDigits; // keep P + 4 significant digits, then round once
  let N: bigint;
  if (K >= 0) {
    N = F >= 0 ? roundDiv(X * pow10(K), 1n << BigInt(F)) : (X * pow10(K)) << BigInt(-F);
  } else {
    N = F >= 0 ? roundDiv(X, pow10(-K) << BigInt(F)) : roundDiv(X << BigInt(-F), pow10(-K));
  }
  return new Decimal(`${N}e${-K}`).toSD(P);
}
