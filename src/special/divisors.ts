/**
 * Divisor sums sigma_k(n) = sum_{d | n} d^k (DLMF 27.2.10), for integer k exactly and for
 * complex k at the current precision, singly or for a whole range 1..N by a sieve.
 *
 *   sigma(3, 10) === 1134n;  sigmaSieve(1, 12)[12] === 28n
 */
import { Complex } from '../numeric/complex.js';
import { ModvetError } from '../numeric/errors.js';
import { withGuard } from '../numeric/precision.js';

// Complex divisor sums add terms of modulus d^Re(k) with varying phases, so they can cancel:
// they are summed with guard digits and rounded once.
const SUM_GUARD = 10;

function checkN(n: number, who: string): void {
  if (!Number.isSafeInteger(n) || n < 1) {
    throw new ModvetError('domain', who, `n = ${n} must be a positive integer`);
  }
}
function checkK(k: number, who: string): void {
  if (!Number.isSafeInteger(k) || k < 0) {
    throw new ModvetError('domain', who, `k = ${k} must be a non-negative integer here (use the complex form)`);
  }
}

/** sigma_k(n) exactly, for integers k >= 0 and n >= 1. */
export function sigma(k: number, n: number): bigint {
  checkK(k, 'sigma');
  checkN(n, 'sigma');
  const K = BigInt(k);
  let total = 0n;
  for (let d = 1; d * d <= n; d++) {
    if (n % d !== 0) continue;
    total += BigInt(d) ** K;
    const e = n / d;
    if (e !== d) total += BigInt(e) ** K;
  }
  return total;
}

/** [0, sigma_k(1), ..., sigma_k(N)] exactly, by adding d^k to every multiple of d. */
export function sigmaSieve(k: number, N: number): bigint[] {
  checkK(k, 'sigma');
  checkN(N, 'sigma');
  const K = BigInt(k);
  const out = new Array<bigint>(N + 1).fill(0n);
  for (let d = 1; d <= N; d++) {
    const p = BigInt(d) ** K;
    for (let m = d; m <= N; m += d) out[m]! += p;
  }
  return out;
}

/** [0, 1^k, 2^k, ..., N^k] for complex k: one exp(k log p) per prime p, products otherwise. */
export function powersUpTo(k: Complex, N: number): Complex[] {
  checkN(N, 'sigma');
  const spf = smallestPrimeFactors(N);
  const out: Complex[] = new Array<Complex>(N + 1);
  out[0] = Complex.ZERO;
  out[1] = Complex.ONE;
  for (let n = 2; n <= N; n++) {
    const p = spf[n]!;
    // n^k = p^k (n/p)^k: multiplicativity of d -> d^k (completely multiplicative)
    out[n] = p === n ? Complex.of(n).pow(k) : out[p]!.mul(out[n / p]!);
  }
  return out;
}

/** sigma_k(n) for complex k at the current precision. */
export function sigmaComplex(k: Complex, n: number): Complex {
  checkN(n, 'sigma');
  return withGuard(SUM_GUARD, () => {
    let total = Complex.ZERO;
    for (let d = 1; d * d <= n; d++) {
      if (n % d !== 0) continue;
      total = total.add(Complex.of(d).pow(k));
      const e = n / d;
      if (e !== d) total = total.add(Complex.of(e).pow(k));
    }
    return total;
  }).round();
}

/** [0, sigma_k(1), ..., sigma_k(N)] for complex k. */
export function sigmaSieveComplex(k: Complex, N: number): Complex[] {
  const out = withGuard(SUM_GUARD, () => {
    const pw = powersUpTo(k, N);
    const acc = new Array<Complex>(N + 1).fill(Complex.ZERO);
    for (let d = 1; d <= N; d++) {
      for (let m = d; m <= N; m += d) acc[m] = acc[m]!.add(pw[d]!);
    }
    return acc;
  });
  return out.map((z) => z.round());
}

/** spf[n] = the smallest prime factor of n (spf[0] = spf[1] = 0). */
export function smallestPrimeFactors(N: number): Int32Array {
  const spf = new Int32Array(N + 1);
  for (let i = 2; i <= N; i++) {
    if (spf[i] !== 0) continue;
    for (let m = i; m <= N; m += i) if (spf[m] === 0) spf[m] = i;
  }
  return spf;
}
