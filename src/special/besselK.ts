/**
 * The modified Bessel function of the second kind K_nu(x): complex order nu, real x > 0.
 *
 * Conventions: K_nu(x) = int_0^inf e^{-x cosh t} cosh(nu t) dt (DLMF 10.32.9), the solution
 * of x^2 w'' + x w' - (x^2 + nu^2) w = 0 that decays as x -> +inf (DLMF 10.25.1, 10.25.3).
 * K_{-nu} = K_nu (10.27.3) and K_{conj nu}(x) = conj K_nu(x), so K is real for real nu and
 * for purely imaginary nu; those results have an exactly zero imaginary part. Results carry
 * the current precision (precision.ts), about 1 ulp relative to |K|. x <= 0 throws
 * ModvetError('domain', 'K').
 *
 *   withDigits(50, () => besselK(Complex.of('0.7', '3.1'), new Decimal(6)).toString())
 *
 * Three methods, all on the BigInt fixed-point kernels (fixed.ts; decimal.js only at the
 * interface); the first two are chosen per call by a cost model fitted to measured timings:
 *
 * 1. Quadrature: the trapezoidal rule on the integral above. The integrand f(t) is even and
 *    analytic in the strip |Im t| < pi/2, so with step h the rule on the whole line has error
 *    at most 2 M(a) / (e^{2 pi a / h} - 1), M(a) = sup_{|s|<a} int |f(t + i s)| dt (Trefethen &
 *    Weideman, "The exponentially convergent trapezoidal rule", SIAM Review 56 (2014),
 *    Thm 5.1). Since |e^{-x cosh(t+is)}| = e^{-x cos s cosh t} and
 *    |cosh(nu (t+is))| <= e^{|Im nu| s} cosh(Re nu t), M(a) <= e^{|Im nu| a} 2 K_{|Re nu|}(x cos a);
 *    a and h are chosen per call to minimise the number of nodes. The integrand decays like
 *    e^{-x e^t / 2}: the sum stops at the first node past the peak where a geometric bound on
 *    the tail is small. Per node: one table-driven e^{-y} and a few multiplications, because
 *    y_j = x (cosh jh - 1) and cosh(nu jh) both satisfy u_{j+1} = 2 cosh(h) u_j - u_{j-1} (+ c).
 *    e^{-x} is factored out, so K_nu(50) ~ e^{-50} keeps its relative precision. Works for
 *    every order, integer or not; best for x above a few units.
 * 2. Series (non-integer nu, small to moderate x): K = (pi/2)(I_{-nu} - I_nu)/sin(nu pi)
 *    (DLMF 10.27.4) with the power series of I (10.25.2), one complex Gamma(1 + nu) (gamma.ts).
 *    Its cancellation (near integer nu, and e^{2x} for large x) is predicted in double
 *    precision and paid for with bits; the cost model then prefers the quadrature.
 * 3. Half-integer real order nu = +-(n + 1/2), n small: the terminating sum of DLMF 10.49.12
 *    (the case s integer of the Eisenstein series, nu = s - 1/2).
 *
 * The precision of a pass is set from an estimate of |K| (saddle point of e^{-x cosh t + nu t},
 * Olver, "Asymptotics and Special Functions" (1974), ch. 3-4) and checked afterwards: when the
 * integrand oscillates (large |Im nu|, small x) or K is near a zero, the result is far smaller
 * than the terms that made it, and a result below the estimate triggers a pass planned with
 * the measured size. Cancellation is paid for with extra bits, never with accuracy.
 *
 * besselKMultiples(nu, x0, N) gives K_nu(n x0) for n = 1..N on one shared set of quadrature
 * nodes: e^{-n x0 (cosh t_j - 1)} = (e^{-x0 (cosh t_j - 1)})^n and cosh(nu t_j) does not depend
 * on n, as the Fourier expansion of the non-holomorphic Eisenstein series needs.
 */
import { Decimal } from 'decimal.js';
import { Complex } from '../numeric/complex.js';
import { fromFixed, toFixed } from '../numeric/convert.js';
import { ModvetError } from '../numeric/errors.js';
import * as fx from '../numeric/fixed.js';
import * as fxc from '../numeric/fixedComplex.js';
import { bitsFor, withGuard } from '../numeric/precision.js';
import { gammaFx, gammaRealFx } from './gamma.js';

const LN2 = Math.LN2;
/** A result this many bits below its estimate is recomputed with the measured size. */
const SLACK_BITS = 8;
/** Largest number of bits a pass may use before the function gives up. */
const MAX_BITS = 60000;
const MAX_NODES = 2_000_000;
/** Beyond this many terms (|nu| or x in the thousands) the series never beats the quadrature. */
const MAX_TERMS = 20_000;
/** The arguments the double-precision planning can represent faithfully. */
const X_MIN = 1e-250;
const X_MAX = 1e15;

// ---------------------------------------------------------------------------
// e^{-y} for y >= 0 in fixed point, table driven

/**
 * Tables for e^{-y} at F bits. y = k log 2 + r with |r| <= log(2)/2, u = r + 1/2 in (0, 1),
 * u = sum of L bytes + v, v < 2^{-8L}: e^{-y} = 2^{-k} e^{1/2} prod_l T_l[byte_l] e^{-v}, the
 * last factor by its Taylor polynomial (n terms). L is chosen to minimise L + n.
 */
interface ExpTable {
  F: number;
  f: bigint;
  L: number;
  /** levels[l][i] = e^{-i 2^{-8(l+1)}}; level 0 also carries the factor e^{1/2}. */
  levels: bigint[][];
  /** (-1)^i / i! for i = 0..n. */
  coef: bigint[];
  /** log 2 at F + 16 bits. */
  ln2: bigint;
  half: bigint;
  lowMask: bigint;
  topShift: bigint;
  toFloatShift: bigint;
}

const expTables = new Map<number, ExpTable>();

function log2Factorial(n: number): number {
  let s = 0;
  for (let i = 2; i <= n; i++) s += Math.log2(i);
  return s;
}

function taylorTerms(bitsSmall: number, F: number): number {
  let n = 1;
  while (bitsSmall * (n + 1) + log2Factorial(n + 1) < F + 4) n++;
  return n;
}

const expShapes = new Map<number, { L: number; n: number }>();

/** The number L of byte tables and n of Taylor terms minimising L + n at F bits. */
function expShape(F: number): { L: number; n: number } {
  let shape = expShapes.get(F);
  if (shape === undefined) {
    let L = 2;
    for (let l = 3; l <= 6; l++) if (l + taylorTerms(8 * l, F) < L + taylorTerms(8 * L, F)) L = l;
    shape = { L, n: taylorTerms(8 * L, F) };
    expShapes.set(F, shape);
  }
  return shape;
}

