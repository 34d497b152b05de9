/**
 * The Gamma function and its logarithm for complex arguments.
 *
 * Conventions:
 * - Gamma(z) = int_0^inf t^{z-1} e^{-t} dt continued to C minus the poles z = 0, -1, -2, ...
 *   (DLMF 5.2.1); there it throws ModvetError('pole', 'Gamma').
 * - logGamma(z) is the analytic continuation of log Gamma from the positive real axis to
 *   C minus (-inf, 0] (DLMF 5.4(i)): real for z > 0, imaginary part continuous off the cut,
 *   and in general NOT the principal log of Gamma(z). On the cut (z < 0 not an integer) it
 *   is the limit from above, log|Gamma(x)| + i pi floor(x). Same convention as mpmath's
 *   loggamma.
 *
 * Method (all on the BigInt fixed-point kernels; decimal.js only at the interface):
 * - Stirling's series (DLMF 5.11.1) at w = z + N, where N shifts |w| up to a radius R that is
 *   chosen per working precision to minimise (N + number of terms); the remainder after K-1
 *   terms is at most the first neglected term times sec^{2K}(ph w / 2) (DLMF 5.11(ii)), which
 *   fixes K. The sum, a real polynomial in 1/w^2, is evaluated by the second-order Horner
 *   (Goertzel) recurrence: 2 real multiplications per term instead of 4.
 * - log Gamma(z) = log Gamma(w) - sum_{k<N} Log(z + k) (DLMF 5.5.1). The product of the
 *   z + k is taken in pairs, (z+k)(z+k+1) being updated by additions only; the multiple of
 *   2 pi i between the principal log of the product and the sum of logs comes from a
 *   double-precision sum of the arguments. The sum of principal logs has its cuts exactly
 *   on (-inf, 0], so this is the continuation above, with no further branch fixing.
 * - Far left (Re z < REFLECT_BELOW) by the reflection formula (DLMF 5.5.3) in the form
 *   log Gamma(z) = log 2 pi - i pi/2 + i pi z - Log(1 - e^{2 pi i z}) - log Gamma(1 - z)
 *   for Im z >= 0, whose right side is analytic in the upper half plane (both sides agree
 *   at z = 1/2), and by conjugation below.
 * - Gamma(z) = exp(log Gamma(w)) / prod (z + k), avoiding the second logarithm; real z on
 *   single bigints; integers and half-integers up to 300 exactly (DLMF 5.4.1, 5.4.6).
 * - Input bits: the result's sensitivity log |z| and, near a pole, -log2 of the distance to
 *   it; logGamma compares its result with the kernel's absolute error and retries with the
 *   bits lost near its zeros z = 1, 2.
 *
 * Kernels for other modules' loops: logGammaFx, gammaFx (and the real ones), and
 * table-driven exp / sin-cos / log on fixed point (expSplitFx, sinCosFx, cexpSplitFx, logFx,
 * clogFx), 1.5-3 times faster than those of fixed.ts (measured, 120-700 bits).
 *
 *   withDigits(50, () => gamma(Complex.of('0.5')).toString())   // sqrt(pi)
 */
import { Decimal } from 'decimal.js';
import { Complex } from '../numeric/complex.js';
import { ModvetError } from '../numeric/errors.js';
import * as fx from '../numeric/fixed.js';
import { type FxC, toComplex } from '../numeric/fixedComplex.js';
import { fromFixed, toFixed } from '../numeric/convert.js';
import { bitsFor, withGuard } from '../numeric/precision.js';
import { bernoulliEvenUpTo } from './bernoulli.js';

/** Below this real part the reflection formula replaces the (long) shifting product. */
const REFLECT_BELOW = -80;
/** Largest internal precision a retry may reach before giving up. */
const MAX_BITS = 200_000;
const TWO_PI = 2 * Math.PI;

// ---------------------------------------------------------------------------
// Stirling coefficients c_k = B_{2k} / (2k (2k - 1)) (DLMF 5.11.1), as fixed values per F.

const coeffCache = new Map<number, bigint[]>();
const log2Coeff: number[] = [0]; // log2 |c_k|, k >= 1

function log2Big(n: bigint): number {
  const L = fx.bitLength(n);
  if (L <= 1000) return Math.log2(Math.abs(Number(n)));
  const s = L - 60;
  return Math.log2(Math.abs(Number(n >> BigInt(s)))) + s;
}

function ensureLog2(K: number): void {
  if (log2Coeff.length > K) return;
  const B = bernoulliEvenUpTo(K + 16);
  for (let k = log2Coeff.length; k <= K + 16; k++) {
    const b = B[k]!;
    log2Coeff.push(log2Big(b.num) - log2Big(b.den) - Math.log2(2 * k * (2 * k - 1)));
  }
}

/** c_0 (unused, 0), c_1, ..., c_{K} at F bits. */
function stirlingCoeffs(K: number, F: number): bigint[] {
  let c = coeffCache.get(F);
  if (c !== undefined && c.length > K) return c;
  if (coeffCache.size > 64) coeffCache.clear();
  const B = bernoulliEvenUpTo(K + 8);
  const out: bigint[] = [0n];
  for (let k = 1; k <= K + 8; k++) {
    const b = B[k]!;
    out.push(fx.roundDiv(b.num << BigInt(F), b.den * BigInt(2 * k * (2 * k - 1))));
  }
  coeffCache.set(F, out);
  c = out;
  return c;
}

/**
 * The number K of the first neglected Stirling term at |w| = r, ph w with cosine cosPh, for
 * an absolute error below 2^-W: log2 c_K - (2K - 1) log2 r + K log2 sec^2(ph/2) < -W.
 * Returns Infinity if the asymptotic series cannot reach that accuracy at this radius.
 */
function stirlingTerms(r: number, cosPh: number, W: number): number {
  const lr = Math.log2(r);
  const ls = Math.log2(2 / (1 + cosPh)); // sec^2(ph/2)
  let prev = Infinity;
  for (let K = 1; ; K++) {
    ensureLog2(K);
    const b = log2Coeff[K]! - (2 * K - 1) * lr + K * ls;
    if (b < -W) return K;
    if (b > prev && K > 3) return Infinity; // past the smallest term
    prev = b;
  }
}

