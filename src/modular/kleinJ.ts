/**
 * Klein's modular invariant j and its exact q-expansion.
 *
 * tau = x + i y with y > 0 and q = e^{2 pi i tau}. Normalisation (Serre, "A Course in
 * Arithmetic", ch. VII 3.3):
 *   j(tau) = E_4(tau)^3 / Delta(tau) = 1/q + 744 + 196884 q + 21493760 q^2 + ...,
 * so j(i) = 1728 and j(rho) = 0, rho = e^{2 pi i/3}. (mpmath's kleinj is j/1728.)
 * Transformation law: j(gamma tau) = j(tau) for gamma in SL(2,Z).
 * Method: E_4 (eisenstein.ts) and Delta (eta.ts), each summed directly at tau to relative
 * accuracy, then one cube and one division. Not E_4^3 - E_6^2 for Delta: that difference
 * cancels badly. At the zeros of E_4 (the orbit of rho) the result is tiny in absolute
 * terms: E_4's guarantee (qseries.ts) carries over, cubed, divided by |Delta|.
 *
 *   withDigits(30, () => kleinJ(Complex.I).toString())   // 1728
 */
import { Complex } from '../numeric/complex.js';
import { ModvetError } from '../numeric/errors.js';
import { eisensteinCoefficients, eisensteinScaled } from './eisenstein.js';
import { discriminantScaled, etaProductPowerCoefficients } from './eta.js';
import { ModularOptions, checkTau, neededBits, scaledToComplex, sdiv, spow, tauRoot, withBits } from './qseries.js';

/** j(tau) at the precision in force; Im tau >= opts.yMin (default 0.02). */
export function kleinJ(tau: Complex, opts?: ModularOptions): Complex {
  const who = 'j';
  const t = checkTau(tau, who, opts);
  const need = neededBits();
  // one exp for both series: the bits E_4's q-series asks for in all but extreme cases
  tauRoot(t, need + 140);
  // relative errors add: 3 from E_4^3, 1 from Delta, a few units from the operations
  const E = eisensteinScaled(4, t, need + 4, who);
  const D = discriminantScaled(t, need + 4, who);
  const F = need + 12;
  return scaledToComplex(sdiv(spow(withBits(E, F), 3), withBits(D, F)));
}

let jCache: bigint[] = [];

/**
 * [c(-1), c(0), c(1), ..., c(N)], the coefficients of j = sum_{m >= -1} c(m) q^m, exact
 * (OEIS A000521): q j = E_4^3 prod (1 - q^n)^-24, E_4 from eisensteinCoefficients.
 */
export function kleinJCoefficients(N: number): bigint[] {
  if (!Number.isSafeInteger(N) || N < -1) {
    throw new ModvetError('domain', 'j', `N = ${N} must be an integer >= -1`);
  }
  const M = N + 1; // q j up to q^M
  if (jCache.length <= M) {
    const L = Math.max(M, 2 * jCache.length, 32);
    const e4 = eisensteinCoefficients(4, L).map((r) => r.num); // integers: 240 sigma_3(n)
    const e4sq = convolve(e4, e4, L);
    const e4cube = convolve(e4sq, e4, L);
    jCache = convolve(e4cube, etaProductPowerCoefficients(-24, L), L);
  }
  return jCache.slice(0, M + 1);
}

/** Coefficients 0..L of the product of two power series. */
function convolve(a: readonly bigint[], b: readonly bigint[], L: number): bigint[] {
  const out: bigint[] = [];
  for (let n = 0; n <= L; n++) {
    let s = 0n;
    for (let i = 0; i <= n; i++) s += a[i]! * b[n - i]!;
    out.push(s);
  }
  return out;
}