function expTable(F: number): ExpTable {
  const cached = expTables.get(F);
  if (cached !== undefined) return cached;
  const { L, n } = expShape(F);
  const G = 24;
  const W = F + G;
  const levels: bigint[][] = [];
  for (let l = 0; l < L; l++) {
    const step = fx.exp(-(1n << BigInt(W - 8 * (l + 1))), W); // e^{-2^{-8(l+1)}}
    let v = l === 0 ? fx.exp(1n << BigInt(W - 1), W) : fx.one(W);
    const row: bigint[] = [];
    for (let i = 0; i < 256; i++) {
      row.push(v >> BigInt(G));
      v = fx.mul(v, step, W);
    }
    levels.push(row);
  }
  const coef: bigint[] = [];
  let c = fx.one(W);
  for (let i = 0; i <= n; i++) {
    if (i > 0) c /= BigInt(i);
    coef.push((i % 2 === 0 ? c : -c) >> BigInt(G));
  }
  const t: ExpTable = {
    F,
    f: BigInt(F),
    L,
    levels,
    coef,
    ln2: fx.ln2(F + 16),
    half: 1n << BigInt(F - 1),
    lowMask: (1n << BigInt(F - 8 * L)) - 1n,
    topShift: BigInt(F - 8 * L),
    toFloatShift: BigInt(F - 30),
  };
  if (expTables.size >= 12) expTables.delete(expTables.keys().next().value as number);
  expTables.set(F, t);
  return t;
}

/**
 * e^{-y} = m 2^{-F} 2^{-k} for y >= 0 at F bits, m / 2^F in [0.7, 1.42]: full relative
 * precision (error a few units of 2^-F relative) for any size of y.
 */
function expNeg(y: bigint, T: ExpTable): [bigint, number] {
  const f = T.f;
  const k = Math.round(Number(y >> T.toFloatShift) / (2 ** 30 * LN2));
  const u = y - ((BigInt(k) * T.ln2) >> 16n) + T.half; // r + 1/2, in (0.15, 0.85)
  const v = u & T.lowMask;
  let top = Number(u >> T.topShift);
  const coef = T.coef;
  let p = coef[coef.length - 1]!;
  for (let i = coef.length - 2; i >= 0; i--) p = coef[i]! + ((p * v) >> f);
  for (let l = T.L - 1; l >= 0; l--) {
    const b = top % 256;
    top = (top - b) / 256;
    p = (p * T.levels[l]![b]!) >> f;
  }
  return [p, k];
}

// ---------------------------------------------------------------------------
// Double-precision planning: sizes, step, truncation and working precision

/**
 * An upper estimate of log int_R e^{-y cosh t + alpha t} dt = log 2 K_alpha(y): Laplace's
 * method at the maximum sinh t* = alpha / y, where y cosh t* = sqrt(y^2 + alpha^2); checked
 * against mpmath for alpha in [0, 40], y in [1e-8, 1e4], the true value exceeds it by at most
 * 0.49 (callers add log 4). For y < 1 and alpha <= 1, where Laplace's method overshoots by up to
 * log(1/y)/2, capped by the bound of smallXBound.
 */
function lnTwoKReal(alpha: number, y: number): number {
  const c = Math.hypot(y, alpha);
  const laplace = -c + alpha * Math.asinh(alpha / y) + 0.5 * Math.log((2 * Math.PI) / c);
  return y < 1 && alpha <= 1 ? Math.min(laplace, LN2 + smallXBound(alpha, y)) : laplace;
}

/**
 * log of a bound on K_alpha(y) for 0 <= alpha <= 1, y < 1: split int_0^inf at t0 = log(2/y);
 * below, e^{-y cosh t} <= 1; above, u = y e^t / 2 gives at most (2/y)^alpha Gamma(alpha, 1)
 * with Gamma(alpha, 1) <= 1/e. So K_alpha(y) <= sinh(alpha t0)/alpha + e^{alpha t0 - 1}.
 */
function smallXBound(alpha: number, y: number): number {
  const t0 = Math.log(2 / y);
  const flat = alpha === 0 ? t0 : Math.sinh(alpha * t0) / alpha;
  return Math.log(flat + Math.exp(alpha * t0 - 1));
}

/**
 * An estimate of log |K_nu(x)| (alpha = |Re nu|, beta = |Im nu|) by the saddle point of
 * e^{-x cosh t + nu t}: sinh t* = w = nu / x, x cosh t* = x sqrt(1 + w^2) (principal roots).
 * Near the turning point x = |nu| the Gaussian width is capped at the Airy scale |nu|^{1/3}.
 * For x < 1 and alpha <= 1 it is also capped by smallXBound, since |K_nu| <= K_alpha and
 * Laplace's method overshoots when nu and x are both small.
 * Measured against mpmath on 3000 random arguments (|Re nu| <= 12, |Im nu| <= 20,
 * 0.01 <= x <= 50): never more than 0.76 below the truth; it is above it only near zeros of
 * K (by more than 6 bits in 0.07% of cases), which the pass check absorbs.
 */
function lnAbsKEstimate(alpha: number, beta: number, x: number): number {
  const wr = alpha / x;
  const wi = beta / x;
  // q = sqrt(1 + w^2), principal; for huge |w|, q = w to double precision
  let qr = wr;
  let qi = wi;
  if (Math.hypot(wr, wi) < 1e150) {
    const zr = 1 + wr * wr - wi * wi;
    const zi = 2 * wr * wi;
    const mod = Math.hypot(zr, zi);
    qr = Math.sqrt((mod + zr) / 2);
    qi = Math.sqrt(Math.max(0, (mod - zr) / 2));
  }
  // nu t* = nu log(w + q)
  const lr = Math.log(Math.hypot(wr + qr, wi + qi));
  const li = Math.atan2(wi + qi, wr + qr);
  const expo = -x * qr + alpha * lr - beta * li;
  const width = Math.max(x * Math.hypot(qr, qi), 0.5 * Math.cbrt(Math.hypot(alpha, beta)));
  const saddle = expo + 0.5 * Math.log((2 * Math.PI) / width) - LN2;
  return x < 1 && alpha <= 1 ? Math.min(saddle, smallXBound(alpha, x)) : saddle;
}

interface Plan {
  h: number;
  /** Nodes t_j = j h for j = 0..J. */
  J: number;
  /** Relative working bits of the nodal kernels. */
  F: number;
  /** Absolute fractional bits of the accumulated sum. */
  R: number;
}

/** log(1 + M(a)/eps) for the bound M(a) <= e^{beta a} 2 K_alpha(x cos a) (times 4, see lnTwoKReal). */
function stepDenominator(alpha: number, beta: number, x: number, lnEps: number, a: number): number {
  const q = beta * a + lnTwoKReal(alpha, x * Math.cos(a)) + Math.log(4) - lnEps;
  return q > 30 ? q : Math.log1p(Math.exp(q));
}

/**
 * The step h(a) = 2 pi a / log(1 + M(a)/eps), maximised over the strip half-width
 * 0 < a < pi/2 by golden-section search. Any a < pi/2 gives a valid bound; the search only
 * affects the number of nodes.
 */
