/**
 * `modvet check [paths...]`: parse every claim file, check every claim, report.
 *
 * Settings, most specific first: a claim's own clause, then the command line, then the
 * file's `use` line, then the defaults (30 digits, 16 samples, seed 1, y_min 0.02).
 * Exit code: 2 when an input could not be read or parsed (the rest is still checked),
 * else 1 when some claim did not get its expected verdict, else 0.
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { parseSource } from '../lang/parser.js';
import { renderDiagnostic } from '../lang/diagnostics.js';
import type { Settings } from '../lang/ast.js';
import { ModvetError } from '../numeric/errors.js';
import { toCheckable } from '../check/fromAst.js';
import { checkClaim, ClaimResult } from '../check/run.js';
import { claimFix, explainRefuted, fixedFileText, type ClaimFix, type ExplainedResult } from '../diagnose/explain.js';
import { CheckableClaim } from '../check/claim.js';
import { claimLines, summaryLine } from '../report/text.js';
import { jsonReport } from '../report/json.js';
import { junitReport } from '../report/junit.js';
import { findClaimFiles } from './files.js';
import { digitsOption, intOption, namePattern, UsageError, yMinOption } from './options.js';
import type { Streams } from './program.js';
import { VERSION } from './version.js';

export const DEFAULTS = { digits: 30, samples: 16, seed: 1, yMin: 0.02 } as const;

export interface CheckFlags {
  digits?: string;
  samples?: string;
  seed?: string;
  ymin?: string;
  only?: string;
  json?: boolean;
  junit?: string;
  quiet?: boolean;
  fix?: boolean;
}

/** Where `--fix` writes a file's corrected claims: beside it, never over anything. */
export function fixedPath(file: string): string {
  return join(dirname(file), basename(file, '.vet') + '.fixed.vet');
}

/** The command-line settings, validated (undefined where not given). */
export function parseFlags(f: CheckFlags): Settings {
  const s: Settings = {};
  if (f.digits !== undefined) s.digits = digitsOption(f.digits);
  if (f.samples !== undefined) s.samples = intOption('--samples', f.samples, 1, 10000);
  if (f.seed !== undefined) s.seed = intOption('--seed', f.seed, 0, 2 ** 32 - 1);
  if (f.ymin !== undefined) s.yMin = yMinOption(f.ymin);
  return s;
}

/** A claim that could not even be set up (a bad clause value) is reported as an error. */
function setupFailure(claim: Pick<CheckableClaim, 'file' | 'line' | 'name' | 'text' | 'expect' | 'source'>, message: string, digits: number): ClaimResult {
  const c: CheckableClaim = { ...claim, params: [], evaluate: () => { throw new Error('not evaluable'); } };
  return { claim: c, verdict: 'error', ok: claim.expect === 'error', digits: 0, requested: digits, samples: 0, timeMs: 0, reason: message, reports: [] };
}

/** Writes a file's checked fixes beside it (module header of explain.ts); true on failure. */
function writeFixes(file: string, text: string, fixes: ClaimFix[], cwd: string, io: Streams): boolean {
  const out = fixedPath(file);
  const fixed = fixedFileText(text, fixes);
  if (fixed === null) {
    io.err(`modvet: ${file}: no suggested fix holds; nothing written\n`);
    return false;
  }
  const target = resolve(cwd, out);
  if (existsSync(target)) {
    io.err(`modvet: ${out} exists; not overwriting it (remove it to write the fixes again)\n`);
    return true;
  }
  try {
    writeFileSync(target, fixed, { flag: 'wx' });
  } catch (e) {
    io.err(`modvet: cannot write ${out}: ${e instanceof Error ? e.message : String(e)}\n`);
    return true;
  }
  io.err(`modvet: wrote ${fixes.length} corrected claim(s) to ${out}\n`);
  return false;
}

