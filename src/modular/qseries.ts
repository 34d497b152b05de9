/**
 * q-series machinery shared by the holomorphic built-ins of src/modular/: argument checks,
 * e^{2 pi i tau r} on the fixed-point kernels, the raw series summers, the float64
 * term-count rules and the checked-evaluation loop that measures cancellation.
 *
 * Conventions: tau = x + i y with y > 0 and q = e^{2 pi i tau}, so |q| = e^{-2 pi y}. Hot
 * loops run on BigInt fixed point (src/numeric/fixed.ts): z is held as Z = z 2^F. A value
 * too large or small for one fixed scale is a `Scaled` { v, F, e } meaning v 2^(e - F),
 * normalised so that the larger part of v lies in [2^(F-1), 2^F).
 *
 * Accuracy contract of the built-ins (the "cancellation guarantee"), with need = the bits
 * of the precision in force plus 6 (so 2^-need < 10^-P / 64) and L the modulus of the
 * largest term of the series summed:
 * - E_k, E_2*, G_k: |z - exact| <= 2^-need max(|exact|, 2^-cap L), cap = cancellationCap(need)
 *   = max(256, need) bits. Cancellation up to `cap` bits is measured and resolved by
 *   re-summing with more bits; beyond it (in practice only at exact zeros such as E_6(i) or
 *   E_4(rho)) the error is that tiny absolute amount.
 * - eta, Delta, theta_2, theta_3, theta_4 have no zeros in the upper half-plane: always
 *   |z - exact| <= 2^-need |exact| (or a 'convergence' error beyond ZERO_FREE_LIMIT_BITS).
 * - j = E_4^3 / Delta: relative, except near the zeros of E_4, where E_4's guarantee
 *   carries over (cubed, divided by |Delta|).
 *
 *   // sum_{n<=N} sigma_3(n) q^n at F bits, q given at F + g bits:
 *   const S = sumQSeries(sigmaSieve(3, N), N, q, F, g, Math.ceil(Math.sqrt(N + 1)), 3 * Math.log2(N) + 2);
 */
import { Decimal } from 'decimal.js';
import { Complex } from '../numeric/complex.js';
import { ModvetError } from '../numeric/errors.js';
import { toFixed } from '../numeric/convert.js';
import * as fx from '../numeric/fixed.js';
import { FxC, cexpSplit, cmul, toComplex } from '../numeric/fixedComplex.js';
import { bitsFor } from '../numeric/precision.js';
import { DEFAULT_Y_MIN, checkTau as checkDomain } from './domain.js';

/** A series needing more terms than this throws 'convergence'. */
export const TERM_BUDGET = 100_000;
/** Bits of cancellation assumed by the first pass (saves a second pass for mild cases). */
const INITIAL_SLACK = 8;
/** Most cancellation resolved for a function without zeros (see checkedEvaluation). */
export const ZERO_FREE_LIMIT_BITS = 16384;

export interface ModularOptions {
  /** Smallest Im tau accepted (default 0.02): bounds the number of terms. */
  yMin?: number;
}

/** Bits a function must deliver at the precision in force: the digits plus 6 guard bits. */
export function neededBits(): number {
  return bitsFor(Decimal.precision) + 6;
}

/** Largest cancellation (bits) a built-in resolves by re-summing; see the header. */
export function cancellationCap(need: number): number {
  return Math.max(256, need);
}

// ---------------------------------------------------------------------------
// Arguments

/** tau split into parts, with float copies for the term-count rules. */
export interface TauParts {
  x: Decimal;
  y: Decimal;
  xf: number;
  yf: number;
  /** e^{2 pi i tau/24} at the most bits computed so far for this tau (see tauRoot). */
  root: Scaled | null;
}

/**
 * Checks tau against the domain {Im tau >= yMin} (domain.ts, shared by all modular
 * built-ins); `who` names the function as users know it. Errors have code 'domain'.
 */