function chooseStep(alpha: number, beta: number, x: number, lnEps: number): number {
  const hOf = (a: number) => (2 * Math.PI * a) / stepDenominator(alpha, beta, x, lnEps, a);
  const g = (Math.sqrt(5) - 1) / 2;
  let lo = 1e-9;
  let hi = Math.PI / 2 - 1e-9;
  let a1 = hi - g * (hi - lo);
  let a2 = lo + g * (hi - lo);
  let h1 = hOf(a1);
  let h2 = hOf(a2);
  for (let i = 0; i < 40 && hi - lo > 1e-4; i++) {
    if (h1 < h2) {
      lo = a1;
      a1 = a2;
      h1 = h2;
      a2 = lo + g * (hi - lo);
      h2 = hOf(a2);
    } else {
      hi = a2;
      a2 = a1;
      h2 = h1;
      a1 = hi - g * (hi - lo);
      h1 = hOf(a1);
    }
  }
  return Math.min(Math.max(h1, h2), 1);
}

/** The optimal step of planTrapezoid, alone. */
function stepFor(alpha: number, beta: number, x: number, pbits: number, lnEst: number): number {
  return chooseStep(alpha, beta, x, lnEst - pbits * LN2 - Math.log(8));
}

/**
 * Error budget (each part at most eps/8, eps = |K|est 2^-pbits, for K = h e^{-x} S,
 * S = sum' tau_j, tau_j = e^{-y_j} cosh(nu t_j) with |tau_j| <= e^{-y_j + alpha t_j}):
 *  - discretisation: M(a) / (e^{2 pi a / h} - 1) (Trefethen & Weideman, above);
 *  - truncation after node J: past the peak, log tau is concave with slope -sigma,
 *    sigma = x sinh t_J - alpha > 0, so sum_{j>J} <= tau_J / (e^{sigma h} - 1);
 *  - nodal rounding: the recurrences' Green functions are sinh(m theta)/sinh(theta), of size
 *    at most m e^{(m-1) alpha h} for cosh(nu t), and G_j = sum_{m<=j} sinh(mh)/sinh(h) for y_j,
 *    so the relative error of tau_j is at most w_j 2^-F, w_j = w0 + 1.5 j^2 + j
 *    + (2 + y_j) 2 G_j 2^-gy (y is carried with gy more bits, yGuard), and the total is
 *    h e^{-x} sum_j w_j e^{-y_j + alpha t_j} 2^-F;
 *  - accumulation: one unit of 2^-R per node.
 * The planning itself runs in double precision on recurrences (e^{t_j} = e^{h} e^{t_{j-1}}),
 * which only has to get logarithms right to a few percent.
 */
function planTrapezoid(
  alpha: number,
  beta: number,
  x: number,
  pbits: number,
  lnEst: number,
  step?: number,
): Plan {
  const lnPart = lnEst - pbits * LN2 - Math.log(8);
  // a smaller step than the optimal one only lowers the discretisation error
  const h = step ?? chooseStep(alpha, beta, x, lnPart);
  const lnH = Math.log(h);
  const eh = Math.exp(h);
  const invSinhH = 1 / Math.sinh(h);
  // the largest exponent -y + alpha t, at sinh t* = alpha / x, is the reference for the sum
  const tPeak = Math.asinh(alpha / x);
  const ref = -(Math.hypot(x, alpha) - x) + alpha * tPeak;
  const lnStop = lnPart + x - lnH; // tau_J / (e^{sigma h} - 1) must fall below e^{lnStop}
  // rounding of one table-driven exponential: n + 2L + a few ulps, n + 2L < F/40 + 12
  const w0 = 20 + (pbits + 64) / 32;
  const yScale = 2 ** -yGuard(x);
  let E = 1; // e^{t_j}
  let G = 0;
  let sum = 0;
  let J = 0;
  for (let j = 0; ; j++) {
    const t = j * h;
    const em1 = E - 1;
    const y = (x * em1 * em1) / (2 * E); // x (cosh t - 1)
    const lnTau = -y + alpha * t;
    const sinhT = (E - 1 / E) / 2;
    G += sinhT * invSinhH;
    const w = w0 + 1.5 * j * j + j + (2 + y) * 2 * G * yScale;
    sum += Math.exp(lnTau - ref) * w;
    if (lnTau < lnStop + 40) {
      const sigma = x * sinhT - alpha;
      if (sigma > 0 && lnTau - Math.log(Math.expm1(sigma * h)) <= lnStop) {
        J = j;
        break;
      }
    }
    if (j >= MAX_NODES) throw new ModvetError('convergence', 'K', 'too many quadrature nodes');
    E *= eh;
  }
  const lnW = ref + Math.log(sum);
  let F = Math.ceil((lnH - x + lnW - lnPart) / LN2);
  F = Math.max(F, pbits + 16);
  F = Math.ceil(F / 32) * 32;
  const R = Math.ceil((lnH - x + Math.log(J + 1) - lnPart) / LN2);
  if (F > MAX_BITS) throw new ModvetError('convergence', 'K', 'cancellation too severe to resolve');
  return { h, J, F, R };
}

// ---------------------------------------------------------------------------
// The trapezoidal sum on fixed-point kernels

interface FixedOrder {
  /** Re nu, Im nu at `bits` fractional bits. */
  re: bigint;
  im: bigint;
  bits: number;
  /** cosh(nu t) is real (nu real or purely imaginary). */
  real: boolean;
}

function fixedOrder(nu: Complex, bits: number): FixedOrder {
  return {
    re: toFixed(nu.re, bits),
    im: toFixed(nu.im, bits),
    bits,
    real: nu.re.isZero() || nu.im.isZero(),
  };
}

/** cosh(nu h) at F bits for h a double: one exponential, a division and one sincos. */
function coshNuH(nu: FixedOrder, h: number, F: number): { re: bigint; im: bigint } {
  const W = F + 16;
  const hW = fx.fromFloat(h, W);
  const ar = fx.rescale(nu.re * hW, nu.bits + W, W);
  const ai = fx.rescale(nu.im * hW, nu.bits + W, W);
  const ep = fx.exp(ar, W);
  const em = fx.div(fx.one(W), ep, W);
  const ch = (ep + em) >> 1n;
  const sh = (ep - em) >> 1n;
  if (ai === 0n) return { re: ch >> 16n, im: 0n };
  const [s, c] = fx.sincos(ai, W);
  return { re: fx.mul(ch, c, W) >> 16n, im: fx.mul(sh, s, W) >> 16n };
}

/**
 * The y recurrence constants at Fy bits: D = 2 cosh h and y_1 = x (cosh h - 1) = 2 x sinh^2(h/2),
 * from the single exponential e^{h/2} (sinh(h/2) keeps its relative precision: W has
 * log2(1/h) extra bits).
 */
