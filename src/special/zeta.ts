/**
 * The Riemann zeta function and the completed zeta xi, for complex s.
 *
 * Conventions: zeta(s) = sum_{n>=1} n^-s continued to s != 1 (DLMF 25.2.1);
 * xi(s) = pi^{-s/2} Gamma(s/2) zeta(s) (math-reference.md), with xi(s) = xi(1 - s) and poles
 * at s = 0 and s = 1. Results carry the current precision (precision.ts) to about one unit
 * in the last place, relative; the poles throw ModvetError('pole').
 *
 * Method, all on the BigInt fixed-point kernels (decimal.js only at the interface):
 * - Re s >= 0: Euler-Maclaurin summation (DLMF 25.2.9) with cut N and M correction terms
 *   chosen per call from the precision and |s| by a cost model; the powers n^-s come from
 *   p^-s for the primes p <= N (one exp and one sincos each) and products for composites.
 *   The remainder is bounded by the first omitted term times |s + 2M + 1| / (Re s + 2M + 1)
 *   (Backlund's bound; H. M. Edwards, "Riemann's Zeta Function", 1974, chapter 6).
 * - Re s < 0: the functional equation DLMF 25.4.2,
 *   zeta(s) = 2^s pi^{s-1} sin(pi s/2) Gamma(1-s) zeta(1-s), evaluated as exp(log factor).
 * - Im s < 0 by zeta(conj s) = conj zeta(s); exact values at the integers s <= 0
 *   (DLMF 25.6.1, 25.6.3): zeta(0) = -1/2, zeta(-2k) = 0, zeta(-n) = -B_{n+1}/(n+1).
 * Cancellation (|zeta| small against the terms, e.g. near a zero on the critical line) is
 * measured after each evaluation and paid for with a retry at higher precision.
 *
 *   withDigits(50, () => zeta(Complex.of(2)).toString())   // pi^2/6 = 1.6449340668...
 */
import { Decimal } from 'decimal.js';
import { Complex } from '../numeric/complex.js';
import { ModvetError } from '../numeric/errors.js';
import * as fx from '../numeric/fixed.js';
import { type FxC, cexpSplit, clog, cmul, csqr, fromComplex, toComplex } from '../numeric/fixedComplex.js';
import { bitsFor, withGuard } from '../numeric/precision.js';
import { bernoulli, bernoulliEvenUpTo } from './bernoulli.js';
import { logGammaFx } from './gamma.js';

const LOG2E = Math.LOG2E;
/** Largest number of guard bits a retry may add before giving up. */
const MAX_EXTRA_BITS = 30000;

// ---------------------------------------------------------------------------
// Shared kernels (also used by dirichletBeta.ts)

/** Smallest prime factor of every n below the table length, and prime counts pi(n). */
let spf = new Int32Array(0);
let primeCount = new Int32Array(0);
function smallestPrimeFactors(n: number): Int32Array {
  if (spf.length > n) return spf;
  const len = Math.max(n + 1, 2 * spf.length, 1024);
  const t = new Int32Array(len);
  const pc = new Int32Array(len);
  for (let i = 2; i < len; i++) {
    pc[i] = pc[i - 1]!;
    if (t[i] !== 0) continue;
    t[i] = i;
    pc[i]++;
    for (let j = i * i; j < len; j += i) if (t[j] === 0) t[j] = i;
  }
  t[1] = 1;
  spf = t;
  primeCount = pc;
  return t;
}

/** How many n in 2..X (odd n in 3..X) are prime, and how many numbers that range holds. */
function countPrimes(X: number, oddOnly: boolean): { primes: number; numbers: number } {
  smallestPrimeFactors(X);
  const all = primeCount[X]!;
  return oddOnly ? { primes: Math.max(0, all - 1), numbers: (X - 1) >> 1 } : { primes: all, numbers: X - 1 };
}

/** log n at F bits, cached per n at the highest precision asked for (rounded up to 128 bits). */
const logCache = new Map<number, { F: number; v: bigint }>();
function logInt(n: number, F: number): bigint {
  const c = logCache.get(n);
  if (c !== undefined && c.F >= F) return c.v >> BigInt(c.F - F);
  const W = Math.ceil((F + 32) / 128) * 128;
  const v = fx.log(BigInt(n) << BigInt(W), W);
  logCache.set(n, { F: W, v });
  return v >> BigInt(W - F);
}

