/**
 * The Dedekind eta function and the discriminant Delta = eta^24, with the exact
 * q-expansion coefficients tau(n) of Delta.
 *
 * tau = x + i y with y > 0 and q = e^{2 pi i tau}. Normalisation (DLMF 23.15; Apostol,
 * "Modular Functions and Dirichlet Series", ch. 3):
 *   eta(tau) = q^{1/24} prod_{n>=1} (1 - q^n),  q^{1/24} = e^{pi i tau / 12};
 *   Delta(tau) = eta(tau)^24 = q prod (1 - q^n)^24 = sum_{n>=1} tau(n) q^n.
 * Transformation laws: eta(tau + 1) = e^{pi i/12} eta(tau), eta(-1/tau) = sqrt(-i tau) eta(tau)
 * (principal root; Apostol Thm 3.1); for gamma in SL(2,Z), eta(gamma tau) = eps (c tau + d)^{1/2}
 * eta(tau) with eps^24 = 1 (Apostol Thm 3.4), so Delta(gamma tau) = (c tau + d)^12 Delta(tau).
 * Method: prod (1 - q^n) by Euler's pentagonal series sum_k (-1)^k q^{k(3k-1)/2}
 * (DLMF 27.14(ii)), about 4 sqrt(2N/3) complex multiplies for N powers of q, summed
 * directly at tau on the fixed-point kernels; e^{pi i tau/12} is the one complex exp and
 * q = (e^{pi i tau/12})^24. The prefactor is exact in relative terms, so the only
 * cancellation is in the pentagonal sum (|eta(x + 0.02i)| can be ~1e-5 while its terms are
 * ~1), measured and resolved as in qseries.ts; eta has no zeros in the upper half-plane, so
 * the result is always relatively accurate.
 *
 *   withDigits(30, () => eta(Complex.I).toString())   // Gamma(1/4) / (2 pi^{3/4}) = 0.76823...
 */
import { Complex } from '../numeric/complex.js';
import { ModvetError } from '../numeric/errors.js';
import {
  ModularOptions,
  Pass,
  Scaled,
  TauParts,
  checkTau,
  checkedEvaluation,
  log2AbsC,
  neededBits,
  pentagonalErrorBound,
  pentagonalSum,
  scaled,
  scaledToComplex,
  smul,
  spow,
  sparseExponentBound,
  tauRoot,
  toFixedC,
  withBits,
} from './qseries.js';

/**
 * One pass for eta (power 1) or Delta (power 24): the pentagonal sum P to 2^-(need + extra)
 * absolutely (its largest term is 1), hence the result to relative 2^-need once
 * |P| >= 2^-extra; lostBits = -log2 |P|.
 */
function etaPass(t: TauParts, need: number, extra: number, power: 1 | 24, who: string): Pass {
  const log2r = -2 * Math.PI * t.yf * Math.LOG2E;
  const target = -(need + extra + 2);
  const G = sparseExponentBound(log2r, target, who);
  const F = need + extra + Math.ceil(Math.log2(pentagonalErrorBound(log2r, G, 4))) + 3;
  // z = e^{2 pi i tau/24} and q = z^24 with 12 guard bits (relative error of z^24 < 2^-F)
  const z = tauRoot(t, F + 12);
  const q = spow(z, 24);
  const P = pentagonalSum(toFixedC(q, F), F, G);
  const lostBits = -log2AbsC(P, F);
  const Ps = scaled(P, F);
  const value = power === 1 ? smul(withBits(z, F), Ps) : smul(withBits(q, F), spow(Ps, 24));
  return { value, lostBits };
}

/** eta at tau as a Scaled value with relative error 2^-need. */
export function etaScaled(t: TauParts, need: number, who = 'eta'): Scaled {
  return checkedEvaluation(need, (extra) => etaPass(t, need, extra, 1, who), who);
}