function yConstants(x: Decimal, h: number, Fy: number): { D: bigint; y1: bigint } {
  const W = Fy + 16 + Math.max(0, Math.ceil(-Math.log2(h)));
  const e = fx.exp(fx.fromFloat(h / 2, W), W);
  const ei = fx.div(fx.one(W), e, W);
  const ch = fx.mul(e, e, W) + fx.mul(ei, ei, W); // 2 cosh h
  const D = ch >> BigInt(W - Fy);
  const sh = (e - ei) >> 1n;
  const y1 = (2n * toFixed(x, W) * fx.mul(sh, sh, W)) >> BigInt(2 * W - Fy);
  return { D, y1 };
}

/**
 * Extra fractional bits of the y recurrence: its rounding errors grow like e^{t_j} / h^2
 * whatever x, while y_j = x (cosh t_j - 1) ~ x e^{t_j} / 2, so a small x needs log2(1/x) more
 * (the weights of planTrapezoid assume 24 + that).
 */
function yGuard(x: number): number {
  return 24 + Math.max(0, Math.ceil(-Math.log2(x)));
}

/**
 * The shift that brings a recurrence value of more than F + 40 bits back to F bits (at least
 * 40; more when Re(nu) h is large and the values grow by many bits a step).
 */
function rescaleBits(re: bigint, im: bigint, F: number): number {
  return Math.max(40, Math.max(fx.bitLength(re), fx.bitLength(im)) - F);
}

/** Shift a by s bits (left for s > 0). */
function shift(a: bigint, s: number): bigint {
  return s >= 0 ? a << BigInt(s) : a >> BigInt(-s);
}

/**
 * S = sum_{j=0}^{J}' e^{-y_j} cosh(nu t_j) (first term halved) as A 2^{-R}. The values of
 * cosh(nu t_j) are kept as C 2^{ec - F}, rescaling both recurrence values together when |C|
 * passes 2^{F+40} (the recurrence is linear), so growth like e^{Re nu t} never costs bits.
 */
function trapezoidSum(nu: FixedOrder, x: Decimal, plan: Plan): { re: bigint; im: bigint } {
  const { h, J, F, R } = plan;
  const f = BigInt(F);
  const gy = yGuard(x.toNumber());
  const Fy = F + gy;
  const fy = BigInt(Fy);
  const T = expTable(F);
  const { D, y1 } = yConstants(x, h, Fy);
  const kappa = 2n * y1;
  const C = coshNuH(nu, h, F);
  const C2re = 2n * C.re;
  const C2im = 2n * C.im;
  const LIM = 1n << BigInt(F + 40);
  const one = 1n << f;
  const bgy = BigInt(gy);
  let Are = shift(1n, R - 1); // j = 0: tau_0 = 1 with weight 1/2
  let Aim = 0n;
  let yPrev = 0n;
  let yCur = y1;
  let cPrevRe = one;
  let cPrevIm = 0n;
  let cRe = C.re;
  let cIm = C.im;
  let ec = 0;
  const base = R - 2 * F;
  for (let j = 1; j <= J; j++) {
    const [m, k] = expNeg(yCur >> bgy, T);
    const s = base + ec - k;
    if (s >= 0) {
      const b = BigInt(s);
      Are += (m * cRe) << b;
      if (!nu.real) Aim += (m * cIm) << b;
    } else if (s > -4 * F) {
      const b = BigInt(-s);
      Are += (m * cRe) >> b;
      if (!nu.real) Aim += (m * cIm) >> b;
    }
    const yNext = ((D * yCur) >> fy) - yPrev + kappa;
    yPrev = yCur;
    yCur = yNext;
    if (nu.real) {
      const nRe = ((C2re * cRe) >> f) - cPrevRe;
      cPrevRe = cRe;
      cRe = nRe;
      if (cRe > LIM || cRe < -LIM) {
        const d = rescaleBits(cRe, 0n, F);
        cRe >>= BigInt(d);
        cPrevRe >>= BigInt(d);
        ec += d;
      }
    } else {
      const nRe = ((C2re * cRe - C2im * cIm) >> f) - cPrevRe;
      const nIm = ((C2re * cIm + C2im * cRe) >> f) - cPrevIm;
      cPrevRe = cRe;
      cPrevIm = cIm;
      cRe = nRe;
      cIm = nIm;
      if (cRe > LIM || cRe < -LIM || cIm > LIM || cIm < -LIM) {
        const d = BigInt(rescaleBits(cRe, cIm, F));
        cRe >>= d;
        cPrevRe >>= d;
        cIm >>= d;
        cPrevIm >>= d;
        ec += Number(d);
      }
    }
  }
  return { re: Are, im: Aim };
}

// ---------------------------------------------------------------------------
// The power series for small x

/**
 * log |Gamma(a + ib)| for a >= 1 in double precision: shift to a >= 10 (DLMF 5.5.1), then
 * three terms of Stirling's series (DLMF 5.11.1); absolute error below 1e-9.
 */
function lnAbsGammaD(a: number, b: number): number {
  let acc = 0;
  for (; a < 10; a += 1) acc -= 0.5 * Math.log(a * a + b * b);
  const r2 = a * a + b * b;
  const th = Math.atan2(b, a);
  let s = 0.5 * (a - 0.5) * Math.log(r2) - b * th - a + 0.5 * Math.log(2 * Math.PI);
  s += a / (12 * r2) - (a * a * a - 3 * a * b * b) / (360 * r2 * r2 * r2);
  return s + acc;
}

/** log |sin(pi (a + ib))| = log((cosh 2 pi b - cos 2 pi a) / 2) / 2, -inf at the integers. */
function lnAbsSinPi(a: number, b: number): number {
  const ar = a - Math.round(a);
  const pb = Math.PI * Math.abs(b);
  if (pb > 20) return pb - LN2 + 0.5 * Math.log1p(-2 * Math.cos(2 * Math.PI * ar) * Math.exp(-2 * pb));
  const s = Math.sin(Math.PI * ar);
  const sh = Math.sinh(pb);
  return 0.5 * Math.log(s * s + sh * sh);
}

type SeriesKind = 'real' | 'imaginary' | 'complex';

interface SeriesPlan {
  kind: SeriesKind;
  /** Terms k = 0..K of each series. */
  K: number;
  F: number;
  /** log of the largest term either part of the formula adds, against which |K| is measured. */
  lnTmax: number;
  /** Bits by which |sin(pi nu)| (or sinh(pi Im nu)) is below 1: computed with that many more. */
  sinBits: number;
}

/**
 * Plan of the series evaluation (alpha = Re nu >= 0, beta = Im nu, nu not an integer):
 *   K_nu(x) = T1 - T2,  T1 = Gamma(1+nu) (x/2)^{-nu} S_-(x) / (2 nu),
 *   T2 = pi (x/2)^nu S_+(x) / (2 sin(nu pi) Gamma(1+nu)),  S_pm = sum_k z^k / (k! (1 pm nu)_k),
 * z = x^2/4 (DLMF 10.25.2 in 10.27.4, with Gamma(nu) Gamma(1-nu) = pi / sin(nu pi), DLMF 5.5.3).
 * For nu = i beta, S_+ = conj S_-, and K = -pi Im((x/2)^{i beta} S_+ / Gamma(1 + i beta)) / sinh(pi beta).
 * Term magnitudes are followed in double precision: the sums stop once both parts' terms are
 * below eps/16 and falling by half a term, past k = Re nu + 1 (from there on the ratios
 * z / (k |k -+ nu|) only decrease, so the tail is below the last term); F pays for the
 * largest term against |K|est (cancellation near integer nu, where T1 ~ T2 ~ 1/sin(nu pi),
 * and for large x, where S ~ e^x but K ~ e^-x).
 */
