/**
 * Differential operators of the claim language (names.ts: lap, dtau, dtaubar, qd, raise,
 * lower, serre): exact derivatives for elementary operands (symbolic.ts, below), finite
 * differences at raised precision with an error estimate for everything else.
 *
 * Conventions: tau = x + i y; d/dtau = (1/2)(d_x - i d_y), d/dtaubar = (1/2)(d_x + i d_y);
 * lap = y^2 (d_x^2 + d_y^2) (lap y^s = s(s-1) y^s); qd = (1/(2 pi i)) d/dtau;
 * raise(k, f) = 2i df/dtau + (k/y) f; lower(f) = -2i y^2 df/dtaubar;
 * serre(k, f) = qd(f) - (k/12) E_2 f.
 *
 * Method. A partial derivative d_x^k f or d_y^k f (k = 1, 2) at tau0 is a central difference
 * of order p = 2 HALF on the offsets -HALF..HALF (weights by Fornberg's algorithm, Math.
 * Comp. 51 (1988) 699-706, in exact rationals), with step h = y0 10^-(D + 2)/p (D the
 * digits in force, y0 = Im tau0: the functions of the language are analytic in a disc of
 * radius y0 about tau0, so y0 is their length scale). The operand is re-evaluated at the
 * shifted points with `extra` more digits, extra = k log10(y0/h) + log10(sum |w|) + 3, which
 * absorbs the cancellation of the difference quotient. The same stencil with step 2h gives
 * Richardson's estimate of the truncation error, est = |D(h) - D(2h)|/(2^p - 1); the
 * returned value is the extrapolation D(h) + (D(h) - D(2h))/(2^p - 1), whose error est
 * bounds with a wide margin. When est exceeds 10^-(D - guard) times the size of the
 * derivative (max(|D f|, 1e-12 max |f_j| / y0^k); evaluate.ts counts errors in those units; a
 * length scale below y0, e.g. y^s with large |s|), h shrinks by (target/est)^(1/p) and
 * the difference is taken again, twice at most; likewise, when the rounding part exceeds
 * the target (a derivative far below f/y0^k, as for E_4 at large y), the lost digits are
 * added and the difference retaken. What is left is reported, never hidden: an error above
 * 10^(2 guard) targets (the step never converged: a kink or a cut inside the stencil) is a
 * 'convergence' error, which the checker counts as undecided, never as agreement.
 * Absolute error = est + sum |w_j| err_j / h^k, err_j the inner evaluations' own error.
 * In y, when tau0 - 2 HALF h i (the farthest node at step 2h) would go below y_min, the stencil is one-sided (offsets
 * 0..2 HALF + k - 1, order 2 HALF for k = 1, 2) and stays at or above y0.
 *
 * Shortcuts proved from the AST (src/lang/depends.ts): an operand that does not depend on
 * tau gives exactly 0 (dtau, dtaubar, lap, qd, lower) or its multiple (raise: (k/y) f;
 * serre: -(k/12) E_2 f); a holomorphic operand has d/dtau = d_x (one direction) and
 * d/dtaubar = lap = lower = 0 exactly.
 *
 * Elementary operands (symbolic.ts: y^s, tau^3, y exp(2 pi i tau), ...) are differentiated
 * exactly instead, by nerdamer: d_x^2 f + d_y^2 f (lap) and (1/2)(d_x -+ i d_y) f (the
 * tau derivatives) as one simplified expression each, d_x f alone for a holomorphic f. The
 * result, read back into an AST, is evaluated at tau0 like any expression, so its error is
 * the evaluator's running scale, with no truncation part. nerdamer sees those operands
 * only, and nothing from a claim is executed as code (symbolic.ts). Because nerdamer
 * simplifies under real-variable assumptions ((x^2)^s -> x^(2s)) and has known slips, each
 * symbolic value is checked at the point against the same derivative by the differences
 * above at CHECK_DIGITS digits (cheaper than the full difference: fewer digits, and the
 * check's error only has to separate right from wrong). On a mismatch the partials are
 * tried one by one, each checked likewise; when a check fails, the operand is not
 * elementary, or nerdamer fails, the derivative is the finite difference above.
 *
 *   applyOperator(node, ctx)   // ctx: evaluate sub-expressions here, or the operand elsewhere
 */
import { Decimal } from 'decimal.js';
import type { Expr, Operator } from '../lang/ast.js';
import { dependsOnTau, isHolomorphic } from '../lang/depends.js';
import { Complex } from '../numeric/complex.js';
import { ModvetError } from '../numeric/errors.js';
import { pi } from '../numeric/constants.js';
import { withDigits, withGuard } from '../numeric/precision.js';
import { DEFAULT_Y_MIN } from '../modular/domain.js';
import { callBuiltin, type Val } from './builtins.js';
import { symbolicPartial, type SymbolicDerivative } from './symbolic.js';

