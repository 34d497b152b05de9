/**
 * The checker's view of a claim: what to sample and how to evaluate both sides. The
 * language front end (src/lang) builds these from the AST; the checker knows nothing of
 * syntax.
 */
import { Decimal } from 'decimal.js';
import { Complex } from '../numeric/complex.js';
import { Mat2 } from '../groups/matrix.js';
import { Group } from '../groups/subgroups.js';

export type Verdict = 'holds' | 'refuted' | 'undecided' | 'error';

/** How a parameter is drawn: a random real, a random complex, or every listed value. */
export type ParamSpec =
  | { kind: 'interval'; name: string; lo: number; hi: number }
  | { kind: 'box'; name: string; reLo: number; reHi: number; imLo: number; imHi: number }
  | { kind: 'values'; name: string; values: Complex[] };

/** One point at which both sides are evaluated. */
export interface Sample {
  tau: Complex;
  /** The group element bound by the claim's group clause, if any. */
  gamma?: Mat2;
  params: Map<string, Complex>;
  /** 'F' for tau in the fundamental domain, 'image' for tau = gamma0 tau0 near the axis, 'fixed'. */
  origin: 'F' | 'image' | 'fixed';
}

/** A side evaluated: its value and the cancellation gauge (largest magnitude met on the way). */
export interface SideValue {
  value: Complex;
  scale: Decimal;
  /** Set when a truncated construct (a lattice sum) limited the value to `rel` relative accuracy. */
  limit?: { rel: Decimal; by: string };
}

export interface CheckableClaim {
  file: string;
  line: number;
  name: string;
  source?: string;
  /** The equation as written, for reports. */
  text: string;
  expect: Verdict;
  digits?: number;
  samples?: number;
  /** The claim's own seed (overrides the run's). */
  seed?: number;
  /** Lower bound for Im tau of this claim (overrides the run's). */
  yMin?: number;
  group?: { variable: string; group: Group };
  params: ParamSpec[];
  /** Fixed points instead of random ones. */
  points?: Complex[];
  /** Restriction of where tau is sampled. */
  region?: (tau: Complex) => boolean;
  regionText?: string;
  /** Both sides at a sample, at the precision in force. Throws ModvetError on failure. */
  evaluate(sample: Sample, yMin: number): { lhs: SideValue; rhs: SideValue };
}