const radiusCache = new Map<number, number>();
/** The shift radius R minimising R + K(R) at W bits (both cost about one product each). */
function radiusFor(W: number): number {
  const key = Math.ceil(W / 16) * 16;
  let R = radiusCache.get(key);
  if (R !== undefined) return R;
  let best = Infinity;
  R = 1;
  const step = Math.max(1, Math.floor(key / 200));
  for (let r = Math.max(2, Math.floor(0.1 * key)); r <= 0.6 * key + 8; r += step) {
    const cost = r + stirlingTerms(r, 1, key);
    if (cost < best) {
      best = cost;
      R = r;
    }
  }
  radiusCache.set(key, R);
  return R;
}

// ---------------------------------------------------------------------------
// Table-driven elementary kernels (exported for incompleteGamma.ts)
//
// fixed.ts reduces exp and sin/cos by repeated halving (about sqrt(F) doublings and
// F / sqrt(F) Taylor terms with a division each). Up to TABLE_MAX_BITS it is 1.5-3 times
// faster to split the reduced argument r = j1/2^8 + j2/2^16 (+ j3/2^24 for exp) + r', take
// e^{j/2^8} etc. from tables built once per 64-bit precision bucket, and sum the Taylor
// series of e^{r'}, |r'| < 2^-16, by Horner's rule with stored 1/n! (no divisions).
// Above TABLE_MAX_BITS (where the tables and the Taylor series get long) the fixed.ts
// kernels are used.

const TABLE_MAX_BITS = 1400;
const TWO_M64 = 2 ** -64;
/** log2(n!) for n < 400 */
const LOG2_FACT: number[] = [0];
for (let n = 1; n < 400; n++) LOG2_FACT.push(LOG2_FACT[n - 1]! + Math.log2(n));

/** The least n with 2^{-b(n+1)} / (n+1)! < 2^-W (Taylor terms for an argument below 2^-b). */
function taylorTerms(b: number, W: number): number {
  let n = 1;
  while (b * (n + 1) + LOG2_FACT[n + 1]! < W + 2) n++;
  return n;
}

/**
 * The bit length of |a|, possibly one too large just below a power of two (the double
 * conversion rounds): for scaling decisions, where fx.bitLength's exactness (through a
 * hexadecimal string) is not needed and costs more than the arithmetic around it.
 */
export function bitLengthApprox(a: bigint): number {
  const v = Math.abs(Number(a));
  if (v === 0) return 0;
  return v < 2 ** 1000 ? Math.floor(Math.log2(v)) + 1 : fx.bitLength(a);
}

/** The double nearest a / 2^F for values not far below 2^-20 (cheaper than fx.toFloat). */
export function toDouble(a: bigint, F: number): number {
  return F > 64 ? Number(a >> BigInt(F - 64)) * TWO_M64 : Number(a) * 2 ** -F;
}

interface Tables {
  W: number;
  /** e^{j/2^8}, e^{j/2^16}, e^{j/2^24} */
  e1: bigint[];
  e2: bigint[];
  e3: bigint[];
  /** cos, sin of j/2^8 and j/2^16 */
  c1: bigint[];
  s1: bigint[];
  c2: bigint[];
  s2: bigint[];
  /** 1/n! */
  inv: bigint[];
  ln2: bigint;
  halfPi: bigint;
}

const tableCache = new Map<number, Tables>();

function powersReal(base: bigint, n: number, W: number): bigint[] {
  const w = BigInt(W);
  const out: bigint[] = [fx.one(W)];
  for (let j = 1; j < n; j++) out.push((out[j - 1]! * base) >> w);
  return out;
}
function powersUnit(c: bigint, s: bigint, n: number, W: number): [bigint[], bigint[]] {
  const w = BigInt(W);
  const C: bigint[] = [fx.one(W)];
  const S: bigint[] = [0n];
  for (let j = 1; j < n; j++) {
    C.push((C[j - 1]! * c - S[j - 1]! * s) >> w);
    S.push((C[j - 1]! * s + S[j - 1]! * c) >> w);
  }
  return [C, S];
}

/** Tables at the bucket W' >= W (W' a multiple of 64), built on first use. */
function tablesFor(W: number): Tables {
  const WT = Math.ceil((W + 8) / 64) * 64;
  let t = tableCache.get(WT);
  if (t !== undefined) return t;
  // built 16 bits finer: the repeated products lose at most 8 bits
  const B = WT + 16;
  const o = fx.one(B);
  const down = (v: bigint[]): bigint[] => v.map((x) => x >> 16n);
  const e1 = powersReal(fx.exp(o >> 8n, B), 182, B);
  const e2 = powersReal(fx.exp(o >> 16n, B), 256, B);
  const e3 = powersReal(fx.exp(o >> 24n, B), 256, B);
  const [s8, c8] = fx.sincos(o >> 8n, B);
  const [s16, c16] = fx.sincos(o >> 16n, B);
  const [c1, s1] = powersUnit(c8, s8, 206, B);
  const [c2, s2] = powersUnit(c16, s16, 256, B);
  const inv: bigint[] = [fx.one(WT)];
  for (let n = 1; inv[n - 1]! !== 0n; n++) inv.push(inv[n - 1]! / BigInt(n));
  t = {
    W: WT,
    e1: down(e1),
    e2: down(e2),
    e3: down(e3),
    c1: down(c1),
    s1: down(s1),
    c2: down(c2),
    s2: down(s2),
    inv,
    ln2: fx.ln2(WT),
    halfPi: fx.pi(WT) >> 1n,
  };
  tableCache.set(WT, t);
  return t;
}

/**
 * e^a as [m, k]: e^a = (m / 2^F) 2^k with m / 2^F in [1, 2), full relative precision for
 * any size of a (the contract of fx.expSplit, with a different range of m).
 */