/**
 * n^-s for n = 1..X at F bits (odd n only when `oddOnly`; even entries are then left 0).
 * p^-s = e^{-Re s log p} e^{-i Im s log p} for primes; composites n = p m as p^-s m^-s, so
 * only the primes cost an exp and a sincos. Error: a few units of 2^-F times (|Im s| + log n).
 */
export function negPowers(s: FxC, X: number, F: number, oddOnly: boolean): FxC[] {
  const t = smallestPrimeFactors(X);
  const zero: FxC = { re: 0n, im: 0n };
  const pw: FxC[] = new Array<FxC>(X + 1).fill(zero);
  pw[1] = { re: fx.one(F), im: 0n };
  for (let n = oddOnly ? 3 : 2; n <= X; n += oddOnly ? 2 : 1) {
    const p = t[n]!;
    if (p === n) {
      const lp = logInt(p, F);
      const mag = fx.exp(-fx.mul(s.re, lp, F), F);
      if (s.im === 0n) {
        pw[n] = { re: mag, im: 0n };
      } else {
        const [sn, cs] = fx.sincos(-fx.mul(s.im, lp, F), F);
        pw[n] = { re: fx.mul(mag, cs, F), im: fx.mul(mag, sn, F) };
      }
    } else {
      pw[n] = cmul(pw[p]!, pw[n / p]!, F);
    }
  }
  return pw;
}

/** zeta(2k) for k = 1..K at Fc bits, from B_{2k} (DLMF 25.6.2); extended on demand. */
let zetaEvenCache: { F: number; v: bigint[] } = { F: -1, v: [] };
/** zeta(2k) at F bits (k >= 1): zeta(2k) = |B_{2k}| (2 pi)^{2k} / (2 (2k)!). */
export function zetaEvenFx(k: number, F: number): bigint {
  const c = zetaEvenCache;
  if (c.F < F || c.v.length <= k) {
    const Fc = Math.max(Math.ceil(F / 128) * 128, c.F);
    const K = Math.max(c.v.length <= k ? Math.max(k, 2 * (c.v.length - 1)) : c.v.length - 1, 32);
    const W = Fc + 32;
    const B = bernoulliEvenUpTo(K);
    const tp2 = fx.mul(2n * fx.pi(W), 2n * fx.pi(W), W); // (2 pi)^2
    const v: bigint[] = [0n];
    let pow = fx.one(W); // (2 pi)^{2j} at W bits
    let fact = 1n; // (2j)!
    for (let j = 1; j <= K; j++) {
      pow = fx.mul(pow, tp2, W);
      fact *= BigInt(2 * j - 1) * BigInt(2 * j);
      const b = B[j]!;
      const num = b.num < 0n ? -b.num : b.num;
      v.push(((num * pow) / (2n * b.den * fact)) >> 32n);
    }
    zetaEvenCache = { F: Fc, v };
  }
  return zetaEvenCache.v[k]! >> BigInt(zetaEvenCache.F - F);
}

/**
 * The shape of an Euler-Maclaurin-type tail: its k-th term is at most
 * coef |(s)_{2k-1}| X^{1 - Re s} (c X)^{-2k}, and the remainder after the terms up to k - 1
 * (`lastIncluded` false) or k (true) is at most that bound times |s + 2k - 1| / (Re s + 2k - 1).
 */
export interface TailShape {
  c: number;
  coef: number;
  lastIncluded: boolean;
  oddOnly: boolean;
}
export interface TailPlan {
  X: number;
  M: number;
}

// Relative costs, measured at 150-350 bits: a prime power (exp + sincos), a product, a tail term.
const COST_PRIME = 20;
const COST_PRODUCT = 1;
const COST_TERM = 2.5;

/**
 * Number of tail terms for cut X so the remainder is below e^logTarget; Infinity if the terms
 * stop decreasing first or more than kCap are needed. Tracks the square of the bound as a
 * double times e^off (renormalised before it underflows), so a step costs a few flops.
 */
