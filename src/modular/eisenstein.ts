/**
 * Holomorphic Eisenstein series E_k (k even >= 2), the lattice sums G_k (k >= 4) and the
 * weight-2 non-holomorphic E_2*.
 *
 * tau = x + i y with y > 0 and q = e^{2 pi i tau}. Normalisation (Serre, "A Course in
 * Arithmetic", ch. VII 2.3 and 4.2, where the weight is written 2k):
 *   E_k(tau) = 1 - (2k / B_k) sum_{n>=1} sigma_{k-1}(n) q^n    (E_4 = 1 + 240 q + ..., E_6 = 1 - 504 q - ...)
 *   G_k(tau) = sum'_{(m,n)} (m tau + n)^-k = 2 zeta(k) E_k(tau),  2 zeta(k) = (2 pi)^k |B_k| / k!  (DLMF 25.6.2)
 *   E_2*(tau) = E_2(tau) - 3 / (pi y).
 * Transformation laws, gamma = (a b; c d) in SL(2,Z):
 *   E_k(gamma tau) = (c tau + d)^k E_k(tau)  (k >= 4);
 *   E_2(gamma tau) = (c tau + d)^2 E_2(tau) + (6c / (pi i)) (c tau + d)  (Zagier, "Elliptic modular forms
 *   and their applications", on quasimodular forms);
 *   E_2*(gamma tau) = (c tau + d)^2 E_2*(tau).
 * Method: the q-series is summed directly at tau (never via the fundamental domain) on the
 * BigInt fixed-point kernels: one complex exp for q, exact sigma_{k-1}(n) from a cached
 * sieve, baby-step/giant-step summation (qseries.ts sumQSeries); the number of terms comes
 * from a float64 tail bound, the working bits from a bound on the rounding error, and
 * cancellation is measured and resolved as described in qseries.ts.
 *
 *   withDigits(40, () => eisensteinE(4, Complex.I).toString())  // 3 Gamma(1/4)^8 / (2 pi)^6 = 1.4558...
 */
import { Complex } from '../numeric/complex.js';
import { ModvetError } from '../numeric/errors.js';
import { toFixed } from '../numeric/convert.js';
import * as fx from '../numeric/fixed.js';
import { bernoulli, Rational } from '../special/bernoulli.js';
import { sigmaSieve } from '../special/divisors.js';
import {
  ModularOptions,
  Pass,
  Scaled,
  TauParts,
  checkTau,
  checkedEvaluation,
  denseTermCount,
  log2Abs,
  log2AbsC,
  neededBits,
  scaled,
  scaledRational,
  scaledToComplex,
  smul,
  spow,
  sumQSeries,
  tauQ,
  toFixedC,
} from './qseries.js';

const LOG2E = Math.LOG2E;

/** The largest weight accepted: sigma_{k-1}(n) and the term count grow with k. */
export const MAX_WEIGHT = 200;

function checkWeight(k: number, who: string, min: number): void {
  if (!Number.isSafeInteger(k) || k < min || k % 2 !== 0) {
    throw new ModvetError('domain', who, `k = ${k} must be an even integer >= ${min}`);
  }
  if (k > MAX_WEIGHT) throw new ModvetError('domain', who, `k = ${k} is above the supported weight ${MAX_WEIGHT}`);
}

function gcd(a: bigint, b: bigint): bigint {
  if (a < 0n) a = -a;
  if (b < 0n) b = -b;
  while (b !== 0n) [a, b] = [b, a % b];
  return a;
}

const factorCache = new Map<number, Rational>();

/** c_k = -2k / B_k, the coefficient of sum sigma_{k-1}(n) q^n in E_k, reduced, den > 0. */
function eisensteinFactor(k: number): Rational {
  const cached = factorCache.get(k);
  if (cached !== undefined) return cached;
  const B = bernoulli(k);
  let num = -2n * BigInt(k) * B.den;
  let den = B.num;
  if (den < 0n) {
    num = -num;
    den = -den;
  }
  const g = gcd(num, den);
  const c = { num: num / g, den: den / g };
  factorCache.set(k, c);
  return c;
}