export function expSplitFx(a: bigint, F: number): [bigint, number] {
  if (F > TABLE_MAX_BITS) return fx.expSplit(a, F);
  const af = toDouble(a, F);
  if (!(Math.abs(af) <= 2 ** 50)) throw new ModvetError('overflow', 'exp', `argument ${af} too large`);
  let k = Math.floor(af / Math.LN2);
  const T = tablesFor(F + 12 + Math.ceil(Math.log2(Math.abs(k) + 1)));
  const W = T.W;
  const w = BigInt(W);
  // r = a - k log 2 in [0, log 2): the double estimate of k may be off by one
  let r = (a << BigInt(W - F)) - BigInt(k) * T.ln2;
  if (r < 0n) {
    r += T.ln2;
    k -= 1;
  } else if (r >= T.ln2) {
    r -= T.ln2;
    k += 1;
  }
  const s8 = BigInt(W - 8);
  const s16 = BigInt(W - 16);
  const s24 = BigInt(W - 24);
  const j1 = r >> s8;
  r -= j1 << s8;
  const j2 = r >> s16;
  r -= j2 << s16;
  const j3 = r >> s24;
  r -= j3 << s24;
  // e^r, 0 <= r < 2^-24: Horner on 1/n!, enough terms for r^n/n! < 2^-W
  const n = taylorTerms(24, W);
  let acc = T.inv[n]!;
  for (let i = n - 1; i >= 0; i--) acc = T.inv[i]! + ((acc * r) >> w);
  let m = (T.e1[Number(j1)]! * T.e2[Number(j2)]!) >> w;
  m = (m * T.e3[Number(j3)]!) >> w;
  m = (m * acc) >> w;
  return [m >> BigInt(W - F), k];
}

/** [sin b, cos b] at F bits (absolute error a few units of 2^-F). */
export function sinCosFx(b: bigint, F: number): [bigint, bigint] {
  if (F > TABLE_MAX_BITS) return fx.sincos(b, F);
  const bf = toDouble(b, F);
  const q = Math.round(bf / (Math.PI / 2));
  const T = tablesFor(F + 12 + Math.ceil(Math.log2(Math.abs(q) + 1)));
  const W = T.W;
  const w = BigInt(W);
  let t = (b << BigInt(W - F)) - BigInt(q) * T.halfPi; // |t| <= pi/4 (a little more)
  const neg = t < 0n;
  if (neg) t = -t;
  const s8 = BigInt(W - 8);
  const s16 = BigInt(W - 16);
  const j1 = Number(t >> s8);
  t -= BigInt(j1) << s8;
  const j2 = Number(t >> s16);
  t -= BigInt(j2) << s16;
  // cos t = sum (-1)^n t^{2n}/(2n)!, sin t = t sum (-1)^n t^{2n}/(2n+1)!, 0 <= t < 2^-16
  const u = (t * t) >> w;
  // terms of cos and sin up to t^{2n+1}
  const n = Math.ceil(taylorTerms(16, W) / 2);
  let ca = T.inv[2 * n]!;
  let sa = T.inv[2 * n + 1]!;
  for (let i = n - 1; i >= 0; i--) {
    ca = T.inv[2 * i]! - ((ca * u) >> w);
    sa = T.inv[2 * i + 1]! - ((sa * u) >> w);
  }
  sa = (sa * t) >> w;
  // rotate by j1/2^8 and j2/2^16
  const c1 = T.c1[j1]!;
  const s1 = T.s1[j1]!;
  const c2 = T.c2[j2]!;
  const s2 = T.s2[j2]!;
  const cc = (c1 * c2 - s1 * s2) >> w;
  const ss = (c1 * s2 + s1 * c2) >> w;
  let cs = (cc * ca - ss * sa) >> w;
  let sn = (cc * sa + ss * ca) >> w;
  if (neg) sn = -sn;
  const d = BigInt(W - F);
  cs >>= d;
  sn >>= d;
  return fx.rotateQuadrant(sn, cs, q);
}

/** e^z as [w, k]: e^z = (w / 2^F) 2^k, full relative precision whatever Re z. */
export function cexpSplitFx(z: FxC, F: number): [FxC, number] {
  const [m, k] = expSplitFx(z.re, F);
  if (z.im === 0n) return [{ re: m, im: 0n }, k];
  const [s, c] = sinCosFx(z.im, F);
  const f = BigInt(F);
  return [{ re: (m * c) >> f, im: (m * s) >> f }, k];
}

/**
 * log a for a > 0 at F bits: a = a' 2^e, a' in [1, 2); y0 = log a' in double precision;
 * log a' = y0 + log1p(a' e^{-y0} - 1) with the argument of log1p below 2^-45.
 */
export function logFx(a: bigint, F: number): bigint {
  if (a <= 0n) throw new ModvetError('domain', 'log', 'argument must be positive');
  const W = F + 12;
  const w = BigInt(W);
  const e = bitLengthApprox(a) - 1 - F;
  const aW = fx.rescale(a, F + e, W);
  const y0 = Math.log(toDouble(aW, W));
  const Y0 = fx.fromFloat(y0, W);
  const [m, k] = expSplitFx(-Y0, W);
  const inv = k >= 0 ? m << BigInt(k) : m >> BigInt(-k);
  const u = ((aW * inv) >> w) - fx.one(W);
  // log1p(u) = u - u^2/2 + u^3/3 - ... (DLMF 4.6.1)
  let p = u;
  let sum = u;
  for (let n = 2n; p > 1n || p < -1n; n++) {
    p = (p * u) >> w;
    sum += n % 2n === 0n ? -(p / n) : p / n;
  }
  return (Y0 + sum + BigInt(e) * fx.ln2(W)) >> 12n;
}

// ---------------------------------------------------------------------------
// Cached constants and small complex kernels

const cached = fx.cachedConstant;
/** log(2 pi) */
const log2Pi = cached((F) => fx.log(2n * fx.pi(F), F));
/** log(pi) */
const logPi = cached((F) => fx.log(fx.pi(F), F));