function termsNeeded(sigma: number, t: number, X: number, logTarget: number, sh: TailShape, kCap: number): number {
  const cX2 = (sh.c * X) ** 2;
  const cX4 = cX2 * cX2;
  const t2 = t * t;
  let off = 2 * (Math.log(sh.coef) + (1 - sigma) * Math.log(X));
  let b2 = (sigma * sigma + t2) / cX4; // squared bound of the first term, times e^-off
  let thr = Math.exp(2 * logTarget - off);
  for (let k = 1; k <= kCap + 1; k++) {
    const a = sigma + 2 * k - 1;
    const a2 = a * a + t2;
    // the remainder factor |s + 2k - 1| / (Re s + 2k - 1) is >= 1: test it only when it can pass
    if (b2 < thr && a > 0 && b2 * (a2 / (a * a)) < thr) return sh.lastIncluded ? k : k - 1;
    const r = (a2 * ((a + 1) * (a + 1) + t2)) / cX4;
    if (r >= 1 && a > 0) return Infinity;
    b2 *= r;
    if (b2 < 1e-200) {
      off += Math.log(b2);
      b2 = 1;
      thr = Math.exp(2 * logTarget - off);
    }
  }
  return Infinity;
}

/**
 * Cut X and term count M minimising the cost model, for remainder below e^logTarget: a coarse
 * geometric scan in X, then a finer one around the best point (the cost is close to convex).
 */
export function planTail(sigma: number, t: number, logTarget: number, sh: TailShape): TailPlan {
  const fix = (x: number) => (sh.oddOnly ? 2 * Math.floor(x / 2) + 1 : Math.max(1, Math.floor(x)));
  let best: TailPlan | undefined;
  let bestCost = Infinity;
  const tryX = (X: number): number => {
    const M = termsNeeded(sigma, t, X, logTarget, sh, Math.min(1e6, bestCost / COST_TERM));
    if (M === Infinity) return Infinity;
    const { primes, numbers } = countPrimes(X, sh.oddOnly);
    const cost = COST_PRIME * primes + COST_PRODUCT * (numbers - primes) + COST_TERM * M;
    if (cost < bestCost) {
      bestCost = cost;
      best = { X, M };
    }
    return cost;
  };
  // The smallest tail term is about |s| X^{1-Re s} e^{-cX} (at 2k ~ cX): start the scan where
  // that reaches half the target's exponent, below which no cut can work.
  const need = -0.5 * logTarget + Math.log(Math.hypot(sigma, t) + 1e-300);
  let X0 = Math.max(1, need / sh.c);
  while (X0 > 1 && sh.c * X0 + Math.max(0, sigma - 1) * Math.log(X0) > need) X0 /= 1.25;
  let X = fix(X0);
  for (let tries = 0; tries < 400; tries++) {
    const c = tryX(X);
    if (best !== undefined && X > 1.5 * best.X && c > 1.2 * bestCost) break;
    X = fix(Math.max(X + 2, X * 1.2));
  }
  if (best === undefined) throw new ModvetError('convergence', 'zeta', 'no Euler-Maclaurin cut found');
  const center: number = (best as TailPlan).X;
  for (let x = center / 1.2; x < center * 1.2; x = Math.max(x + 2, x * 1.04)) tryX(fix(x));
  return best;
}

/** a / b with a at F bits and b at Fb bits, result at F bits. */
function cdivMixed(a: FxC, b: FxC, Fb: number): FxC {
  const den = b.re * b.re + b.im * b.im;
  const f = BigInt(Fb);
  return {
    re: ((a.re * b.re + a.im * b.im) << f) / den,
    im: ((a.im * b.re - a.re * b.im) << f) / den,
  };
}

/** log2 |z| for a fixed value z at F bits (-Infinity for 0). */
export function log2Abs(z: FxC, F: number): number {
  const L = Math.max(fx.bitLength(z.re), fx.bitLength(z.im));
  if (L === 0) return -Infinity;
  const sh = Math.max(0, L - 60);
  const r = Number(z.re >> BigInt(sh));
  const i = Number(z.im >> BigInt(sh));
  return Math.log2(Math.hypot(r, i)) + sh - F;
}

/** log2 of a sum of powers of two given by their exponents. */
export function log2Sum(...e: number[]): number {
  const m = Math.max(...e);
  if (m === -Infinity) return m;
  return m + Math.log2(e.reduce((acc, x) => acc + 2 ** (x - m), 0));
}

