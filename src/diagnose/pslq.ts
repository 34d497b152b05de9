/**
 * PSLQ: an integer relation a (not all zero) with a_1 x_1 + ... + a_n x_n = 0 for a real
 * vector x known to a stated number of digits.
 *
 * Method: the one-level PSLQ of H. R. P. Ferguson, D. H. Bailey and S. Arno, "Analysis of
 * PSLQ, an integer relation finding algorithm", Math. Comp. 68 (1999) 351-369, in the
 * step-by-step form of D. H. Bailey, "PSLQ: an algorithm to discover integer relations":
 * gamma = sqrt(4/3); initialise the lower-trapezoidal H from the normalised x and
 * fully reduce it (Hermite reduction); then repeat exchange, corner, reduction, norm bound,
 * termination. Only B (the matrix whose columns become relations) is kept; A = B^-1 is not
 * needed for the answer.
 *
 * Conventions:
 * - `digits` is the accuracy of x relative to max |x_i|: x is first quantised to
 *   10^-digits of that size, so a relation is searched for "using `digits` digits"; the
 *   internal arithmetic carries GUARD_BITS more bits so that rounding inside the
 *   algorithm does not eat into them.
 * - Column j of B is reported as a relation when y_j (x normalised to |x| = 1) falls below
 *   sqrt(n) |b_j| 10^-digits: the residual that a true relation b_j leaves when each x_i
 *   is off by 10^-digits. Callers that need certainty confirm the relation at higher
 *   precision (recognise.ts does).
 * - The run stops with no relation when the proven lower bound 1/max_j |H_jj| on the norm of
 *   any relation (proved in the 1999 paper) exceeds maxNorm, or after maxIterations.
 *   It never loops unboundedly.
 * - The relation is primitive (gcd 1), with its first nonzero entry positive.
 *
 * Arithmetic: BigInt fixed point (a real x is the bigint x * 2^F), not decimal.js. Every
 * step is a multiply-and-shift on numbers of a few hundred bits, where native BigInt is
 * one to two orders of magnitude faster than decimal.js's base-1e7 digit arrays (see
 * src/numeric/fixed.ts); the reductions multiply by integers and are exact.
 *
 *   const [a, b] = [new Decimal(2).sqrt(), new Decimal(3).sqrt()];   // at 40 digits
 *   pslq([a.plus(b), a, b], { digits: 30, maxNorm: 100 })             // [1n, -1n, -1n]
 */
import { Decimal } from 'decimal.js';
import { bitLength, isqrt, roundDiv } from '../numeric/fixed.js';
import { toFixed } from '../numeric/convert.js';
import { bitsFor } from '../numeric/precision.js';

/** Bits carried beyond the input's own, against rounding inside the iteration. */
const GUARD_BITS = 40;
/** log2 of gamma = sqrt(4/3), the value of Bailey's step-by-step description (the 1999
 * analysis takes gamma > sqrt(4/3); the limit value works in practice, as there). */
const LOG2_GAMMA = 0.5 * Math.log2(4 / 3);
const LOG2_10 = Math.log2(10);

export interface PslqOptions {
  /** Digits of x to use (relative to max |x_i|). */
  digits: number;
  /** Largest Euclidean norm of a relation worth finding. */
  maxNorm: number;
  /** Iteration cap; default 100 n^2 + 1000 (far above what the bound needs in practice). */
  maxIterations?: number;
}

export type PslqStop = 'found' | 'norm-bound' | 'iteration-cap';

export interface PslqResult {
  relation: bigint[] | null;
  stop: PslqStop;
  iterations: number;
  /** The proven lower bound on the norm of any relation at the last iteration. */
  normLowerBound: number;
}

/** An integer relation for x within the bounds of `opts`, or null. */
export function pslq(x: readonly Decimal[], opts: PslqOptions): bigint[] | null {
  return pslqRun(x, opts).relation;
}

