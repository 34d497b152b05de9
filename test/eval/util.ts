// Shared helpers of the evaluator tests: evaluation of a source expression at a fixed tau,
// digits of agreement of an equation, and the EvalError a call throws.
import { Decimal } from 'decimal.js';
import type { Complex } from '../../src/numeric/complex.js';
import { withDigits } from '../../src/numeric/precision.js';
import { EvalError, evaluate, type EvalEnv } from '../../src/eval/evaluate.js';
import { eq, expr } from '../lang/util.js';

export function evalAt(tau: Complex) {
  return {
    /** Evaluates `e` at P digits (default env: the given tau). */
    ev(e: string, P = 30, env: Partial<EvalEnv> = {}, clauses: string[] = []): { value: Complex; scale: Decimal } {
      const x = expr(e, clauses);
      return withDigits(P, () => evaluate(x, { tau, ...env }));
    },
    /** Digits of agreement of the two sides of `lhs = rhs`, evaluated at P digits. */
    agree(equation: string, P = 30, env: Partial<EvalEnv> = {}, clauses: string[] = []): number {
      const c = eq(equation, clauses);
      return withDigits(P, () => {
        const l = evaluate(c.lhs, { tau, ...env }).value;
        const r = evaluate(c.rhs, { tau, ...env }).value;
        const d = withDigits(P + 20, () => l.sub(r).abs().div(Decimal.max(l.abs(), r.abs())).toNumber());
        return d === 0 ? Infinity : -Math.log10(d);
      });
    },
  };
}

/** The EvalError that f throws (fails the test when it throws nothing or something else). */
export function evalError(f: () => unknown): EvalError {
  try {
    f();
  } catch (e) {
    if (e instanceof EvalError) return e;
    throw e;
  }
  throw new Error('expected an EvalError');
}