/**
 * k + s (sign 1) or k - s (sign -1) for an integer k, exactly: the decimal subtraction is done
 * at the digits it needs, and the imaginary part is only negated (exact in decimal.js).
 */
export function shiftExact(s: Complex, k: number, sign: 1 | -1): Complex {
  const need = s.re.sd() + Math.abs(s.re.e) + String(Math.abs(k)).length + 2;
  return withGuard(Math.max(0, need - Decimal.precision), () =>
    sign === 1 ? new Complex(s.re.plus(k), s.im) : new Complex(new Decimal(k).minus(s.re), s.im.neg()),
  );
}

/** log2 |x| of a Decimal, to double precision, whatever its exponent (-Infinity for 0). */
function decimalLog2(x: Decimal): number {
  if (x.isZero()) return -Infinity;
  const [m, e] = x.abs().toExponential(16).split('e');
  return Math.log2(Number(m)) + Number(e) * 3.321928094887362;
}

/** Fixed value and binary exponent: the number is v * 2^k / 2^F. */
export interface Scaled {
  v: FxC;
  F: number;
  k: number;
}

// ---------------------------------------------------------------------------
// Euler-Maclaurin for Re s >= 0 (valid for all s, but the terms grow like N^{-Re s} below 0)

const ZETA_TAIL: TailShape = { c: 2 * Math.PI, coef: 2 * 1.6449340668482264, lastIncluded: false, oddOnly: false };

/**
 * One Euler-Maclaurin evaluation (DLMF 25.2.9):
 * zeta(s) = sum_{n<N} n^-s + N^-s/2 + N^{1-s}/(s-1) + sum_{k=1}^M (B_{2k}/(2k)!) (s)_{2k-1} N^{1-s-2k},
 * with B_{2k}/(2k)! = (-1)^{k+1} 2 zeta(2k) / (2 pi)^{2k} (DLMF 25.6.2) so that the
 * fixed-point tail terms V_k = (s)_{2k-1} N^{1-s-2k} / (2 pi)^{2k} stay well scaled.
 * Returns the sum at F bits and the size of the pole term N^{1-s}/(s-1).
 */
function zetaEM(s: FxC, sm1: FxC, F1: number, N: number, M: number, F: number): { z: FxC; pole: FxC } {
  const pw = negPowers(s, N, F, false);
  let re = 0n;
  let im = 0n;
  for (let n = 1; n < N; n++) {
    re += pw[n]!.re;
    im += pw[n]!.im;
  }
  const PN = pw[N]!;
  re += PN.re >> 1n;
  im += PN.im >> 1n;
  const bN = BigInt(N);
  const pole = cdivMixed({ re: PN.re * bN, im: PN.im * bN }, sm1, F1);
  re += pole.re;
  im += pole.im;
  if (M > 0) {
    const twoPi = 2n * fx.pi(F);
    const fourPi2 = fx.mul(twoPi, twoPi, F);
    const D = fourPi2 * bN * bN; // (2 pi N)^2 at F bits
    const sN = cmul(s, PN, F);
    let V: FxC = { re: (sN.re << BigInt(F)) / (fourPi2 * bN), im: (sN.im << BigInt(F)) / (fourPi2 * bN) };
    const s2 = csqr(s, F);
    const o = fx.one(F);
    for (let k = 1; k <= M; k++) {
      const c = 2n * zetaEvenFx(k, F);
      const Tre = (V.re * c) >> BigInt(F);
      const Tim = (V.im * c) >> BigInt(F);
      if (k % 2 === 1) {
        re += Tre;
        im += Tim;
      } else {
        re -= Tre;
        im -= Tim;
      }
      if (k < M) {
        // V_{k+1} = V_k (s + 2k - 1)(s + 2k) / (2 pi N)^2, (s+a)(s+a+1) = s^2 + (2a+1) s + a(a+1)
        const a = BigInt(2 * k - 1);
        const q: FxC = { re: s2.re + (2n * a + 1n) * s.re + a * (a + 1n) * o, im: s2.im + (2n * a + 1n) * s.im };
        V = { re: (V.re * q.re - V.im * q.im) / D, im: (V.re * q.im + V.im * q.re) / D };
      }
    }
  }
  return { z: { re, im }, pole };
}