/** Half-width of the central stencil: order 2 HALF. */
export const HALF = 2;
/** Step refinements after the first difference, when the Richardson estimate is too large. */
const REFINEMENTS = 2;
/** A derivative below SIZE_FLOOR f / y0^k is accurate relative to f / y0^k only. */
const SIZE_FLOOR = new Decimal('1e-12');

const ZERO = new Decimal(0);
/** Digits (before the guard) of the finite difference that checks a symbolic value. */
export const CHECK_DIGITS = 12;
/** A symbolic value passes when within CHECK_SLACK times the check's error (or target). */
const CHECK_SLACK = 1000;

export interface OperatorContext {
  /** Evaluates a sub-expression in the current environment (the weight, the point `at`). */
  run(e: Expr): Val;
  /** Evaluates the operand with tau replaced, at the precision in force (a fresh walk). */
  evalAt(e: Expr, tau: Complex): Val;
  /** The environment's tau; throws when there is none. */
  tau(): Complex;
  yMin: number | undefined;
  /** Digits between the precision in force and the one `scale` is counted in. */
  guard: number;
}

// ---------------------------------------------------------------------------
// Fornberg's weights in exact rationals

export interface Frac {
  n: bigint;
  d: bigint;
}
const gcd = (a: bigint, b: bigint): bigint => {
  a = a < 0n ? -a : a;
  b = b < 0n ? -b : b;
  while (b !== 0n) [a, b] = [b, a % b];
  return a;
};
const frac = (n: bigint, d = 1n): Frac => {
  if (d < 0n) [n, d] = [-n, -d];
  const g = gcd(n, d) || 1n;
  return { n: n / g, d: d / g };
};
const mul = (a: Frac, b: Frac): Frac => frac(a.n * b.n, a.d * b.d);
const sub = (a: Frac, b: Frac): Frac => frac(a.n * b.d - b.n * a.d, a.d * b.d);
const divf = (a: Frac, b: Frac): Frac => frac(a.n * b.d, a.d * b.n);

const weightCache = new Map<string, Frac[]>();

/**
 * Weights w_j with f^(k)(0) ~ sum_j w_j f(x_j) (unit step) on the integer nodes x_j:
 * Fornberg's recursion (Math. Comp. 1988; the form of SIAM Review 40 (1998) 685-691).
 */
export function fornbergWeights(nodes: readonly number[], k: number): Frac[] {
  const key = `${nodes.join(',')}|${k}`;
  const hit = weightCache.get(key);
  if (hit !== undefined) return hit;
  const n = nodes.length - 1;
  const x = nodes.map((v) => frac(BigInt(v)));
  // C[j][m]: weight of node j for the m-th derivative
  const C: Frac[][] = Array.from({ length: n + 1 }, () => Array.from({ length: k + 1 }, () => frac(0n)));
  C[0]![0] = frac(1n);
  let c1 = frac(1n);
  let c4 = x[0]!;
  for (let i = 1; i <= n; i++) {
    const mn = Math.min(i, k);
    let c2 = frac(1n);
    const c5 = c4;
    c4 = x[i]!;
    for (let j = 0; j < i; j++) {
      const c3 = sub(x[i]!, x[j]!);
      c2 = mul(c2, c3);
      if (j === i - 1) {
        for (let m = mn; m >= 1; m--) {
          const t = sub(mul(frac(BigInt(m)), C[i - 1]![m - 1]!), mul(c5, C[i - 1]![m]!));
          C[i]![m] = divf(mul(c1, t), c2);
        }
        C[i]![0] = divf(sub(frac(0n), mul(mul(c1, c5), C[i - 1]![0]!)), c2);
      }
      for (let m = mn; m >= 1; m--) {
        const t = sub(mul(c4, C[j]![m]!), mul(frac(BigInt(m)), C[j]![m - 1]!));
        C[j]![m] = divf(t, c3);
      }
      C[j]![0] = divf(mul(c4, C[j]![0]!), c3);
    }
    c1 = c2;
  }
  const w = C.map((row) => row[k]!);
  weightCache.set(key, w);
  return w;
}

// ---------------------------------------------------------------------------
// One partial derivative

type Dir = 'x' | 'y';

interface Partial {
  value: Complex;
  /** Absolute error bound. */
  err: Decimal;
  /** max |f_j| / y0^k over the nodes: the size against which the target is set. */
  size: Decimal;
}