/**
 * Principal log z (z != 0) at F bits, arg in (-pi, pi] up to rounding. Method: L0 from
 * double precision, then log z = L0 + log1p(z e^{-L0} - 1) with |z e^{-L0} - 1| < 2^-45,
 * so one complex exponential and a few terms of log1p replace a log and an atan2.
 */
export function clogFx(z: FxC, F: number): FxC {
  if (z.re === 0n && z.im === 0n) throw new ModvetError('pole', 'log', 'log(0) is undefined');
  const W = F + 12;
  const w = BigInt(W);
  const s = Math.max(bitLengthApprox(z.re), bitLengthApprox(z.im)) - 1 - F; // |z| ~ 2^s
  const zr = fx.rescale(z.re, F + s, W);
  const zi = fx.rescale(z.im, F + s, W);
  const xr = toDouble(zr, W);
  const xi = toDouble(zi, W);
  const l0 = 0.5 * Math.log(xr * xr + xi * xi);
  const t0 = Math.atan2(xi, xr);
  const L0re = fx.fromFloat(l0, W);
  const L0im = fx.fromFloat(t0, W);
  const [m, k] = expSplitFx(-L0re, W);
  const [sn, cs] = sinCosFx(L0im, W);
  // e^{-L0} = e^{-l0} (cos t0 - i sin t0); |k| <= 2 since |l0| < log 3
  let er = (m * cs) >> w;
  let ei = -(m * sn) >> w;
  if (k > 0) {
    er <<= BigInt(k);
    ei <<= BigInt(k);
  } else if (k < 0) {
    er >>= BigInt(-k);
    ei >>= BigInt(-k);
  }
  const o = fx.one(W);
  const ur = ((zr * er - zi * ei) >> w) - o;
  const ui = (zr * ei + zi * er) >> w;
  // log1p(u) = u - u^2/2 + u^3/3 - ... (DLMF 4.6.1)
  let pr = ur;
  let pi = ui;
  let sr = ur;
  let si = ui;
  for (let n = 2n; pr > 1n || pr < -1n || pi > 1n || pi < -1n; n++) {
    const t = (pr * ur - pi * ui) >> w;
    pi = (pr * ui + pi * ur) >> w;
    pr = t;
    if (n % 2n === 0n) {
      sr -= pr / n;
      si -= pi / n;
    } else {
      sr += pr / n;
      si += pi / n;
    }
  }
  const re = L0re + sr + BigInt(s) * fx.ln2(W);
  const im = L0im + si;
  return { re: re >> 12n, im: im >> 12n };
}

// ---------------------------------------------------------------------------
// The shifted Stirling evaluation (complex)

/** Bits by which the nearest non-positive integer is close: -log2 dist, 0 when dist >= 1. */
function poleBits(re: bigint, im: bigint, F: number): number {
  const o = fx.one(F);
  let n = fx.roundDiv(re, o);
  if (n > 0n) n = 0n;
  const dr = fx.toFloat(re - n * o, F);
  const di = fx.toFloat(im, F);
  const d = Math.hypot(dr, di);
  if (d === 0) throw new ModvetError('pole', 'Gamma', `Gamma has a pole at ${n}`);
  return d >= 1 ? 0 : Math.ceil(-Math.log2(d));
}

interface Shifted {
  /** log Gamma(w) at W bits, w = z + N */
  L: FxC;
  /** prod_{k<N} (z + k) = P * 2^Pexp, P at W bits with |P| in [1, 2^64) */
  P: FxC;
  Pexp: number;
  N: number;
}

/** Normalise a running product so its larger part has between W + 1 and W + 64 bits. */
function normalise(P: FxC, W: number): [FxC, number] {
  const L = Math.max(bitLengthApprox(P.re), bitLengthApprox(P.im));
  if (L > W + 64) {
    const s = L - W - 1;
    const b = BigInt(s);
    return [{ re: P.re >> b, im: P.im >> b }, s];
  }
  if (L <= W) {
    const s = W + 1 - L;
    const b = BigInt(s);
    return [{ re: P.re << b, im: P.im << b }, -s];
  }
  return [P, 0];
}