/** Delta at tau as a Scaled value with relative error 2^-need (24 |dP/P| <= 2^-need). */
export function discriminantScaled(t: TauParts, need: number, who = 'Delta'): Scaled {
  const needP = need + 6;
  return checkedEvaluation(needP, (extra) => etaPass(t, needP, extra, 24, who), who);
}

/** eta(tau) at the precision in force; Im tau >= opts.yMin (default 0.02). */
export function eta(tau: Complex, opts?: ModularOptions): Complex {
  const t = checkTau(tau, 'eta', opts);
  return scaledToComplex(etaScaled(t, neededBits()));
}

/** Delta(tau) = eta(tau)^24 = q prod (1 - q^n)^24 at the precision in force. */
export function discriminant(tau: Complex, opts?: ModularOptions): Complex {
  const t = checkTau(tau, 'Delta', opts);
  return scaledToComplex(discriminantScaled(t, neededBits()));
}

// ---------------------------------------------------------------------------
// Exact coefficients

function checkCount(N: number, who: string): void {
  if (!Number.isSafeInteger(N) || N < 0) {
    throw new ModvetError('domain', who, `N = ${N} must be a non-negative integer`);
  }
}

/** [e_0, ..., e_N] with prod_{n>=1} (1 - q^n) = sum e_n q^n: e_n in {-1, 0, 1} (DLMF 27.14(ii)). */
export function pentagonalCoefficients(N: number): Int8Array {
  checkCount(N, 'eta');
  const e = new Int8Array(N + 1);
  e[0] = 1;
  for (let k = 1; (k * (3 * k - 1)) / 2 <= N; k++) {
    const s = k & 1 ? -1 : 1;
    e[(k * (3 * k - 1)) / 2] = s;
    if ((k * (3 * k + 1)) / 2 <= N) e[(k * (3 * k + 1)) / 2] = s;
  }
  return e;
}

/**
 * [f_0, ..., f_N] with prod (1 - q^n)^alpha = sum f_n q^n, for any integer alpha, exactly.
 * Recurrence for a power of a series g with g_0 = 1 (Knuth, TAOCP vol. 2, section 4.7,
 * powers of a power series): n f_n = sum_{j=1}^{n} ((alpha + 1) j - n) g_j f_{n-j}; g is sparse (pentagonal), so the
 * cost is O(N^1.5) BigInt operations, and the division by n is exact.
 */
export function etaProductPowerCoefficients(alpha: number, N: number): bigint[] {
  checkCount(N, 'eta');
  if (!Number.isSafeInteger(alpha)) throw new ModvetError('domain', 'eta', `alpha = ${alpha} must be an integer`);
  const g = pentagonalCoefficients(N);
  const nz: number[] = [];
  for (let j = 1; j <= N; j++) if (g[j] !== 0) nz.push(j);
  const a1 = BigInt(alpha + 1);
  const f: bigint[] = [1n];
  for (let n = 1; n <= N; n++) {
    let s = 0n;
    const bn = BigInt(n);
    for (const j of nz) {
      if (j > n) break;
      const term = (a1 * BigInt(j) - bn) * f[n - j]!;
      s += g[j]! > 0 ? term : -term;
    }
    f.push(s / bn);
  }
  return f;
}

let deltaCache: bigint[] = [0n];

/** [0, tau(1), ..., tau(N)]: the coefficients of q^0..q^N in Delta, exact (OEIS A000594). */
export function deltaCoefficients(N: number): bigint[] {
  checkCount(N, 'Delta');
  if (deltaCache.length <= N) {
    const M = Math.max(N, 2 * (deltaCache.length - 1), 32);
    deltaCache = [0n, ...etaProductPowerCoefficients(24, M - 1)];
  }
  return deltaCache.slice(0, N + 1);
}

/** Ramanujan's tau(n), n >= 1, exactly. */
export function ramanujanTau(n: number): bigint {
  if (!Number.isSafeInteger(n) || n < 1) throw new ModvetError('domain', 'tau', `n = ${n} must be a positive integer`);
  return deltaCoefficients(n)[n]!;
}