interface Stencil {
  nodes: number[];
  order: number;
}

function stencil(k: number, central: boolean): Stencil {
  if (central) return { nodes: Array.from({ length: 2 * HALF + 1 }, (_, j) => j - HALF), order: 2 * HALF };
  // one-sided on 0..2 HALF + k - 1: order 2 HALF for k = 1 and k = 2
  const m = 2 * HALF + k - 1;
  return { nodes: Array.from({ length: m + 1 }, (_, j) => j), order: 2 * HALF };
}

function log10(d: Decimal): number {
  if (d.isZero()) return -Infinity;
  return d.e + Math.log10(d.div(new Decimal(10).pow(d.e)).toNumber());
}

class Differentiator {
  private readonly cache = new Map<string, Val>();
  readonly y0: Decimal;

  constructor(
    private readonly ctx: OperatorContext,
    private readonly operand: Expr,
    readonly t0: Complex,
    private readonly op: string,
  ) {
    this.y0 = t0.im;
  }

  /** f at t0 + offset (the offset exact), at the precision in force. */
  value(offset: Complex): Val {
    const t = this.t0.add(offset);
    const key = `${Decimal.precision}|${t.re.toString()}|${t.im.toString()}`;
    const hit = this.cache.get(key);
    if (hit !== undefined) return hit;
    const v = this.ctx.evalAt(this.operand, t);
    this.cache.set(key, v);
    return v;
  }

  /** The error of a value from its scale at the precision in force. */
  errorOf(v: Val): Decimal {
    return v.s.times(new Decimal(10).pow(this.ctx.guard - Decimal.precision));
  }

  /**
   * d_dir^k f at t0 (module header). `floor`: the size of the other partial it will be
   * added to (the accuracy needed is relative to the sum, not to this part alone).
   */
  partial(dir: Dir, k: number, floor: Decimal = ZERO): Partial {
    const D = Decimal.precision;
    const yMin = this.ctx.yMin ?? DEFAULT_Y_MIN;
    let logU = -(D + 2) / (2 * HALF);
    // digits added when the derivative is far smaller than f / y0^k (E_4 at large y)
    let boost = 0;
    let best: Partial | null = null;
    let bestTarget: Decimal | null = null;
    let bestEst = ZERO;
    for (let attempt = 0; attempt <= REFINEMENTS; attempt++) {
      const h = this.y0.times(new Decimal(10).pow(logU)).toSD(2);
      // the farthest node of the 2h stencil is 2 HALF h below y0
      const central = dir === 'x' || this.y0.minus(h.times(2 * HALF)).gte(yMin);
      const st = stencil(k, central);
      const w = fornbergWeights(st.nodes, k);
      const sumW = w.reduce((s, f) => s + Math.abs(Number(f.n) / Number(f.d)), 0);
      const extra = Math.ceil(k * -logU + Math.log10(sumW)) + 3 + boost;
      const r = withGuard(extra, () => {
        const step = (j: number, hh: Decimal): Complex => (dir === 'x' ? new Complex(hh.times(j), 0) : new Complex(0, hh.times(j)));
        const diff = (hh: Decimal): { v: Complex; rnd: Decimal; size: Decimal } => {
          let v = Complex.ZERO;
          let rnd = ZERO;
          let size = ZERO;
          st.nodes.forEach((j, idx) => {
            const wj = w[idx]!;
            if (wj.n === 0n) return;
            const f = this.value(step(j, hh));
            const wd = new Decimal(wj.n.toString()).div(wj.d.toString());
            v = v.add(f.v.scale(wd));
            rnd = rnd.plus(wd.abs().times(this.errorOf(f)));
            size = Decimal.max(size, f.v.abs());
          });
          const hk = hh.pow(k);
          return { v: v.scale(new Decimal(1).div(hk)), rnd: rnd.div(hk), size: size.div(this.y0.pow(k)) };
        };
        const a = diff(h);
        const b = diff(h.times(2));
        const q = new Decimal(2).pow(st.order).minus(1);
        const delta = a.v.sub(b.v);
        const est = delta.abs().div(q);
        return { value: a.v.add(delta.scale(new Decimal(1).div(q))), est, rnd: a.rnd, size: a.size };
      });
      const value = r.value.round();
      // errors count in units of 10^-(D - guard) (evaluate.ts): one unit of |D f|, with a
      // floor SIZE_FLOOR max |f_j| / y0^k for derivatives that (nearly) vanish
      const target = new Decimal(10).pow(this.ctx.guard - D).times(Decimal.max(value.abs(), r.size.times(SIZE_FLOOR), floor));
      best = { value, err: r.est.plus(r.rnd), size: r.size };
      bestTarget = target;
      bestEst = r.est;
      const truncOk = r.est.lte(target) || r.est.isZero();
      const roundOk = r.rnd.lte(target);
      if (truncOk && roundOk) break;
      // rounding: the difference quotient cancelled more than planned; add what was lost
      if (!roundOk) boost += Math.ceil(log10(r.rnd.div(target))) + 1;
      // truncation: the function varies faster than y0; shrink the step by the missing factor
      if (!truncOk) logU += Math.min(-0.3, log10(target.div(r.est)) / (2 * HALF) - 0.3);
    }
    // a step that never converged (a kink or cut inside the stencil, a length scale far below
    // y0): more than 2 guard digits lost is beyond what the checker can decide; never pass it
    // (the rounding part is the operand's own error: the checker's escalation handles it)
    if (bestTarget !== null && bestEst.gt(bestTarget.times(new Decimal(10).pow(2 * this.ctx.guard)))) {
      throw new ModvetError('convergence', this.op, `the finite difference in ${dir} did not converge (truncation estimate ${bestEst.toSD(2).toString()})`);
    }
    return best!;
  }
}

