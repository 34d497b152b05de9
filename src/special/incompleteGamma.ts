/**
 * The upper incomplete gamma function Gamma(a, x) = int_x^inf t^{a-1} e^{-t} dt (DLMF 8.2.2)
 * for complex a and real x > 0 (x <= 0 throws ModvetError('domain', 'Gamma(a, x)')).
 * Principal branch: x^a = e^{a log x} with log x real. Finite for every a, including
 * a = 0, -1, -2, ... where Gamma(a) has poles.
 *
 * Everything is computed for the scaled function f(a, x) = e^x x^{-a} Gamma(a, x), which is
 * of order 1/(x + |a|) for large x, and multiplied by e^{-x} x^a at the end. Methods:
 * - Continued fraction, the even contraction of DLMF 8.9.2 (a J-fraction):
 *     f = 1/(b_0 + c_1/(b_1 + c_2/(b_2 + ...))),  b_k = x + 2k + 1 - a,  c_k = -k (k - a).
 *   The number of steps n is found first in double precision from the Wallis recurrence,
 *   |K_k - K_{k-1}| = |c_1 ... c_k| / |B_k B_{k-1}| (a geometric tail allowance added); then
 *   the n-th convergent is evaluated exactly once, backwards, as the three-term recurrence
 *   P_k = b_k P_{k+1} + c_{k+1} P_{k+2}, f = P_1 / P_0 (stable; 6 real multiplications a
 *   step, a P_{k+1} being shared between two steps).
 * - Series for small x: f = e^x x^{-a} Gamma(a) - sum_{k>=0} x^k / (a)_{k+1}
 *   (DLMF 8.2.1 with 8.7.1 and 8.5.1), the sum by Horner's rule on a numerator/denominator
 *   pair. The cancellation between the two parts is estimated beforehand in double
 *   precision (log |Gamma(a)| and a short continued fraction for |f|), then measured on
 *   the result (largest part against the result); if the estimate fell short the
 *   evaluation is repeated with the bits that were lost. log Gamma(a) is kept for the
 *   last few values of a (lattice sums call with a = s and 1 - s and many x).
 * - a = -n, n = 0, 1, 2, ... exactly: f_0 = e^x E_1(x) with E_1 from DLMF 6.6.2 and
 *   f_k = (1 - x f_{k-1}) / k, the scaled form of the recurrence DLMF 8.8.2.
 * The method is chosen by estimated cost (CF steps against series terms plus Gamma(a)); the
 * fraction only for x >= Re a - 1, since below it cancels (the value is then dominated by
 * Gamma(a), which the series path supplies without cancellation).
 *
 * gammaUpperScaled returns f itself: a sum of x^{-a} Gamma(a, x) over many x is then
 * e^{-x} f with no complex power. gammaUpperScaledFx is the fixed-point kernel of both.
 *
 *   withDigits(30, () => gammaUpper(Complex.of(1), new Decimal(2)).toString())   // e^-2
 */
import { Decimal } from 'decimal.js';
import { Complex } from '../numeric/complex.js';
import { ModvetError } from '../numeric/errors.js';
import * as fx from '../numeric/fixed.js';
import { type FxC } from '../numeric/fixedComplex.js';
import { toFixed } from '../numeric/convert.js';
import { bitsFor } from '../numeric/precision.js';
import { bitLengthApprox, cexpSplitFx, expSplitFx, logAbsGammaDouble, logFx, logGammaFx, splitToComplex } from './gamma.js';

const WHO = 'Gamma(a, x)';
/** Largest internal precision a retry may reach before giving up. */
const MAX_BITS = 100_000;
/** Relative cost of Gamma(a) in units of one series term (measured at 50-100 digits). */
const GAMMA_COST_TERMS = 60;
/** Largest number of continued-fraction steps ever attempted. */
const MAX_CF_STEPS = 200_000;

/** A scaled value: (m / 2^F) * 2^e. */
export interface SplitFx {
  m: FxC;
  e: number;
}

// ---------------------------------------------------------------------------
// Step counts in double precision

/**
 * Steps n of the J-fraction for a relative error below 2^-bits, from the Wallis recurrence
 * in double precision (rescaled): rel_k = |c_1 ... c_k| / (|B_{k-1}| |A_k|). Returns
 * Infinity when more than `cap` steps would be needed.
 */