function planSeries(alpha: number, beta: number, x: number, pbits: number, lnEst: number): SeriesPlan | null {
  const lnSin = lnAbsSinPi(alpha, beta);
  if (!Number.isFinite(lnSin)) return null;
  const kind: SeriesKind = beta === 0 ? 'real' : alpha === 0 ? 'imaginary' : 'complex';
  const lnG = lnAbsGammaD(1 + alpha, beta);
  const lnX2 = Math.log(x / 2);
  const lnZ = 2 * lnX2;
  const b2 = beta * beta;
  // T2's prefactor; for nu = i beta the one-series form has pi / (|Gamma| sinh(pi beta)) instead
  const c2 = kind === 'imaginary' ? Math.log(Math.PI) - lnG - lnSin : Math.log(Math.PI / 2) - lnSin - lnG + alpha * lnX2;
  const c1 = kind === 'imaginary' ? -Infinity : lnG - Math.log(2 * Math.hypot(alpha, beta)) - alpha * lnX2;
  const lnTarget = lnEst - pbits * LN2 - Math.log(16);
  let m1 = 0;
  let m2 = 0;
  let max1 = 0;
  let max2 = 0;
  let K = 0;
  for (let k = 1; ; k++) {
    const lk = Math.log(k);
    const d1 = lnZ - lk - 0.5 * Math.log((k - alpha) * (k - alpha) + b2);
    const d2 = lnZ - lk - 0.5 * Math.log((k + alpha) * (k + alpha) + b2);
    m1 += d1;
    m2 += d2;
    if (m1 > max1) max1 = m1;
    if (m2 > max2) max2 = m2;
    if (k > alpha + 1 && c1 + m1 < lnTarget && c2 + m2 < lnTarget && d1 < -LN2 && d2 < -LN2) {
      K = k;
      break;
    }
    if (k > MAX_TERMS) return null;
  }
  const lnTmax = Math.max(c1 + max1, c2 + max2);
  const nuAbs = Math.hypot(alpha, beta);
  const guard = Math.log2(nuAbs * (Math.abs(lnX2) + 1) + nuAbs + 4) + 8;
  let F = Math.ceil(pbits + (lnTmax + Math.log(K + 10) + Math.log(16) - lnEst) / LN2 + guard);
  F = Math.ceil(Math.max(F, pbits + 16) / 32) * 32;
  if (F > MAX_BITS) return null;
  return { kind, K, F, lnTmax, sinBits: Math.max(0, Math.ceil(-lnSin / LN2)) + 4 };
}

/** A complex value (re + i im) 2^{e - F}, F implied by the caller. */
interface Scaled {
  re: bigint;
  im: bigint;
  e: number;
}

function smul(a: Scaled, b: Scaled, F: number): Scaled {
  const c = fxc.cmul(a, b, F);
  return { re: c.re, im: c.im, e: a.e + b.e };
}

/** a / b with b normalised first (so the quotient keeps F bits whatever |b|). */
function sdiv(a: Scaled, b: Scaled, F: number): Scaled {
  const s = Math.max(fx.bitLength(b.re), fx.bitLength(b.im)) - (F + 1);
  const bn = { re: shift(b.re, -s), im: shift(b.im, -s) };
  const c = fxc.cdiv(a, bn, F);
  return { re: c.re, im: c.im, e: a.e - b.e - s };
}

function ssub(a: Scaled, b: Scaled): Scaled {
  const e = Math.max(a.e, b.e);
  return { re: shift(a.re, a.e - e) - shift(b.re, b.e - e), im: shift(a.im, a.e - e) - shift(b.im, b.e - e), e };
}

/** The same value with its mantissa shifted to F + 1 bits (exact when shifting up). */
function snorm(a: Scaled, F: number): Scaled {
  const s = Math.max(fx.bitLength(a.re), fx.bitLength(a.im)) - (F + 1);
  if (s === 0 || (a.re === 0n && a.im === 0n)) return a;
  return { re: shift(a.re, -s), im: shift(a.im, -s), e: a.e + s };
}

/**
 * sum_{k=0}^{K} z^k / (k! (1 + s nu)_k) at F bits (s = +1 or -1), by the term ratio
 * z / (k d), d = k + s nu, as z conj(d) / (k |d|^2) with |d|^2 and a conj(d) kept exact until
 * the one rounding: d is tiny for nu near an integer and must not lose relative precision.
 */
function seriesSum(nr: bigint, ni: bigint, s: 1 | -1, z: bigint, K: number, F: number, real: boolean): Scaled {
  const f = BigInt(F);
  const f2 = 2n * f;
  const one = 1n << f;
  const sr = s > 0 ? nr : -nr;
  const si = s > 0 ? ni : -ni;
  let ar = one;
  let ai = 0n;
  let Sr = one;
  let Si = 0n;
  for (let k = 1; k <= K; k++) {
    const bk = BigInt(k);
    const dr = bk * one + sr;
    if (real) {
      ar = (ar * ((z << f) / (bk * dr))) >> f;
      Sr += ar;
      continue;
    }
    const r = (z << f2) / (bk * (dr * dr + si * si)); // z / (k |d|^2) at F bits
    const pr = ar * dr + ai * si; // a conj(d) at 2F bits
    const pi = ai * dr - ar * si;
    ar = (pr * r) >> f2;
    ai = (pi * r) >> f2;
    Sr += ar;
    Si += ai;
  }
  return { re: Sr, im: Si, e: 0 };
}

/** [cosh u, sinh u] 2^{-k} (and k) for u >= 0 at F bits. */
function coshSinhScaled(u: bigint, F: number): { ch: bigint; sh: bigint; k: number } {
  const [m, k] = fx.expSplit(u, F);
  const inv = 2 * k < F + 4 ? fx.div(fx.one(F), m, F) >> BigInt(2 * k) : 0n;
  return { ch: (m + inv) >> 1n, sh: (m - inv) >> 1n, k };
}

/**
 * sin(pi nu) as a Scaled value at F bits (its mantissa at Fs = F + extra bits, so that a value
 * near 0 at nu near an integer keeps F significant bits): Re nu is reduced exactly mod 1, and
 * sin(pi(a + ib)) = sin(pi a) cosh(pi b) + i cos(pi a) sinh(pi b) (addition theorem, sin(iy) = i sinh y).
 */
