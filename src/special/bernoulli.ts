/**
 * Bernoulli numbers B_n as exact rationals, cached.
 *
 * Convention: B_1 = -1/2, B_2 = 1/6, B_4 = -1/30, B_{odd > 1} = 0 (DLMF 24.2.1).
 * Method: tangent numbers T_k by the integer recurrence of Brent & Harvey ("Fast
 * computation of Bernoulli, tangent and secant numbers", 2011, Algorithm TangentNumbers),
 * then B_{2k} = (-1)^(k-1) 2k T_k / (2^(2k) (2^(2k) - 1)).
 */
import { ModvetError } from '../numeric/errors.js';

export interface Rational {
  num: bigint;
  den: bigint; // > 0, gcd(num, den) = 1
}

function gcd(a: bigint, b: bigint): bigint {
  if (a < 0n) a = -a;
  while (b !== 0n) [a, b] = [b, a % b];
  return a;
}

/** The largest n offered to users (bernoulli(n) in claims): B_4000 takes about 4 s. */
export const MAX_USER_BERNOULLI = 4000;

let cache: Rational[] = []; // cache[k] = B_{2k}

function extend(kmax: number): void {
  const n = Math.max(kmax, 2 * (cache.length - 1), 16);
  const T: bigint[] = new Array<bigint>(n + 1).fill(0n);
  T[1] = 1n;
  for (let k = 2; k <= n; k++) T[k] = BigInt(k - 1) * T[k - 1]!;
  for (let k = 2; k <= n; k++) {
    for (let j = k; j <= n; j++) T[j] = BigInt(j - k) * T[j - 1]! + BigInt(j - k + 2) * T[j]!;
  }
  const out: Rational[] = [{ num: 1n, den: 1n }];
  for (let k = 1; k <= n; k++) {
    const p = 1n << BigInt(2 * k);
    let num = BigInt(2 * k) * T[k]!;
    if (k % 2 === 0) num = -num;
    const den = p * (p - 1n);
    const g = gcd(num, den);
    out.push({ num: num / g, den: den / g });
  }
  cache = out;
}

/** B_n for n >= 0, exact. */
export function bernoulli(n: number): Rational {
  if (!Number.isInteger(n) || n < 0) {
    throw new ModvetError('domain', 'bernoulli', `n = ${n} must be a non-negative integer`);
  }
  if (n === 1) return { num: -1n, den: 2n };
  if (n % 2 === 1) return { num: 0n, den: 1n };
  const k = n / 2;
  if (k >= cache.length) extend(k);
  return cache[k]!;
}

/** B_0, B_2, ..., B_{2k} (a view of the cache; do not modify). */
export function bernoulliEvenUpTo(k: number): readonly Rational[] {
  if (k >= cache.length) extend(k);
  return cache;
}