export function cfSteps(ar: number, ai: number, x: number, bits: number, cap: number): number {
  const w = new WallisDouble(ar, ai, x);
  let lc = 0; // log2 |c_1 ... c_k| (up to the factors still in cprod)
  let cprod = 1; // |c_j|^2 since the last logarithm
  let prevRel = Infinity;
  for (let k = 1; k <= cap; k++) {
    const c2 = w.partialNumerator2(k);
    if (c2 === 0) return k; // a = k exactly: the fraction terminates
    cprod *= c2;
    const B1r = w.B1r;
    const B1i = w.B1i;
    w.step(k);
    if ((k & 3) === 0) {
      // every 4 steps: the relative size of the last difference, and the tail of a
      // geometric series with the observed ratio 2^{rho} per step
      lc += 0.5 * Math.log2(cprod);
      cprod = 1;
      const rel = lc - 0.5 * (Math.log2(B1r * B1r + B1i * B1i) + Math.log2(w.A1r * w.A1r + w.A1i * w.A1i)) - 2 * w.scale;
      const rho = (rel - prevRel) / 4;
      if (rho < -0.02 && rel - Math.log2(1 - 2 ** rho) < -bits) return k + 1;
      prevRel = rel;
    }
    w.rescale();
  }
  return Infinity;
}

/**
 * The Wallis recurrence of the J-fraction in double precision:
 * A_k = b_k A_{k-1} + c_k A_{k-2} (B likewise) with b_k = x + 2k + 1 - a, c_k = -k (k - a);
 * A_{-1} = 1, A_0 = b_0, B_{-1} = 0, B_0 = 1. `scale` counts the factors 2^-400 applied.
 */
class WallisDouble {
  A2r = 1;
  A2i = 0;
  A1r: number;
  A1i: number;
  B2r = 0;
  B2i = 0;
  B1r = 1;
  B1i = 0;
  scale = 0;
  constructor(
    private readonly ar: number,
    private readonly ai: number,
    private readonly x: number,
  ) {
    this.A1r = x + 1 - ar;
    this.A1i = -ai;
  }
  /** |c_k|^2 */
  partialNumerator2(k: number): number {
    const cr = -k * (k - this.ar);
    const ci = k * this.ai;
    return cr * cr + ci * ci;
  }
  step(k: number): void {
    const br = this.x + 2 * k + 1 - this.ar;
    const ai = this.ai;
    const cr = -k * (k - this.ar);
    const ci = k * ai;
    const Ar = br * this.A1r + ai * this.A1i + cr * this.A2r - ci * this.A2i;
    const Ai = br * this.A1i - ai * this.A1r + cr * this.A2i + ci * this.A2r;
    const Br = br * this.B1r + ai * this.B1i + cr * this.B2r - ci * this.B2i;
    const Bi = br * this.B1i - ai * this.B1r + cr * this.B2i + ci * this.B2r;
    this.A2r = this.A1r;
    this.A2i = this.A1i;
    this.A1r = Ar;
    this.A1i = Ai;
    this.B2r = this.B1r;
    this.B2i = this.B1i;
    this.B1r = Br;
    this.B1i = Bi;
  }
  /** Keeps the numbers inside the double range (the ratios are unchanged). */
  rescale(): void {
    if (Math.abs(this.B1r) + Math.abs(this.B1i) <= 2 ** 400) return;
    const s = 2 ** -400;
    this.A1r *= s;
    this.A1i *= s;
    this.A2r *= s;
    this.A2i *= s;
    this.B1r *= s;
    this.B1i *= s;
    this.B2r *= s;
    this.B2i *= s;
    this.scale += 400;
  }
}

/**
 * Terms K of sum_k x^k / (a)_{k+1} for a tail below 2^-bits times the largest term, and
 * log2 of that largest term; Infinity if more than `cap` terms. (a + k = 0 never occurs:
 * the caller routes a = 0, -1, ... elsewhere.)
 */