/** Doubles 2 zeta(2k), k = 0..ESTIMATE_TERMS, for the double-precision estimates below. */
const ESTIMATE_TERMS = 10;
let twoZetaEven: number[] | undefined;

/**
 * log2 |value| of zeta(s) (`chi4` false) or beta(s) (`chi4` true) for Re s >= 0, estimated in
 * double precision by the same summation with a generous cut (N ~ 1.5 (|s| + 20) / c) and
 * ESTIMATE_TERMS tail terms; where the estimate is not above its own error (rounding with
 * phases |Im s| log n, the last tail term), the log2 of that error is returned instead. It only
 * chooses the guard bits of the first exact attempt, so a small value (near a zero) does not
 * cost a wasted attempt.
 */
export function estimateLog2(sigma: number, t: number, chi4: boolean): number {
  const zs = (twoZetaEven ??= Array.from({ length: ESTIMATE_TERMS + 1 }, (_, k) =>
    k === 0 ? 0 : 2 * fx.toFloat(zetaEvenFx(k, 64), 64),
  ));
  const c = chi4 ? Math.PI / 2 : 2 * Math.PI;
  const a = Math.hypot(sigma, t);
  let X = Math.ceil((1.5 * (a + 20)) / c);
  if (chi4 && X % 2 === 0) X++;
  let re = 0;
  let im = 0;
  let mags = 0;
  const powAt = (n: number): [number, number] => {
    const l = Math.log(n);
    const m = Math.exp(-sigma * l);
    mags += m * (1 + Math.abs(t) * l);
    return [m * Math.cos(t * l), -m * Math.sin(t * l)];
  };
  for (let n = 1; n < X; n += chi4 ? 2 : 1) {
    const [pr, pi] = powAt(n);
    const sg = chi4 && (n & 3) === 3 ? -1 : 1;
    re += sg * pr;
    im += sg * pi;
  }
  const [xr, xi] = powAt(X);
  // tail: X^-s/2 (+ X^{1-s}/(s-1) for zeta) + sum_k (-1)^{k+1} coef_k V_k, V_1 = s X^-s / (X c^2)
  let tr = xr / 2;
  let ti = xi / 2;
  if (!chi4) {
    const dr = sigma - 1;
    const d2 = dr * dr + t * t;
    tr += (X * (xr * dr + xi * t)) / d2;
    ti += (X * (xi * dr - xr * t)) / d2;
  }
  let vr = (sigma * xr - t * xi) / (X * c * c);
  let vi = (sigma * xi + t * xr) / (X * c * c);
  const D = (c * X) ** 2;
  let last = 0;
  for (let k = 1; k <= ESTIMATE_TERMS; k++) {
    const z2 = zs[k]! / 2;
    const coef = (chi4 ? z2 * (1 - 2 ** (-2 * k)) : 2 * z2) * (k % 2 === 1 ? 1 : -1);
    tr += coef * vr;
    ti += coef * vi;
    last = Math.abs(coef) * Math.hypot(vr, vi);
    // V_{k+1} = V_k (s + 2k - 1)(s + 2k) / (c X)^2
    const qr = (sigma + 2 * k - 1) * (sigma + 2 * k) - t * t;
    const qi = t * (2 * sigma + 4 * k - 1);
    [vr, vi] = [(vr * qr - vi * qi) / D, (vr * qi + vi * qr) / D];
  }
  const sign = chi4 && ((X - 1) >> 1) % 2 === 1 ? -1 : 1;
  re += sign * tr;
  im += sign * ti;
  const err = 4 * last * Math.hypot(sigma + 2 * ESTIMATE_TERMS, t) / (sigma + 2 * ESTIMATE_TERMS) + 4e-16 * (mags + 10);
  const e = Math.log2(Math.max(Math.hypot(re, im), 2 * err));
  return Number.isFinite(e) ? e : 0;
}

/** One evaluation at a given number of extra bits, with its estimated absolute error. */
export interface Attempt {
  v: FxC;
  F: number;
  /** log2 of the estimated absolute error of v / 2^F. */
  errLog2: number;
}

/**
 * Repeat `attempt(extra)`, from `firstExtra` on, until the estimated error is below
 * 2^-(bits+3) relative to the value, adding the missing bits each time (cancellation: a
 * value small against its terms).
 */