// sigma_p(1..N) for p = k - 1, with float log2 copies for the error bounds; grown by doubling.
interface SigmaTable {
  s: bigint[];
  l: Float64Array;
}
const sigmaCache = new Map<number, SigmaTable>();

function sigmaTable(p: number, N: number): SigmaTable {
  const c = sigmaCache.get(p);
  if (c !== undefined && c.s.length > N) return c;
  const M = Math.max(N, 2 * ((c?.s.length ?? 0) - 1), 64);
  const s = sigmaSieve(p, M);
  const l = new Float64Array(M + 1);
  for (let n = 1; n <= M; n++) l[n] = log2Abs(s[n]!);
  const t = { s, l };
  sigmaCache.set(p, t);
  return t;
}

/** log2(2^a + 2^b) without overflow. */
function log2Sum(a: number, b: number): number {
  const hi = Math.max(a, b);
  if (hi === -Infinity) return -Infinity;
  return hi + Math.log2(1 + 2 ** (Math.min(a, b) - hi));
}

/**
 * One pass for E_k (or E_2* when `star`), as required by checkedEvaluation: the value to
 * 2^-(need + extra) L absolutely, L = max(1, |c_k| max_n sigma_{k-1}(n) |q|^n [, 3/(pi y)]).
 */
function eisensteinPass(k: number, t: TauParts, need: number, extra: number, who: string, star: boolean): Pass {
  const c = eisensteinFactor(k);
  const log2c = log2Abs(c.num) - log2Abs(c.den);
  const log2r = -2 * Math.PI * t.yf * LOG2E; // |q| = 2^log2r
  const p = k - 1;
  const log2Star = star ? Math.log2(3 / (Math.PI * t.yf)) : -Infinity;
  // lower bound on L (sigma_p(n) >= n^p), used to set the tail target before sieving
  const nPeak = p / (2 * Math.PI * t.yf);
  let lLo = Math.max(0, log2Star);
  for (const n of [Math.floor(nPeak), Math.ceil(nPeak), 1]) {
    if (n >= 1) lLo = Math.max(lLo, log2c + p * Math.log2(n) + n * log2r);
  }
  const N = denseTermCount(log2c, p, log2r, lLo - need - extra - 2, who);

  // the actual largest term and the rounding-error factor Phi of sumQSeries (see there)
  let m = 1;
  let coefBits = 0;
  let log2L = Math.max(0, log2Star);
  let log2Phi = 0;
  let table: SigmaTable | null = null;
  if (N > 0) {
    table = sigmaTable(p, N);
    let maxE = -Infinity;
    for (let n = 1; n <= N; n++) {
      maxE = Math.max(maxE, table.l[n]! + n * log2r);
      coefBits = Math.max(coefBits, table.l[n]!);
    }
    m = Math.max(1, Math.min(Math.ceil(Math.sqrt(N + 1)), Math.floor(64 / -log2r)));
    // 8 sum (n + 1) sigma(n) r^n <= 8 (N + 1) N 2^maxE: a few bits generous, but no pow a term
    log2Phi = log2Sum(3 + Math.log2((N + 1) * N) + maxE, Math.log2(4 / -Math.expm1(m * log2r * Math.LN2)));
    log2L = Math.max(log2L, log2c + maxE);
  }
  const F = Math.max(need + extra + 4, Math.ceil(need + extra + log2c + log2Phi - log2L) + 3);
  let re = fx.one(F);
  let im = 0n;
  if (table !== null) {
    const g = Math.ceil(m * -log2r) + 4; // 2^g r^m >= 1, as sumQSeries requires
    const q = toFixedC(tauQ(t, F + g + 4), F + g);
    const S = sumQSeries(table.s, N, q, F, g, m, Math.ceil(coefBits) + 1);
    re += (S.re * c.num) / c.den;
    im += (S.im * c.num) / c.den;
  }
  if (star) {
    // 3 / (pi y) with guard bits for the error of pi y amplified by 1/y
    const G = 8 + Math.max(0, Math.ceil(-2 * Math.log2(t.yf)));
    const W = F + G;
    const piY = fx.mul(fx.pi(W), toFixed(t.y, W), W);
    re -= fx.div(3n << BigInt(W), piY, W) >> BigInt(G);
  }
  const v = { re, im };
  return { value: scaled(v, F), lostBits: log2L - log2AbsC(v, F) };
}

