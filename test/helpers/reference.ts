/**
 * Access to the mpmath reference values (test/reference/values.json, written by
 * test/reference/generate.py with Debian's python3-mpmath) and the accuracy measure the
 * suite uses: the error in units of the last requested digit, relative to |reference|.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Decimal } from 'decimal.js';
import { Complex } from '../../src/numeric/complex.js';
import { withDigits } from '../../src/numeric/precision.js';

interface RawCase {
  args: [string, string][];
  value: [string, string];
}
interface RawFile {
  library: string;
  digits: number;
  functions: Record<string, RawCase[]>;
  bernoulli: [number, string][];
}

const file = fileURLToPath(new URL('../reference/values.json', import.meta.url));
const raw = JSON.parse(readFileSync(file, 'utf8')) as RawFile;

export const referenceLibrary = raw.library;

export interface RefCase {
  args: Complex[];
  value: Complex;
  /** A short label for failure messages: the arguments as written. */
  label: string;
}

/** The reference cases of one function; arguments are exact decimal strings. */
export function referenceCases(fn: string): RefCase[] {
  const cases = raw.functions[fn];
  if (cases === undefined) throw new Error(`no reference values for ${fn}`);
  return cases.map((c) => ({
    args: c.args.map(([re, im]) => new Complex(re, im)),
    value: new Complex(c.value[0], c.value[1]),
    label: `${fn}(${c.args.map(([re, im]) => `${re}${im.startsWith('-') ? '' : '+'}${im}i`).join(', ')})`,
  }));
}

/**
 * |actual - ref| in units of the P-th significant digit of |ref|: one unit is
 * 10^(floor(log10 |ref|) - P + 1). For ref = 0 the unit is 10^(1 - P) (an absolute scale of 1).
 */
export function ulpError(actual: Complex, ref: Complex, P: number): number {
  return withDigits(260, () => {
    const err = actual.sub(ref).abs();
    const r = ref.abs();
    const unit = r.isZero() ? new Decimal(10).pow(1 - P) : new Decimal(10).pow(r.e - P + 1);
    return err.div(unit).toNumber();
  });
}

/** Exact Bernoulli numbers from mpmath.bernfrac: [n, numerator, denominator]. */
export function referenceBernoulli(): [number, bigint, bigint][] {
  return raw.bernoulli.map(([n, frac]) => {
    const [num, den] = frac.split('/');
    return [n, BigInt(num!), BigInt(den!)];
  });
}