export function retryUntilAccurate(
  who: string,
  bits: number,
  firstExtra: number,
  attempt: (extra: number) => Attempt,
): Scaled {
  let extra = firstExtra;
  for (;;) {
    const r = attempt(extra);
    const deficit = r.errLog2 - (log2Abs(r.v, r.F) - bits - 3);
    if (deficit <= 0) return { v: r.v, F: r.F, k: 0 };
    extra += Math.ceil(Math.min(deficit, MAX_EXTRA_BITS)) + 4;
    if (extra > MAX_EXTRA_BITS) {
      throw new ModvetError('convergence', who, 'cancellation too severe to resolve');
    }
  }
}

/**
 * zeta(s) by Euler-Maclaurin (meant for Re s >= 0), relative error below 2^-bits. The
 * absolute error is estimated from the run: rounding, the input's rounding amplified by
 * |Im s| + log n, the pole term's relative error, and the remainder bound.
 */
function zetaDirectFx(s: Complex, bits: number): Scaled {
  const sigma = s.re.toNumber();
  const t = s.im.toNumber();
  if (s.im.isZero() && s.re.eq(1)) throw new ModvetError('pole', 'zeta', 'zeta has a pole at s = 1');
  // |s - 1| (only its size: s - 1 itself is formed in fixed point with the bits it needs)
  const d = s.re.minus(1);
  const sm1Log2 = d.isZero() ? decimalLog2(s.im) : s.im.isZero() ? decimalLog2(d) : 0.5 * Math.log2(2 ** (2 * decimalLog2(d)) + 2 ** (2 * decimalLog2(s.im)));
  // near the pole |zeta| ~ 1/|s-1|: the truncation error may be that much larger
  const tolerance = Math.max(0, -sm1Log2);
  // zeta(s) = 1 + O(2^-Re s): beyond this it rounds to 1 at any precision up to `bits`
  if (sigma > bits + 8) return { v: { re: fx.one(64), im: 0n }, F: 64, k: 0 };
  // a small |zeta| (near a zero) costs its size in bits: start with them (near the pole,
  // where the double estimate is useless, |zeta| is large anyway)
  const firstExtra = sm1Log2 < -8 ? 0 : Math.max(0, Math.ceil(-estimateLog2(sigma, t, false)) + 2);
  return retryUntilAccurate('zeta', bits, firstExtra, (extra) => {
    const tgt = -(bits + 6 + extra) + tolerance; // log2 of the truncation error aimed at
    const { X: N, M } = planTail(sigma, t, tgt / LOG2E, ZETA_TAIL);
    const count = N * (Math.log(N) + Math.abs(t) + 6) + 10 * M + 8;
    // the pole term N^{1-s}/(s-1): the numerator's error (~4N units) over |s-1|, plus the
    // relative error of the division (s - 1 carries 8 extra bits), in units of 2^-F
    const poleErr = (size: number) => log2Sum(Math.log2(4 * N) - sm1Log2, size - 6);
    const F = Math.ceil(
      bits + 8 + extra - tolerance + log2Sum(Math.log2(count), poleErr((1 - sigma) * Math.log2(N) - sm1Log2)),
    );
    // s - 1 at F1 bits has relative error 2^-(F+8): the pole term keeps its relative accuracy
    const F1 = F + Math.max(0, Math.ceil(-sm1Log2)) + 8;
    const s1 = fromComplex(s, F1);
    const sm1: FxC = { re: s1.re - fx.one(F1), im: s1.im };
    const sF: FxC = { re: s1.re >> BigInt(F1 - F), im: s1.im >> BigInt(F1 - F) };
    const { z, pole } = zetaEM(sF, sm1, F1, N, M, F);
    const errLog2 = log2Sum(Math.log2(count) - F, poleErr(log2Abs(pole, F)) - F, tgt);
    return { v: z, F, errLog2 };
  });
}

// ---------------------------------------------------------------------------
// The functional equation for Re s < 0

/** log pi at F bits, cached. */
let lnPiCache: { F: number; v: bigint } = { F: -1, v: 0n };
export function lnPiFx(F: number): bigint {
  if (lnPiCache.F < F) {
    const W = Math.ceil((F + 32) / 128) * 128;
    lnPiCache = { F: W, v: fx.log(fx.pi(W), W) };
  }
  return lnPiCache.v >> BigInt(lnPiCache.F - F);
}

