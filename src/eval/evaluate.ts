/**
 * Evaluation of resolved expressions (src/lang/ast.ts) at the precision in force.
 *
 * Public API (stable):
 *   evaluate(expr, env): { value: Complex; scale: Decimal }
 *   evaluateConstant(expr): Complex                 clause values: box corners, list elements, points
 *   evaluateConstantWithError(expr)                 the same with an absolute error bound
 *   evaluateRegion(region): NumericBound[]          region bounds as Decimals, for the sampler
 *   inRegion(bounds, tau): boolean
 *   EvalError                                       runtime failures, with the node's span
 *   EVAL_GUARD_DIGITS
 *
 * Conventions:
 * - Precision: the caller sets it (withDigits). The whole tree is evaluated with
 *   EVAL_GUARD_DIGITS extra digits and the value rounded once to the precision in force.
 *   The guard digits absorb the rounding of long expressions and the sensitivity of
 *   built-ins to rounded arguments (e.g. E(4, g(tau)) with g(tau) rounded), which the
 *   scale below does not track. Cancellation beyond them is not resolved here: it shows
 *   in `scale`, and the checker's second evaluation at higher precision settles it.
 * - tau, parameter values and group entries are exact inputs (the identity is checked at
 *   exactly those values), except: EvalEnv may state their absolute errors (tauError,
 *   paramErrors); without that, an input with more significant digits than the working
 *   precision counts as rounded, with an error of one unit in its last digit (a fixed
 *   point such as rho computed to 100 digits). Errors matter only near zeros (builtins.ts).
 * - `scale` is a first-order running error bound in units of the working precision: the
 *   value's error is at most about 10^-P * scale (P the digits in force; small factors
 *   aside; typically 10^-EVAL_GUARD_DIGITS smaller, thanks to the guard digits). Rules,
 *   with S the scale of a node and v its value:
 *     exact leaf (literal with at most P digits, i, tau, x, y, taubar, parameters, a, b,
 *       c, d): S = 0 (an input with a stated error: that error / 10^-P);
 *     rounded constant (pi, euler, rho, a longer literal): S = |v|;
 *     a +- b: S_a + S_b + |v|, so S >= the magnitudes of the operands that cancelled;
 *     a*b: S_a |b| + |a| S_b + |v|;   a/b: (S_a + |v| S_b)/|b| + |v|;   -a: S_a;
 *     a^n (exact integer n): |n| |v| S_a/|a| + |v|;   a^b: |v| (|b| S_a/|a| + |log a| S_b) + |v|;
 *     elementary f(a): |f'(a)| S_a + |v|;   g(z): S_z/|c z + d|^2 + |v| (1 + the relative
 *       cancellation in a z + b and in c z + d);
 *     special and modular built-ins: see builtins.ts: |v| (a floor 2^-cap L for E, G,
 *       E2star, whose accuracy is absolute at their zeros), plus, near a zero or when an
 *       argument lost digits, the measured effect of the arguments' errors.
 *   The returned scale also counts the final rounding (+ |value|). A value carries about
 *   log10(|value| / (10^-P scale)) correct digits; when that is below 1 it is noise.
 * - Truncated constructs: a lattice sum (lattice.ts) is accurate only to the relative
 *   error its extrapolation reached, far above 10^-P. That error is not put into the scale
 *   (it would pass for cancellation); the evaluation records the largest such relative
 *   error met anywhere in the expression and returns it as `limit`, with what caused it.
 *   It carries over to the result relative to the result's scale (exact for products and
 *   quotients; an upper bound for sums, whose scale counts the summands). A lattice sum
 *   inside a differential operator is refused ('convergence'): its error is not smooth
 *   enough in tau to difference.
 * - Text is never executed: numbers are parsed by decimal.js from the literal text, exactly.
 * - Failures (a pole, a domain error from a built-in, division by zero, a non-integer where
 *   an integer is required) throw EvalError with the span of the failing node; errors
 *   inside a let expansion also list the call sites in `trace`.
 *
 *   withDigits(40, () => evaluate(claim.lhs, { tau: Complex.of('0.1', '1.2') }).value)
 */
import { Decimal } from 'decimal.js';
import type { Comparison, ConstantName, Expr, LatticeSum, Operator, Region, RegionQuantity, Series, Span, TauPartName } from '../lang/ast.js';
import { freeBoundKeys } from '../lang/depends.js';
import type { Mat2 } from '../groups/matrix.js';
import { Complex } from '../numeric/complex.js';
import { euler, pi } from '../numeric/constants.js';
import { ModvetError, type NumericErrorCode } from '../numeric/errors.js';
import { withGuard } from '../numeric/precision.js';
import { isStackOverflow } from '../lang/resolve.js';
import { callBuiltin, type Val } from './builtins.js';
import { applyOperator } from './derivative.js';
import { evalSeries } from './series.js';
import { evalLimit } from './limit.js';
import { evalLattice } from './lattice.js';
import { zeta } from '../special/zeta.js';