function seriesTerms(a: FxC, F: number, x: number, bits: number, cap: number): { K: number; lmax: number } {
  const ar = fx.toFloat(a.re, F);
  const ai = fx.toFloat(a.im, F);
  // the factor a + j nearest 0, from the fixed value (a double may round it to 0)
  const j = Math.round(-ar);
  const nearRe = j >= 0 ? fx.toFloat(a.re + BigInt(j) * fx.one(F), F) : 0;
  const lx = Math.log2(x);
  const absLog2 = (k: number): number => {
    const r = k === j ? nearRe : ar + k;
    return 0.5 * Math.log2(r * r + ai * ai);
  };
  let lt = -absLog2(0); // term k = 0: 1/a
  let lmax = lt;
  for (let k = 1; k <= cap; k++) {
    const r = ar + k;
    const ld = absLog2(k);
    lt += lx - ld;
    if (lt > lmax) lmax = lt;
    const ratio = lx - ld; // log2 of the next ratio is at most this once a + k grows
    if (ratio < -0.05 && r > 0) {
      const tail = lt - Math.log2(1 - 2 ** ratio);
      if (tail < lmax - bits) return { K: k, lmax };
    }
  }
  return { K: Infinity, lmax };
}

// ---------------------------------------------------------------------------
// Fixed-point evaluations of f(a, x) = e^x x^{-a} Gamma(a, x) at W bits

function bitLen(c: FxC): number {
  return Math.max(bitLengthApprox(c.re), bitLengthApprox(c.im));
}

/**
 * Working bits for depth k of a backward recurrence of n steps at W bits: an error made at
 * depth k reaches the result damped by the convergence achieved by then, at least
 * (W - 16) k / n bits for these fractions (their log-error is concave in k, so the linear
 * estimate is pessimistic), so that many bits may be dropped there. Multiples of 32, >= 64.
 */
function depthBits(W: number, k: number, n: number): number {
  const drop = Math.floor(((W - 16) * k) / n / 32) * 32;
  return Math.max(64, W - drop);
}

/**
 * The n-th convergent of the J-fraction, by the backward recurrence (see the header), with
 * the precision of each step from depthBits: the deep steps, which matter least, run on
 * shorter numbers (about half the cost overall).
 */
export function cfScaledFx(a: FxC, x: bigint, W: number, n: number): FxC {
  const real = a.im === 0n;
  // state at Wk bits: P_{k+1} (p1), P_{k+2} (p2), a P_{k+2} (ap2)
  let Wk = depthBits(W, n, n);
  let d = BigInt(W - Wk);
  let wk = BigInt(Wk);
  let ar = a.re >> d;
  let ai = a.im >> d;
  const oW = fx.one(W);
  // P_{n+1} = 1, P_n = b_n
  let p2r = fx.one(Wk);
  let p2i = 0n;
  let ap2r = ar;
  let ap2i = ai;
  let p1r = (x + BigInt(2 * n + 1) * oW - a.re) >> d;
  let p1i = -ai;
  let xtW = x + BigInt(2 * n - 1) * oW; // x + 2k + 1 at W bits, for k = n - 1
  const twoW = 2n * oW;
  for (let k = n - 1; k >= 0; k--) {
    const Wn = depthBits(W, k, n);
    if (Wn !== Wk) {
      // more bits from here on: extend the state exactly
      const up = BigInt(Wn - Wk);
      p1r <<= up;
      p1i <<= up;
      p2r <<= up;
      p2i <<= up;
      ap2r <<= up;
      ap2i <<= up;
      Wk = Wn;
      d = BigInt(W - Wk);
      wk = BigInt(Wk);
      ar = a.re >> d;
      ai = a.im >> d;
    }
    const xt = xtW >> d;
    xtW -= twoW;
    // P_k = (x + 2k + 1) P_{k+1} - a P_{k+1} + (k+1) (a P_{k+2} - (k+1) P_{k+2})
    const K1 = BigInt(k + 1);
    let ap1r: bigint;
    let ap1i: bigint;
    let pr: bigint;
    let pi: bigint;
    if (real) {
      ap1r = (ar * p1r) >> wk;
      ap1i = 0n;
      pr = ((xt * p1r) >> wk) - ap1r + K1 * (ap2r - K1 * p2r);
      pi = 0n;
    } else {
      ap1r = (ar * p1r - ai * p1i) >> wk;
      ap1i = (ar * p1i + ai * p1r) >> wk;
      pr = ((xt * p1r) >> wk) - ap1r + K1 * (ap2r - K1 * p2r);
      pi = ((xt * p1i) >> wk) - ap1i + K1 * (ap2i - K1 * p2i);
    }
    p2r = p1r;
    p2i = p1i;
    ap2r = ap1r;
    ap2i = ap1i;
    p1r = pr;
    p1i = pi;
    if ((k & 7) === 0) {
      // keep the numbers near Wk bits: the ratio is all that matters
      const L = Math.max(bitLengthApprox(p1r), bitLengthApprox(p1i)) - Wk - 64;
      if (L > 0) {
        const s = BigInt(L);
        p1r >>= s;
        p1i >>= s;
        p2r >>= s;
        p2i >>= s;
        ap2r >>= s;
        ap2i >>= s;
      }
    }
  }
  // f = P_1 / P_0 (P_1 is now p2, P_0 is p1), at W bits
  const w = BigInt(W);
  const den = p1r * p1r + p1i * p1i;
  return {
    re: ((p2r * p1r + p2i * p1i) << w) / den,
    im: ((p2i * p1r - p2r * p1i) << w) / den,
  };
}

