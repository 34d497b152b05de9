/**
 * The built-in functions of the claim language, bound to the numeric, special and modular
 * layers, each with its rule for the error scale (evaluate.ts, header).
 *
 * Conventions: arguments and results are `Val`s { v, s }: a value and its scale S (error
 * about 10^-P S at the working precision P). Integer arguments (the weight of E and G, n of
 * sigma and bernoulli) must be integers within their own error bound (2*3 is exact; a
 * computed 3.0000...01 within its error is rounded; 4.5 is a 'domain' error); real
 * arguments (x of K(nu, x) and Gamma(a, x)) must be real within their error bound. Failures
 * are ModvetErrors naming the function; evaluate.ts attaches the node's span. Names,
 * arities and summaries live in src/lang/names.ts.
 *
 * Scale of a result: |v| for exact arguments, except E, G, E2star, whose accuracy is only
 * absolute at their zeros (qseries.ts: |z - exact| <= 2^-need max(|exact|, 2^-cap L)):
 * there max(|v|, 2^-cap L), L an upper estimate of the largest term of the series.
 * Arguments are otherwise taken as exact (evaluate.ts carries guard digits for that). Near
 * a zero of the result this fails: E_4 at a rounded rho is about E_4'(rho) times the
 * rounding, far above E_4's own error. There the error an argument brings in is measured
 * by a probe, |f(z + delta) - f(z)| with delta the argument's error (also i delta for a
 * non-holomorphic argument); the probe also covers zeros of higher order, the step being
 * about the distance to the zero. The same probe runs when an argument has lost more
 * digits than the guard digits hold. Elementary functions use their derivatives instead.
 *
 *   callBuiltin('E', [{ v: Complex.of(4), s: ZERO }, { v: Complex.I, s: ZERO }], {})
 */
import { Decimal } from 'decimal.js';
import type { BuiltinName } from '../lang/ast.js';
import { Complex } from '../numeric/complex.js';
import { ModvetError } from '../numeric/errors.js';
import { withGuard } from '../numeric/precision.js';
import { besselK } from '../special/besselK.js';
import { bernoulli, MAX_USER_BERNOULLI } from '../special/bernoulli.js';
import { dirichletBeta } from '../special/dirichletBeta.js';
import { sigma, sigmaComplex } from '../special/divisors.js';
import { gamma, logAbsGammaDouble } from '../special/gamma.js';
import { gammaUpper } from '../special/incompleteGamma.js';
import { xi, zeta } from '../special/zeta.js';
import { e2star, eisensteinE, eisensteinG } from '../modular/eisenstein.js';
import { discriminant, eta } from '../modular/eta.js';
import { kleinJ } from '../modular/kleinJ.js';
import { completedE, nonholomorphicE } from '../modular/nonholomorphic.js';
import { cancellationCap, neededBits, type ModularOptions } from '../modular/qseries.js';
import { theta2, theta3, theta4 } from '../modular/theta.js';

export interface Val {
  v: Complex;
  s: Decimal;
}

const ZERO = new Decimal(0);
const LN10 = Math.LN10;

/** Digits an argument may lose before its error is probed (below evaluate.ts's guard digits). */
const LOST_DIGITS_PROBE = 4;
/** A result below 10^-NEAR_ZERO_DIGITS times its largest term counts as near a zero. */
const NEAR_ZERO_DIGITS = 4;

// ---------------------------------------------------------------------------
// Elementary functions: S = |f'(a)| S_a + |f(a)|

type ElementaryName = 'exp' | 'log' | 'sqrt' | 'abs' | 're' | 'im' | 'conj' | 'arg' | 'sin' | 'cos' | 'sinh' | 'cosh';
type Unary = (a: Val) => Val;

/** f with derivative modulus df (evaluated only when the argument carries an error). */
function elementary(f: (z: Complex) => Complex, df: (z: Complex, fz: Complex) => Decimal): Unary {
  return (a) => {
    const v = f(a.v);
    return { v, s: a.s.isZero() ? v.abs() : df(a.v, v).times(a.s).plus(v.abs()) };
  };
}

