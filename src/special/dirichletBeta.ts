/**
 * The Dirichlet beta function beta(s) = sum_{n>=0} (-1)^n (2n+1)^-s, i.e. L(s, chi_4) for the
 * non-principal character mod 4, continued to an entire function of complex s.
 *
 * Conventions: results carry the current precision (precision.ts) to about one unit in the
 * last place, relative; beta(1) = pi/4, beta(2) = Catalan's constant, beta(0) = 1/2.
 *
 * Method, on the BigInt fixed-point kernels shared with zeta.ts:
 * - Re s >= 0: the first N terms summed directly, the alternating tail by the Euler-Boole
 *   summation formula (J. M. Borwein, N. J. Calkin, D. Manna, "Euler-Boole summation
 *   revisited", Amer. Math. Monthly 116 (2009) 387-412) with h = 0:
 *     sum_{j>=0} (-1)^j f(j) = f(0)/2 - sum_{k=1}^M (2^{2k} - 1) B_{2k}/(2k)! f^{(2k-1)}(0) + R_M,
 *   f(x) = (2x + m)^-s, m = 2N + 1. The remainder is |R_M| <= |T_M| |s+2M-1| / (Re s + 2M - 1)
 *   (the periodic Euler function is bounded by |E_{2M-1}(0)|), and N, M come from the same
 *   cost model as zeta's Euler-Maclaurin. Only odd n^-s are needed: odd primes cost an exp
 *   and a sincos, odd composites a product.
 * - Re s < 0: the functional equation of L(s, chi_4) (DLMF 25.15.5 specialised),
 *   beta(s) = (2/pi)^{1-s} cos(pi s/2) Gamma(1-s) beta(1-s), evaluated as exp(log factor).
 * - Im s < 0 by beta(conj s) = conj beta(s); exact values at the integers s <= 0:
 *   beta(-n) = E_n / 2 (Euler numbers, DLMF 24.2.6), so beta(-1) = beta(-3) = ... = 0.
 *
 *   withDigits(40, () => dirichletBeta(Complex.of(2)).toString())   // 0.9159655941772190150546...
 */
import { Decimal } from 'decimal.js';
import { Complex } from '../numeric/complex.js';
import * as fx from '../numeric/fixed.js';
import { ModvetError } from '../numeric/errors.js';
import { type FxC, cexpSplit, cmul, csqr, fromComplex, toComplex } from '../numeric/fixedComplex.js';
import { bitsFor } from '../numeric/precision.js';
import { logGammaFx } from './gamma.js';
import {
  type Scaled,
  type TailShape,
  MAX_IM_S,
  cmulWide,
  estimateLog2,
  lnPiFx,
  log2Sum,
  logFactorBits,
  logSinHalfPiFx,
  negPowers,
  planTail,
  retryUntilAccurate,
  shiftExact,
  zetaEvenFx,
} from './zeta.js';

// ---------------------------------------------------------------------------
// Euler numbers for the exact values at negative integers

/** E_0, E_2, E_4, ... as exact integers, cached (E_{odd} = 0). */
const eulerEven: bigint[] = [1n];
/**
 * E_{2n} from sum_{k=0}^{n} C(2n, 2k) E_{2k} = 0 (n >= 1), which is sech t cosh t = 1 written
 * with the generating function sech t = sum E_n t^n / n! (DLMF 24.2.6).
 */
function eulerNumber(n2: number): bigint {
  for (let n = eulerEven.length; n <= n2; n++) {
    let sum = 0n;
    let binom = 1n; // C(2n, 2k)
    for (let k = 0; k < n; k++) {
      sum += binom * eulerEven[k]!;
      const a = BigInt(2 * k);
      binom = (binom * (BigInt(2 * n) - a) * (BigInt(2 * n) - a - 1n)) / ((a + 1n) * (a + 2n));
    }
    eulerEven.push(-sum);
  }
  return eulerEven[n2]!;
}

/** beta(-n) exactly from E_n up to this n; beyond it the functional equation is cheaper. */
const EXACT_NEGATIVE_MAX = 400;

// ---------------------------------------------------------------------------
// Euler-Boole summation for Re s >= 0

/** |T_k| <= lambda(2) |(s)_{2k-1}| m^{1-Re s} (pi m / 2)^{-2k}, remainder after T_M included. */
const BETA_TAIL: TailShape = { c: Math.PI / 2, coef: 1.2337005501361698, lastIncluded: true, oddOnly: true };

/**
 * sum_{n<N} (-1)^n (2n+1)^-s + (-1)^N [m^-s/2 + sum_{k=1}^M (-1)^{k+1} lambda(2k) W_k] with
 * m = 2N + 1 and W_k = (s)_{2k-1} m^{1-s-2k} (2/pi)^{2k}: the Euler-Boole coefficient
 * (2^{2k}-1) B_{2k} 2^{2k-1}/(2k)! is (-1)^{k+1} lambda(2k) (2/pi)^{2k}, where
 * lambda(2k) = (1 - 2^{-2k}) zeta(2k) (DLMF 25.6.2), which keeps the fixed-point W_k well scaled.
 */