export function checkTau(tau: Complex, who: string, opts?: ModularOptions): TauParts {
  const yMin = opts?.yMin ?? DEFAULT_Y_MIN;
  if (!(Number.isFinite(yMin) && yMin > 0)) {
    throw new ModvetError('domain', who, `yMin = ${yMin} must be a positive finite number`);
  }
  if (!tau.isFinite()) throw new ModvetError('domain', who, `tau = ${tau} must be finite`);
  checkDomain(tau, who, yMin);
  return { x: tau.re, y: tau.im, xf: tau.re.toNumber(), yf: tau.im.toNumber(), root: null };
}

// ---------------------------------------------------------------------------
// Scaled complex values: v 2^(e - F)

export interface Scaled {
  v: FxC;
  F: number;
  e: number;
}

/** log2 |a| to about 1e-15 (a != 0); -Infinity for 0. */
export function log2Abs(a: bigint): number {
  if (a < 0n) a = -a;
  const f = Number(a);
  if (f !== Infinity) return f === 0 ? -Infinity : Math.log2(f);
  const s = fx.bitLength(a) - 64;
  return Math.log2(Number(a >> BigInt(s))) + s;
}

/** log2 |z| for a fixed complex z at F bits (-Infinity for 0). */
export function log2AbsC(z: FxC, F: number): number {
  const a = log2Abs(z.re);
  const b = log2Abs(z.im);
  const hi = Math.max(a, b);
  if (hi === -Infinity) return -Infinity;
  const lo = Math.min(a, b);
  return hi + 0.5 * Math.log2(1 + 2 ** (2 * (lo - hi))) - F;
}

function shiftC(z: FxC, s: number): FxC {
  if (s === 0) return z;
  const b = BigInt(Math.abs(s));
  return s > 0 ? { re: z.re << b, im: z.im << b } : { re: z.re >> b, im: z.im >> b };
}

/** Renormalise so the larger part lies near 2^(F-1). Zero stays zero. */
export function normalise(s: Scaled): Scaled {
  const l = Math.max(log2Abs(s.v.re), log2Abs(s.v.im));
  if (l === -Infinity) return { v: s.v, F: s.F, e: 0 };
  const sh = s.F - 1 - Math.floor(l);
  if (sh === 0) return s;
  return { v: shiftC(s.v, sh), F: s.F, e: s.e - sh };
}

/** A fixed value at F bits as a normalised Scaled value. */
export function scaled(v: FxC, F: number, e = 0): Scaled {
  return normalise({ v, F, e });
}

/** Change the working bits of a Scaled value. */
export function withBits(s: Scaled, F: number): Scaled {
  return { v: shiftC(s.v, F - s.F), F, e: s.e };
}

export function smul(a: Scaled, b: Scaled): Scaled {
  const bb = b.F === a.F ? b : withBits(b, a.F);
  return normalise({ v: cmul(a.v, bb.v, a.F), F: a.F, e: a.e + bb.e });
}

export function sdiv(a: Scaled, b: Scaled): Scaled {
  const bb = b.F === a.F ? b : withBits(b, a.F);
  const den = bb.v.re * bb.v.re + bb.v.im * bb.v.im;
  if (den === 0n) throw new ModvetError('pole', 'division', 'division by zero');
  const f = BigInt(a.F);
  const re = ((a.v.re * bb.v.re + a.v.im * bb.v.im) << f) / den;
  const im = ((a.v.im * bb.v.re - a.v.re * bb.v.im) << f) / den;
  return normalise({ v: { re, im }, F: a.F, e: a.e - bb.e });
}

/** s^n for an integer n >= 1 by repeated squaring (relative error about 2n units). */
export function spow(s: Scaled, n: number): Scaled {
  let acc: Scaled | null = null;
  let base = s;
  for (let k = n; k > 0; k >>= 1) {
    if (k & 1) acc = acc === null ? base : smul(acc, base);
    if (k > 1) base = smul(base, base);
  }
  if (acc === null) throw new RangeError('spow: n must be >= 1');
  return acc;
}

/** The value as an absolute fixed complex at F bits (tiny values round to 0). */
export function toFixedC(s: Scaled, F: number): FxC {
  return shiftC(s.v, F - s.F + s.e);
}

/** The Complex nearest s, rounded to the precision in force. */
export function scaledToComplex(s: Scaled): Complex {
  return toComplex(s.v, s.F, s.e);
}

