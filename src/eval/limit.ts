/**
 * limit(s -> a, f): the limit of f(s) as s -> a, for a removable singularity (f is
 * analytic in a punctured disc about a and bounded there), by Richardson extrapolation.
 *
 * Method. With r = max(1, |a|) and h_k = r 2^-(k+3), k = 0, 1, ..., f is evaluated at
 * a + h_k and a - h_k (along the real direction) with EXTRA more digits (the difference
 * quotients hidden in f, e.g. (e^s - 1)/s, lose up to log10(r/h_k) digits). On each side
 * f(a +- h) = L + c_1 h + c_2 h^2 + ..., so the Richardson table in powers of h with ratio 2,
 * T[k][j] = T[k][j-1] + (T[k][j-1] - T[k-1][j-1])/(2^j - 1), has diagonal T[k][k] -> L
 * (the polynomial extrapolation to h = 0 through the points so far). The error estimate is
 * |T+[k][k] - T+[k-1][k-1]| + |T-[k][k] - T-[k-1][k-1]| + |L+ - L-| (the spread of the
 * successive extrapolants and of the two sides); the value is (L+ + L-)/2.
 * Stop when the estimate is at most 10^-(P + 1) M, P the working digits, M the largest
 * |f| seen (an absolute floor: a limit 0 converges too), at step >= 3; after MAX_STEPS
 * steps without that, 'convergence' ("did not converge after N steps"): a pole, a jump
 * (the sides disagree) or an essential singularity never pass, the checker calls the
 * sample undecided. The estimate (with the rounding of f at the extra digits, amplified by
 * the table's weights, below 4) goes into the scale.
 */
import { Decimal } from 'decimal.js';
import type { Expr, Limit, Span } from '../lang/ast.js';
import { Complex } from '../numeric/complex.js';
import { withGuard } from '../numeric/precision.js';
import type { Val } from './builtins.js';

export const MAX_STEPS = 60;
/** log10(2^(MAX_STEPS + 3)) + 5 */
const EXTRA = 25;

export interface LimitContext {
  run(e: Expr): Val;
  /** The body with the variable bound to s, at the precision in force. */
  at(s: Complex): Val;
  fail(code: 'convergence', span: Span, message: string): never;
}

export function evalLimit(e: Limit, ctx: LimitContext): Val {
  const P = Decimal.precision;
  const a = ctx.run(e.at);
  const res = withGuard(EXTRA, () => {
    const r = Decimal.max(1, a.v.abs());
    const plus: Complex[][] = [];
    const minus: Complex[][] = [];
    let m = new Decimal(0);
    let roundErr = new Decimal(0);
    const tol = new Decimal(10).pow(-(P + 1));
    const extend = (table: Complex[][], fv: Complex): void => {
      const k = table.length;
      const row: Complex[] = [fv];
      for (let j = 1; j <= k; j++) {
        const prev = row[j - 1]!;
        const up = table[k - 1]![j - 1]!;
        row.push(prev.add(prev.sub(up).scale(new Decimal(1).div(new Decimal(2).pow(j).minus(1)))));
      }
      table.push(row);
    };
    for (let k = 0; k < MAX_STEPS; k++) {
      const h = r.times(new Decimal(2).pow(-(k + 3)));
      const fp = ctx.at(a.v.add(new Complex(h, 0)));
      const fm = ctx.at(a.v.sub(new Complex(h, 0)));
      for (const f of [fp, fm]) {
        const af = f.v.abs();
        if (af.gt(m)) m = af;
        if (f.s.gt(roundErr)) roundErr = f.s;
      }
      extend(plus, fp.v);
      extend(minus, fm.v);
      if (k < 3) continue;
      const lp = plus[k]![k]!;
      const lm = minus[k]![k]!;
      const est = lp.sub(plus[k - 1]![k - 1]!).abs().plus(lm.sub(minus[k - 1]![k - 1]!).abs()).plus(lp.sub(lm).abs());
      if (est.lte(tol.times(m))) return { v: lp.add(lm).scale(new Decimal('0.5')), est, roundErr };
    }
    return null;
  });
  if (res === null) return ctx.fail('convergence', e.span, `limit did not converge after ${MAX_STEPS} steps (a pole, a jump or no limit at ${a.v.toString()}?)`);
  // scale units: 10^-P; the inner rounding errors were counted in units of 10^-(P + EXTRA)
  const ten = new Decimal(10);
  const s = res.est.times(ten.pow(P)).plus(res.roundErr.times(4).div(ten.pow(EXTRA)));
  const v = res.v.round();
  return { v, s: s.plus(v.abs()) };
}