/** Extra digits the whole expression is evaluated with (see the header). */
export const EVAL_GUARD_DIGITS = 5;

export interface GroupBinding {
  /** The variable of the group clause (g in `for g in SL2Z`). */
  name: string;
  matrix: Mat2;
}

export interface EvalEnv {
  tau: Complex;
  group?: GroupBinding;
  /** Values of the claim's parameters, by name. */
  params?: ReadonlyMap<string, Complex>;
  /** Passed to the modular built-ins as { yMin }; their default (0.02) when absent. */
  yMin?: number;
  /**
   * Absolute errors of inputs that are not exact: a fixed point such as rho rounded to the
   * working precision (evaluateConstantWithError gives it). Absent means exact.
   */
  tauError?: Decimal;
  paramErrors?: ReadonlyMap<string, Decimal>;
}

export interface EvalResult {
  value: Complex;
  scale: Decimal;
  /** The relative accuracy a truncated construct limited the value to (module header). */
  limit?: { rel: Decimal; by: string };
}

/** The truncation errors met in one evaluation (shared by all its walkers). */
interface TruncationLog {
  rel: Decimal;
  by: string;
  /** Inside a differential operator's shifted walks: lattice sums are refused there. */
  inOperator: boolean;
}

function newLog(inOperator = false): TruncationLog {
  return { rel: ZERO, by: '', inOperator };
}

/** 'unbound': the environment lacks tau, a parameter or the group (a caller's bug). */
export type EvalErrorCode = NumericErrorCode | 'unbound';

export class EvalError extends Error {
  constructor(
    readonly code: EvalErrorCode,
    /** The node that failed: a call, an operator, a literal. */
    readonly span: Span,
    /** The function or operator as the user wrote it ('E', '/', '^', 'g'). */
    readonly fn: string,
    message: string,
    /** Call sites of the let macros the failure happened in, innermost first. */
    readonly trace: Span[] = [],
  ) {
    super(message);
    this.name = 'EvalError';
  }
}

/**
 * Values already computed at one sample and one precision, shared by several evaluations
 * there: a claim and its variants (a suggested fix, a mutant) that contain the same nodes
 * reuse them. The caller keys a memo by everything the values depend on (tau, parameters,
 * group element, y_min, precision); the truncation log is shared too, so a reused lattice
 * sum still limits the result.
 */
export class EvaluationMemo {
  readonly values = new Map<Expr, Val>();
  readonly log: TruncationLog = newLog();
}

/** Evaluates at the precision in force (module header); `memo`: see EvaluationMemo. */
export function evaluate(expr: Expr, env: EvalEnv, memo?: EvaluationMemo): EvalResult {
  const log = memo?.log ?? newLog();
  const raw = withGuard(EVAL_GUARD_DIGITS, () => walk(new Walker(env, NO_BINDINGS, null, -1, log, memo?.values), expr));
  const value = raw.v.round();
  const out: EvalResult = { value, scale: raw.s.plus(value.abs()).toSD(8) };
  if (log.rel.gt(0)) out.limit = { rel: log.rel.toSD(3), by: log.by };
  return out;
}

/** A constant expression (no tau, parameters or group) at the precision in force. */
export function evaluateConstant(expr: Expr): Complex {
  return evaluateConstantWithError(expr).value;
}

/**
 * A constant expression and a bound on its absolute error (10^-P scale): pass it as
 * EvalEnv.tauError / paramErrors when the value is used as a point or a parameter.
 */
export function evaluateConstantWithError(expr: Expr): { value: Complex; error: Decimal } {
  const raw = withGuard(EVAL_GUARD_DIGITS, () => walk(new Walker(null), expr));
  const value = raw.v.round();
  return { value, error: raw.s.plus(value.abs()).times(new Decimal(10).pow(-Decimal.precision)).toSD(8) };
}

export interface NumericBound {
  quantity: RegionQuantity;
  op: Comparison;
  value: Decimal;
  span: Span;
}

/** The region's bounds as real numbers at the precision in force; a non-real bound throws. */
export function evaluateRegion(region: Region): NumericBound[] {
  return region.bounds.map((b) => {
    const v = evaluateConstant(b.bound);
    if (!v.im.isZero()) throw new EvalError('domain', b.bound.span, 'region', `the bound ${v} is not real`);
    return { quantity: b.quantity, op: b.op, value: v.re, span: b.span };
  });
}

