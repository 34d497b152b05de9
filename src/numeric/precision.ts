/**
 * The precision context: how many significant decimal digits results must carry.
 *
 * Convention: the context is decimal.js's own `precision` setting, changed only through
 * `withDigits` / `withGuard`, which restore it in a `finally` block, so no caller ever
 * sees a precision left changed. Functions of the numeric and special layers return
 * results correct to the context's digits (about one unit in the last place).
 *
 *   withDigits(50, () => pi().toString())   // 50 digits of pi
 */
import { Decimal } from 'decimal.js';
import { ModvetError } from './errors.js';

export const MIN_DIGITS = 5;
export const MAX_DIGITS = 2000;
const LOG2_10 = 3.321928094887362;

Decimal.set({
  precision: 30,
  rounding: Decimal.ROUND_HALF_EVEN,
  toExpNeg: -7,
  toExpPos: 21,
  minE: -9e15,
  maxE: 9e15,
});

/** The number of significant digits in force. */
export function digits(): number {
  return Decimal.precision;
}

/** Check a requested precision; throws a typed error outside [MIN_DIGITS, MAX_DIGITS]. */
export function checkDigits(d: number, who = 'precision'): void {
  if (!Number.isInteger(d) || d < MIN_DIGITS || d > MAX_DIGITS) {
    throw new ModvetError(
      'precision',
      who,
      `digits = ${d} is outside the supported range ${MIN_DIGITS}..${MAX_DIGITS}`,
    );
  }
}

/** Run `fn` with `d` significant digits in force, restoring the previous setting afterwards. */
export function withDigits<T>(d: number, fn: () => T): T {
  checkDigits(d);
  const saved = Decimal.precision;
  Decimal.set({ precision: d });
  try {
    return fn();
  } finally {
    Decimal.set({ precision: saved });
  }
}

/**
 * Run `fn` with `extra` guard digits on top of the current precision. The caller rounds
 * the result back (Decimal#toSD or Complex#round); guard digits beyond MAX_DIGITS are allowed
 * here because they are internal.
 */
export function withGuard<T>(extra: number, fn: () => T): T {
  const saved = Decimal.precision;
  Decimal.set({ precision: saved + Math.max(0, Math.ceil(extra)) });
  try {
    return fn();
  } finally {
    Decimal.set({ precision: saved });
  }
}

/** Binary digits carrying `d` decimal digits. */
export function bitsFor(d: number): number {
  return Math.ceil(d * LOG2_10);
}