/** A positive rational num/den as a Scaled value at F bits. */
export function scaledRational(num: bigint, den: bigint, F: number): Scaled {
  const sh = Math.max(0, fx.bitLength(den) - fx.bitLength(num)) + F + 2;
  return normalise({ v: { re: (num << BigInt(sh)) / den, im: 0n }, F, e: F - sh });
}

// ---------------------------------------------------------------------------
// e^{2 pi i tau r}

/**
 * e^{2 pi i tau num/den} as a Scaled value with relative error below 8 units of 2^-F
 * (one complex exp on the fixed kernels; the argument carries log2|x| extra bits).
 */
export function expTwoPiITau(t: TauParts, num: number, den: number, F: number): Scaled {
  const G = 8 + Math.max(0, Math.ceil(Math.log2(Math.abs(t.xf) + Math.abs(t.yf) + 1)));
  const W = F + G;
  const twoPi = fx.pi(W + 2) >> 1n; // 2 pi at W bits, to within one unit
  const X = toFixed(t.x, W);
  const Y = toFixed(t.y, W);
  const n = BigInt(num);
  const d = BigInt(den);
  // 2 pi i tau r = -2 pi y r + i 2 pi x r
  const s = BigInt(W);
  const re = -((twoPi * Y * n) >> s) / d;
  const im = ((twoPi * X * n) >> s) / d;
  const [w, k] = cexpSplit({ re, im }, W);
  return normalise({ v: shiftC(w, -G), F, e: k });
}

/**
 * z = e^{2 pi i tau/24} at F bits (relative error below 8 units), remembered on `t` at the
 * most bits asked for, so that functions evaluated together at one tau (E_4 and Delta in j)
 * share one complex exp.
 */
export function tauRoot(t: TauParts, F: number): Scaled {
  if (t.root !== null && t.root.F >= F) return withBits(t.root, F);
  const z = expTwoPiITau(t, 1, 24, F);
  t.root = z;
  return z;
}

/**
 * q = e^{2 pi i tau} at F bits, relative error below 8 units: from the remembered root as
 * z^24 when it has the bits (24 times its error plus 6 roundings stays below 1 unit with
 * 10 extra bits), otherwise by its own exp.
 */
export function tauQ(t: TauParts, F: number): Scaled {
  if (t.root !== null && t.root.F >= F + 10) return withBits(spow(withBits(t.root, F + 10), 24), F);
  return expTwoPiITau(t, 1, 1, F);
}

// ---------------------------------------------------------------------------
// Term counts (float64 bounds on the tail)

/**
 * The smallest N >= 0 with sum_{n > N} t_n <= 2^target, where
 * log2 t_n = log2C + p log2 n + log2(1 + ln n) + n log2r (a bound of the form
 * C n^p (1 + ln n) r^n covers sigma_p(n) r^n: sigma_p(n) / n^p = sum_{d | n} d^-p <= 1 + ln n).
 * Past the peak the ratio rho_n = t_{n+1}/t_n decreases, so sum_{n > N} t_n <= t_{N+1} / (1 - rho_{N+1}).
 * Throws 'convergence' (naming `who`) when N would exceed TERM_BUDGET.
 */
export function denseTermCount(log2C: number, p: number, log2r: number, target: number, who: string): number {
  const log2t = (n: number) => log2C + p * Math.log2(n) + Math.log2(1 + Math.log(n)) + n * log2r;
  const done = (N: number): boolean => {
    const n = N + 1;
    const log2rho = log2t(n + 1) - log2t(n);
    if (log2rho >= 0) return false;
    return log2t(n) - Math.log2(-Math.expm1(log2rho * Math.LN2)) <= target;
  };
  if (done(0)) return 0;
  // bracket from the estimate where r^n alone reaches the target, then bisect
  let lo = 0; // !done(lo)
  let hi = Math.min(TERM_BUDGET, Math.max(1, Math.ceil((target - log2C) / log2r))); // done(hi)?
  while (!done(hi)) {
    if (hi >= TERM_BUDGET) {
      throw new ModvetError('convergence', who, `the q-series needs more than ${TERM_BUDGET} terms here`);
    }
    lo = hi;
    hi = Math.min(TERM_BUDGET, 2 * hi);
  }
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (done(mid)) hi = mid;
    else lo = mid;
  }
  return hi;
}

