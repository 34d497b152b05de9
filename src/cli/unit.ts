/**
 * One claim checked and reported: the unit of work of `modvet check`, run in the main
 * thread (--jobs 1) or in a worker thread (pool.ts). Everything it returns is plain data
 * (strings, numbers, plain objects), so it crosses to the main thread unchanged and the
 * reports assembled there are the same whatever the number of workers.
 *
 * A unit names its claim by file and index; the file's text travels with it and is parsed
 * again where the unit runs (parsing is cheap, and an AST holds no transferable state).
 */
import { parseSource } from '../lang/parser.js';
import type { Settings } from '../lang/ast.js';
import { ModvetError } from '../numeric/errors.js';
import { toCheckable } from '../check/fromAst.js';
import { checkClaim, type ClaimResult } from '../check/run.js';
import type { CheckableClaim, Verdict } from '../check/claim.js';
import { claimFix, explainRefuted, type ExplainedResult } from '../diagnose/explain.js';
import type { SpanEdit } from '../diagnose/types.js';
import { claimLines } from '../report/text.js';
import { claimJson } from '../report/json.js';
import { junitCase, type JunitCase } from '../report/junit.js';
import type { HtmlClaim } from '../report/html.js';
import { htmlClaim } from '../report/claimPlot.js';

export const DEFAULTS = { digits: 30, samples: 16, seed: 1, yMin: 0.02 } as const;

export interface UnitSettings {
  /** The command line's settings (over the file's `use` line). */
  cli: Settings;
  seed: number;
  color: boolean;
  quiet: boolean;
  /** Render the claim's piece of the HTML report (`check --report`): plots, so only when asked. */
  html?: boolean;
  /** Explain refuted claims (default true; `tex` needs only the verdicts). */
  explain?: boolean;
}

export interface Unit {
  /** Position in the run (the order of the reports). */
  index: number;
  file: string;
  text: string;
  /** Index of the claim among the file's parsed claims. */
  claim: number;
}

/** A fix that holds, by claim index (explain.ts ClaimFix without the AST). */
export type UnitFix = { claim: number; rhs: string } | { claim: number; edit: SpanEdit };

export interface CheckRecord {
  samples: number;
  digits: number;
  requested: number;
  seed: number;
  yMin: number;
  reason?: string;
  limitedBy?: string;
  /** Whether the worst sample was judged against the terms (both sides vanish). */
  vanishing?: boolean;
}

export interface UnitOutcome {
  index: number;
  name: string;
  verdict: Verdict;
  ok: boolean;
  timeMs: number;
  /** The text report's lines for this claim (empty when --quiet and as expected). */
  lines: string[];
  json: ReturnType<typeof claimJson>;
  junit: JunitCase;
  fix: UnitFix | null;
  /** What the check did, for records such as the LaTeX comments (tex.ts). */
  record: CheckRecord;
  /** The HTML report's piece (when UnitSettings.html is set). */
  html?: HtmlClaim;
}

/** A claim that could not even be set up (a bad clause value) is reported as an error. */
function setupFailure(claim: Pick<CheckableClaim, 'file' | 'line' | 'name' | 'text' | 'expect' | 'source'>, message: string, digits: number): ClaimResult {
  const c: CheckableClaim = { ...claim, params: [], evaluate: () => { throw new Error('not evaluable'); } };
  return { claim: c, verdict: 'error', ok: claim.expect === 'error', digits: 0, requested: digits, samples: 0, timeMs: 0, reason: message, reports: [] };
}

const parsed = new Map<string, ReturnType<typeof parseSource>>();

/** The file's parse, kept for the units of the same file (keyed by name and text). */
function parse(file: string, text: string): ReturnType<typeof parseSource> {
  const key = `${file}\u0000${text}`;
  let p = parsed.get(key);
  if (p === undefined) {
    if (parsed.size > 64) parsed.clear();
    p = parseSource(text, file);
    parsed.set(key, p);
  }
  return p;
}

/** Checks one claim, explains it when refuted, and renders its report pieces. */
export function runUnit(unit: Unit, s: UnitSettings): UnitOutcome {
  const { ast } = parse(unit.file, unit.text);
  const claim = ast.claims[unit.claim];
  if (claim === undefined) throw new Error(`no claim ${unit.claim} in ${unit.file}`);
  // the command line overrides the file's `use` defaults; a claim's own clauses override both
  const defaults: Settings = { ...ast.defaults, ...s.cli };
  const fileSeed = s.cli.seed ?? ast.defaults.seed;
  let result: ExplainedResult;
  let fix: UnitFix | null = null;
  let setUp = false;
  let usedSeed = s.seed;
  try {
    const checkable = toCheckable(claim, defaults);
    setUp = true;
    if (checkable.seed === undefined && fileSeed !== undefined) checkable.seed = fileSeed;
    usedSeed = checkable.seed ?? s.seed;
    const opts = {
      digits: defaults.digits ?? DEFAULTS.digits,
      samples: defaults.samples ?? DEFAULTS.samples,
      seed: s.seed,
      yMin: defaults.yMin ?? DEFAULTS.yMin,
    };
    result = checkClaim(checkable, opts);
    if (result.verdict === 'refuted' && s.explain !== false) {
      // say what is off, where it fails most simply, and check the corrected claim
      const explanation = explainRefuted(result, { claim, fileText: unit.text, defaults }, opts);
      result = { ...result, explanation };
      const f = claimFix(claim, explanation);
      if (f !== null) fix = 'edit' in f ? { claim: unit.claim, edit: f.edit } : { claim: unit.claim, rhs: f.rhs };
    }
  } catch (e) {
    if (!(e instanceof ModvetError)) throw e;
    setUp = false;
    result = setupFailure(
      { file: unit.file, line: claim.span.line, name: claim.name, text: claim.text, expect: claim.expect, ...(claim.source !== undefined ? { source: claim.source } : {}) },
      e.message,
      defaults.digits ?? DEFAULTS.digits,
    );
  }
  return {
    index: unit.index,
    name: claim.name,
    verdict: result.verdict,
    ok: result.ok,
    timeMs: result.timeMs,
    lines: !s.quiet || !result.ok ? claimLines(result, { color: s.color, quiet: s.quiet }) : [],
    json: claimJson(result),
    junit: junitCase(result),
    fix,
    record: {
      samples: result.samples,
      digits: result.digits,
      requested: result.requested,
      seed: usedSeed,
      yMin: result.claim.yMin ?? defaults.yMin ?? DEFAULTS.yMin,
      ...(result.reason !== undefined ? { reason: result.reason } : {}),
      ...(result.limitedBy !== undefined ? { limitedBy: result.limitedBy } : {}),
      ...(result.worst?.assessment.vanishing === true ? { vanishing: true } : {}),
    },
    ...(s.html === true ? { html: htmlClaim(result, { claim: setUp ? claim : null, index: unit.index, yMin: defaults.yMin ?? DEFAULTS.yMin }) } : {}),
  };
}