export function runCheck(paths: string[], flags: CheckFlags, io: Streams, cwd: string): number {
  const cli = parseFlags(flags);
  const only = flags.only !== undefined ? namePattern(flags.only) : null;
  if (flags.junit !== undefined && flags.junit.endsWith('.vet')) {
    throw new UsageError(`--junit ${flags.junit}: refusing to write a report over a claim file`);
  }
  const found = findClaimFiles(paths.length > 0 ? paths : ['identities'], cwd);
  const problems = [...found.problems];
  if (found.files.length === 0 && problems.length === 0) {
    problems.push({ file: paths.join(' ') || 'identities', message: 'no .vet files found' });
  }
  const color = io.color ?? false;
  const seed = cli.seed ?? DEFAULTS.seed;
  const results: ExplainedResult[] = [];
  let fileSeed: number | undefined;
  let fixFailed = false;
  for (const file of found.files) {
    let text: string;
    try {
      text = readFileSync(resolve(cwd, file), 'utf8');
    } catch (e) {
      problems.push({ file, message: e instanceof Error ? e.message : String(e) });
      continue;
    }
    const { ast, diagnostics } = parseSource(text, file);
    if (diagnostics.length > 0) {
      for (const d of diagnostics) io.err(renderDiagnostic(d, text) + '\n');
      problems.push({ file, message: `${diagnostics.length} problem(s) in the file; the claims that parsed were checked` });
    }
    // the command line overrides the file's `use` defaults; a claim's own clauses override both
    const defaults: Settings = { ...ast.defaults, ...cli };
    fileSeed = cli.seed ?? ast.defaults.seed;
    const fixes: ClaimFix[] = [];
    for (const claim of ast.claims) {
      if (only !== null && !only(claim.name)) continue;
      let result: ExplainedResult;
      try {
        const checkable = toCheckable(claim, defaults);
        if (checkable.seed === undefined && fileSeed !== undefined) checkable.seed = fileSeed;
        const opts = {
          digits: defaults.digits ?? DEFAULTS.digits,
          samples: defaults.samples ?? DEFAULTS.samples,
          seed,
          yMin: defaults.yMin ?? DEFAULTS.yMin,
        };
        result = checkClaim(checkable, opts);
        if (result.verdict === 'refuted') {
          // say what is off, where it fails most simply, and check the corrected claim
          const explanation = explainRefuted(result, { claim, fileText: text, defaults }, opts);
          result = { ...result, explanation };
          const f = claimFix(claim, explanation);
          if (f !== null) fixes.push(f);
        }
      } catch (e) {
        if (!(e instanceof ModvetError)) throw e;
        result = setupFailure(
          { file, line: claim.span.line, name: claim.name, text: claim.text, expect: claim.expect, ...(claim.source !== undefined ? { source: claim.source } : {}) },
          e.message,
          defaults.digits ?? DEFAULTS.digits,
        );
      }
      results.push(result);
      if (!flags.json && (!flags.quiet || !result.ok)) {
        for (const line of claimLines(result, { color, quiet: flags.quiet ?? false })) io.out(line + '\n');
      }
    }
    const refuted = results.filter((r) => r.claim.file === file && r.verdict === 'refuted').length;
    if (flags.fix === true && refuted > 0) fixFailed = writeFixes(file, text, fixes, cwd, io) || fixFailed;
  }
  for (const p of found.problems) io.err(`modvet: ${p.file}: ${p.message}\n`);
  const settings = {
    seed,
    digits: cli.digits ?? DEFAULTS.digits,
    samples: cli.samples ?? DEFAULTS.samples,
    yMin: cli.yMin ?? DEFAULTS.yMin,
  };
  if (flags.json) io.out(jsonReport(VERSION, settings, results, problems));
  else io.out(summaryLine(results, seed, problems.length, color) + '\n');
  if (flags.junit !== undefined) {
    try {
      writeFileSync(resolve(cwd, flags.junit), junitReport(results, problems));
    } catch (e) {
      io.err(`modvet: cannot write the JUnit report ${flags.junit}: ${e instanceof Error ? e.message : String(e)}\n`);
      return 2;
    }
  }
  if (problems.length > 0 || fixFailed) return 2;
  return results.every((r) => r.ok) ? 0 : 1;
}