/** Whether tau satisfies every bound. */
export function inRegion(bounds: readonly NumericBound[], tau: Complex): boolean {
  return bounds.every((b) => {
    const q = b.quantity === 'x' ? tau.re : b.quantity === 'y' ? tau.im : b.quantity === 'absx' ? tau.re.abs() : tau.abs();
    switch (b.op) {
      case '<':
        return q.lt(b.value);
      case '<=':
        return q.lte(b.value);
      case '>':
        return q.gt(b.value);
      case '>=':
        return q.gte(b.value);
    }
  });
}

// ---------------------------------------------------------------------------

const ZERO = new Decimal(0);

function exactOrRounded(d: Decimal): { d: Decimal; s: Decimal } {
  const P = Decimal.precision;
  return d.sd() <= P ? { d, s: ZERO } : { d: d.toSD(P), s: d.abs() };
}

/** Runs the walker; a tree nested too deeply for the stack (lets within lets) becomes an EvalError. */
function walk(w: Walker, expr: Expr): Val {
  try {
    return w.run(expr);
  } catch (e) {
    if (isStackOverflow(e)) throw new EvalError('overflow', expr.span, 'evaluate', 'the expression is nested too deeply to evaluate');
    throw e;
  }
}

/**
 * An input's error in units of the working precision: the stated absolute error, or, when
 * none is stated, one unit in the last digit of an input with more significant digits than
 * the working precision (such a value was rounded: a fixed point like rho computed to many
 * digits); shorter inputs are exact.
 */
function inputScale(err: Decimal | undefined, v: Complex): Decimal {
  const P = Decimal.precision;
  if (err !== undefined) return err.isZero() ? ZERO : err.times(new Decimal(10).pow(P));
  let ulp = ZERO;
  for (const part of [v.re, v.im]) {
    if (part.isZero() || part.sd() <= P) continue;
    const u = new Decimal(10).pow(part.e - part.sd() + 1);
    if (u.gt(ulp)) ulp = u;
  }
  return ulp.isZero() ? ZERO : ulp.times(new Decimal(10).pow(P));
}

function rethrow(e: unknown, span: Span, fn: string): never {
  if (e instanceof EvalError) throw e;
  if (e instanceof ModvetError) throw new EvalError(e.code, span, fn, e.message);
  throw e;
}

function constant(name: ConstantName): Val {
  switch (name) {
    case 'i':
      return { v: Complex.I, s: ZERO };
    case 'pi':
      return { v: new Complex(pi(), 0), s: pi() };
    case 'euler':
      return { v: new Complex(euler(), 0), s: euler() };
    case 'rho':
      // e^{2 pi i/3} = (-1 + i sqrt 3)/2
      return { v: new Complex('-0.5', new Decimal(3).sqrt().div(2)), s: new Decimal(1) };
  }
}

const NO_BINDINGS: ReadonlyMap<number, Val> = new Map();

class Walker {
  // expansions share subtrees: each distinct node is evaluated once per call
  private readonly memo: Map<Expr, Val>;

  /**
   * bindings: values of series variables by key (series.ts). A term walker has a parent
   * (the walker of the enclosing scope) and the key it binds: nodes free of that key are
   * evaluated by the parent, once for all terms.
   */
  constructor(
    private readonly env: EvalEnv | null,
    private readonly bindings: ReadonlyMap<number, Val> = NO_BINDINGS,
    private readonly parent: Walker | null = null,
    private readonly key = -1,
    private readonly log: TruncationLog = parent?.log ?? newLog(),
    memo?: Map<Expr, Val>,
  ) {
    this.memo = memo ?? new Map<Expr, Val>();
  }

  /** Fixes a node's value (a frozen let argument of an operator). */
  seed(e: Expr, v: Val): void {
    this.memo.set(e, v);
  }

  run(e: Expr): Val {
    const hit = this.memo.get(e);
    if (hit !== undefined) return hit;
    if (this.parent !== null && !freeBoundKeys(e).has(this.key)) return this.parent.run(e);
    const r = this.node(e);
    this.memo.set(e, r);
    return r;
  }

  private unbound(span: Span, what: string): never {
    throw new EvalError('unbound', span, what, `${what} has no value here`);
  }

