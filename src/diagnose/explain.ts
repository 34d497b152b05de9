/**
 * Explaining a refuted claim: what is off (diagnose.ts), the simplest point where it fails
 * (shrink.ts), and, where the diagnosis is exact, the corrected claim, checked in the same
 * run. Also the text of a claim file with the checked fixes applied (`check --fix`).
 *
 * Conventions:
 * - The diagnosis works from the samples the checker already evaluated (ClaimResult.reports)
 *   plus at most a few extra evaluations; shrinking tries simple points in a fixed order.
 * - A fix rewrites the right side only (types.ts), tidied by simplify.ts where that is
 *   shorter and still holds. The corrected claim is parsed afresh from
 *   the file text with the new right side, in the file's own context (its `use` line and
 *   lets), with `expect holds`, and checked with the run's settings; it is suggested only
 *   with the verdict it got, so a fix that does not hold is shown as such, never as a pass.
 *
 *   const e = explainRefuted(result, { claim, fileText, defaults }, opts)
 *   e.diagnosis.text   // "LHS = 1/2 * RHS"
 *   e.suggestion       // { equation: 'E(4, tau)^2 = 1/2*2*E(8, tau)', verdict: 'holds', digits: 30 }
 */
import type { Claim, Settings } from '../lang/ast.js';
import { parseSource } from '../lang/parser.js';
import { applyFix, PrintError } from '../lang/print.js';
import { ModvetError } from '../numeric/errors.js';
import type { Verdict } from '../check/claim.js';
import { toCheckable } from '../check/fromAst.js';
import { checkClaim, type CheckOptions, type ClaimResult } from '../check/run.js';
import { contextFromSamples, diagnosisSample } from './context.js';
import { diagnose } from './diagnose.js';
import { shrink } from './shrink.js';
import { mapExpr } from './mutate.js';
import { simplifiedText } from './simplify.js';
import { applyEdit, repairSuggestion } from './repair.js';
import type { Diagnosis, SimplestFailure, SpanEdit } from './types.js';

export interface ClaimSource {
  claim: Claim;
  /** The whole file the claim came from. */
  fileText: string;
  /** The settings in force for the file (its `use` line under the command line). */
  defaults: Settings;
}

export interface Suggestion {
  /** The corrected right side, in the claim language. */
  rhs: string;
  /** LHS = corrected RHS, as it would be written. */
  equation: string;
  verdict: Verdict;
  digits: number;
  limitedBy?: string;
  reason?: string;
}

export interface Explanation {
  diagnosis: Diagnosis;
  simplest: SimplestFailure | null;
  suggestion?: Suggestion;
}

/** A result with its explanation (refuted claims), as the reports take it. */
export interface ExplainedResult extends ClaimResult {
  explanation?: Explanation;
}

/**
 * Candidates the shrinker may evaluate: fewer for claims whose evaluations are costly
 * (lattice sums, about a second each; operators on non-elementary operands), decided from
 * the AST so that the report does not depend on the machine's speed.
 */
export function shrinkBudget(claim: Claim): number {
  let heavy = false;
  for (const side of [claim.lhs, claim.rhs]) {
    mapExpr(side, (e) => {
      if (e.kind === 'lattice' || e.kind === 'operator') heavy = true;
      return null;
    });
  }
  return heavy ? 2 : 20;
}

/** Extra evaluations the diagnosis may make: few for costly claims (as shrinkBudget). */
export function diagnosisBudget(claim: Claim): number {
  return shrinkBudget(claim) < 20 ? 2 : 10;
}

export interface ExplainOptions extends CheckOptions {
  /** Search for the simplest failure (default true). */
  shrink?: boolean;
}

/** The file text with `claim`'s right side replaced and its `expect refuted` clause removed. */
export function rewriteClaim(fileText: string, claim: Claim, newRhs: string): string {
  return applyEdit(fileText, claim, { side: 'rhs', start: claim.rhs.span.start, end: claim.rhs.span.end, text: newRhs });
}

/** The claim at the same header line of a re-parsed file, or null when it did not parse. */
function reparsed(fileText: string, file: string, line: number): { claim: Claim; defaults: Settings } | null {
  const { ast, diagnostics } = parseSource(fileText, file);
  const claim = ast.claims.find((c) => c.span.line === line);
  if (claim === undefined || diagnostics.some((d) => d.span.line >= line && d.span.line <= claim.equationSpan.line)) return null;
  return { claim, defaults: ast.defaults };
}