const ELEMENTARY: Readonly<Record<ElementaryName, Unary>> = {
  exp: elementary((z) => z.exp(), (_z, fz) => fz.abs()),
  log: elementary((z) => z.log(), (z) => new Decimal(1).div(z.abs())),
  sqrt: (a) => {
    const v = a.v.sqrt();
    if (a.s.isZero()) return { v, s: v.abs() };
    // sqrt' = 1/(2 sqrt z); at z = 0 the error is sqrt(10^-P S_a), i.e. S = sqrt(S_a 10^P)
    const s = v.isZero() ? a.s.times(new Decimal(10).pow(Decimal.precision)).sqrt() : a.s.div(v.abs().times(2)).plus(v.abs());
    return { v, s };
  },
  abs: (a) => {
    const r = a.v.abs();
    return { v: new Complex(r, 0), s: a.s.plus(r) };
  },
  re: (a) => ({ v: new Complex(a.v.re, 0), s: a.s }),
  im: (a) => ({ v: new Complex(a.v.im, 0), s: a.s }),
  conj: (a) => ({ v: a.v.conj(), s: a.s }),
  arg: (a) => {
    const r = a.v.arg();
    return { v: new Complex(r, 0), s: a.s.div(a.v.abs()).plus(r.abs()) };
  },
  sin: elementary((z) => z.sin(), (z) => z.cos().abs()),
  cos: elementary((z) => z.cos(), (z) => z.sin().abs()),
  sinh: elementary((z) => z.sinh(), (z) => z.cosh().abs()),
  cosh: elementary((z) => z.cosh(), (z) => z.sinh().abs()),
};

function isElementary(fn: BuiltinName): fn is ElementaryName {
  return Object.prototype.hasOwnProperty.call(ELEMENTARY, fn);
}

// ---------------------------------------------------------------------------
// Arguments

/** An exact integer argument, else a 'domain' error (near-integers are rounded by checkArgs first). */
function integerValue(a: Complex, who: string, what: string): number {
  if (!a.im.isZero() || !a.re.isInteger() || !a.re.abs().lt(2 ** 53)) {
    throw new ModvetError('domain', who, `${what} = ${a} must be an integer`);
  }
  return a.re.toNumber();
}

/** A real argument, else a 'domain' error. */
function realValue(a: Complex, who: string, what: string): Decimal {
  if (!a.im.isZero()) throw new ModvetError('domain', who, `${what} = ${a} must be real`);
  return a.re;
}

/** How an argument enters: integer (never probed), real, holomorphic, non-holomorphic. */
type ArgKind = 'int' | 'real' | 'holo' | 'nonholo';

/**
 * Rounds integer arguments that are integers within their error bound, drops imaginary
 * parts of real arguments within theirs; other values are left for integerValue/realValue
 * to reject.
 */
function normaliseArgs(kinds: readonly ArgKind[], args: Val[]): Val[] {
  const unit = new Decimal(10).pow(2 - Decimal.precision);
  return args.map((a, k) => {
    const kind = kinds[k];
    if (a.s.isZero()) return a;
    const tol = a.s.plus(a.v.abs()).times(unit);
    if (kind === 'int') {
      const n = a.v.re.round();
      if (a.v.im.abs().lte(tol) && a.v.re.minus(n).abs().lte(tol)) return { v: new Complex(n, 0), s: ZERO };
    } else if (kind === 'real' && a.v.im.abs().lte(tol)) {
      return { v: new Complex(a.v.re, 0), s: a.s };
    }
    return a;
  });
}

// ---------------------------------------------------------------------------
// Term-size estimates, natural logs in float64; upper estimates suffice (they set floors
// that matter only at exact zeros, and the near-zero test).

const TWO_PI = 2 * Math.PI;

/** log of the largest term of E_k's q-series at Im tau = y (constant term 1 included). */
function logLargestTermE(k: number, y: number): number {
  // 2k/|B_k| with |B_k| = 2 k! zeta(k) / (2 pi)^k (DLMF 24.8.1 at x = 0), zeta(k) >= 1 dropped
  const logC = Math.log(2 * k) - (Math.LN2 + logAbsGammaDouble(k + 1, 0) - k * Math.log(TWO_PI));
  // sigma_{k-1}(n) <= zeta(k-1) n^{k-1} <= 2 n^{k-1} for k >= 4; sigma_1(n) <= n (1 + ln n)
  const p = k - 1;
  const n = Math.max(1, p / (TWO_PI * y)); // maximiser of n^p e^{-2 pi n y}
  const logSigma = k >= 4 ? Math.LN2 + p * Math.log(n) : Math.log(n * (1 + Math.log(n)));
  return Math.max(0, logC + logSigma - TWO_PI * n * y);
}

