/**
 * The Jacobi theta constants theta_2, theta_3, theta_4 (theta functions at z = 0).
 *
 * tau = x + i y with y > 0. The nome is p = e^{pi i tau} (NOT q = e^{2 pi i tau}; DLMF 20.2(i)):
 *   theta_3(tau) = sum_{n in Z} p^{n^2}          = 1 + 2 p + 2 p^4 + ...
 *   theta_4(tau) = sum_{n in Z} (-1)^n p^{n^2}   = 1 - 2 p + 2 p^4 - ...
 *   theta_2(tau) = sum_{n in Z} p^{(n+1/2)^2}    = 2 e^{pi i tau/4} (1 + p^2 + p^6 + ...),
 * with e^{pi i tau/4} exactly that exponential (no branch choice: DLMF 20.2.2).
 * Transformation laws (DLMF 20.7(vii), 20.7(viii)): theta_3(tau + 1) = theta_4(tau),
 * theta_2(tau + 1) = e^{pi i/4} theta_2(tau), theta_3(-1/tau) = sqrt(-i tau) theta_3(tau),
 * theta_4(-1/tau) = sqrt(-i tau) theta_2(tau) (principal roots). Jacobi's identity:
 * theta_3^4 = theta_2^4 + theta_4^4.
 * Method: the sums directly at tau on the fixed-point kernels, powers p^{n^2} by
 * p^{(n+1)^2} = p^{n^2} p^{2n+1} (2 complex multiplies a term); the one complex exp is
 * e^{pi i tau} (theta_3, theta_4) or e^{pi i tau/4} (theta_2). Cancellation (theta_4 and
 * theta_2 are tiny near some cusps: |theta_4(0.02i)| ~ 1e-16) is measured and resolved as
 * in qseries.ts; the theta constants have no zeros in the upper half-plane (Jacobi's triple
 * product, DLMF 20.5(i)), so the results are always relatively accurate.
 *
 *   withDigits(30, () => theta3(Complex.I).toString())   // pi^{1/4} / Gamma(3/4) = 1.08643...
 */
import { Complex } from '../numeric/complex.js';
import * as fx from '../numeric/fixed.js';
import { FxC, cmul } from '../numeric/fixedComplex.js';
import {
  ModularOptions,
  Pass,
  TauParts,
  checkTau,
  checkedEvaluation,
  expTwoPiITau,
  log2AbsC,
  neededBits,
  scaled,
  scaledToComplex,
  smul,
  spow,
  sparseExponentBound,
  toFixedC,
  withBits,
} from './qseries.js';

/**
 * sum_{n=1}^{K} s^n p^{n^2 + b n} at F bits (s = -1 when `alternate`), walking
 * t_{n+1} = t_n d_n, d_{n+1} = d_n p^2, t_1 = p^{1+b}, d_1 = p^{3+b}.
 */
function thetaWalk(p: FxC, F: number, K: number, b: 0 | 1, alternate: boolean): FxC {
  let Sre = 0n;
  let Sim = 0n;
  if (K < 1) return { re: Sre, im: Sim };
  const p2 = cmul(p, p, F);
  let t = b === 0 ? p : p2; // p^{1+b}
  let d = b === 0 ? cmul(p2, p, F) : cmul(p2, p2, F); // p^{3+b}
  for (let n = 1; ; n++) {
    if (alternate && n & 1) {
      Sre -= t.re;
      Sim -= t.im;
    } else {
      Sre += t.re;
      Sim += t.im;
    }
    if (n === K) break;
    t = cmul(t, d, F);
    d = cmul(d, p2, F);
  }
  return { re: Sre, im: Sim };
}

/**
 * Phi with |thetaWalk - exact| <= Phi 2^-F when p carries at most dp units and |p| <= r:
 * term n depends on at most 2n + 3 truncations (< 2 units each, undamped since all moduli
 * are <= 1) and moves by e_n r^(e_n - 1) dp for its exponent e_n.
 */