/**
 * sum_{k=0}^{K} x^k / (a)_{k+1} = (1/a)(1 + x/(a+1)(1 + x/(a+2)(...))) by Horner's rule on
 * T = U/V: U <- V (a + k) + x U, V <- V (a + k), one division at the end.
 */
function seriesSumFx(a: FxC, x: bigint, W: number, K: number): FxC {
  // (a V is formed from a V directly, not from |a + k|^2: near a pole the factor a + k is
  // tiny and must keep its relative precision)
  const w = BigInt(W);
  const o = fx.one(W);
  let ur = o;
  let ui = 0n;
  let vr = o;
  let vi = 0n;
  const real = a.im === 0n;
  for (let k = K; k >= 1; k--) {
    const kb = BigInt(k);
    if (real) {
      vr = ((a.re * vr) >> w) + kb * vr;
      ur = vr + ((x * ur) >> w);
    } else {
      // V (a + k) = a V + k V
      const avr = ((a.re * vr - a.im * vi) >> w) + kb * vr;
      const avi = ((a.re * vi + a.im * vr) >> w) + kb * vi;
      ur = avr + ((x * ur) >> w);
      ui = avi + ((x * ui) >> w);
      vr = avr;
      vi = avi;
    }
    if ((k & 15) === 0) {
      const L = Math.max(bitLengthApprox(vr), bitLengthApprox(vi), bitLengthApprox(ur), bitLengthApprox(ui)) - W - 64;
      if (L > 0) {
        const s = BigInt(L);
        ur >>= s;
        ui >>= s;
        vr >>= s;
        vi >>= s;
      }
    }
  }
  // S = U / (a V)
  const dr = (a.re * vr - a.im * vi) >> w;
  const di = (a.re * vi + a.im * vr) >> w;
  const den = dr * dr + di * di;
  return { re: ((ur * dr + ui * di) << w) / den, im: ((ui * dr - ur * di) << w) / den };
}

/**
 * A few recent log Gamma(a) values for repeated calls with the same a (a lattice sum
 * alternates a = s and a = 1 - s over many x), most recent first.
 */
interface LogGammaEntry {
  re: bigint;
  im: bigint;
  W: number;
  v: FxC;
}
const LG_CACHE_SIZE = 4;
const lgCache: LogGammaEntry[] = [];
function cachedLogGamma(a: FxC, W: number): FxC | null {
  for (const c of lgCache) {
    if (c.W < W) continue;
    const d = BigInt(c.W - W);
    const mask = (1n << d) - 1n;
    // the cached a, moved to W bits, must be exactly a
    if (c.re >> d !== a.re || c.im >> d !== a.im || (c.re & mask) !== 0n || (c.im & mask) !== 0n) continue;
    return { re: c.v.re >> d, im: c.v.im >> d };
  }
  return null;
}
function logGammaCached(a: FxC, W: number): FxC {
  const hit = cachedLogGamma(a, W);
  if (hit !== null) return hit;
  const v = logGammaFx(a, W);
  lgCache.unshift({ re: a.re, im: a.im, W, v });
  if (lgCache.length > LG_CACHE_SIZE) lgCache.pop();
  return v;
}

