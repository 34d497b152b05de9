/**
 * The shared vocabulary of the diagnosis stage (src/diagnose): what a diagnosis gets from
 * the checker, what it returns, and how a suggested fix is written.
 *
 * Conventions:
 * - ratio r = LHS/RHS and difference d = LHS - RHS at each sample, from the values at the
 *   checker's higher precision (the p2 of run.ts), which carry about `digits` correct digits.
 * - A fix rewrites the right side only: the corrected claim is LHS = fix(RHS), so that the
 *   left side, usually the derived expression the user wants to check, stays as written.
 */
import type { Complex } from '../numeric/complex.js';
import type { CheckableClaim, Sample, SideValue } from '../check/claim.js';
import type { Recognised } from './recognise.js';

/** One evaluated sample. */
export interface DiagnosisSample {
  sample: Sample;
  lhs: Complex;
  rhs: Complex;
  /** Whether the checker found the two sides equal here. */
  agree: boolean;
  /** Correct significant digits of lhs and rhs (about the checker's P1). */
  digits: number;
}

export interface DiagnosisContext {
  claim: CheckableClaim;
  /** The requested digits. */
  P: number;
  samples: DiagnosisSample[];
  /**
   * Both sides at a sample of the caller's choosing (another tau, parameter or group
   * element) at `digits` digits; throws ModvetError (e.g. code 'ymin') when it cannot.
   */
  evaluate(sample: Sample, digits: number): { lhs: SideValue; rhs: SideValue };
  /** The names of the claim's parameters (for s -> 1 - s and parameter fits). */
  params: string[];
  /** The claim's group clause variable, if any (for (c tau + d)^m and multipliers). */
  group?: string;
  /** Most extra evaluations the diagnosis may make (default diagnose.ts MAX_EXTRA); fewer for costly claims. */
  extraBudget?: number;
}

/**
 * A rewrite of the right side: `wrap` is a claim-language template in which '#' stands
 * for the old right side in parentheses ("2*pi*#", "# + 744", "(c*tau + d)^2*#",
 * "conj(#)"); `substitute` replaces a parameter or tau by an expression in the claim
 * language (s -> "1 - s", tau -> "-1/tau") throughout the right side.
 */
export type Fix = { kind: 'wrap'; template: string } | { kind: 'substitute'; name: string; by: string };

export type DiagnosisKind =
  | 'constant-factor' // LHS = c RHS, c recognised
  | 'parameter-factor' // LHS = c F(s) RHS, F from the normalisation family
  | 'automorphy-factor' // LHS = (c tau + d)^m RHS
  | 'y-power' // LHS = y^a RHS
  | 'multiplier' // LHS = e^{2 pi i n/24} RHS with n depending on the group element
  | 'branch' // LHS = -RHS at some samples, LHS = RHS at the others
  | 'constant-difference' // LHS = RHS + c, c recognised
  | 'anomaly' // LHS = RHS + C c (c tau + d), C recognised
  | 'affine' // LHS = a RHS + b, a != 1 and b != 0 (a sign slip in a q-expansion: 2 - E_6)
  | 'conjugate' // LHS = conj(RHS)
  | 'reflection' // LHS = RHS at s -> 1 - s
  | 'inversion' // LHS = RHS at tau -> -1/tau
  | 'term-slip' // one edit inside a side (repair.ts): a term's factor or sign, an exponent's sign, a nome
  | 'unrecognised';

export interface Diagnosis {
  kind: DiagnosisKind;
  /** One sentence for the report, e.g. "LHS = 2 pi * RHS". */
  text: string;
  /** The recognised constant (factor c, difference c or anomaly coefficient C), if any. */
  constant?: Recognised;
  /** For 'affine': the recognised offset b (`constant` holds the factor a). */
  offset?: Recognised;
  /** The corrected right side, where the diagnosis is exact. */
  fix?: Fix;
  /** For 'term-slip': the edit that makes the claim hold (repair.ts). */
  edit?: SpanEdit;
  /** Digits to which the pattern matched the samples (the worst sample). */
  digits: number;
}

/**
 * An edit of the file text inside one side (repair.ts): [start, end) replaced by `text`,
 * offsets into the file text (span.ts). Kept apart from Fix, which rewrites the right side
 * only (applyFix in print.ts): a term slip may sit on the left side.
 */
export interface SpanEdit {
  side: 'lhs' | 'rhs';
  start: number;
  end: number;
  text: string;
}

/** A simplest failing point found by shrinking (shrink.ts). */
export interface SimplestFailure {
  sample: Sample;
  /** e.g. "g = S at tau = 2i" or "s = 2 at tau = i". */
  text: string;
  /** Relative residual there. */
  residual: string;
}