/** Stirling at w = z + N (z at W bits, exact), with the product of the shift. */
function shiftedStirling(z: FxC, W: number, target: number): Shifted {
  const w = BigInt(W);
  const o = fx.one(W);
  const x = toDouble(z.re, W);
  const y = toDouble(z.im, W);
  const R = radiusFor(target);
  // shift so that the effective radius |w| cos(ph w / 2) >= R: the remainder bound
  // (DLMF 5.11(ii)) behaves as that of a real argument of this size, since
  // |w|^{-2K} sec^{2K}(ph w/2) = (|w| cos(ph w/2))^{-2K}; r_eff^2 = |w| (|w| + Re w) / 2.
  // (Large |Im z| needs no shift at all, even with Re z < 0.)
  let N = 0;
  if (Math.abs(y) < R) N = Math.max(0, Math.ceil(Math.sqrt(R * R - y * y) - x));
  for (;;) {
    const u = x + N;
    const r = Math.hypot(u, y);
    if (r * (r + u) >= 2 * R * R) break;
    N += Math.max(1, Math.ceil((2 * R * R - r * (r + u)) / (4 * r)));
  }
  // product of (z + k), k < N, in pairs f_k = (z+k)(z+k+1), f_{k+2} = f_k + 4z + 4k + 6
  let P: FxC = { re: o, im: 0n };
  let Pexp = 0;
  if (N >= 2) {
    // f_0 = z^2 + z exactly at 2W bits, rounded once
    let fr = ((z.re * z.re - z.im * z.im) >> w) + z.re;
    let fi = ((2n * z.re * z.im) >> w) + z.im;
    let dr = 4n * z.re + 6n * o;
    const di = 4n * z.im;
    const eight = 8n * o;
    P = { re: fr, im: fi };
    for (let k = 2; k + 1 < N; k += 2) {
      fr += dr;
      fi += di;
      dr += eight;
      P = { re: (P.re * fr - P.im * fi) >> w, im: (P.re * fi + P.im * fr) >> w };
      if ((k & 7) === 0) {
        const [Q, s] = normalise(P, W);
        P = Q;
        Pexp += s;
      }
    }
  }
  if (N % 2 === 1) {
    const lr = z.re + BigInt(N - 1) * o;
    P = { re: (P.re * lr - P.im * z.im) >> w, im: (P.re * z.im + P.im * lr) >> w };
  }
  {
    const [Q, s] = normalise(P, W);
    P = Q;
    Pexp += s;
  }
  const wr = z.re + BigInt(N) * o;
  const wi = z.im;
  const xw = x + N;
  const rw = Math.hypot(xw, y);
  const K = stirlingTerms(rw, xw / rw, target);
  if (!Number.isFinite(K)) throw new ModvetError('convergence', 'Gamma', 'Stirling series cannot reach the precision');
  // t = 1/w, v = t^2
  const den = wr * wr + wi * wi;
  const tr = (wr << (2n * w)) / den;
  const ti = -(wi << (2n * w)) / den;
  let Sr = 0n;
  let Si = 0n;
  if (K >= 2) {
    const c = stirlingCoeffs(K, W);
    // p(v) = sum_{j=0}^{K-2} c_{j+1} v^j at v = 1/w^2, evaluated as sum d_j u^j with
    // u = 4^e v, d_j = c_{j+1} / 4^{e j}, 2^e <= |w|: |u| <= 1 and the d_j (unlike the c_j,
    // which grow like (2j)!) stay below 1, so every number has about W bits
    const e = Math.max(0, Math.floor(Math.log2(rw)) - 1);
    const e2 = BigInt(2 * e);
    const ur = (tr * tr - ti * ti) >> (w - e2);
    const ui = (2n * tr * ti) >> (w - e2);
    // second-order Horner for a real polynomial: b_j = d_j + 2 Re u b_{j+1} - |u|^2 b_{j+2},
    // p = d_0 + b_1 u - |u|^2 b_2
    const a2 = 2n * ur;
    const beta = (ur * ur + ui * ui) >> w;
    let b1 = 0n;
    let b2 = 0n;
    for (let j = K - 2; j >= 1; j--) {
      const b = (c[j + 1]! >> (e2 * BigInt(j))) + ((a2 * b1 - beta * b2) >> w);
      b2 = b1;
      b1 = b;
    }
    const pr = c[1]! + ((b1 * ur - beta * b2) >> w);
    const pi = (b1 * ui) >> w;
    Sr = (pr * tr - pi * ti) >> w;
    Si = (pr * ti + pi * tr) >> w;
  }
  // (w - 1/2) log w - w + log(2 pi)/2 + S (DLMF 5.11.1)
  const lw = clogFx({ re: wr, im: wi }, W);
  const hr = wr - (o >> 1n);
  const Lr = ((hr * lw.re - wi * lw.im) >> w) - wr + (log2Pi(W) >> 1n) + Sr;
  const Li = ((hr * lw.im + wi * lw.re) >> w) - wi + Si;
  return { L: { re: Lr, im: Li }, P, Pexp, N };
}

/** sum_{k<N} arg(z + k) in double precision (for the branch of the log of the product). */
function argSum(z: FxC, W: number, N: number): number {
  const x = fx.toFloat(z.re, W);
  const y = fx.toFloat(z.im, W);
  if (y === 0) {
    // on the cut: each negative factor contributes pi (limit from above)
    const neg = x < 0 ? Math.min(N, Math.ceil(-x)) : 0;
    return neg * Math.PI;
  }
  let s = 0;
  for (let k = 0; k < N; k++) s += Math.atan2(y, x + k);
  return s;
}

/** log of the product as a continuous sum of principal logs: Log P + 2 pi i m. */
function logProduct(sh: Shifted, z: FxC, W: number): FxC {
  if (sh.N === 0) return { re: 0n, im: 0n };
  const lp = clogFx(sh.P, W);
  const m = Math.round((argSum(z, W, sh.N) - fx.toFloat(lp.im, W)) / TWO_PI);
  return { re: lp.re + BigInt(sh.Pexp) * fx.ln2(W), im: lp.im + BigInt(m) * 2n * fx.pi(W) };
}

/**
 * Internal guard bits for a kernel call at target precision F; F + guard is rounded up to a
 * multiple of 32 so that the per-precision caches (Stirling coefficients, tables) see few keys.
 */
function guardBits(z: FxC, F: number): number {
  const x = Math.abs(fx.toFloat(z.re, F));
  const y = Math.abs(fx.toFloat(z.im, F));
  const G = 10 + Math.ceil(Math.log2(4 + x + y)) + poleBits(z.re, z.im, F);
  return Math.ceil((F + G) / 32) * 32 - F;
}

/**
 * log Gamma(z) for z at F bits (taken as exact), to absolute error about 2^-F, on the
 * branch of the module header (on the cut: the limit from above). Throws 'pole' at
 * z = 0, -1, -2, ... For Re z < REFLECT_BELOW it uses the reflection formula.
 */
export function logGammaFx(z: FxC, F: number): FxC {
  const G = guardBits(z, F);
  const W = F + G;
  const zw: FxC = { re: z.re << BigInt(G), im: z.im << BigInt(G) };
  const r = logGammaW(zw, W, F + 4);
  return { re: r.re >> BigInt(G), im: r.im >> BigInt(G) };
}

function logGammaW(z: FxC, W: number, target: number): FxC {
  const o = fx.one(W);
  if (z.re < BigInt(REFLECT_BELOW) * o) {
    if (z.im < 0n) {
      const r = reflectedUpper({ re: z.re, im: -z.im }, W, target);
      return { re: r.re, im: -r.im };
    }
    return reflectedUpper(z, W, target);
  }
  const sh = shiftedStirling(z, W, target);
  const lp = logProduct(sh, z, W);
  return { re: sh.L.re - lp.re, im: sh.L.im - lp.im };
}

