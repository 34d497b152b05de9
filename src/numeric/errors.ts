/**
 * Typed errors of the numeric layer.
 *
 * Every function that cannot return a correct finite number throws a ModvetError
 * naming itself and the offending argument; none returns NaN or Infinity silently.
 */

/** The closed set of numeric failure kinds. */
export type NumericErrorCode =
  | 'domain' // argument outside the function's domain (x <= 0 for K_nu, ...)
  | 'ymin' // Im tau below the configured y_min (valid mathematically, but too costly to sum)
  | 'pole' // argument at a pole (Gamma at 0, -1, ...; zeta at 1)
  | 'precision' // requested precision outside [MIN_DIGITS, MAX_DIGITS]
  | 'convergence' // a series or quadrature did not reach the requested accuracy
  | 'overflow'; // the result does not fit the number type

export class ModvetError extends Error {
  constructor(
    readonly code: NumericErrorCode,
    /** The function that failed, as the user knows it (e.g. "Gamma", "zeta"). */
    readonly fn: string,
    message: string,
  ) {
    super(`${fn}: ${message}`);
    this.name = 'ModvetError';
  }
}