/** E_2* = E_2 - 3/(pi y): the larger of the two parts' terms. */
function logLargestTermE2star(y: number): number {
  return Math.max(logLargestTermE(2, y), Math.log(3 / (Math.PI * y)));
}

/** max(|v|, 2^-cap L), log L given (natural log). */
function floorScale(v: Complex, logL: number): Decimal {
  const cap = cancellationCap(neededBits());
  const floor = new Decimal(2).pow(logL / Math.LN2 - cap);
  const a = v.abs();
  return a.gt(floor) ? a : floor;
}

function logAbs(v: Complex): number {
  if (v.isZero()) return -Infinity;
  const a = v.abs();
  // mantissa and exponent separately: |v| may be far outside float64's range
  return (a.e + Math.log10(a.div(new Decimal(10).pow(a.e)).toNumber())) * LN10;
}

function imTau(z: Complex): number {
  return Math.max(z.im.toNumber(), 1e-300);
}

// ---------------------------------------------------------------------------
// The special and modular built-ins

interface Spec {
  args: readonly ArgKind[];
  f: (args: Complex[], opts: ModularOptions) => Complex;
  /** The scale of the result for exact arguments (default |v|). */
  own?: (v: Complex, args: Complex[]) => Decimal;
  /** Whether v is near a zero, so that argument errors are probed (default: never). */
  nearZero?: (v: Complex, args: Complex[]) => boolean;
  /** Whether v is exact for these (exact) arguments: S = 0. */
  exact?: (v: Complex, args: Complex[]) => boolean;
}

const nearZeroE = (who: string) => (v: Complex, [k, z]: Complex[]): boolean =>
  logAbs(v) < logLargestTermE(integerValue(k!, who, 'k'), imTau(z!)) - NEAR_ZERO_DIGITS * LN10;

const isNonNegInt = (k: Complex): boolean => k.im.isZero() && k.re.isInteger() && k.re.gte(0) && k.re.lt(2 ** 31);

const SPECS: Readonly<Record<Exclude<BuiltinName, ElementaryName>, Spec>> = {
  sigma: {
    args: ['holo', 'int'],
    f: ([k, n]) => {
      const N = integerValue(n!, 'sigma', 'n');
      if (N < 1) throw new ModvetError('domain', 'sigma', `n = ${N} must be a positive integer`);
      if (!isNonNegInt(k!)) return sigmaComplex(k!, N);
      // exact for integer k >= 0, rounded only if it has more digits than the precision
      const d = new Decimal(sigma(k!.re.toNumber(), N).toString());
      return new Complex(d.toSD(Decimal.precision), 0);
    },
    exact: (v, [k]) => isNonNegInt(k!) && v.re.sd() < Decimal.precision,
  },
  bernoulli: {
    args: ['int'],
    f: ([n]) => {
      const idx = integerValue(n!, 'bernoulli', 'n');
      if (idx > MAX_USER_BERNOULLI) {
        throw new ModvetError('domain', 'bernoulli', `n = ${idx} is above the supported ${MAX_USER_BERNOULLI}`);
      }
      const B = bernoulli(idx);
      return new Complex(new Decimal(B.num.toString()).div(B.den.toString()), 0);
    },
    exact: (v) => v.re.isInteger(),
  },
  zeta: { args: ['holo'], f: ([s]) => zeta(s!) },
  xi: { args: ['holo'], f: ([s]) => xi(s!) },
  Gamma: {
    args: ['holo', 'real'],
    f: (a) => (a.length === 1 ? gamma(a[0]!) : gammaUpper(a[0]!, realValue(a[1]!, 'Gamma(a, x)', 'x'))),
  },
  beta: { args: ['holo'], f: ([s]) => dirichletBeta(s!) },
  K: { args: ['holo', 'real'], f: ([nu, x]) => besselK(nu!, realValue(x!, 'K', 'x')) },
  E: {
    args: ['int', 'holo'],
    f: ([k, z], o) => eisensteinE(integerValue(k!, 'E', 'k'), z!, o),
    own: (v, [k, z]) => floorScale(v, logLargestTermE(integerValue(k!, 'E', 'k'), imTau(z!))),
    nearZero: nearZeroE('E'),
  },
  G: {
    args: ['int', 'holo'],
    f: ([k, z], o) => eisensteinG(integerValue(k!, 'G', 'k'), z!, o),
    // G_k = 2 zeta(k) E_k, and log 2 zeta(k) < log 2 + 0.1 for k >= 4
    own: (v, [k, z]) => floorScale(v, logLargestTermE(integerValue(k!, 'G', 'k'), imTau(z!)) + Math.LN2 + 0.1),
    nearZero: nearZeroE('G'),
  },
  E2star: {
    args: ['nonholo'],
    f: ([z], o) => e2star(z!, o),
    own: (v, [z]) => floorScale(v, logLargestTermE2star(imTau(z!))),
    nearZero: (v, [z]) => logAbs(v) < logLargestTermE2star(imTau(z!)) - NEAR_ZERO_DIGITS * LN10,
  },
  eta: { args: ['holo'], f: ([z], o) => eta(z!, o) },
  Delta: { args: ['holo'], f: ([z], o) => discriminant(z!, o) },
  // j = E_4^3/Delta is relatively accurate except extremely close to the zeros of E_4 (the
  // orbit of rho), where it is tiny anyway; |j| < 1 means near that orbit
  j: { args: ['holo'], f: ([z], o) => kleinJ(z!, o), nearZero: (v) => v.abs().lt(1) },
  theta2: { args: ['holo'], f: ([z], o) => theta2(z!, o) },
  theta3: { args: ['holo'], f: ([z], o) => theta3(z!, o) },
  theta4: { args: ['holo'], f: ([z], o) => theta4(z!, o) },
  Ens: { args: ['holo', 'nonholo'], f: ([s, z], o) => nonholomorphicE(s!, z!, o) },
  Estar: { args: ['holo', 'nonholo'], f: ([s, z], o) => completedE(s!, z!, o) },
  // the second method, so that a claim can check the Fourier expansion without circularity
  EnsSplit: { args: ['holo', 'nonholo'], f: ([s, z], o) => nonholomorphicE(s!, z!, { ...o, method: 'epstein' }) },
  EstarSplit: { args: ['holo', 'nonholo'], f: ([s, z], o) => completedE(s!, z!, { ...o, method: 'epstein' }) },
};