/** Checks the corrected claim (module header). */
function checkSuggestion(src: ClaimSource, rhs: string, opts: CheckOptions): Suggestion {
  const equation = `${src.claim.lhsText.trim()} = ${rhs}`;
  const text = rewriteClaim(src.fileText, src.claim, rhs);
  const again = reparsed(text, src.claim.span.file, src.claim.span.line);
  if (again === null) return { rhs, equation, verdict: 'error', digits: 0, reason: 'the corrected claim did not parse' };
  try {
    const checkable = toCheckable({ ...again.claim, expect: 'holds' }, { ...again.defaults, ...src.defaults });
    const r = checkClaim(checkable, opts);
    return {
      rhs,
      equation,
      verdict: r.verdict,
      digits: r.digits,
      ...(r.limitedBy !== undefined ? { limitedBy: r.limitedBy } : {}),
      ...(r.reason !== undefined ? { reason: r.reason } : {}),
    };
  } catch (e) {
    if (!(e instanceof ModvetError)) throw e;
    return { rhs, equation, verdict: 'error', digits: 0, reason: e.message };
  }
}

/** The explanation of a refuted claim (module header). */
export function explainRefuted(result: ClaimResult, src: ClaimSource, opts: ExplainOptions): Explanation {
  const P = result.requested;
  const yMin = result.claim.yMin ?? opts.yMin;
  const ctx = { ...contextFromSamples(result.claim, P, result.reports.map(diagnosisSample), yMin), extraBudget: diagnosisBudget(src.claim) };
  const diagnosis = diagnose(ctx);
  const simplest = opts.shrink === false ? null : shrink(result.claim, P, yMin, { maxEvaluations: shrinkBudget(src.claim) });
  if (diagnosis.kind === 'unrecognised') {
    // no global pattern: look for a slip inside one term (repair.ts)
    const rep = repairSuggestion(result, src, opts);
    if (rep !== null) return { diagnosis: rep.diagnosis, simplest, suggestion: rep.suggestion };
  }
  const out: Explanation = { diagnosis, simplest };
  if (diagnosis.fix !== undefined) {
    let rhs: string | null = null;
    try {
      rhs = applyFix(diagnosis.fix, src.claim);
    } catch (e) {
      if (!(e instanceof PrintError)) throw e;
    }
    if (rhs !== null) out.suggestion = suggest(src, rhs, opts);
  }
  return out;
}

/** The corrected claim checked, in its simplified form when that holds too (simplify.ts). */
export function suggest(src: ClaimSource, rhs: string, opts: CheckOptions): Suggestion {
  const parsed = reparsed(rewriteClaim(src.fileText, src.claim, rhs), src.claim.span.file, src.claim.span.line);
  const simple = parsed === null ? null : simplifiedText(parsed.claim.rhs);
  if (simple !== null && simple !== rhs) {
    const s = checkSuggestion(src, simple, opts);
    if (s.verdict === 'holds') return s;
  }
  return checkSuggestion(src, rhs, opts);
}

/** A checked fix of one claim: a new right side, or an edit of either side (repair.ts). */
export type ClaimFix = { claim: Claim; rhs: string } | { claim: Claim; edit: SpanEdit };

/** The fix of an explanation whose suggestion holds, or null. */
export function claimFix(claim: Claim, x: Explanation): ClaimFix | null {
  if (x.suggestion === undefined || x.suggestion.verdict !== 'holds') return null;
  return x.diagnosis.edit !== undefined ? { claim, edit: x.diagnosis.edit } : { claim, rhs: x.suggestion.rhs };
}

/**
 * The file text with every fix that holds applied, the last claim first (each claim's
 * edits stay inside its own lines, so the earlier claims' offsets stay valid), or null when
 * there is none.
 */
export function fixedFileText(fileText: string, fixes: ClaimFix[]): string | null {
  if (fixes.length === 0) return null;
  const sorted = [...fixes].sort((a, b) => b.claim.span.start - a.claim.span.start);
  let text = fileText;
  for (const f of sorted) text = 'edit' in f ? applyEdit(text, f.claim, f.edit) : rewriteClaim(text, f.claim, f.rhs);
  return text;
}
