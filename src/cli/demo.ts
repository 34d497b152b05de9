/**
 * `modvet demo`: a short tour of the numeric layer, each value computed to the requested
 * digits. The closed forms beside each line say what the value should be.
 */
import { Complex } from '../numeric/complex.js';
import { euler, ln2, pi } from '../numeric/constants.js';
import { withDigits } from '../numeric/precision.js';

export function demoLines(d: number): string[] {
  return withDigits(d, () => {
    const rows: [string, string][] = [
      ['pi', pi().toString()],
      ['log 2', ln2().toString()],
      ['Euler gamma', euler().toString()],
      ['e = exp(1)', Complex.ONE.exp().toString()],
      ['exp(pi sqrt(163))', Complex.of(163).sqrt().scale(pi()).exp().toString()],
      ['i^i = exp(-pi/2)', Complex.I.pow(Complex.I).toString()],
    ];
    const w = Math.max(...rows.map((r) => r[0].length));
    return [`modvet numeric layer, ${d} significant digits:`, ...rows.map(([k, v]) => `  ${k.padEnd(w)}  ${v}`)];
  });
}