/**
 * The largest exponent G that a sparse series sum c_g q^g (|c_g| <= 1, distinct g) must
 * include so that the omitted part is below 2^target: sum_{g > G} r^g = r^(G+1)/(1 - r).
 */
export function sparseExponentBound(log2r: number, target: number, who: string): number {
  const G = Math.max(0, Math.ceil((target + Math.log2(-Math.expm1(log2r * Math.LN2))) / log2r));
  if (!Number.isFinite(G) || G > TERM_BUDGET * TERM_BUDGET) {
    throw new ModvetError('convergence', who, `the q-series needs more than ${TERM_BUDGET} terms here`);
  }
  return G;
}

// ---------------------------------------------------------------------------
// Raw summers

/**
 * sum_{n=0}^{N} a_n q^n at F bits, by baby steps and giant steps (Paterson & Stockmeyer,
 * SIAM J. Comput. 2 (1973)): the powers b_i = q^i, i < m, at F + g bits, the block sums
 * s_j = sum_i a_{jm+i} b_i exactly (integer times fixed), then Horner in Q = q^m, the sum
 * at F bits and Q at F + g (|Q| = r^m is small, and its error is multiplied by |S|).
 * Cost: m - 1 + N/m complex multiplies and N integer-times-fixed products. `coefBits` must
 * bound log2 max |a_n|.
 *
 * Error, with u = 2^-F and r >= |q|: if q carries at most 4 units of 2^-(F+g) and
 * 2^g r^m >= 1, the result is within Phi u of the exact sum, where
 * Phi = 8 sum_n (n + 1) |a_n| r^n + 4 / (1 - r^m): the truncation of b_i (at most
 * sqrt(2) i units of 2^-(F+g)) reaches the result multiplied by r^(n - i) <= r^(n - m),
 * which the g extra bits cancel, and each giant step truncates twice.
 */
export function sumQSeries(
  a: readonly bigint[],
  N: number,
  q: FxC,
  F: number,
  g: number,
  m: number,
  coefBits: number,
): FxC {
  const Fb = F + g;
  const G = BigInt(g);
  // Each baby power is packed as one integer re + im 2^K, so a block term costs one
  // multiply and one add; |sum_i a_i re_i| < m 2^(coefBits + Fb) < 2^(K-1) keeps the parts apart.
  const K = BigInt(Fb + coefBits + Math.ceil(Math.log2(m)) + 3);
  const packed: bigint[] = [fx.one(Fb)];
  let p = q;
  for (let i = 1; i < m; i++) {
    packed.push(p.re + (p.im << K));
    p = cmul(p, q, Fb);
  }
  // Q = q^m stays at F + g bits: its relative error is amplified by the size of S
  const Qre = p.re;
  const Qim = p.im;
  const fb = BigInt(Fb);
  const mask = (1n << K) - 1n;
  const half = 1n << (K - 1n);
  const wrap = 1n << K;
  let Sre = 0n;
  let Sim = 0n;
  for (let j = Math.floor(N / m); j >= 0; j--) {
    const base = j * m;
    const top = Math.min(m - 1, N - base);
    let s = 0n;
    for (let i = 0; i <= top; i++) {
      const c = a[base + i]!;
      if (c !== 0n) s += c * packed[i]!;
    }
    let sre = s & mask; // the low K bits, as a signed value
    if (sre >= half) sre -= wrap;
    const sim = (s - sre) >> K;
    const tre = (Sre * Qre - Sim * Qim) >> fb;
    const tim = (Sre * Qim + Sim * Qre) >> fb;
    Sre = tre + (sre >> G);
    Sim = tim + (sim >> G);
  }
  return { re: Sre, im: Sim };
}