function betaBoole(s: FxC, m: number, M: number, F: number): FxC {
  const pw = negPowers(s, m, F, true);
  let re = 0n;
  let im = 0n;
  for (let n = 1; n < m; n += 2) {
    if ((n & 3) === 1) {
      re += pw[n]!.re;
      im += pw[n]!.im;
    } else {
      re -= pw[n]!.re;
      im -= pw[n]!.im;
    }
  }
  const Pm = pw[m]!;
  let tre = Pm.re >> 1n;
  let tim = Pm.im >> 1n;
  if (M > 0) {
    const bm = BigInt(m);
    const pi2 = fx.mul(fx.pi(F), fx.pi(F), F);
    const D = (pi2 * bm * bm) >> 2n; // (pi m / 2)^2 at F bits
    const sP = cmul(s, Pm, F);
    // W_1 = s m^-s / m * (2/pi)^2
    let W: FxC = { re: (sP.re << BigInt(F + 2)) / (pi2 * bm), im: (sP.im << BigInt(F + 2)) / (pi2 * bm) };
    const s2 = csqr(s, F);
    const o = fx.one(F);
    for (let k = 1; k <= M; k++) {
      const z = zetaEvenFx(k, F);
      const lam = z - (z >> BigInt(2 * k));
      const Tre = (W.re * lam) >> BigInt(F);
      const Tim = (W.im * lam) >> BigInt(F);
      if (k % 2 === 1) {
        tre += Tre;
        tim += Tim;
      } else {
        tre -= Tre;
        tim -= Tim;
      }
      if (k < M) {
        // W_{k+1} = W_k (s + 2k - 1)(s + 2k) / (pi m / 2)^2
        const a = BigInt(2 * k - 1);
        const q: FxC = { re: s2.re + (2n * a + 1n) * s.re + a * (a + 1n) * o, im: s2.im + (2n * a + 1n) * s.im };
        W = { re: (W.re * q.re - W.im * q.im) / D, im: (W.re * q.im + W.im * q.re) / D };
      }
    }
  }
  // the tail starts at n = N = (m - 1)/2 with sign (-1)^N
  if (((m - 1) >> 1) % 2 === 0) {
    re += tre;
    im += tim;
  } else {
    re -= tre;
    im -= tim;
  }
  return { re, im };
}

/** beta(s) by Euler-Boole (meant for Re s >= 0), relative error below 2^-bits. */
function betaDirectFx(s: Complex, bits: number): Scaled {
  const sigma = s.re.toNumber();
  const t = s.im.toNumber();
  // beta(s) = 1 - O(3^-Re s): beyond this it rounds to 1 at any precision up to `bits`
  if (sigma * Math.log2(3) > bits + 8) return { v: { re: fx.one(64), im: 0n }, F: 64, k: 0 };
  // a small |beta| (near a zero) costs its size in bits: start with them
  const firstExtra = Math.max(0, Math.ceil(-estimateLog2(sigma, t, true)) + 2);
  return retryUntilAccurate('dirichletBeta', bits, firstExtra, (extra) => {
    const tgt = -(bits + 6 + extra);
    const { X: m, M } = planTail(sigma, t, tgt / Math.LOG2E, BETA_TAIL);
    const count = (m / 2) * (Math.log(m) + Math.abs(t) + 6) + 10 * M + 8;
    const F = Math.ceil(bits + 8 + extra + Math.log2(count));
    const v = betaBoole(fromComplex(s, F), m, M, F);
    return { v, F, errLog2: log2Sum(Math.log2(count) - F, tgt) };
  });
}

/**
 * beta(s) for Re s < 0, Im s >= 0: beta(s) = (2/pi)^{1-s} cos(pi s/2) Gamma(1-s) beta(1-s),
 * with cos(pi s/2) = sin(pi (s+1)/2) and the factor taken as exp of its logarithm.
 */
function betaReflectedFx(s: Complex, bits: number): Scaled {
  const FL = logFactorBits(s, bits);
  const oms = shiftExact(s, 1, -1);
  const sp1 = shiftExact(s, 1, 1);
  const omsF = fromComplex(oms, FL);
  const lg = logGammaFx(omsF, FL);
  const lc = logSinHalfPiFx(sp1, FL);
  const l2p = fx.ln2(FL) - lnPiFx(FL); // log(2/pi)
  const L: FxC = {
    re: fx.mul(omsF.re, l2p, FL) + lc.re + lg.re,
    im: fx.mul(omsF.im, l2p, FL) + lc.im + lg.im,
  };
  const [w, k] = cexpSplit(L, FL);
  const b1 = betaDirectFx(oms, bits + 4);
  return { v: cmulWide(w, b1.v), F: FL + b1.F, k: k + b1.k };
}

/** The Dirichlet beta function at the current precision (see the module header). */
export function dirichletBeta(s: Complex): Complex {
  if (s.im.abs().gt(MAX_IM_S)) {
    throw new ModvetError('domain', 'beta', `|Im s| = ${s.im.abs().toSD(6)} is above the supported ${MAX_IM_S}`);
  }
  if (s.im.isZero() && s.re.isInteger() && s.re.lte(0) && s.re.gte(-EXACT_NEGATIVE_MAX)) {
    // beta(-n) = E_n / 2 (DLMF 24.2.6 generating function; E_n = 0 for odd n)
    const n = -s.re.toNumber();
    if (n % 2 === 1) return Complex.ZERO;
    return new Complex(new Decimal(eulerNumber(n / 2).toString()).div(2), 0);
  }
  // beta(conj s) = conj beta(s): the coefficients are real
  if (s.im.isNegative()) return dirichletBeta(s.conj()).conj();
  const bits = bitsFor(Decimal.precision);
  const r = s.re.isNegative() ? betaReflectedFx(s, bits) : betaDirectFx(s, bits);
  const b = toComplex(r.v, r.F, r.k);
  return s.im.isZero() ? new Complex(b.re, 0) : b;
}