/**
 * log Gamma(z) = log 2 pi - i pi/2 + i pi z - Log(1 - e^{2 pi i z}) - log Gamma(1 - z) for
 * Im z >= 0 (DLMF 5.5.3, continuous form; see the header). |e^{2 pi i z}| <= 1 keeps 1 - q
 * off the cut of Log; its smallness near a pole is covered by the pole guard bits.
 */
function reflectedUpper(z: FxC, W: number, target: number): FxC {
  const o = fx.one(W);
  const pi = fx.pi(W);
  const n = fx.roundDiv(z.re, o);
  const theta = z.re - n * o; // |theta| <= 1/2, exact
  const twoPi = 2n * pi;
  const w = BigInt(W);
  const [q, k] = cexpSplitFx({ re: -((twoPi * z.im) >> w), im: (twoPi * theta) >> w }, W);
  const qr = k >= 0 ? q.re << BigInt(k) : q.re >> BigInt(-k);
  const qi = k >= 0 ? q.im << BigInt(k) : q.im >> BigInt(-k);
  const l1q = clogFx({ re: o - qr, im: -qi }, W);
  const oneMinus: FxC = { re: o - z.re, im: -z.im };
  const sh = shiftedStirling(oneMinus, W, target);
  const lp = logProduct(sh, oneMinus, W);
  const lg1 = { re: sh.L.re - lp.re, im: sh.L.im - lp.im };
  return {
    re: log2Pi(W) - ((pi * z.im) >> w) - l1q.re - lg1.re,
    im: ((pi * z.re) >> w) - (pi >> 1n) - l1q.im - lg1.im,
  };
}

/**
 * Gamma(z) for z at F bits (taken as exact) as [m, k]: Gamma(z) = (m / 2^F) 2^k with
 * |m| / 2^F between 1/4 and 2, relative error about 2^-F. Throws 'pole' at z = 0, -1, -2, ...
 */
export function gammaFx(z: FxC, F: number): [FxC, number] {
  const G = guardBits(z, F);
  const W = F + G;
  const zw: FxC = { re: z.re << BigInt(G), im: z.im << BigInt(G) };
  let L: FxC;
  let P: FxC | null = null;
  let Pexp = 0;
  if (zw.re < BigInt(REFLECT_BELOW) * fx.one(W)) {
    L = logGammaW(zw, W, F + 4);
  } else {
    const sh = shiftedStirling(zw, W, F + 4);
    L = sh.L;
    if (sh.N > 0) {
      P = sh.P;
      Pexp = sh.Pexp;
    }
  }
  if (Math.abs(fx.toFloat(L.re, W)) > 2 ** 48) {
    throw new ModvetError('overflow', 'Gamma', 'the result is outside the exponent range');
  }
  let [m, k] = cexpSplitFx(L, W);
  if (P !== null) {
    // m / P with P normalised to [1, 2) so the quotient keeps W bits; then drop the guard
    const s = Math.max(bitLengthApprox(P.re), bitLengthApprox(P.im)) - (W + 1);
    const Pn: FxC = { re: P.re >> BigInt(s), im: P.im >> BigInt(s) };
    const den = Pn.re * Pn.re + Pn.im * Pn.im;
    const w = BigInt(W);
    m = { re: ((m.re * Pn.re + m.im * Pn.im) << w) / den, im: ((m.im * Pn.re - m.re * Pn.im) << w) / den };
    k -= Pexp + s;
  }
  return [{ re: m.re >> BigInt(G), im: m.im >> BigInt(G) }, k];
}

// ---------------------------------------------------------------------------
// Real arguments: the same scheme on single bigints (half the work or less).

interface ShiftedReal {
  L: bigint; // log Gamma(x + N)
  P: bigint; // prod (x + k) = P 2^Pexp, P at W bits with |P| in [1, 2^64)
  Pexp: number;
  neg: number; // number of negative factors
}

function normaliseReal(P: bigint, W: number): [bigint, number] {
  const L = bitLengthApprox(P);
  if (L > W + 64) return [P >> BigInt(L - W - 1), L - W - 1];
  if (L <= W) return [P << BigInt(W + 1 - L), -(W + 1 - L)];
  return [P, 0];
}

function shiftedStirlingReal(x: bigint, W: number, target: number): ShiftedReal {
  const w = BigInt(W);
  const o = fx.one(W);
  const xd = toDouble(x, W);
  const R = radiusFor(target);
  const N = Math.max(0, Math.ceil(R - xd));
  let P = o;
  let Pexp = 0;
  if (N >= 2) {
    let f = ((x * x) >> w) + x;
    let d = 4n * x + 6n * o;
    const eight = 8n * o;
    P = f;
    for (let k = 2; k + 1 < N; k += 2) {
      f += d;
      d += eight;
      P = (P * f) >> w;
      if ((k & 7) === 0) {
        const [Q, s] = normaliseReal(P, W);
        P = Q;
        Pexp += s;
      }
    }
  }
  if (N % 2 === 1) P = (P * (x + BigInt(N - 1) * o)) >> w;
  {
    const [Q, s] = normaliseReal(P, W);
    P = Q;
    Pexp += s;
  }
  const neg = xd < 0 ? Math.min(N, Math.ceil(-xd)) : 0;
  const wr = x + BigInt(N) * o;
  const K = stirlingTerms(xd + N, 1, target);
  let S = 0n;
  const t = (o << w) / wr;
  if (K >= 2) {
    // Horner in u = 4^e / w^2 <= 1 on c_{j+1} / 4^{e j} (as in the complex case)
    const c = stirlingCoeffs(K, W);
    const e = Math.max(0, Math.floor(Math.log2(xd + N)) - 1);
    const e2 = BigInt(2 * e);
    const u = (t * t) >> (w - e2);
    let b = c[K - 1]! >> (e2 * BigInt(K - 2));
    for (let j = K - 2; j >= 1; j--) b = (c[j]! >> (e2 * BigInt(j - 1))) + ((b * u) >> w);
    S = (b * t) >> w;
  }
  const lw = logFx(wr, W);
  const L = (((wr - (o >> 1n)) * lw) >> w) - wr + (log2Pi(W) >> 1n) + S;
  return { L, P, Pexp, neg };
}

