/**
 * Sums and products of the claim language (names.ts SERIES): sum(n = a..b, f),
 * sum(n = a..inf, f), sum(d | n, f), and prod likewise; f is re-evaluated per term with the
 * variable bound to the integer (evaluate.ts walks it; sub-expressions free of the variable
 * are evaluated once).
 *
 * Ranges. a and b must evaluate to integers (|a|, |b| <= 2^53), else a 'domain' error at
 * the bound. b < a is an empty range: 0 for a sum, 1 for a product (a literal empty range
 * is rejected at parse time as 'bad-range', a computed one, e.g. 1..n-1 at n = 1, is
 * allowed). A finite range has at most MAX_SERIES_TERMS terms (a literal one is checked at
 * parse time, a computed one here: 'domain'). sum(d | n, f) runs over the positive
 * divisors of n, ascending; n must evaluate to a positive integer <= 10^12 ('domain').
 *
 * Convergence rule for a = ..inf (stated once, used for both): with P the working digits
 * (the digits in force plus the evaluator's guard), eps = 10^-(P + 1),
 *   sum:  stop after THREE consecutive terms with |t_k| <= eps * M, M the largest modulus of
 *         a partial sum so far (M > 0: leading zero terms never stop the sum);
 *   prod: stop after THREE consecutive factors with |f_k - 1| <= eps.
 * At most INFINITE_SERIES_BUDGET terms are taken; exhausting the budget throws 'convergence'
 * ("did not converge after N terms"), which the checker counts as undecided, never as a
 * pass. Slowly (algebraically) convergent series such as sum 1/n^2 therefore fail: the rule
 * is meant for the geometric convergence of q-expansions, theta and eta products.
 *
 * Error scale (evaluate.ts units, 10^-P): per term the '+' (resp. '*') rule of evaluate.ts,
 * so a sum's scale is sum_k (S_k + |s_k|), s_k the partial sums: terms that cancel leave
 * their size in the scale. The truncated tail is estimated from the last three terms'
 * ratio r (capped at 0.99) as |t_last| (1 + r/(1 - r)), relative for a product, and added.
 *
 *   evalSeries(node, ctx)   // ctx: evaluate in the enclosing scope, or the body at n
 */
import { Decimal } from 'decimal.js';
import type { Expr, Series, Span } from '../lang/ast.js';
import { INFINITE_SERIES_BUDGET, MAX_SERIES_TERMS } from '../lang/names.js';
import { Complex } from '../numeric/complex.js';
import type { Val } from './builtins.js';

export interface SeriesContext {
  /** Evaluates a sub-expression in the enclosing scope (the bounds). */
  run(e: Expr): Val;
  /** Evaluates the body with the variable bound to n. */
  term(n: number): Val;
  fail(code: 'domain' | 'convergence', span: Span, message: string): never;
}

const ZERO = new Decimal(0);
const CONSECUTIVE = 3;
const MAX_DIVISOR_ARG = 1e12;

function toInt(ctx: SeriesContext, x: Val, span: Span, what: string): number {
  const v = x.v;
  if (!v.im.isZero() || !v.re.isInteger()) ctx.fail('domain', span, `${what} must be an integer, got ${v.toString()}`);
  const n = v.re.toNumber();
  if (!Number.isSafeInteger(n)) ctx.fail('domain', span, `${what} ${v.re.toString()} is too large`);
  return n;
}

/** Positive divisors of n, ascending. */
export function divisors(n: number): number[] {
  const small: number[] = [];
  const large: number[] = [];
  for (let d = 1; d * d <= n; d++) {
    if (n % d !== 0) continue;
    small.push(d);
    if (d * d !== n) large.push(n / d);
  }
  return [...small, ...large.reverse()];
}

class Accumulator {
  v: Complex;
  s = ZERO;
  /** Largest |partial sum| (sum) so far. */
  m = ZERO;
  private readonly last: Decimal[] = [];
  private small = 0;

  constructor(private readonly op: 'sum' | 'prod') {
    this.v = op === 'sum' ? Complex.ZERO : Complex.ONE;
  }

  add(t: Val): void {
    if (this.op === 'sum') {
      this.v = this.v.add(t.v);
      const av = this.v.abs();
      this.s = this.s.plus(t.s).plus(av);
      if (av.gt(this.m)) this.m = av;
    } else {
      const prev = this.v;
      this.v = prev.mul(t.v);
      this.s = this.s.times(t.v.abs()).plus(prev.abs().times(t.s)).plus(this.v.abs());
    }
  }

  /** Feeds the convergence rule (module header); true when it says stop. */
  converged(t: Val, eps: Decimal): boolean {
    const size = this.op === 'sum' ? t.v.abs() : t.v.sub(Complex.ONE).abs();
    this.last.push(size);
    if (this.last.length > CONSECUTIVE) this.last.shift();
    const ok = this.op === 'sum' ? this.m.gt(0) && size.lte(eps.times(this.m)) : size.lte(eps);
    this.small = ok ? this.small + 1 : 0;
    return this.small >= CONSECUTIVE;
  }

  /** The tail estimate in scale units (module header). */
  tail(): Decimal {
    const [a, b, c] = this.last;
    if (a === undefined || b === undefined || c === undefined || c.isZero()) return ZERO;
    let r = new Decimal(0.5);
    if (!b.isZero()) r = Decimal.max(c.div(b), a.isZero() ? ZERO : b.div(a));
    r = Decimal.min(r, new Decimal(0.99));
    const t = c.times(r.div(new Decimal(1).minus(r)).plus(1));
    const rel = this.op === 'sum' ? t : t.times(this.v.abs());
    return rel.times(new Decimal(10).pow(Decimal.precision));
  }
}

export function evalSeries(e: Series, ctx: SeriesContext): Val {
  const acc = new Accumulator(e.op);
  if (e.range.kind === 'divisors') {
    const n = toInt(ctx, ctx.run(e.range.of), e.range.of.span, `the number whose divisors ${e.op} runs over`);
    if (n < 1) ctx.fail('domain', e.range.of.span, `${e.op}(d | n, ...) needs a positive integer n, got ${n}`);
    if (n > MAX_DIVISOR_ARG) ctx.fail('domain', e.range.of.span, `${e.op}(d | n, ...) supports n <= 10^12, got ${n}`);
    for (const d of divisors(n)) acc.add(ctx.term(d));
    return { v: acc.v, s: acc.s };
  }
  const from = toInt(ctx, ctx.run(e.range.from), e.range.from.span, `the start of the ${e.op} range`);
  if (e.range.to !== null) {
    const to = toInt(ctx, ctx.run(e.range.to), e.range.to.span, `the end of the ${e.op} range`);
    if (to - from + 1 > MAX_SERIES_TERMS) ctx.fail('domain', e.range.to.span, `the range ${from}..${to} has more than ${MAX_SERIES_TERMS} terms`);
    for (let n = from; n <= to; n++) acc.add(ctx.term(n));
    return { v: acc.v, s: acc.s };
  }
  const eps = new Decimal(10).pow(-(Decimal.precision + 1));
  for (let k = 0; k < INFINITE_SERIES_BUDGET; k++) {
    const t = ctx.term(from + k);
    acc.add(t);
    if (acc.converged(t, eps)) return { v: acc.v, s: acc.s.plus(acc.tail()) };
  }
  return ctx.fail('convergence', e.span, `${e.op} did not converge after ${INFINITE_SERIES_BUDGET} terms`);
}