function walkErrorBound(log2r: number, K: number, b: 0 | 1, dp: number): number {
  const r = 2 ** log2r;
  let phi = 2;
  for (let n = 1; n <= K; n++) {
    const e = n * n + b * n;
    phi += 2 * (2 * n + 3) + dp * e * r ** (e - 1);
  }
  return phi;
}

/** The largest K with K^2 + b K <= G. */
function lastIndex(G: number, b: 0 | 1): number {
  let K = Math.floor(Math.sqrt(G));
  while (K * K + b * K > G) K--;
  return K;
}

/** One pass for theta_3 (alternate = false) or theta_4 (true): 1 + 2 sum_{n>=1} (+-1)^n p^{n^2}. */
function theta34Pass(t: TauParts, need: number, extra: number, alternate: boolean, who: string): Pass {
  const log2r = -Math.PI * t.yf * Math.LOG2E; // |p| = 2^log2r
  const log2L = Math.max(0, 1 + log2r); // largest term: 1 or 2 |p|
  const target = log2L - (need + extra + 3); // tail of 2 sum, so one more bit
  const K = lastIndex(sparseExponentBound(log2r, target, who), 0);
  const F = need + extra + Math.ceil(Math.log2(2 * walkErrorBound(log2r, K, 0, 4)) - log2L) + 3;
  const S = K === 0 ? { re: 0n, im: 0n } : thetaWalk(toFixedC(expTwoPiITau(t, 1, 2, F + 4), F), F, K, 0, alternate);
  const v = { re: fx.one(F) + 2n * S.re, im: 2n * S.im };
  return { value: scaled(v, F), lostBits: log2L - log2AbsC(v, F) };
}

/** One pass for theta_2 = 2 z (1 + sum_{n>=1} p^{n^2 + n}), z = e^{pi i tau/4}, p = z^4. */
function theta2Pass(t: TauParts, need: number, extra: number, who: string): Pass {
  const log2r = -Math.PI * t.yf * Math.LOG2E;
  const target = -(need + extra + 2); // the sum's largest term is 1
  const K = lastIndex(sparseExponentBound(log2r, target, who), 1);
  const F = need + extra + Math.ceil(Math.log2(walkErrorBound(log2r, K, 1, 4))) + 3;
  const z = expTwoPiITau(t, 1, 8, F + 8);
  const p = toFixedC(spow(z, 4), F);
  const S = thetaWalk(p, F, K, 1, false);
  const v = { re: fx.one(F) + S.re, im: S.im };
  const value = smul(withBits(z, F), scaled(v, F, 1)); // the factor 2 as e = 1
  return { value, lostBits: -log2AbsC(v, F) };
}

/** theta_2(tau) = sum_n e^{pi i (n + 1/2)^2 tau} at the precision in force; Im tau >= opts.yMin. */
export function theta2(tau: Complex, opts?: ModularOptions): Complex {
  const who = 'theta_2';
  const t = checkTau(tau, who, opts);
  const need = neededBits();
  return scaledToComplex(checkedEvaluation(need, (extra) => theta2Pass(t, need, extra, who), who));
}

/** theta_3(tau) = sum_n e^{pi i n^2 tau} at the precision in force; Im tau >= opts.yMin. */
export function theta3(tau: Complex, opts?: ModularOptions): Complex {
  const who = 'theta_3';
  const t = checkTau(tau, who, opts);
  const need = neededBits();
  return scaledToComplex(checkedEvaluation(need, (extra) => theta34Pass(t, need, extra, false, who), who));
}

/** theta_4(tau) = sum_n (-1)^n e^{pi i n^2 tau} at the precision in force; Im tau >= opts.yMin. */
export function theta4(tau: Complex, opts?: ModularOptions): Complex {
  const who = 'theta_4';
  const t = checkTau(tau, who, opts);
  const need = neededBits();
  return scaledToComplex(checkedEvaluation(need, (extra) => theta34Pass(t, need, extra, true, who), who));
}