/** The error the arguments bring in, measured where the module header says. */
function probe(spec: Spec, args: Val[], v: Complex, opts: ModularOptions): Decimal {
  const u = new Decimal(10).pow(-Decimal.precision);
  const lostLimit = new Decimal(10).pow(LOST_DIGITS_PROBE);
  const values = args.map((a) => a.v);
  let near: boolean | undefined;
  let extra = ZERO;
  args.forEach((a, k) => {
    const kind = spec.args[k]!;
    if (kind === 'int' || a.s.isZero()) return;
    const lost = a.s.gt(a.v.abs().times(lostLimit));
    near ??= spec.nearZero?.(v, values) ?? false;
    if (!near && !lost) return;
    const delta = u.times(a.s);
    const steps = kind === 'nonholo' ? [new Complex(delta, 0), new Complex(0, delta)] : [new Complex(delta, 0)];
    for (const d of steps) {
      const moved = values.slice();
      // the step must survive the addition: enough digits to hold z + delta exactly enough
      moved[k] = withGuard(Math.max(0, a.v.abs().e - delta.e) + 2, () => a.v.add(d));
      try {
        extra = extra.plus(spec.f(moved, opts).sub(v).abs().div(u));
      } catch (e) {
        // a step out of the domain adds nothing: the value itself was computed
        if (!(e instanceof ModvetError)) throw e;
      }
    }
  });
  return extra;
}

/** Calls a built-in on evaluated arguments (arity already checked by the resolver). */
export function callBuiltin(fn: BuiltinName, args: Val[], opts: ModularOptions): Val {
  if (isElementary(fn)) return ELEMENTARY[fn](args[0]!);
  const spec = SPECS[fn];
  const normal = normaliseArgs(spec.args, args);
  const values = normal.map((a) => a.v);
  const v = spec.f(values, opts);
  const allExact = normal.every((a) => a.s.isZero());
  if (allExact && spec.exact?.(v, values)) return { v, s: ZERO };
  const own = spec.own?.(v, values) ?? v.abs();
  return { v, s: own.plus(probe(spec, normal, v, opts)) };
}