/**
 * sum_{k in Z} (-1)^k q^{k(3k-1)/2} over the exponents <= G, at F bits (Euler's pentagonal
 * number theorem, DLMF 27.14(ii): this is prod_{n>=1} (1 - q^n)). Walks
 * t_k = q^{k(3k-1)/2}, t_{-k} = t_k q^k, t_{k+1} = t_k q^{3k+1} (4 multiplies per k).
 * The error bound is pentagonalErrorBound.
 */
export function pentagonalSum(q: FxC, F: number, G: number): FxC {
  let Sre = fx.one(F);
  let Sim = 0n;
  let t: FxC = { re: fx.one(F), im: 0n }; // t_0
  let u: FxC = { re: fx.one(F), im: 0n }; // q^(k-1)
  let w = q; // q^(3(k-1)+1)
  const q3 = cmul(cmul(q, q, F), q, F);
  for (let k = 1; (k * (3 * k - 1)) / 2 <= G; k++) {
    t = cmul(t, w, F); // t_k
    u = cmul(u, q, F); // q^k
    if (k & 1) {
      Sre -= t.re;
      Sim -= t.im;
    } else {
      Sre += t.re;
      Sim += t.im;
    }
    if ((k * (3 * k + 1)) / 2 > G) break;
    const tm = cmul(t, u, F); // t_{-k}
    if (k & 1) {
      Sre -= tm.re;
      Sim -= tm.im;
    } else {
      Sre += tm.re;
      Sim += tm.im;
    }
    w = cmul(w, q3, F);
  }
  return { re: Sre, im: Sim };
}

/**
 * Phi with |pentagonalSum - sum over exponents <= G| <= Phi 2^-F when q carries at most
 * dq units of 2^-F and |q| <= r = 2^log2r < 1. Every quantity in the walk has modulus <= 1,
 * so each truncation (< 2 units) reaches a term undamped: term k depends on at most 3k + 3
 * of them. An error dq in q moves q^g by at most g r^(g-1) dq.
 */
export function pentagonalErrorBound(log2r: number, G: number, dq: number): number {
  const r = 2 ** log2r;
  let phi = 0;
  for (let k = 1; (k * (3 * k - 1)) / 2 <= G; k++) {
    const g1 = (k * (3 * k - 1)) / 2;
    const g2 = g1 + k;
    phi += 12 * (k + 1) + dq * (g1 * r ** (g1 - 1) + g2 * r ** (g2 - 1));
  }
  return phi + 4;
}

// ---------------------------------------------------------------------------
// The checked-evaluation loop

/** What one evaluation pass returns: the value and log2(L / |value|), L the largest term. */
export interface Pass {
  value: Scaled;
  lostBits: number;
}

/**
 * Runs `pass(extra)` -- which must return a value within 2^-(need + extra) L of the exact
 * one -- first with a small allowance for cancellation, then, while the measured
 * cancellation exceeds the allowance, again with the measured loss plus a margin.
 *
 * For a function with zeros the allowance stops at cancellationCap(need) (at once when no
 * bit was correct: an exact zero bounds the loss only from below), and the accepted value
 * is within 2^-need max(|exact|, 2^-cap L). For a function known to have no zeros in the
 * upper half-plane (`zeroFree` names it: eta, Delta, the theta constants) the loss is
 * finite, so the allowance grows until the value is relatively accurate, up to
 * ZERO_FREE_LIMIT_BITS, beyond which it throws 'convergence'.
 */
export function checkedEvaluation(need: number, pass: (extra: number) => Pass, zeroFree?: string): Scaled {
  const cap = zeroFree === undefined ? cancellationCap(need) : ZERO_FREE_LIMIT_BITS;
  let extra = INITIAL_SLACK;
  for (;;) {
    const r = pass(extra);
    if (r.lostBits <= extra - 1) return r.value;
    if (extra >= cap) {
      if (zeroFree === undefined) return r.value;
      throw new ModvetError('convergence', zeroFree, `cancellation beyond ${cap} bits at this tau`);
    }
    const noBits = r.lostBits >= need + extra - 4;
    const next = noBits ? (zeroFree === undefined ? cap : 2 * (need + extra)) : Math.ceil(r.lostBits) + 8;
    extra = Math.min(cap, next);
  }
}
