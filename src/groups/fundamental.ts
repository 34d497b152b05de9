/**
 * Reduction of a point of the upper half plane to the fundamental domain
 * F = { |x| <= 1/2, |tau| >= 1 }, returning the matrix used.
 *
 * A utility for reports and sampling only: built-ins never use it, or a claimed
 * transformation law would be checked against itself.
 */
import { Complex } from '../numeric/complex.js';
import { ModvetError } from '../numeric/errors.js';
import { Mat2 } from './matrix.js';

export interface Reduced {
  /** gamma tau, in F. */
  tau: Complex;
  /** gamma with gamma tau in F. */
  gamma: Mat2;
}

const MAX_STEPS = 10_000;

export function reduceToFundamental(tau: Complex): Reduced {
  if (!tau.im.isPositive()) throw new ModvetError('domain', 'reduce', `Im tau = ${tau.im} must be > 0`);
  let z = tau;
  let g = Mat2.I;
  for (let step = 0; step < MAX_STEPS; step++) {
    // translate x into [-1/2, 1/2]
    const n = z.re.plus(0.5).floor();
    if (!n.isZero()) {
      z = z.sub(Complex.of(n));
      g = Mat2.translation(-BigInt(n.toFixed(0))).mul(g);
    }
    if (z.abs2().gte(1)) return { tau: z, gamma: g };
    // invert: tau -> -1/tau raises Im tau when |tau| < 1
    z = Complex.ONE.neg().div(z);
    g = Mat2.S.mul(g);
  }
  throw new ModvetError('convergence', 'reduce', `no reduction of ${tau} after ${MAX_STEPS} steps`);
}