/**
 * Series path at W bits: f = e^{x - a log x + log Gamma(a)} - S. Returns the value and the
 * bits lost to cancellation (log2 of the largest part over the result).
 */
function seriesScaledFx(a: FxC, x: bigint, W: number, K: number, lmaxTerm: number): { f: FxC; lost: number } {
  const w = BigInt(W);
  const lx = logFx(x, W);
  const lg = logGammaCached(a, W);
  const E: FxC = { re: x - ((a.re * lx) >> w) + lg.re, im: -((a.im * lx) >> w) + lg.im };
  const [g, k] = cexpSplitFx(E, W);
  const G: FxC = k >= 0 ? { re: g.re << BigInt(k), im: g.im << BigInt(k) } : { re: g.re >> BigInt(-k), im: g.im >> BigInt(-k) };
  const S = seriesSumFx(a, x, W, K);
  const f = { re: G.re - S.re, im: G.im - S.im };
  const big = Math.max(k, lmaxTerm, bitLen(S) - W);
  const lf = bitLen(f) - W;
  // a factor a + k close to 0 (a near a pole of Gamma) costs its bits in the Horner products
  return { f, lost: Math.max(0, big - lf) + poleBits(a, W) };
}

/** -log2 of the distance from a to the nearest non-positive integer (0 if at least 1). */
function poleBits(a: FxC, W: number): number {
  const j = Math.round(-fx.toFloat(a.re, W));
  if (j < 0) return 0;
  const d = Math.hypot(fx.toFloat(a.re + BigInt(j) * fx.one(W), W), fx.toFloat(a.im, W));
  return d >= 1 ? 0 : Math.min(MAX_BITS, -Math.log2(d));
}

/**
 * a = -n exactly (n >= 0): f_0 = e^x E_1(x), E_1(x) = -gamma - log x - sum_{k>=1} (-x)^k/(k k!)
 * (DLMF 6.6.2), then f_k = (1 - x f_{k-1}) / k (DLMF 8.8.2 scaled). Real. Returns the value
 * and the bits lost (alternating series, and the subtractions of the recurrence).
 */
function negativeIntegerScaledFx(n: number, x: bigint, W: number): { f: bigint; lost: number } {
  const w = BigInt(W);
  const o = fx.one(W);
  const xd = fx.toFloat(x, W);
  // E_1 series: the largest term, x^k/k! at k = floor(x), is about e^x / sqrt(2 pi x); the
  // result about e^{-x} / (x + 1)
  let t = o; // (-x)^k / k!
  let sum = 0n;
  for (let k = 1; ; k++) {
    t = -((t * x) >> w) / BigInt(k);
    sum += t / BigInt(k);
    if (k > xd && (t === 0n || (t < 0n ? -t : t) < 2n)) break;
  }
  let ltmax = 0; // log2 of the largest x^k/k!
  for (let k = 1, l = 0; k <= xd + 1; k++) {
    l += Math.log2(xd / k);
    if (l > ltmax) ltmax = l;
  }
  const E1 = -fx.euler(W) - logFx(x, W) - sum;
  const [em, ek] = expSplitFx(x, W);
  let f = ek >= 0 ? ((em * E1) >> w) << BigInt(ek) : ((em * E1) >> w) >> BigInt(-ek);
  let lost = Math.max(0, ltmax - Math.log2(Math.abs(fx.toFloat(E1, W))));
  for (let k = 1; k <= n; k++) {
    const xf = (x * f) >> w;
    const d = o - xf;
    // relative error of d: that of x f times |x f| / |d|
    const r = Math.abs(fx.toFloat(xf, W) / fx.toFloat(d, W));
    if (r > 1) lost += Math.log2(r);
    f = d / BigInt(k);
  }
  return { f, lost };
}

/** Is a (at F bits) exactly a non-positive integer? Returns -a or -1. */
function nonPositiveInteger(a: FxC, F: number): number {
  if (a.im !== 0n || a.re > 0n) return -1;
  const o = fx.one(F);
  if (a.re % o !== 0n) return -1;
  const n = Number(-a.re / o);
  return Number.isSafeInteger(n) ? n : -1;
}