/**
 * A branch of log sin(pi u / 2) at F bits (absolute error a few 2^-F), for Im u >= 0.
 * u = 2j + r with |Re r| <= 1 exactly (decimal arithmetic), sin(pi u/2) = (-1)^j sin(pi r/2);
 * near the zero r = 0 the value is computed from r itself with the bits it needs. For
 * Im u > 1: sin z = (i/2) e^{-iz} (1 - e^{2iz}) with |e^{2iz}| < e^{-pi}, so the log has
 * no cancellation whatever the size of Im u.
 */
export function logSinHalfPiFx(u: Complex, F: number): FxC {
  const j = Math.round(u.re.toNumber() / 2);
  const r = shiftExact(u, -2 * j, 1);
  const parity = j % 2 === 0 ? 0n : fx.pi(F); // log(-1) = i pi
  if (r.im.gt(1)) {
    const W = F + 8;
    const z = fromComplex(r, W);
    const hp = fx.pi(W) >> 1n;
    const x = fx.mul(z.re, hp, W);
    const y = fx.mul(z.im, hp, W);
    // e^{2iz} = e^{-2y} (cos 2x + i sin 2x)
    const e = fx.exp(-2n * y, W);
    const [sn, cs] = fx.sincos(2n * x, W);
    const w: FxC = { re: fx.one(W) - fx.mul(e, cs, W), im: -fx.mul(e, sn, W) };
    const lw = clog(w, W);
    return {
      re: (y - fx.ln2(W) + lw.re) >> 8n,
      im: ((hp - x + lw.im) >> 8n) + parity,
    };
  }
  // |r| may be small: keep its relative precision through sin
  const lost = r.isZero() ? 0 : Math.max(0, -Math.round(Math.log2(r.abs().toNumber() || 1e-300)));
  const W = F + 8 + lost;
  const z = fromComplex(r, W);
  const hp = fx.pi(W) >> 1n;
  const x = fx.mul(z.re, hp, W);
  const y = fx.mul(z.im, hp, W);
  const [sn, cs] = fx.sincos(x, W);
  // sin(x + iy) = sin x cosh y + i cos x sinh y (DLMF 4.21.37)
  const [m, k] = fx.expSplit(y, W);
  const ey = k >= 0 ? m << BigInt(k) : m >> BigInt(-k);
  const emy = fx.div(fx.one(W), ey, W);
  const ch = (ey + emy) >> 1n;
  const sh = (ey - emy) >> 1n;
  const v: FxC = { re: fx.mul(sn, ch, W), im: fx.mul(cs, sh, W) };
  const lv = clog(v, W);
  return { re: lv.re >> BigInt(8 + lost), im: (lv.im >> BigInt(8 + lost)) + parity };
}

/** a b without the fixed-point shift: the result has the sum of the two scales. */
export function cmulWide(a: FxC, b: FxC): FxC {
  return { re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re };
}

/** Bits for an exponent-sized quantity L(s) of size about |s| log |s| to absolute 2^-bits. */
export function logFactorBits(s: Complex, bits: number): number {
  const a = s.abs().toNumber();
  return bits + 12 + Math.ceil(2 * Math.log2(a + 2));
}

/**
 * zeta(s) for Re s < 0, Im s >= 0 by DLMF 25.4.2:
 * zeta(s) = 2^s pi^{s-1} sin(pi s/2) Gamma(1-s) zeta(1-s), with Re(1 - s) > 1 on the right.
 * The factor is exp(L), L = s log 2 + (s-1) log pi + log sin(pi s/2) + log Gamma(1-s), to
 * absolute accuracy, so its size (e^{pi |Im s|/2} against e^{-pi |Im s|/2}) costs nothing.
 */
function zetaReflectedFx(s: Complex, bits: number): Scaled {
  const FL = logFactorBits(s, bits);
  const oms = shiftExact(s, 1, -1);
  const sF = fromComplex(s, FL);
  const lg = logGammaFx(fromComplex(oms, FL), FL);
  const ls = logSinHalfPiFx(s, FL);
  const l2 = fx.ln2(FL);
  const lp = lnPiFx(FL);
  const L: FxC = {
    re: fx.mul(sF.re, l2, FL) + fx.mul(sF.re - fx.one(FL), lp, FL) + ls.re + lg.re,
    im: fx.mul(sF.im, l2 + lp, FL) + ls.im + lg.im,
  };
  const [w, k] = cexpSplit(L, FL);
  const z1 = zetaDirectFx(oms, bits + 4);
  return { v: cmulWide(w, z1.v), F: FL + z1.F, k: k + z1.k };
}