function sinPiNu(nr: bigint, ni: bigint, F: number, extra: number): Scaled {
  const Fs = F + extra;
  const g = BigInt(extra);
  const fs = BigInt(Fs);
  const one = 1n << fs;
  const a = nr << g;
  const n = fx.roundDiv(a, one);
  let [sa, ca] = fx.sincos((fx.pi(Fs) * (a - n * one)) >> fs, Fs);
  if (n % 2n !== 0n) {
    sa = -sa;
    ca = -ca;
  }
  if (ni === 0n) return { re: sa, im: 0n, e: -extra };
  const b = ni << g;
  const cs = coshSinhScaled((fx.pi(Fs) * (b < 0n ? -b : b)) >> fs, Fs);
  const sh = b < 0n ? -cs.sh : cs.sh;
  return { re: (sa * cs.ch) >> fs, im: (ca * sh) >> fs, e: cs.k - extra };
}

/** K_nu(x) by the series of planSeries, nu with Re nu >= 0, at F bits, as (re + i im) 2^{e - F}. */
function seriesK(nu: Complex, x: Decimal, plan: SeriesPlan): Scaled {
  const { F, K, kind } = plan;
  const f = BigInt(F);
  const one = 1n << f;
  const nr = toFixed(nu.re, F);
  const ni = toFixed(nu.im, F);
  // log(x/2), with the bits a small x needs to keep its relative precision
  const ex = Math.max(0, Math.ceil(-Math.log2(x.toNumber()))) + 8;
  const L = (fx.log(toFixed(x, F + ex), F + ex) >> BigInt(ex)) - fx.ln2(F);
  const xF = toFixed(x, F);
  const z = (xF * xF) >> (f + 2n);
  const piF = fx.pi(F);
  if (kind === 'real') {
    const [gm, gk] = gammaRealFx(one + nr, F);
    const [em, ek] = fx.expSplit((nr * L) >> f, F); // (x/2)^nu
    const sin = sinPiNu(nr, 0n, F, plan.sinBits);
    const Sm = seriesSum(nr, 0n, -1, z, K, F, true);
    const Sp = seriesSum(nr, 0n, 1, z, K, F, true);
    const twoNu = snorm({ re: 2n * nr, im: 0n, e: 0 }, F);
    const T1 = sdiv({ re: (gm * Sm.re) >> f, im: 0n, e: gk }, smul(twoNu, { re: em, im: 0n, e: ek }, F), F);
    const num2: Scaled = { re: (piF * ((em * Sp.re) >> f)) >> f, im: 0n, e: ek };
    const T2 = sdiv(num2, smul({ re: 2n * sin.re, im: 0n, e: sin.e }, { re: gm, im: 0n, e: gk }, F), F);
    return ssub(T1, T2);
  }
  const [G, gk] = gammaFx({ re: one + nr, im: ni }, F);
  const [E, ek] = fxc.cexpSplit({ re: (nr * L) >> f, im: (ni * L) >> f }, F); // (x/2)^nu
  const Sp = seriesSum(nr, ni, 1, z, K, F, false);
  if (kind === 'imaginary') {
    // K = -pi Im(E S_+ / G) / sinh(pi beta) (sin(i pi beta) = i sinh(pi beta))
    const q = sdiv(smul({ ...E, e: ek }, Sp, F), { ...G, e: gk }, F);
    const sin = sinPiNu(0n, ni, F, plan.sinBits);
    return sdiv({ re: -((piF * q.im) >> f), im: 0n, e: q.e }, { re: sin.im, im: 0n, e: sin.e }, F);
  }
  const Sm = seriesSum(nr, ni, -1, z, K, F, false);
  const sin = sinPiNu(nr, ni, F, plan.sinBits);
  const twoNu = snorm({ re: 2n * nr, im: 2n * ni, e: 0 }, F);
  const T1 = sdiv(smul({ ...G, e: gk }, Sm, F), smul({ ...E, e: ek }, twoNu, F), F);
  const num2 = smul({ re: (piF * E.re) >> f, im: (piF * E.im) >> f, e: ek }, Sp, F);
  const T2 = sdiv(num2, smul({ re: 2n * sin.re, im: 2n * sin.im, e: sin.e }, { ...G, e: gk }, F), F);
  return ssub(T1, T2);
}

// ---------------------------------------------------------------------------
// Half-integer order: a terminating sum

/** Largest n for which K_{n+1/2} is summed in closed form (n + 1 positive terms). */
const MAX_HALF_ORDER = 1000;

/** n when nu = +-(n + 1/2) with 0 <= n <= MAX_HALF_ORDER, else -1. */
function halfIntegerOrder(nu: Complex): number {
  if (!nu.im.isZero()) return -1;
  const t = nu.re.abs().times(2);
  if (!t.isInteger() || t.mod(2).isZero() || t.gt(2 * MAX_HALF_ORDER + 1)) return -1;
  return (t.toNumber() - 1) / 2;
}

/**
 * K_{n+1/2}(x) = sqrt(pi / (2x)) e^{-x} sum_{k=0}^{n} (n+k)! / (k! (n-k)!) (2x)^{-k}
 * (DLMF 10.49.12 for the modified spherical Bessel function k_n, with 10.47.9; equation
 * numbers from memory, checked against K_{1/2} and K_{3/2} = K_{1/2}(1 + 1/x) of 10.39.2
 * and 10.29.1). All terms are positive: Horner in u = 1/(2x) at F bits loses about
 * log2(n) bits, whatever x.
 */
function halfIntegerK(n: number, x: Decimal, pbits: number): Raw {
  const F = pbits + 16 + Math.ceil(Math.log2(n + 1));
  const f = BigInt(F);
  const one = 1n << f;
  const xF = toFixed(x, F + 64);
  const u = (one << (f + 64n)) / (2n * xF); // 1/(2x) at F bits
  // a_k = (n+k)! / (k! (n-k)!), a_{k+1} = a_k (n+k+1)(n-k) / (k+1)
  const a: bigint[] = [1n];
  for (let k = 0; k < n; k++) a.push((a[k]! * BigInt((n + k + 1) * (n - k))) / BigInt(k + 1));
  let p = a[n]! << f;
  for (let k = n - 1; k >= 0; k--) p = (a[k]! << f) + ((p * u) >> f);
  // sqrt(pi / (2x)) e^{-x}
  const W = F + 8;
  const s = fx.sqrt(fx.div(fx.pi(W), fx.rescale(xF, F + 64, W) * 2n, W), W);
  const [m, k] = fx.expSplit(-(xF >> 64n), F);
  return { re: ((p * s) >> BigInt(W)) * m, im: 0n, bits: 2 * F - k };
}

/** log(sqrt(re^2 + im^2) 2^-F) for bigints of any size. */
function lnAbsFixed(re: bigint, im: bigint, F: number): number {
  const L = Math.max(fx.bitLength(re), fx.bitLength(im));
  if (L === 0) return -Infinity;
  const s = Math.max(0, L - 60);
  const a = Number(re >> BigInt(s));
  const b = Number(im >> BigInt(s));
  return Math.log(Math.hypot(a, b)) + (s - F) * LN2;
}