/** f at W = F + G bits as (m / 2^F) 2^e with |m| / 2^F in [1, 2). */
function normaliseSplit(f: FxC, W: number, G: number): SplitFx {
  const e = bitLen(f) - W - 1;
  const sh = G + e;
  const m = sh >= 0 ? { re: f.re >> BigInt(sh), im: f.im >> BigInt(sh) } : { re: f.re << BigInt(-sh), im: f.im << BigInt(-sh) };
  return { m, e };
}

/**
 * f(a, x) = e^x x^{-a} Gamma(a, x) for a, x at F bits (taken as exact), x > 0, as
 * (m / 2^F) 2^e with relative error about 2^-F. Chooses the method by cost and retries the
 * cancelling ones with more bits (see the header). Reuses log Gamma(a) between calls with
 * the same a.
 */
export function gammaUpperScaledFx(a: FxC, x: bigint, F: number): SplitFx {
  if (x <= 0n) throw new ModvetError('domain', WHO, 'x must be positive');
  const ar = fx.toFloat(a.re, F);
  const ai = fx.toFloat(a.im, F);
  const xd = fx.toFloat(x, F);
  const n = nonPositiveInteger(a, F);
  // bits the series will lose: near a pole of Gamma(a) about twice the distance's (a tiny
  // factor in the products, then the cancellation); for larger x the cancellation between
  // e^x x^-a Gamma(a) and the sum, estimated in double precision
  let predicted = 0;
  if (n >= 0) predicted = 2.9 * xd;
  else {
    predicted = 2 * poleBits(a, F);
    if (xd >= 1 && xd >= ar - 1) {
      const lG = (xd - ar * Math.log(xd) + logAbsGammaDouble(ar, ai)) / Math.LN2;
      predicted += Math.max(0, lG - log2AbsCfDouble(ar, ai, xd));
    }
  }
  // (precisions rounded up to multiples of 32 bits keep the per-precision caches small)
  const W0 = roundBits(F + 12);
  const Ws = roundBits(F + 12 + Math.ceil(predicted));
  // The fraction first, if it can beat a lower bound of the series' cost (about x terms plus
  // Gamma(a)); for x well below Re a it computes a value dominated by Gamma(a) from O(1)
  // pieces and cancels badly (measured against mpmath), so it is not used there. Its steps
  // grow like (bits log 2 / 4)^2 / x (convergence about e^{-4 sqrt(n x)}): the count in
  // double precision is skipped when that estimate is far beyond the budget.
  const cfAllowed = xd >= ar - 1;
  const nEst = ((W0 * Math.LN2) / 4) ** 2 / xd;
  const aWs = { re: a.re << BigInt(Ws - F), im: a.im << BigInt(Ws - F) };
  const gammaCost = n >= 0 ? 0 : cachedLogGamma(aWs, Ws) !== null ? 10 : GAMMA_COST_TERMS;
  const tryCf = (budget: number): SplitFx | null => {
    if (!cfAllowed || nEst > 2 * budget) return null;
    const steps = cfSteps(ar, ai, xd, W0 - 4, Math.min(MAX_CF_STEPS, Math.ceil(budget)));
    if (!Number.isFinite(steps)) return null;
    const G = W0 - F;
    const aW: FxC = { re: a.re << BigInt(G), im: a.im << BigInt(G) };
    return normaliseSplit(cfScaledFx(aW, x << BigInt(G), W0, steps + 2), W0, G);
  };
  const lowerBound = xd + gammaCost;
  const quick = tryCf(lowerBound);
  if (quick !== null) return quick;
  let seriesCost: number;
  let K = 0;
  let lmax = 0;
  if (n >= 0) {
    seriesCost = (1.5 * xd + 10 + n / 3) * (Ws / W0) + W0 / 32;
  } else {
    const st = seriesTerms(a, F, xd, Ws + 8, 20 * Ws + 4 * xd + 100);
    K = st.K;
    lmax = st.lmax;
    seriesCost = K * (Ws / W0) + gammaCost;
  }
  if (seriesCost > 1.5 * lowerBound) {
    const cf = tryCf(Number.isFinite(seriesCost) ? seriesCost : MAX_CF_STEPS);
    if (cf !== null) return cf;
  }
  if (!Number.isFinite(seriesCost)) throw new ModvetError('convergence', WHO, `no method converges at a = ${ar} + ${ai}i, x = ${xd}`);
  let W = Ws;
  for (;;) {
    if (W > MAX_BITS) throw new ModvetError('precision', WHO, 'cancellation too severe to resolve');
    const G = W - F;
    const aW: FxC = { re: a.re << BigInt(G), im: a.im << BigInt(G) };
    const xW = x << BigInt(G);
    let f: FxC;
    let lost: number;
    if (n >= 0) {
      const r = negativeIntegerScaledFx(n, xW, W);
      f = { re: r.f, im: 0n };
      lost = r.lost;
    } else {
      if (W !== Ws) K = seriesTerms(a, F, xd, W + 8, 20 * W + 4 * xd + 100).K;
      ({ f, lost } = seriesScaledFx(aW, xW, W, K, lmax));
    }
    if (lost + F + 8 <= W) return normaliseSplit(f, W, G);
    W = roundBits(F + Math.ceil(lost) + 16);
  }
}