// ---------------------------------------------------------------------------
// Public functions

/** zeta(-n) for integers n >= 0 up to this bound exactly from B_{n+1} (DLMF 25.6.3). */
const EXACT_NEGATIVE_MAX = 600;

function toDecimalComplex(r: Scaled): Complex {
  return toComplex(r.v, r.F, r.k);
}

/**
 * The Riemann zeta function at the current precision (see the module header).
 * Throws ModvetError('pole') at s = 1.
 */
/**
 * The largest |Im s| accepted: the cost of Euler-Maclaurin summation grows linearly in
 * |Im s| (about 0.6 s at 1e5 and 30 digits); beyond it a typed error, never a hang.
 */
export const MAX_IM_S = 1e5;

function checkHeight(s: Complex, who: string): void {
  if (s.im.abs().gt(MAX_IM_S)) {
    throw new ModvetError('domain', who, `|Im s| = ${s.im.abs().toSD(6)} is above the supported ${MAX_IM_S}`);
  }
}

export function zeta(s: Complex): Complex {
  checkHeight(s, 'zeta');
  if (s.im.isZero()) {
    const x = s.re;
    if (x.eq(1)) throw new ModvetError('pole', 'zeta', 'zeta has a pole at s = 1');
    if (x.isInteger() && x.lte(0) && x.gte(-EXACT_NEGATIVE_MAX)) {
      // DLMF 25.6.1 and 25.6.3: zeta(0) = -1/2, zeta(-n) = -B_{n+1}/(n+1), zero for even n > 0
      const n = -x.toNumber();
      if (n === 0) return new Complex(new Decimal(-0.5), 0);
      if (n % 2 === 0) return Complex.ZERO;
      const b = bernoulli(n + 1);
      return new Complex(new Decimal((-b.num).toString()).div((b.den * BigInt(n + 1)).toString()), 0);
    }
  }
  // zeta(conj s) = conj zeta(s) (Schwarz reflection): work with Im s >= 0
  if (s.im.isNegative()) return zeta(s.conj()).conj();
  const bits = bitsFor(Decimal.precision);
  const z = toDecimalComplex(s.re.isNegative() ? zetaReflectedFx(s, bits) : zetaDirectFx(s, bits));
  return s.im.isZero() ? new Complex(z.re, 0) : z;
}

/**
 * The completed zeta xi(s) = pi^{-s/2} Gamma(s/2) zeta(s) (math-reference.md), entire except
 * for simple poles at s = 0 and s = 1 (ModvetError 'pole'). For Re s < 1/2 it uses
 * xi(s) = xi(1 - s) (DLMF 25.4.1 rewritten), so zeta is only ever summed at Re >= 1/2.
 */
export function xi(s: Complex): Complex {
  checkHeight(s, 'xi');
  if (s.isZero() || (s.im.isZero() && s.re.eq(1))) {
    throw new ModvetError('pole', 'xi', `xi has a pole at s = ${s.re.toString()}`);
  }
  const u = s.re.lt(0.5) ? shiftExact(s, 1, -1) : s;
  const bits = bitsFor(Decimal.precision);
  const FL = logFactorBits(u, bits);
  const uF = fromComplex(u, FL);
  const half: FxC = { re: uF.re >> 1n, im: uF.im >> 1n }; // exact up to one unit
  const lg = logGammaFx(half, FL);
  const lp = lnPiFx(FL);
  const L: FxC = { re: lg.re - fx.mul(half.re, lp, FL), im: lg.im - fx.mul(half.im, lp, FL) };
  const [w, k] = cexpSplit(L, FL);
  const z = zetaDirectFx(u, bits + 4);
  const r = toDecimalComplex({ v: cmulWide(w, z.v), F: FL + z.F, k: k + z.k });
  return s.im.isZero() ? new Complex(r.re, 0) : r;
}