// ---------------------------------------------------------------------------
// Public functions

function checkArgs(nu: Complex, x: Decimal, name: string): number {
  if (!nu.isFinite()) throw new ModvetError('domain', 'K', `order nu = ${nu} must be finite`);
  if (!x.isFinite() || !x.isPositive() || x.isZero()) {
    throw new ModvetError('domain', 'K', `argument ${name} = ${x} must be positive (K_nu(x) is defined for x > 0)`);
  }
  const xd = x.toNumber();
  if (xd < X_MIN || xd > X_MAX) {
    throw new ModvetError('overflow', 'K', `argument ${name} = ${x} is outside the supported range [1e-250, 1e15]`);
  }
  return xd;
}

/** A result (re + i im) 2^-bits. */
interface Raw {
  re: bigint;
  im: bigint;
  bits: number;
}

/** K = h e^{-x} S by the trapezoidal rule. */
function trapezoidK(nu: Complex, x: Decimal, plan: Plan): Raw {
  const F = plan.F;
  const S = trapezoidSum(fixedOrder(nu, F + 16), x, plan);
  const hF = fx.fromFloat(plan.h, F);
  const [mx, kx] = fx.expSplit(-toFixed(x, F + 8) >> 8n, F);
  const hm = hF * mx;
  return { re: hm * S.re, im: hm * S.im, bits: 2 * F + plan.R - kx };
}

/**
 * Predicted cost of a pass in microseconds: operation counts times the time of one BigInt
 * operation at F bits, a least-squares fit (separately per method, whose operations differ in
 * size mix) to timings of both methods on 180 arguments (20..400 digits, 0.01 <= x <= 30) under
 * Node 20 on x86-64. Only the ratio matters: it picks the faster method, within 2% on average
 * in that sample.
 */
function trapezoidCost(p: Plan, real: boolean): number {
  const { L, n } = expShape(p.F);
  const ops = p.J * (2 * L + 3 * n + 8 + (real ? 8 : 16)) + 400;
  return ops * (0.0272 + 1.78e-5 * p.F + 1.09e-7 * p.F * p.F);
}
function seriesCost(p: SeriesPlan): number {
  const perTerm = p.kind === 'real' ? 16 : p.kind === 'imaginary' ? 14 : 28;
  const ops = p.K * perTerm + (p.kind === 'real' ? 2 : 4) * p.F + 500;
  return ops * (0.0443 + 2.98e-5 * p.F + 9.9e-8 * p.F * p.F);
}

/** K_nu(x) for complex nu and real x > 0, to the current precision (DLMF 10.25, 10.32.9). */
export function besselK(nu: Complex, x: Decimal): Complex {
  return besselKUsing(nu, x, 'auto');
}

/**
 * How besselKUsing evaluates: 'auto' takes the half-integer sum where it applies, else the
 * cheaper of series and quadrature by the cost model; 'series' and 'quadrature' force one
 * (tests and benchmarks run both; 'series' falls back to the quadrature where the series
 * does not apply: integer order, or cancellation beyond MAX_BITS).
 */
export type BesselKMethod = 'auto' | 'series' | 'quadrature';

/** besselK with the method chosen by the caller. */
export function besselKUsing(nu: Complex, x: Decimal, method: BesselKMethod): Complex {
  const xd = checkArgs(nu, x, 'x');
  const P = Decimal.precision;
  // K_{-nu} = K_nu (DLMF 10.27.3): work with Re nu >= 0
  const v = nu.re.isNegative() ? nu.neg() : nu;
  const alpha = v.re.toNumber();
  const beta = v.im.toNumber();
  const real = v.re.isZero() || v.im.isZero();
  const pbits = bitsFor(P) + SLACK_BITS + 4;
  const half = method === 'auto' ? halfIntegerOrder(v) : -1;
  if (half >= 0 && half <= 4 * Math.sqrt(pbits)) {
    const r = halfIntegerK(half, x, pbits);
    return new Complex(fromFixed(r.re, r.bits), 0);
  }
  let lnEst = lnAbsKEstimate(alpha, Math.abs(beta), xd);
  for (;;) {
    const sp = method === 'quadrature' ? null : planSeries(alpha, beta, xd, pbits, lnEst);
    let tp: Plan | null = null;
    if (method !== 'series' || sp === null) {
      try {
        tp = planTrapezoid(alpha, Math.abs(beta), xd, pbits, lnEst);
      } catch (e) {
        if (sp === null) throw e; // the series may still do (too many nodes, huge cancellation)
      }
    }
    const r =
      tp === null || (sp !== null && seriesCost(sp) < trapezoidCost(tp, real))
        ? fromScaled(seriesK(v, x, sp!), sp!.F)
        : trapezoidK(v, x, tp);
    const lnK = lnAbsFixed(r.re, r.im, r.bits);
    if (lnK >= lnEst - SLACK_BITS * LN2) {
      return new Complex(fromFixed(r.re, r.bits), real ? new Decimal(0) : fromFixed(r.im, r.bits));
    }
    // K is smaller than estimated (the terms cancelled more): its computed size, accurate to
    // pbits - (lnEst - lnK)/log 2 bits, is the estimate of the next pass
    lnEst = Number.isFinite(lnK) ? lnK : lnEst - pbits * LN2;
  }
}

/**
 * K_nu(n x0) for n = 1..N, on one grid of quadrature nodes shared by all n: with
 * g_j = e^{-x0 (cosh t_j - 1)}, the integrand of K_nu(n x0) is e^{-n x0} g_j^n cosh(nu t_j), so the
 * nodes cost one exponential each, once, and each further n one multiplication per node.
 * The grid is the finest step any n needs (the largest n x0 wants the smallest step, about
 * pi sqrt(2 / (P n x0))); each n sums every m_n-th node, m_n = floor(h_n / h_min), up to its own
 * truncation point, with its own error plan (planTrapezoid at the imposed step). An n whose
 * result falls below its estimate by more than the slack is recomputed by besselK.
 */
