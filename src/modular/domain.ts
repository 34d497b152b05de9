/**
 * Where the modular built-ins may be evaluated: Im tau > 0 and Im tau >= yMin.
 *
 * Built-ins are evaluated directly at tau by their expansions, whose term counts grow like
 * P / Im tau; yMin (default 0.02) bounds that cost. It is configurable per call.
 */
import { Complex } from '../numeric/complex.js';
import { ModvetError } from '../numeric/errors.js';

export const DEFAULT_Y_MIN = 0.02;

/**
 * Throws a typed error naming the function, the argument and the limit: 'domain' for
 * Im tau <= 0, 'ymin' for 0 < Im tau < yMin (the checker draws another point then).
 */
export function checkTau(tau: Complex, who: string, yMin: number = DEFAULT_Y_MIN): void {
  if (!tau.im.isPositive() || tau.im.isZero()) {
    throw new ModvetError('domain', who, `Im tau = ${tau.im} must be positive (tau = ${tau})`);
  }
  if (tau.im.lt(yMin)) {
    throw new ModvetError('ymin', who, `Im tau = ${tau.im} is below y_min = ${yMin} (tau = ${tau}); raise --ymin or move the point`);
  }
}