/** E_k at tau as a Scaled value, relative error 2^-need (with the cancellation guarantee). */
export function eisensteinScaled(k: number, t: TauParts, need: number, who = `E_${k}`): Scaled {
  return checkedEvaluation(need, (extra) => eisensteinPass(k, t, need, extra, who, false));
}

/**
 * E_k(tau) for even k >= 2, at the precision in force. Domain: Im tau >= opts.yMin
 * (default 0.02). Accurate relative to max(|E_k|, 2^-cap L), L the largest term (qseries.ts).
 */
export function eisensteinE(k: number, tau: Complex, opts?: ModularOptions): Complex {
  const who = `E_${k}`;
  checkWeight(k, who, 2);
  const t = checkTau(tau, who, opts);
  return scaledToComplex(eisensteinScaled(k, t, neededBits(), who));
}

/** G_k(tau) = sum'_{(m,n)} (m tau + n)^-k = 2 zeta(k) E_k(tau) for even k >= 4 (Serre VII 4.2). */
export function eisensteinG(k: number, tau: Complex, opts?: ModularOptions): Complex {
  const who = `G_${k}`;
  checkWeight(k, who, 4);
  const t = checkTau(tau, who, opts);
  const need = neededBits();
  const F = need + 8 + Math.ceil(Math.log2(2 * k));
  const E = eisensteinScaled(k, t, need + 2, who);
  // 2 zeta(k) = (2 pi)^k |B_k| / k!  (DLMF 25.6.2)
  const B = bernoulli(k);
  let fact = 1n;
  for (let i = 2n; i <= BigInt(k); i++) fact *= i;
  const twoPi: Scaled = { v: { re: fx.pi(F), im: 0n }, F, e: 1 };
  const absB = B.num < 0n ? -B.num : B.num;
  const zeta2 = smul(spow(twoPi, k), scaledRational(absB, B.den * fact, F));
  return scaledToComplex(smul(zeta2, E));
}

/** E_2*(tau) = E_2(tau) - 3/(pi Im tau), modular of weight 2, not holomorphic (Zagier, op. cit.). */
export function e2star(tau: Complex, opts?: ModularOptions): Complex {
  const who = 'E_2*';
  const t = checkTau(tau, who, opts);
  const need = neededBits();
  return scaledToComplex(checkedEvaluation(need, (extra) => eisensteinPass(2, t, need, extra, who, true)));
}

/**
 * The q-expansion coefficients a_0, ..., a_N of E_k (even k >= 2), exact:
 * a_0 = 1, a_n = -(2k/B_k) sigma_{k-1}(n). E_4: 1, 240, 2160, ... (OEIS A004009).
 */
export function eisensteinCoefficients(k: number, N: number): Rational[] {
  checkWeight(k, `E_${k}`, 2);
  if (!Number.isSafeInteger(N) || N < 0) {
    throw new ModvetError('domain', `E_${k}`, `N = ${N} must be a non-negative integer`);
  }
  const c = eisensteinFactor(k);
  const out: Rational[] = [{ num: 1n, den: 1n }];
  if (N === 0) return out;
  const s = sigmaTable(k - 1, N).s;
  for (let n = 1; n <= N; n++) {
    const g = gcd(s[n]!, c.den);
    out.push({ num: c.num * (s[n]! / g), den: c.den / g });
  }
  return out;
}