export function besselKMultiples(nu: Complex, x0: Decimal, N: number): Complex[] {
  if (!Number.isInteger(N) || N < 0) {
    throw new ModvetError('domain', 'K', `N = ${N} must be a non-negative integer`);
  }
  const xd = checkArgs(nu, x0, 'x0');
  if (N === 0) return [];
  if (xd * N > X_MAX) {
    throw new ModvetError('overflow', 'K', `N x0 = ${N * xd} is outside the supported range [1e-250, 1e15]`);
  }
  const P = Decimal.precision;
  const v = nu.re.isNegative() ? nu.neg() : nu;
  const alpha = v.re.toNumber();
  const beta = Math.abs(v.im.toNumber());
  const real = v.re.isZero() || v.im.isZero();
  const pbits = bitsFor(P) + SLACK_BITS + 4;
  const half = halfIntegerOrder(v);
  if (half >= 0 && half <= 4 * Math.sqrt(pbits)) {
    // the terminating sum is cheaper than a node per n
    const out: Complex[] = [];
    for (let n = 1; n <= N; n++) {
      const r = halfIntegerK(half, withGuard(x0.sd() + 16 - P, () => x0.times(n)), pbits);
      out.push(new Complex(fromFixed(r.re, r.bits), 0));
    }
    return out;
  }
  // per-n plans on a common fine grid
  const lnEst: number[] = [0];
  const steps: number[] = [0];
  let hf = Infinity;
  for (let n = 1; n <= N; n++) {
    lnEst.push(lnAbsKEstimate(alpha, beta, n * xd));
    steps.push(stepFor(alpha, beta, n * xd, pbits, lnEst[n]!));
    hf = Math.min(hf, steps[n]!);
  }
  const plans: Plan[] = [{ h: hf, J: 0, F: 0, R: 0 }];
  const mult: number[] = [1];
  let Fmax = 0;
  let mmax = 1;
  for (let n = 1; n <= N; n++) {
    const m = Math.max(1, Math.floor(steps[n]! / hf));
    const p = planTrapezoid(alpha, beta, n * xd, pbits, lnEst[n]!, m * hf);
    plans.push(p);
    mult.push(m);
    Fmax = Math.max(Fmax, p.F);
    mmax = Math.max(mmax, m);
  }
  // powers add log2 N bits of rounding, the fine index 2 log2 m to the cosh recurrence bound
  const F = Math.ceil((Fmax + Math.ceil(Math.log2(N + 1)) + 2 * Math.ceil(Math.log2(mmax + 1)) + 4) / 32) * 32;
  if (F > MAX_BITS) throw new ModvetError('convergence', 'K', 'cancellation too severe to resolve');
  // active[n]: the last fine node any n' >= n uses
  const active: number[] = new Array<number>(N + 2).fill(0);
  for (let n = N; n >= 1; n--) active[n] = Math.max(active[n + 1]!, plans[n]!.J * mult[n]!);
  const nodes = sharedNodes(fixedOrder(v, F + 16), x0, hf, active[1]!, F);
  const f = BigInt(F);
  const one = 1n << f;
  const LOW = 1n << BigInt(F - 32);
  const HIGH = 1n << BigInt(F + 32);
  const PM: bigint[] = new Array<bigint>(active[1]! + 1).fill(one);
  const PE: number[] = new Array<number>(active[1]! + 1).fill(0);
  const [mx, kx] = fx.expSplit(-toFixed(x0, F + 8) >> 8n, F);
  const hfF = fx.fromFloat(hf, F);
  let XM = one;
  let XE = 0;
  const out: Complex[] = [];
  for (let n = 1; n <= N; n++) {
    // g_j^n = PM 2^-F 2^-PE, e^{-n x0} = XM 2^-F 2^XE
    const top = active[n]!;
    for (let j = 1; j <= top; j++) {
      let M = (PM[j]! * nodes.gm[j]!) >> f;
      let E = PE[j]! + nodes.gk[j]!;
      if (M < LOW) {
        M <<= 32n;
        E += 32;
      } else if (M > HIGH) {
        M >>= 32n;
        E -= 32;
      }
      PM[j] = M;
      PE[j] = E;
    }
    XM = (XM * mx) >> f;
    XE += kx;
    if (XM < LOW) {
      XM <<= 32n;
      XE -= 32;
    } else if (XM > HIGH) {
      XM >>= 32n;
      XE += 32;
    }
    const { J, R } = plans[n]!;
    const m = mult[n]!;
    let Are = shift(1n, R - 1);
    let Aim = 0n;
    const base = R - 2 * F;
    for (let i = 1, j = m; i <= J; i++, j += m) {
      const s = base + nodes.ec[j]! - PE[j]!;
      if (s < -4 * F) continue;
      const M = PM[j]!;
      Are += shift(M * nodes.cre[j]!, s);
      if (!real) Aim += shift(M * nodes.cim[j]!, s);
    }
    const hm = BigInt(m) * hfF * XM; // the step m hf, exactly as the nodes were placed
    const r: Raw = { re: hm * Are, im: hm * Aim, bits: 2 * F + R - XE };
    const lnK = lnAbsFixed(r.re, r.im, r.bits);
    if (lnK >= lnEst[n]! - SLACK_BITS * LN2) {
      out.push(new Complex(fromFixed(r.re, r.bits), real ? new Decimal(0) : fromFixed(r.im, r.bits)));
    } else {
      out.push(besselK(v, withGuard(x0.sd() + 16 - P, () => x0.times(n)))); // n x0 exactly
    }
  }
  return out;
}

/** The nodes of besselKMultiples: e^{-y_j} = gm 2^-F 2^-gk, cosh(nu t_j) = (cre + i cim) 2^{ec - F}. */
interface SharedNodes {
  gm: bigint[];
  gk: number[];
  cre: bigint[];
  cim: bigint[];
  ec: number[];
}

/** The recurrences of trapezoidSum, recorded node by node instead of summed. */
function sharedNodes(nu: FixedOrder, x: Decimal, h: number, J: number, F: number): SharedNodes {
  const f = BigInt(F);
  const gy = yGuard(x.toNumber());
  const Fy = F + gy;
  const fy = BigInt(Fy);
  const bgy = BigInt(gy);
  const T = expTable(F);
  const { D, y1 } = yConstants(x, h, Fy);
  const kappa = 2n * y1;
  const C = coshNuH(nu, h, F);
  const C2re = 2n * C.re;
  const C2im = 2n * C.im;
  const LIM = 1n << BigInt(F + 40);
  const one = 1n << f;
  const out: SharedNodes = { gm: [one], gk: [0], cre: [one], cim: [0n], ec: [0] };
  let yPrev = 0n;
  let yCur = y1;
  let cPrevRe = one;
  let cPrevIm = 0n;
  let cRe = C.re;
  let cIm = C.im;
  let ec = 0;
  for (let j = 1; j <= J; j++) {
    const [m, k] = expNeg(yCur >> bgy, T);
    out.gm.push(m);
    out.gk.push(k);
    out.cre.push(cRe);
    out.cim.push(cIm);
    out.ec.push(ec);
    const yNext = ((D * yCur) >> fy) - yPrev + kappa;
    yPrev = yCur;
    yCur = yNext;
    const nRe = ((C2re * cRe - C2im * cIm) >> f) - cPrevRe;
    const nIm = ((C2re * cIm + C2im * cRe) >> f) - cPrevIm;
    cPrevRe = cRe;
    cPrevIm = cIm;
    cRe = nRe;
    cIm = nIm;
    if (cRe > LIM || cRe < -LIM || cIm > LIM || cIm < -LIM) {
      const d = BigInt(rescaleBits(cRe, cIm, F));
      cRe >>= d;
      cPrevRe >>= d;
      cIm >>= d;
      cPrevIm >>= d;
      ec += Number(d);
    }
  }
  return out;
}

function fromScaled(s: Scaled, F: number): Raw {
  return { re: s.re, im: s.im, bits: F - s.e };
}
