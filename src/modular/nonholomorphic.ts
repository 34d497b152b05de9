/**
 * The non-holomorphic Eisenstein series, by two independent methods.
 *
 * Conventions (math-reference.md): tau = x + iy, y > 0.
 *   E(s, tau)  = sum_{gamma in Gamma_inf \ SL(2,Z)} Im(gamma tau)^s
 *              = (1/2) sum_{gcd(c,d)=1} y^s / |c tau + d|^{2s}     (coset normalisation,
 *                constant term y^s + ...; Re s > 1, continued to all s != 1)
 *   E*(s, tau) = xi(2s) E(s, tau), xi(s) = pi^{-s/2} Gamma(s/2) zeta(s); E*(s) = E*(1 - s);
 *                poles at s = 0 and s = 1.
 * The other two normalisations in use are one line away:
 *   lattice sum  Z(s, tau) = sum'_{(m,n)} y^s/|m tau + n|^{2s} = 2 zeta(2s) E(s, tau)
 *   physics      sum'_{(m,n)} (y / (pi |m tau + n|^2))^s       = 2 zeta(2s) pi^{-s} E(s, tau)
 *
 * Method 'fourier' (default): the Fourier expansion (math-reference.md; e.g. Zagier,
 * "Eisenstein series and the Riemann zeta function", 1981)
 *   E*(s, tau) = xi(2s) y^s + xi(2s-1) y^{1-s}
 *              + 4 sqrt(y) sum_{n>=1} n^{s-1/2} sigma_{1-2s}(n) K_{s-1/2}(2 pi n y) cos(2 pi n x).
 * Method 'epstein': the Epstein theta splitting (Chowla-Selberg style incomplete-gamma
 * expansion), with Q(m, n) = |m tau + n|^2 / y,
 *   2 E*(s, tau) = -1/s + 1/(s-1) + sum'_{(m,n)} [(pi Q)^{-s} Gamma(s, pi Q) + (pi Q)^{s-1} Gamma(1-s, pi Q)].
 * The two share no code path beyond the special functions, so their agreement is a test.
 *
 *   withDigits(40, () => nonholomorphicE(Complex.of(2), Complex.I))
 */
import { Decimal } from 'decimal.js';
import { Complex } from '../numeric/complex.js';
import { pi } from '../numeric/constants.js';
import { ModvetError } from '../numeric/errors.js';
import { digits, withGuard } from '../numeric/precision.js';
import { besselKMultiples } from '../special/besselK.js';
import { sigmaSieveComplex, powersUpTo } from '../special/divisors.js';
import { gammaUpper } from '../special/incompleteGamma.js';
import { xi } from '../special/zeta.js';
import { checkTau, DEFAULT_Y_MIN } from './domain.js';

export type NonholomorphicMethod = 'fourier' | 'epstein';

export interface NonholomorphicOptions {
  method?: NonholomorphicMethod;
  yMin?: number;
}

const LN10 = Math.LN10;
/** Guard digits to start with; more are added when the terms cancel. */
const START_GUARD = 8;
/** Largest number of Fourier terms before the sample is given up as not converging. */
const TERM_BUDGET = 20000;
/** Largest number of lattice points in the Epstein method. */
const LATTICE_BUDGET = 200000;

function checkS(s: Complex, who: string, poles: number[]): void {
  for (const p of poles) {
    if (s.im.isZero() && s.re.eq(p)) throw new ModvetError('pole', who, `s = ${p} is a pole`);
  }
}

/** E*(s, tau) = xi(2s) E(s, tau). */
export function completedE(s: Complex, tau: Complex, opts: NonholomorphicOptions = {}): Complex {
  checkTau(tau, 'Estar', opts.yMin ?? DEFAULT_Y_MIN);
  checkS(s, 'Estar', [0, 1]);
  return (opts.method ?? 'fourier') === 'fourier' ? withCancellationRetry((g) => fourierStar(s, tau, g)) : withCancellationRetry((g) => epsteinStar(s, tau, g));
}

/** E(s, tau) in the coset normalisation. */
export function nonholomorphicE(s: Complex, tau: Complex, opts: NonholomorphicOptions = {}): Complex {
  checkTau(tau, 'Ens', opts.yMin ?? DEFAULT_Y_MIN);
  checkS(s, 'Ens', [1]);
  // xi(2s) has a pole at s = 1/2 while E*(s) is finite there, so E(1/2, tau) = 0
  if (s.im.isZero() && s.re.eq(0.5)) return Complex.ZERO;
  // at s = 0 both E*(s) and xi(2s) have simple poles with residue -1/2 (E*(s) = E*(1 - s)
  // and the residue 1/2 of E* at s = 1), so E(0, tau) = 1
  if (s.isZero()) return Complex.ONE;
  const method = opts.method ?? 'fourier';
  return withGuard(4, () => {
    const star = method === 'fourier' ? withCancellationRetry((g) => fourierStar(s, tau, g)) : withCancellationRetry((g) => epsteinStar(s, tau, g));
    return star.div(xi(s.scale(2)));
  }).round();
}

interface Attempt {
  value: Complex;
  /** log10 of (largest term / |value|): the digits lost to cancellation. */
  lostDigits: number;
}

/** Runs a summation with guard digits, retrying once with the digits it lost. */
function withCancellationRetry(f: (guard: number) => Attempt): Complex {
  let guard = START_GUARD;
  for (let attempt = 0; attempt < 3; attempt++) {
    const r = withGuard(guard, () => f(guard));
    if (r.lostDigits <= guard - 3) return r.value.round();
    guard = Math.ceil(r.lostDigits) + 6;
  }
  throw new ModvetError('precision', 'Eisenstein E(s, tau)', 'cancellation could not be resolved');
}