/** log2 |a / 2^F| for a != 0, to double precision. */
function log2Fixed(a: bigint, F: number): number {
  const L = bitLength(a);
  const s = Math.max(0, L - 60);
  return Math.log2(Math.abs(Number(a >> BigInt(s)))) + s - F;
}

function gcd(a: bigint, b: bigint): bigint {
  if (a < 0n) a = -a;
  if (b < 0n) b = -b;
  while (b !== 0n) [a, b] = [b, a % b];
  return a;
}

/** Primitive, first nonzero entry positive. */
function normalise(v: bigint[]): bigint[] {
  let g = 0n;
  for (const a of v) g = gcd(g, a);
  if (g === 0n) return v;
  const first = v.find((a) => a !== 0n) ?? 1n;
  const s = first < 0n ? -g : g;
  return v.map((a) => a / s);
}

/** PSLQ with its stopping reason and iteration count (for tests and reports). */
export function pslqRun(x: readonly Decimal[], opts: PslqOptions): PslqResult {
  const n = x.length;
  if (n < 2) throw new RangeError('pslq needs at least two numbers');
  if (!(opts.digits >= 2) || !(opts.maxNorm >= 1)) throw new RangeError('pslq: digits >= 2 and maxNorm >= 1 required');
  const maxIt = opts.maxIterations ?? 100 * n * n + 1000;
  // tolerance for y_j relative to |x|: sqrt(n) |b_j| 10^-digits (below), at most this
  const log2TolBase = Math.log2(Math.sqrt(n)) - opts.digits * LOG2_10;
  const log2TolMax = log2TolBase + Math.log2(opts.maxNorm);

  // quantise x to 2^-Pb of max |x|, then carry GUARD_BITS more
  const Pb = bitsFor(opts.digits);
  const F = Pb + GUARD_BITS + bitLength(BigInt(n));
  const unitRelation = (i: number): PslqResult => ({
    relation: x.map((_, k) => (k === i ? 1n : 0n)),
    stop: 'found',
    iterations: 0,
    normLowerBound: 1,
  });
  let big = -Infinity;
  for (const xi of x) if (!xi.isZero()) big = Math.max(big, xi.e);
  if (big === -Infinity) return unitRelation(0);
  const shift = Math.ceil((big + 1) * LOG2_10); // max |x| < 2^shift
  const X = x.map((xi) => toFixed(xi, Pb - shift) << BigInt(F - Pb));

  // a zero entry (to the digits used) is the relation e_i
  for (let i = 0; i < n; i++) if (X[i] === 0n) return unitRelation(i);

  // y = x / |x|
  const norm = isqrt(X.reduce((s, v) => s + v * v, 0n));
  const y = X.map((v) => (v << BigInt(F)) / norm);
  for (let i = 0; i < n; i++) if (y[i] === 0n || log2Fixed(y[i]!, F) < log2TolBase) return unitRelation(i);

  // s_k = sqrt(sum_{j >= k} y_j^2), at F bits
  const s: bigint[] = new Array<bigint>(n);
  let acc = 0n;
  for (let k = n - 1; k >= 0; k--) {
    acc += y[k]! * y[k]!;
    s[k] = isqrt(acc);
  }
  // H (n x (n-1)): H_kk = s_{k+1}/s_k, H_ij = -y_i y_j / (s_j s_{j+1}) for i > j
  const H: bigint[][] = [];
  for (let i = 0; i < n; i++) {
    const row = new Array<bigint>(n - 1).fill(0n);
    for (let j = 0; j < Math.min(i + 1, n - 1); j++) {
      if (i === j) row[j] = (s[j + 1]! << BigInt(F)) / s[j]!;
      else row[j] = -(((y[i]! * y[j]!) << BigInt(F)) / (s[j]! * s[j + 1]!));
    }
    H.push(row);
  }
  // B = identity (exact integers)
  const B: bigint[][] = [];
  for (let i = 0; i < n; i++) B.push(Array.from({ length: n }, (_, k) => (k === i ? 1n : 0n)));

  /** Reduce row i of H against row j: the integer steps of Bailey's step 3. */
  const reduce = (i: number, j: number): void => {
    const hjj = H[j]![j]!;
    if (hjj === 0n) return;
    const t = roundDiv(H[i]![j]!, hjj);
    if (t === 0n) return;
    y[j] = y[j]! + t * y[i]!;
    const Hi = H[i]!;
    const Hj = H[j]!;
    for (let k = 0; k <= j; k++) Hi[k] = Hi[k]! - t * Hj[k]!;
    for (let k = 0; k < n; k++) {
      const Bk = B[k]!;
      Bk[j] = Bk[j]! + t * Bk[i]!;
    }
  };
  for (let i = 1; i < n; i++) for (let j = i - 1; j >= 0; j--) reduce(i, j);

  let bound = 0;
  for (let it = 1; it <= maxIt; it++) {
    // exchange: m maximising gamma^(m+1) |H_mm|
    let m = 0;
    let best = -Infinity;
    for (let i = 0; i < n - 1; i++) {
      const h = H[i]![i]!;
      if (h === 0n) continue;
      const v = log2Fixed(h, F) + (i + 1) * LOG2_GAMMA;
      if (v > best) {
        best = v;
        m = i;
      }
    }
    [y[m], y[m + 1]] = [y[m + 1]!, y[m]!];
    [H[m], H[m + 1]] = [H[m + 1]!, H[m]!];
    for (let k = 0; k < n; k++) {
      const Bk = B[k]!;
      [Bk[m], Bk[m + 1]] = [Bk[m + 1]!, Bk[m]!];
    }
    // corner: a rotation restores the zero at H[m][m+1]
    if (m < n - 2) {
      const a = H[m]![m]!;
      const b = H[m]![m + 1]!;
      const t0 = isqrt(a * a + b * b);
      if (t0 !== 0n) {
        const t1 = (a << BigInt(F)) / t0;
        const t2 = (b << BigInt(F)) / t0;
        for (let i = m; i < n; i++) {
          const t3 = H[i]![m]!;
          const t4 = H[i]![m + 1]!;
          H[i]![m] = (t1 * t3 + t2 * t4) >> BigInt(F);
          H[i]![m + 1] = (t1 * t4 - t2 * t3) >> BigInt(F);
        }
      }
    }
    // reduction of the rows below the exchange
    for (let i = m + 1; i < n; i++) for (let j = Math.min(i - 1, m + 1); j >= 0; j--) reduce(i, j);

    // termination: y_j below 10^-digits |b_j| sqrt(n), b_j column j of B, is the residual
    // a true relation b_j leaves on inputs off by 10^-digits: b_j is then a relation
    for (let j = 0; j < n; j++) {
      const v = y[j] === 0n ? -Infinity : log2Fixed(y[j]!, F);
      if (v >= log2TolMax) continue;
      const col = B.map((row) => row[j]!);
      const colNorm = Math.sqrt(col.reduce((acc2, b) => acc2 + Number(b) * Number(b), 0));
      if (colNorm <= opts.maxNorm && v < log2TolBase + Math.log2(colNorm)) {
        return { relation: normalise(col), stop: 'found', iterations: it, normLowerBound: bound };
      }
    }
    // norm bound: every relation has norm >= 1 / max |H_jj|
    let hMax = -Infinity;
    for (let j = 0; j < n - 1; j++) if (H[j]![j] !== 0n) hMax = Math.max(hMax, log2Fixed(H[j]![j]!, F));
    bound = 2 ** -hMax;
    if (bound > opts.maxNorm) return { relation: null, stop: 'norm-bound', iterations: it, normLowerBound: bound };
  }
  return { relation: null, stop: 'iteration-cap', iterations: maxIt, normLowerBound: bound };
}
