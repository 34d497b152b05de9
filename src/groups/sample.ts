/**
 * Seeded random points and group elements for sampling.
 *
 * Elements: choose the bottom row (c, d) coprime, obeying the group's congruences, with
 * |c tau + d|^2 <= Im(tau) / yMin, so that Im(gamma tau) = Im(tau)/|c tau + d|^2 >= yMin;
 * then complete it to a matrix by the extended Euclidean algorithm and shift the top row
 * by a random multiple of the bottom row (which leaves gamma tau's height unchanged).
 * The same seed gives the same elements on every machine (integer arithmetic only, apart
 * from the double-precision bound on |c tau + d|, which is checked exactly afterwards).
 */
import { Decimal } from 'decimal.js';
import { Complex } from '../numeric/complex.js';
import { ModvetError } from '../numeric/errors.js';
import { Random } from '../numeric/random.js';
import { Mat2 } from './matrix.js';
import { contains, Group, groupName } from './subgroups.js';

export interface SampleOptions {
  /** Lower bound for Im(gamma tau). */
  yMin: number;
  /** Largest allowed |b| and |a| shift (the top row); default 3. */
  topShift?: number;
}

function gcd(a: number, b: number): number {
  a = Math.abs(a);
  b = Math.abs(b);
  while (b) [a, b] = [b, a % b];
  return a;
}

/** [u, v] with u d + v c = 1 for coprime (d, c). */
function bezout(d: bigint, c: bigint): [bigint, bigint] {
  let [r0, r1] = [d, c];
  let [s0, s1] = [1n, 0n];
  let [t0, t1] = [0n, 1n];
  while (r1 !== 0n) {
    const q = r0 / r1;
    [r0, r1] = [r1, r0 - q * r1];
    [s0, s1] = [s1, s0 - q * s1];
    [t0, t1] = [t1, t0 - q * t1];
  }
  return r0 < 0n ? [-s0, -t0] : [s0, t0];
}

function mod(x: number, n: number): number {
  return ((x % n) + n) % n;
}

/** A random element gamma of the group with Im(gamma tau) >= yMin. */
export function randomElement(group: Group, rng: Random, tau: Complex, opts: SampleOptions): Mat2 {
  const x = tau.re.toNumber();
  const y = tau.im.toNumber();
  if (!(y > 0)) throw new ModvetError('domain', 'sample', `Im tau = ${y} must be > 0`);
  if (!(opts.yMin > 0) || opts.yMin > y) {
    throw new ModvetError('domain', 'sample', `yMin = ${opts.yMin} must lie in (0, Im tau = ${y}]`);
  }
  const N = group.kind === 'SL2Z' ? 1 : group.N;
  const unitD = group.kind === 'Gamma1' || group.kind === 'Gamma';
  const R2 = y / opts.yMin; // |c tau + d|^2 <= R2
  const cMax = Math.floor(Math.sqrt(R2) / y);
  const cs: number[] = [];
  for (let c = -cMax; c <= cMax; c++) if (c !== 0 && c % N === 0) cs.push(c);
  for (let attempt = 0; attempt < 1000; attempt++) {
    // mostly c != 0 (c = 0 gives translations only)
    const c = cs.length > 0 && rng.next() < 0.9 ? cs[rng.int(0, cs.length - 1)]! : 0;
    let d: number;
    if (c === 0) {
      d = unitD && N > 2 ? 1 : rng.next() < 0.5 ? 1 : -1;
    } else {
      const half = Math.sqrt(Math.max(0, R2 - c * c * y * y));
      const lo = Math.ceil(-c * x - half);
      const hi = Math.floor(-c * x + half);
      if (hi < lo) continue;
      d = rng.int(lo, hi);
      if (gcd(c, d) !== 1) continue;
      if (unitD && mod(d, N) !== mod(1, N)) continue;
    }
    const C = BigInt(c);
    const D = BigInt(d);
    let a: bigint;
    let b: bigint;
    if (c === 0) {
      a = D; // det = a d = 1
      b = 0n;
    } else {
      const [u, v] = bezout(D, C); // u d + v c = 1  =>  a = u, b = -v
      a = u;
      b = -v;
    }
    // shift the top row: (a + t c, b + t d)
    const shift = opts.topShift ?? 3;
    let t = BigInt(rng.int(-shift, shift));
    if (group.kind === 'Gamma') {
      // need b + t d = 0 mod N; d = 1 mod N, so t = -b mod N
      const n = BigInt(N);
      t = (((-b % n) + n) % n) + n * BigInt(rng.int(-1, 0));
    }
    const g = c === 0 ? new Mat2(a, b + t * a, 0n, D) : new Mat2(a + t * C, b + t * D, C, D);
    if (!contains(group, g)) continue;
    // exact check of the height bound with Decimal arithmetic
    const h = tau.im.div(g.automorphy(tau).abs2());
    if (h.lt(new Decimal(opts.yMin))) continue;
    return g;
  }
  throw new ModvetError('convergence', 'sample', `no element of ${groupName(group)} found for tau = ${tau}`);
}

/** A random point of the fundamental domain with Im tau <= yMax (as exact short decimals). */
export function randomInFundamental(rng: Random, yMax = 2): Complex {
  const x = rng.uniform(-0.5, 0.5);
  // a margin of 1e-12 keeps the 15-digit rounding inside F
  const y = rng.uniform(Math.sqrt(1 - x * x) + 1e-12, yMax);
  return Complex.of(x.toPrecision(15), y.toPrecision(15));
}