function roundBits(W: number): number {
  return Math.ceil(W / 32) * 32;
}

/** log2 |f(a, x)| roughly, from the 8th convergent of the J-fraction in double precision. */
function log2AbsCfDouble(ar: number, ai: number, x: number): number {
  const w = new WallisDouble(ar, ai, x);
  for (let k = 1; k <= 8; k++) w.step(k);
  // f = 1/K, K = A/B
  return 0.5 * (Math.log2(w.B1r * w.B1r + w.B1i * w.B1i) - Math.log2(w.A1r * w.A1r + w.A1i * w.A1i));
}

// ---------------------------------------------------------------------------
// Public function

/**
 * Gamma(a, x) at the current precision for complex a and real x > 0 (module header).
 * Throws ModvetError('domain', 'Gamma(a, x)') for x <= 0.
 */
export function gammaUpper(a: Complex, x: Decimal): Complex {
  const { aF, xF, F } = inputs(a, x);
  const { m, e } = gammaUpperScaledFx(aF, xF, F);
  // Gamma(a, x) = e^{a log x - x} f
  const w = BigInt(F);
  const lx = logFx(xF, F);
  const E: FxC = { re: ((aF.re * lx) >> w) - xF, im: (aF.im * lx) >> w };
  const [g, k] = cexpSplitFx(E, F);
  const r: FxC = { re: (g.re * m.re - g.im * m.im) >> w, im: (g.re * m.im + g.im * m.re) >> w };
  const out = splitToComplex(r, F, k + e, WHO);
  return a.im.isZero() ? new Complex(out.re, 0) : out;
}

/**
 * The scaled function e^x x^{-a} Gamma(a, x) at the current precision (module header): of
 * order 1/(x + |a|) for large x, so a sum of x^{-a} Gamma(a, x) over many x needs only
 * e^{-x} times this, without a complex power. Same domain and errors as gammaUpper.
 */
export function gammaUpperScaled(a: Complex, x: Decimal): Complex {
  const { aF, xF, F } = inputs(a, x);
  const { m, e } = gammaUpperScaledFx(aF, xF, F);
  const out = splitToComplex(m, F, e, WHO);
  return a.im.isZero() ? new Complex(out.re, 0) : out;
}

/** Checked inputs at the working precision F of the interface functions. */
function inputs(a: Complex, x: Decimal): { aF: FxC; xF: bigint; F: number } {
  if (!x.isFinite() || x.lte(0)) throw new ModvetError('domain', WHO, `x = ${x.toString()} must be positive`);
  const P = Decimal.precision;
  const xd = x.toNumber();
  const ad = Math.abs(a.re.toNumber()) + Math.abs(a.im.toNumber());
  if (xd > 2 ** 40 || ad > 2 ** 40) throw new ModvetError('overflow', WHO, 'argument too large');
  // log2 x and |log x|, also for x below the double range
  const l2x = xd > 0 ? Math.log2(xd) : x.e * 3.321928094887362;
  const lxd = Math.abs(l2x * Math.LN2);
  // the size of a log x - x (absolute error there is relative error in the result), the
  // sensitivity of the result to a, and the relative precision of a small x
  const F = bitsFor(P) + 12 + Math.ceil(Math.log2(2 + xd + ad * (1 + lxd))) + Math.max(0, Math.ceil(-l2x));
  return { aF: { re: toFixed(a.re, F), im: toFixed(a.im, F) }, xF: toFixed(x, F), F };
}