interface RealLogGamma {
  /** log |Gamma(x)| at W bits */
  re: bigint;
  /** Im log Gamma(x + i0) / pi, an integer */
  piMultiple: number;
  /** sign of Gamma(x) */
  sign: 1 | -1;
}

function logGammaRealW(x: bigint, W: number, target: number): RealLogGamma {
  const o = fx.one(W);
  if (x < BigInt(REFLECT_BELOW) * o) {
    // log|Gamma(x)| = log pi - log|sin pi x| - log Gamma(1 - x) (DLMF 5.5.3)
    const n = fx.roundDiv(x, o);
    const theta = x - n * o;
    const w = BigInt(W);
    const [s] = sinCosFx((fx.pi(W) * theta) >> w, W);
    const lg1 = logGammaRealW(o - x, W, target).re;
    const lpi = logPi(W);
    const sign = (n % 2n === 0n) === theta > 0n ? 1 : -1;
    const fl = Number(n) + (theta < 0n ? -1 : 0);
    return { re: lpi - logFx(s < 0n ? -s : s, W) - lg1, piMultiple: fl, sign };
  }
  const sh = shiftedStirlingReal(x, W, target);
  const lp = logFx(sh.P < 0n ? -sh.P : sh.P, W) + BigInt(sh.Pexp) * fx.ln2(W);
  return { re: sh.L - lp, piMultiple: -sh.neg, sign: sh.neg % 2 === 0 ? 1 : -1 };
}

/** log |Gamma(x)| for real x at F bits, with Im log Gamma(x + i0) = pi * piMultiple. */
export function logGammaRealFx(x: bigint, F: number): { re: bigint; piMultiple: number; sign: 1 | -1 } {
  const G = guardBits({ re: x, im: 0n }, F);
  const r = logGammaRealW(x << BigInt(G), F + G, F + 4);
  return { re: r.re >> BigInt(G), piMultiple: r.piMultiple, sign: r.sign };
}

/** Gamma(x) for real x at F bits as [m, k], Gamma(x) = (m / 2^F) 2^k, relative error ~2^-F. */
export function gammaRealFx(x: bigint, F: number): [bigint, number] {
  const G = guardBits({ re: x, im: 0n }, F);
  const W = F + G;
  const xw = x << BigInt(G);
  let L: bigint;
  let P = 0n;
  let Pexp = 0;
  let sign = 1;
  if (xw < BigInt(REFLECT_BELOW) * fx.one(W)) {
    const r = logGammaRealW(xw, W, F + 4);
    L = r.re;
    sign = r.sign;
  } else {
    const sh = shiftedStirlingReal(xw, W, F + 4);
    L = sh.L;
    P = sh.P;
    Pexp = sh.Pexp;
  }
  if (Math.abs(fx.toFloat(L, W)) > 2 ** 48) {
    throw new ModvetError('overflow', 'Gamma', 'the result is outside the exponent range');
  }
  let [m, k] = expSplitFx(L, W);
  if (P !== 0n) {
    const s = bitLengthApprox(P) - (W + 1);
    m = (m << BigInt(W)) / (P >> BigInt(s));
    k -= Pexp + s;
  }
  if (sign < 0) m = -m;
  return [m >> BigInt(G), k];
}

// ---------------------------------------------------------------------------
// A double-precision estimate (for choosing precisions and methods elsewhere)

/** log |Gamma(x + iy)| to about 1e-6 absolute (Stirling after a shift; 5.5.3 for x < 1/2). */
export function logAbsGammaDouble(x: number, y: number): number {
  if (x < 0.5) {
    // |Gamma(z)| = pi / (|sin pi z| |Gamma(1 - z)|), |sin pi z|^2 = sin^2 pi x + sinh^2 pi y
    const py = Math.PI * Math.abs(y);
    const ls = py > 20 ? py - Math.LN2 : 0.5 * Math.log(Math.sin(Math.PI * x) ** 2 + Math.sinh(py) ** 2);
    return Math.log(Math.PI) - ls - logAbsGammaDouble(1 - x, -y);
  }
  let shift = 0;
  while (x < 10) {
    shift += 0.5 * Math.log(x * x + y * y);
    x += 1;
  }
  // Re[(z - 1/2) log z - z + log(2 pi)/2 + 1/(12 z)] (DLMF 5.11.1)
  const r2 = x * x + y * y;
  return (x - 0.5) * 0.5 * Math.log(r2) - y * Math.atan2(y, x) - x + 0.9189385332046728 + x / (12 * r2) - shift;
}

// ---------------------------------------------------------------------------
// Public functions on Complex

const LOG2_10 = 3.321928094887362;

/** log2 of a nonzero Decimal's magnitude, roughly (to within 1). */
function log2Dec(d: Decimal): number {
  const v = Math.abs(d.toNumber());
  if (v > 0 && Number.isFinite(v)) return Math.log2(v);
  return d.e * LOG2_10;
}

/** Throw 'pole' at non-positive integers; else the bits the input needs near a pole. */
function inputPoleBits(z: Complex, who: string): number {
  const r = z.re.round();
  if (r.gt(0)) return 0;
  if (z.im.isZero() && z.re.eq(r)) {
    throw new ModvetError('pole', who, `${who} has a pole at z = ${r.toString()}`);
  }
  // -log2 |z - r| from the larger of the two parts (within half a bit)
  const dr = z.re.minus(r);
  const l = Math.max(dr.isZero() ? -Infinity : log2Dec(dr), z.im.isZero() ? -Infinity : log2Dec(z.im));
  return Math.max(0, Math.ceil(-l));
}

/** Bits for the input: the result's sensitivity |psi(z)| ~ log |z| costs log2 of it. */
function inputBits(z: Complex, who: string): number {
  const a = Math.abs(z.re.toNumber()) + Math.abs(z.im.toNumber());
  return bitsFor(Decimal.precision) + 10 + Math.ceil(Math.log2(2 + Math.log(2 + a))) + inputPoleBits(z, who);
}