// ---------------------------------------------------------------------------

/** An exact zero. */
const EXACT_ZERO: Val = { v: Complex.ZERO, s: ZERO };

/** Evaluates an operator node (module header). */
export function applyOperator(e: Operator, ctx: OperatorContext): Val {
  const atVal = e.at === null ? null : ctx.run(e.at);
  const t0 = atVal === null ? ctx.tau() : atVal.v;
  const weight = e.weight === null ? null : ctx.run(e.weight);
  const depends = dependsOnTau(e.arg);
  const holo = isHolomorphic(e.arg);
  const y0 = t0.im;
  const toScale = (err: Decimal): Decimal => err.times(new Decimal(10).pow(Decimal.precision - ctx.guard));

  if (!depends || (holo && (e.op === 'dtaubar' || e.op === 'lap' || e.op === 'lower'))) {
    if (e.op !== 'raise' && e.op !== 'serre') return EXACT_ZERO;
  }
  const d = new Differentiator(ctx, e.arg, t0, e.op);
  const fd = (dir: Dir, k: 1 | 2, floor: Decimal = ZERO): Partial => d.partial(dir, k, floor);
  // each partial symbolic when it can be (and checks), else differenced
  const partial = (dir: Dir, k: 1 | 2, floor: Decimal = ZERO): Partial =>
    exact(e, d, ctx, k === 1 ? dir : dir === 'x' ? 'xx' : 'yy', () => fd(dir, k)) ?? fd(dir, k, floor);
  // f at t0 (for raise and serre), evaluated in the shifted environment like the rest
  const center = (): Val => (depends ? d.value(Complex.ZERO) : ctx.run(e.arg));

  let v: Complex;
  let err: Decimal;
  switch (e.op) {
    case 'lap': {
      // d_x^2 f + d_y^2 f: as one symbolic sum (nerdamer cancels like terms), else part by part
      const sum = exact(e, d, ctx, 'lap', () => laplacian(fd)) ?? laplacian(partial);
      const y2 = y0.times(y0);
      v = sum.value.scale(y2);
      err = sum.err.times(y2);
      break;
    }
    case 'dtau':
    case 'dtaubar':
    case 'qd':
    case 'raise':
    case 'lower':
    case 'serre': {
      // the tau derivative: d_x alone for holomorphic f; else (1/2)(d_x -+ i d_y)
      let dv = Complex.ZERO;
      let de = ZERO;
      if (depends && !(holo && (e.op === 'dtaubar' || e.op === 'lower'))) {
        const bar = e.op === 'dtaubar' || e.op === 'lower';
        const r = holo ? partial('x', 1) : (exact(e, d, ctx, bar ? 'taubar' : 'tau', () => wirtinger(fd, bar)) ?? wirtinger(partial, bar));
        dv = r.value;
        de = r.err;
      }
      ({ v, err } = finish(e.op, dv, de, y0, weight, center, t0, ctx));
      break;
    }
  }
  let s = toScale(err).plus(v.abs());
  // the point's own error moves the result by about |v| delta / y0
  if (atVal !== null && !atVal.s.isZero()) s = s.plus(v.abs().times(atVal.s).div(y0));
  return { v, s };
}

type PartialOf = (dir: Dir, k: 1 | 2, floor?: Decimal) => Partial;