  private node(e: Expr): Val {
    switch (e.kind) {
      case 'number': {
        const { d, s } = exactOrRounded(new Decimal(e.text));
        return { v: e.imaginary ? new Complex(0, d) : new Complex(d, 0), s };
      }
      case 'constant':
        return constant(e.name);
      case 'tau':
        if (this.env === null) return this.unbound(e.span, 'tau');
        return { v: this.env.tau, s: inputScale(this.env.tauError, this.env.tau) };
      case 'tauPart':
        return this.tauPart(e.part, this.run(e.arg), e.span);
      case 'param': {
        const v = this.env?.params?.get(e.name);
        if (v === undefined) return this.unbound(e.span, e.name);
        return { v, s: inputScale(this.env?.paramErrors?.get(e.name), v) };
      }
      case 'groupEntry': {
        const m = this.env?.group?.matrix;
        if (m === undefined) return this.unbound(e.span, e.entry);
        return { v: Complex.of(m[e.entry].toString()), s: ZERO };
      }
      case 'moebius':
        return this.moebius(e.arg, e.group, e.span);
      case 'neg': {
        const a = this.run(e.arg);
        return { v: a.v.neg(), s: a.s };
      }
      case 'binary':
        return this.binary(e.op, this.run(e.left), this.run(e.right), e.span);
      case 'call': {
        const args = e.args.map((a) => this.run(a));
        const yMin = this.env?.yMin;
        try {
          return callBuiltin(e.fn, args, yMin === undefined ? {} : { yMin });
        } catch (err) {
          return rethrow(err, e.span, e.fn);
        }
      }
      case 'operator':
        return this.operator(e);
      case 'boundVar': {
        const v = this.bindings.get(e.key);
        return v === undefined ? this.unbound(e.span, e.name) : v;
      }
      case 'series':
        return this.series(e);
      case 'lattice':
        return this.lattice(e);
      case 'limit':
        return evalLimit(e, {
          run: (x) => this.run(x),
          at: (v) => {
            const b = new Map(this.bindings);
            b.set(e.key, { v, s: ZERO });
            return new Walker(this.env, b, this, e.key).run(e.body);
          },
          fail: (code, span, message) => {
            throw new EvalError(code, span, 'limit', message);
          },
        });
      case 'letCall':
        try {
          return this.run(e.body);
        } catch (err) {
          if (err instanceof EvalError) throw new EvalError(err.code, err.span, err.fn, err.message, [...err.trace, e.span]);
          throw err;
        }
    }
  }

  /** A differential operator (derivative.ts): the operand is walked afresh at shifted points. */
  private operator(e: Operator): Val {
    const env = this.env;
    // frozen let arguments: evaluated here, once per precision, and seeded into each shifted walk
    const frozen = new Map<number, Map<Expr, Val>>();
    const frozenAt = (): Map<Expr, Val> => {
      const P = Decimal.precision;
      let m = frozen.get(P);
      if (m === undefined) {
        const w = new Walker(env, NO_BINDINGS, null, -1, this.log);
        m = new Map(e.frozen.map((f) => [f, w.run(f)]));
        frozen.set(P, m);
      }
      return m;
    };
    try {
      return applyOperator(e, {
        run: (x) => this.run(x),
        // the shifted points are exact inputs: the error of tau itself is not differentiated
        evalAt: (x, tau) => {
          const w = new Walker(env === null ? { tau } : { ...env, tau, tauError: ZERO }, this.bindings, null, -1, newLog(true));
          if (e.frozen.length > 0) for (const [f, v] of frozenAt()) w.seed(f, v);
          return w.run(x);
        },
        tau: () => (env === null ? this.unbound(e.span, e.op) : env.tau),
        yMin: env?.yMin,
        guard: EVAL_GUARD_DIGITS,
      });
    } catch (err) {
      return rethrow(err, e.span, e.op);
    }
  }

  /** A sum or product (series.ts): the body walked once per term with its variable bound. */
  private series(e: Series): Val {
    return evalSeries(e, {
      run: (x) => this.run(x),
      term: (n) => {
        const b = new Map(this.bindings);
        b.set(e.key, { v: new Complex(n, 0), s: ZERO });
        return new Walker(this.env, b, this, e.key).run(e.body);
      },
      fail: (code, span, message) => {
        throw new EvalError(code, span, e.op, message);
      },
    });
  }