function log10Abs(z: Complex): number {
  if (z.isZero()) return -Infinity;
  const a = z.abs();
  return a.e + Math.log10(a.div(new Decimal(10).pow(a.e)).toNumber());
}

function fourierStar(s: Complex, tau: Complex, guard: number): Attempt {
  const P = digits();
  const x = tau.re;
  const y = tau.im;
  const Y = Complex.of(y);
  const nu = s.sub(Complex.of(0.5));
  const yf = y.toNumber();
  // number of terms: K_nu(2 pi n y) ~ sqrt(pi/(4 pi n y)) e^{-2 pi n y} once 2 pi n y >> |nu|^2,
  // times |n^nu sigma_{-2nu}(n)| <= n^{3|Re nu| + 1}; e^{pi |Im nu| / 2} bounds the order's effect
  const nuAbs = nu.abs().toNumber();
  const reNu = Math.abs(nu.re.toNumber());
  const imNu = Math.abs(nu.im.toNumber());
  let N = 10;
  for (let it = 0; it < 4; it++) {
    const need = P * LN10 + 10 + (Math.PI * imNu) / 2 + (3 * reNu + 1) * Math.log(N + 1);
    N = Math.max(Math.ceil(need / (2 * Math.PI * yf)), Math.ceil((nuAbs * nuAbs + 1) / (2 * Math.PI * yf)));
  }
  if (N > TERM_BUDGET) {
    throw new ModvetError('convergence', 'Estar', `the Fourier series would need ${N} terms at Im tau = ${y}`);
  }
  const sig = sigmaSieveComplex(s.scale(-2).add(Complex.ONE), N); // sigma_{1-2s}(n)
  const pw = powersUpTo(nu, N); // n^{s-1/2}
  const twoPi = pi().times(2);
  // K_nu(2 pi n y) for all n at once: the quadrature nodes are shared across n
  const ks = besselKMultiples(nu, twoPi.times(y), N);
  let sum = Complex.ZERO;
  let largest = new Decimal(0);
  // cos(2 pi n x) by the Chebyshev recurrence c_{n+1} = 2 c_1 c_n - c_{n-1} (its rounding
  // error grows only linearly in n, far inside the guard digits)
  const cos1 = Complex.of(twoPi.times(x)).cos().re;
  let cPrev = new Decimal(1);
  let cCur = cos1;
  for (let n = 1; n <= N; n++) {
    const k = ks[n - 1]!;
    const t = pw[n]!.mul(sig[n]!).mul(k).scale(cCur);
    // the gauge needs only the size: max(|re|, |im|) is within a factor sqrt 2 of |t|
    const ta = Decimal.max(t.re.abs(), t.im.abs());
    if (ta.gt(largest)) largest = ta;
    sum = sum.add(t);
    const cNext = cos1.times(cCur).times(2).minus(cPrev);
    cPrev = cCur;
    cCur = cNext;
  }
  const fourier = sum.scale(y.sqrt().times(4));
  const c1 = xi(s.scale(2)).mul(Y.pow(s));
  const c2 = xi(s.scale(2).sub(Complex.ONE)).mul(Y.pow(Complex.ONE.sub(s)));
  const value = c1.add(c2).add(fourier);
  const scale = Decimal.max(c1.abs(), c2.abs(), largest.times(y.sqrt()).times(4));
  void guard;
  return { value, lostDigits: log10Abs(Complex.of(scale)) - log10Abs(value) };
}

function epsteinStar(s: Complex, tau: Complex, guard: number): Attempt {
  const P = digits();
  const x = tau.re.toNumber();
  const y = tau.im.toNumber();
  // terms ~ (pi Q)^{|Re s|} e^{-pi Q}: keep pi Q <= X with e^{-X} X^{|Re s| + 1} < 10^{-P}
  const reS = Math.abs(s.re.toNumber()) + 1;
  let X = P * LN10 + 10;
  for (let it = 0; it < 4; it++) X = P * LN10 + 10 + reS * Math.log(X);
  const R2 = (X * y) / Math.PI; // |m tau + n|^2 <= R2
  const mMax = Math.floor(Math.sqrt(R2) / y);
  const piD = pi();
  const oneMinusS = Complex.ONE.sub(s);
  const sMinusOne = s.sub(Complex.ONE);
  let sum = Complex.ZERO;
  let largest = new Decimal(0);
  let count = 0;
  // half lattice: m > 0, or m = 0 and n > 0; the terms are even in (m, n)
  for (let m = 0; m <= mMax; m++) {
    const half = Math.sqrt(Math.max(0, R2 - m * m * y * y));
    const lo = m === 0 ? 1 : Math.ceil(-m * x - half);
    const hi = Math.floor(-m * x + half);
    for (let n = lo; n <= hi; n++) {
      if (++count > LATTICE_BUDGET) {
        throw new ModvetError('convergence', 'Estar', `the lattice sum would need over ${LATTICE_BUDGET} points`);
      }
      const mt = tau.scale(m).add(Complex.of(n));
      const piQ = mt.abs2().div(tau.im).times(piD);
      const X = Complex.of(piQ);
      const t1 = X.pow(s.neg()).mul(gammaUpper(s, piQ));
      const t2 = X.pow(sMinusOne).mul(gammaUpper(oneMinusS, piQ));
      const t = t1.add(t2);
      const ta = t.abs();
      if (ta.gt(largest)) largest = ta;
      sum = sum.add(t);
    }
  }
  // the full lattice is twice the half lattice
  const poles = s.inv().neg().add(sMinusOne.inv());
  const value = poles.add(sum.scale(2)).scale(0.5);
  const scale = Decimal.max(poles.abs(), largest.times(2));
  void guard;
  return { value, lostDigits: log10Abs(Complex.of(scale)) - log10Abs(value) };
}