/** d_x^2 f + d_y^2 f from two partials (the x part accurate relative to the sum). */
function laplacian(p: PartialOf): Partial {
  const yy = p('y', 2);
  const xx = p('x', 2, yy.value.abs());
  return { value: xx.value.add(yy.value), err: xx.err.plus(yy.err), size: Decimal.max(xx.size, yy.size) };
}

/** df/dtau = (1/2)(d_x - i d_y) f, or df/dtaubar = (1/2)(d_x + i d_y) f (bar). */
function wirtinger(p: PartialOf, bar: boolean): Partial {
  const dy = p('y', 1);
  const dx = p('x', 1, dy.value.abs());
  const iy = dy.value.mulI();
  const value = (bar ? dx.value.add(iy) : dx.value.sub(iy)).scale('0.5');
  return { value, err: dx.err.plus(dy.err).div(2), size: Decimal.max(dx.size, dy.size) };
}

/**
 * A derivative of an elementary operand, exactly (symbolic.ts), evaluated at t0; its error
 * is the evaluation's own. Null (difference it instead) when there is no symbolic form, its
 * evaluation fails, or it disagrees with `check`, the same derivative by differences at
 * CHECK_DIGITS digits (module header).
 */
function exact(e: Operator, d: Differentiator, ctx: OperatorContext, which: SymbolicDerivative, check: () => Partial): Partial | null {
  const ast = symbolicPartial(e, which);
  if (ast === null) return null;
  let f: Val;
  try {
    f = ctx.evalAt(ast, d.t0);
  } catch {
    // e.g. a division by zero nerdamer's form has and the operand has not: difference it
    return null;
  }
  const err = d.errorOf(f);
  const P = Decimal.precision;
  const checkP = Math.min(P, CHECK_DIGITS + ctx.guard);
  let ok: boolean;
  try {
    ok = withDigits(checkP, () => {
      const c = check();
      // the check's error bound, or its target (the units partial() aims at), whichever is larger
      const unit = new Decimal(10).pow(ctx.guard - checkP).times(Decimal.max(c.value.abs(), c.size.times(SIZE_FLOOR)));
      const tol = Decimal.max(c.err, unit).times(CHECK_SLACK);
      return f.v.sub(c.value).abs().lte(tol);
    });
  } catch (err) {
    // a difference that does not converge cannot confirm: the full difference reports it
    if (err instanceof ModvetError) return null;
    throw err;
  }
  return ok ? { value: f.v, err, size: ZERO } : null;
}

/** From the tau derivative (value dv, error de) to the operator's result. */
function finish(
  op: Exclude<Operator['op'], 'lap'>,
  dv: Complex,
  de: Decimal,
  y0: Decimal,
  weight: Val | null,
  center: () => Val,
  t0: Complex,
  ctx: OperatorContext,
): { v: Complex; err: Decimal } {
  const unit = new Decimal(10).pow(ctx.guard - Decimal.precision);
  switch (op) {
    case 'dtau':
    case 'dtaubar':
      return { v: dv, err: de };
    case 'lower': {
      // -2i y^2 df/dtaubar
      const c = y0.times(y0).times(2);
      return { v: dv.mulI().scale(c.neg()), err: de.times(c) };
    }
    case 'qd':
    case 'serre': {
      const twoPi = pi().times(2);
      // dv / (2 pi i) = -i dv / (2 pi)
      const qv = dv.mulI().neg().scale(new Decimal(1).div(twoPi));
      const qe = de.div(twoPi).plus(qv.abs().times(unit));
      if (op === 'qd') return { v: qv, err: qe };
      const k = weight!;
      const f = center();
      const e2 = callBuiltin('E', [{ v: new Complex(2, 0), s: ZERO }, { v: t0, s: ZERO }], ctx.yMin === undefined ? {} : { yMin: ctx.yMin });
      const c = k.v.mul(e2.v).scale(new Decimal(1).div(12));
      const term = c.mul(f.v);
      // errors of k, E_2 and f (first order)
      const te = k.s.times(e2.v.abs()).plus(k.v.abs().times(e2.s)).div(12).times(f.v.abs()).times(unit).plus(c.abs().times(f.s).times(unit));
      return { v: qv.sub(term), err: qe.plus(te) };
    }
    case 'raise': {
      // 2i df/dtau + (k/y) f
      const k = weight!;
      const f = center();
      const c = k.v.scale(new Decimal(1).div(y0));
      const term = c.mul(f.v);
      const te = k.s.div(y0).times(f.v.abs()).times(unit).plus(c.abs().times(f.s).times(unit));
      return { v: dv.mulI().scale(2).add(term), err: de.times(2).plus(te) };
    }
  }
}