function magnitudeLimit(z: Complex, who: string, limit: number): void {
  if (z.re.abs().gt(limit) || z.im.abs().gt(limit)) {
    throw new ModvetError('overflow', who, `argument ${z.toString()} is too large`);
  }
}

/**
 * The Decimal nearest (m / 2^F) 2^k at the current precision. For |k| beyond a few
 * thousand the power of 2 is taken in decimal arithmetic with guard digits: fromFixed would
 * build integers of |k| bits or 10^|k| (milliseconds, or beyond BigInt's size, for
 * |Gamma(0.5 + 10^6 i)| ~ e^{-1.6 10^6}). Throws 'overflow' outside decimal.js's range.
 */
export function splitToDecimal(m: bigint, F: number, k: number, who: string): Decimal {
  if (Math.abs(k) <= 4000) return fromFixed(m, F - k);
  const P = Decimal.precision;
  const d = withGuard(10, () => fromFixed(m, F).times(new Decimal(2).pow(k))).toSD(P);
  if (!d.isFinite() || (d.isZero() && m !== 0n)) {
    throw new ModvetError('overflow', who, 'the result is outside the exponent range');
  }
  return d;
}

/** splitToDecimal for both parts of a complex value. */
export function splitToComplex(c: FxC, F: number, k: number, who: string): Complex {
  if (Math.abs(k) <= 4000) return toComplex(c, F, k);
  return new Complex(splitToDecimal(c.re, F, k, who), splitToDecimal(c.im, F, k, who));
}

/** Exact arguments get exact formulas up to this size. */
const EXACT_MAX = 300;
const factorials: bigint[] = [1n];
function factorial(n: number): bigint {
  for (let k = factorials.length; k <= n; k++) factorials.push(factorials[k - 1]! * BigInt(k));
  return factorials[n]!;
}
const sqrtPiCache = new Map<number, bigint>();

/**
 * Gamma at the integers 1..EXACT_MAX and the half-integers of size up to EXACT_MAX, from
 * Gamma(n) = (n-1)! (DLMF 5.4.1), Gamma(n + 1/2) = (2n)! sqrt(pi) / (4^n n!) and
 * Gamma(1/2 - n) = (-4)^n n! sqrt(pi) / (2n)! (DLMF 5.4.6 with 5.5.1); else null.
 */
function gammaExact(x: Decimal): Decimal | null {
  if (x.abs().gt(EXACT_MAX)) return null;
  const P = Decimal.precision;
  if (x.isInteger()) return x.isPositive() ? new Decimal(factorial(x.toNumber() - 1).toString()).toSD(P) : null;
  const t = x.times(2);
  if (!t.isInteger()) return null;
  const F = bitsFor(P) + 12;
  let sp = sqrtPiCache.get(F);
  if (sp === undefined) {
    sp = fx.sqrt(fx.pi(F), F);
    sqrtPiCache.set(F, sp);
  }
  // x = n + 1/2 (n >= 0) or 1/2 - n (n >= 1): a rational times sqrt(pi), one rounding
  const n = Math.abs(x.minus(0.5).toNumber());
  const f2n = factorial(2 * n);
  const fn = factorial(n);
  const p4 = 1n << BigInt(2 * n);
  const [num, den] = x.isPositive() ? [f2n, p4 * fn] : [(n % 2 === 0 ? 1n : -1n) * p4 * fn, f2n];
  const S = Math.max(0, fx.bitLength(den) - fx.bitLength(num) + 2); // keep F significant bits
  return fromFixed(((sp * num) << BigInt(S)) / den, F + S);
}

/** Gamma(z) at the current precision; ModvetError 'pole' at z = 0, -1, -2, ... */
export function gamma(z: Complex): Complex {
  const F = inputBits(z, 'Gamma');
  magnitudeLimit(z, 'Gamma', 1e14);
  if (z.im.isZero()) {
    const exact = gammaExact(z.re);
    if (exact !== null) return new Complex(exact, 0);
    const [m, k] = gammaRealFx(toFixed(z.re, F), F);
    return new Complex(splitToDecimal(m, F, k, 'Gamma'), 0);
  }
  const [m, k] = gammaFx({ re: toFixed(z.re, F), im: toFixed(z.im, F) }, F);
  return splitToComplex(m, F, k, 'Gamma');
}

/**
 * log Gamma(z) at the current precision on the branch of the module header; 'pole' at
 * z = 0, -1, -2, ... Where the value is small (near z = 1, 2) the absolute error of the
 * kernel is compared with it and the evaluation repeated with the bits that were lost.
 */
export function logGamma(z: Complex): Complex {
  magnitudeLimit(z, 'logGamma', 1e250);
  const need = bitsFor(Decimal.precision) + 4;
  if (z.im.isZero() && (z.re.eq(1) || z.re.eq(2))) return Complex.ZERO; // DLMF 5.4.1
  let F = inputBits(z, 'logGamma');
  for (;;) {
    if (F > MAX_BITS) throw new ModvetError('precision', 'logGamma', 'cancellation too severe to resolve');
    const zr = toFixed(z.re, F);
    const zi = toFixed(z.im, F);
    let re: bigint;
    let im: bigint;
    if (zi === 0n) {
      const r = logGammaRealFx(zr, F);
      re = r.re;
      im = BigInt(r.piMultiple) * fx.pi(F);
      // Im z tiny but nonzero and negative: the limit from below is the conjugate
      if (z.im.isNegative()) im = -im;
    } else {
      ({ re, im } = logGammaFx({ re: zr, im: zi }, F));
    }
    // the kernel's error is a few units of 2^-F: the result must exceed it by `need` bits
    const mag = Math.max(bitLengthApprox(re), bitLengthApprox(im)) - F;
    const lost = need + 4 - (F + mag);
    if (lost <= 0) return new Complex(fromFixed(re, F), im === 0n ? 0 : fromFixed(im, F));
    F += lost + 8;
  }
}
