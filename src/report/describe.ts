/**
 * Plain descriptions of results shared by the text, JSON and JUnit reports: samples,
 * group elements and numbers to a fixed number of digits.
 */
import { Complex } from '../numeric/complex.js';
import { withDigits } from '../numeric/precision.js';
import { Mat2 } from '../groups/matrix.js';
import { toWord, wordToString } from '../groups/words.js';
import { Sample } from '../check/claim.js';

/** Digits shown for values in reports. */
export const SHOWN_DIGITS = 20;

export function showComplex(z: Complex, sd = SHOWN_DIGITS): string {
  return withDigits(Math.max(sd, 5), () => z.toString(sd));
}

export function complexJson(z: Complex, sd = SHOWN_DIGITS): { re: string; im: string } {
  return withDigits(Math.max(sd, 5), () => ({ re: z.re.toSD(sd).toString(), im: z.im.toSD(sd).toString() }));
}

export function showMatrix(m: Mat2): string {
  return `(${m.a} ${m.b}; ${m.c} ${m.d}) = ${wordToString(toWord(m))}`;
}

export function showSample(s: Sample, groupVar?: string): string {
  const parts = [`tau = ${showComplex(s.tau)}`];
  if (s.gamma !== undefined) parts.push(`${groupVar ?? 'g'} = ${showMatrix(s.gamma)}`);
  for (const [k, v] of s.params) parts.push(`${k} = ${showComplex(v)}`);
  return parts.join(', ');
}

/** "1 sample", "16 samples". */
export function samplesText(n: number): string {
  return n === 1 ? '1 sample' : `${n} samples`;
}