  /** A lattice sum (lattice.ts): the body walked per pair, by a walker per row m. */
  private lattice(e: LatticeSum): Val {
    if (this.log.inOperator) {
      throw new EvalError('convergence', e.span, 'sum', 'a lattice sum inside a differential operator is not supported: its truncation error cannot be differenced');
    }
    const rows = new Map<number, Walker>();
    const [km, kn] = e.keys;
    const r = evalLattice(e, {
      term: (m, n) => {
        let row = rows.get(m);
        if (row === undefined) {
          const b = new Map(this.bindings);
          b.set(km, { v: new Complex(m, 0), s: ZERO });
          row = new Walker(this.env, b, this, km);
          rows.set(m, row);
        }
        const b = new Map(this.bindings);
        b.set(km, { v: new Complex(m, 0), s: ZERO });
        b.set(kn, { v: new Complex(n, 0), s: ZERO });
        return new Walker(this.env, b, row, kn).run(e.body);
      },
      zeta: (k) => {
        try {
          return zeta(k);
        } catch (err) {
          return rethrow(err, e.span, 'zeta');
        }
      },
      fail: (code, span, message) => {
        throw new EvalError(code, span, 'sum', message);
      },
    });
    if (r.rel.gt(this.log.rel)) {
      this.log.rel = r.rel;
      this.log.by = 'a lattice sum';
    }
    return { v: r.v, s: r.s };
  }

  private tauPart(part: TauPartName, t: Val, span: Span): Val {
    switch (part) {
      case 'x':
        return { v: new Complex(t.v.re, 0), s: t.s };
      case 'y':
        return { v: new Complex(t.v.im, 0), s: t.s };
      case 'taubar':
        return { v: t.v.conj(), s: t.s };
      case 'q': {
        const twoPi = pi().times(2);
        const v = this.guarded(span, 'q', () => t.v.scale(twoPi).mulI().exp());
        // exp(w), w = 2 pi i t: |q| (S_w + 1) with S_w = 2 pi (S_t + 2|t|) (pi and the product rounded)
        return { v, s: v.absBound().times(twoPi.times(t.s.plus(t.v.absBound().times(2))).plus(1)) };
      }
    }
  }

  private guarded(span: Span, fn: string, f: () => Complex): Complex {
    try {
      return f();
    } catch (err) {
      return rethrow(err, span, fn);
    }
  }

  private moebius(argExpr: Expr, name: string, span: Span): Val {
    const m = this.env?.group?.matrix;
    if (m === undefined) return this.unbound(span, name);
    const z = this.run(argExpr);
    const a = Complex.of(m.a.toString());
    const b = Complex.of(m.b.toString());
    const c = Complex.of(m.c.toString());
    const d = Complex.of(m.d.toString());
    const num = a.mul(z.v).add(b);
    const den = c.mul(z.v).add(d);
    const v = this.guarded(span, name, () => num.div(den));
    // d/dz (az+b)/(cz+d) = 1/(cz+d)^2 (det 1); the rounding of num and den, each relative
    // to the terms it added, and of the quotient
    const den2 = den.abs2();
    const absZ = z.v.abs();
    const relNum = num.isZero() ? ZERO : a.abs().times(absZ).plus(b.abs()).div(num.abs());
    const relDen = c.abs().times(absZ).plus(d.abs()).div(den.abs());
    const av = v.absBound();
    return { v, s: z.s.div(den2).plus(av.times(relNum.plus(relDen).plus(1))) };
  }

  private binary(op: '+' | '-' | '*' | '/' | '^', a: Val, b: Val, span: Span): Val {
    switch (op) {
      case '+':
      case '-': {
        const v = op === '+' ? a.v.add(b.v) : a.v.sub(b.v);
        return { v, s: a.s.plus(b.s).plus(v.absBound()) };
      }
      case '*': {
        const v = a.v.mul(b.v);
        return { v, s: a.s.times(b.v.absBound()).plus(a.v.absBound().times(b.s)).plus(v.absBound()) };
      }
      case '/': {
        const v = this.guarded(span, '/', () => a.v.div(b.v));
        const av = v.absBound();
        return { v, s: a.s.plus(av.times(b.s)).div(b.v.absBound()).plus(av) };
      }
      case '^':
        return this.power(a, b, span);
    }
  }

  private power(a: Val, b: Val, span: Span): Val {
    const v = this.guarded(span, '^', () => a.v.pow(b.v));
    const av = v.absBound();
    if (a.v.isZero()) {
      // 0^n = 0 for Re n > 0: first order, only 0^1 passes the base's error on
      return { v, s: b.v.equals(Complex.ONE) ? a.s : ZERO };
    }
    const isInt = b.s.isZero() && b.v.im.isZero() && b.v.re.isInteger();
    // an exact base (the lattice sums' m tau + n) costs no division
    let s = a.s.isZero() ? ZERO : av.times(b.v.absBound()).times(a.s).div(a.v.absBound());
    if (!isInt && !b.s.isZero()) s = s.plus(av.times(a.v.log().absBound()).times(b.s));
    return { v, s: s.plus(av) };
  }
}
