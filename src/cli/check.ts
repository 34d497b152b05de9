/**
 * `modvet check [paths...]`: parse every claim file, check every claim, report.
 *
 * Settings, most specific first: a claim's own clause, then the command line, then the
 * file's `use` line, then the defaults (30 digits, 16 samples, seed 1, y_min 0.02).
 * Exit code: 2 when an input could not be read or parsed (the rest is still checked),
 * else 1 when some claim did not get its expected verdict, else 0.
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { basename, dirname, join, resolve } from 'node:path';
import { parseSource } from '../lang/parser.js';
import { renderDiagnostic } from '../lang/diagnostics.js';
import type { Claim, FileAst, Settings } from '../lang/ast.js';
import { fixedFileText, type ClaimFix } from '../diagnose/explain.js';
import { evaluationCost } from '../report/claimPlot.js';
import { summaryLine } from '../report/text.js';
import { jsonDocument } from '../report/json.js';
import { junitDocument } from '../report/junit.js';
import { htmlDocument } from '../report/html.js';
import { findClaimFiles } from './files.js';
import { digitsOption, intOption, namePattern, shardOption, UsageError, yMinOption } from './options.js';
import { runUnits } from './pool.js';
import { Progress } from './progress.js';
import type { Streams } from './program.js';
import { DEFAULTS, type Unit, type UnitOutcome, type UnitSettings } from './unit.js';
import { VERSION } from './version.js';

export { DEFAULTS };

export interface CheckFlags {
  digits?: string;
  samples?: string;
  seed?: string;
  ymin?: string;
  only?: string;
  json?: boolean;
  junit?: string;
  /** Also write the HTML report (plots per claim) to this file. */
  report?: string;
  quiet?: boolean;
  fix?: boolean;
  jobs?: string;
  shard?: string;
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

/** A cost hint for the dispatch order (pool.ts): the estimated cost of one evaluation. */
function unitCost(claims: Map<string, Claim[]>): (u: Unit) => number {
  return (u) => {
    const claim = claims.get(u.file)?.[u.claim];
    return claim === undefined ? 0 : evaluationCost(claim);
  };
}

export interface LoadedClaims {
  found: ReturnType<typeof findClaimFiles>;
  /** Files that could not be read or parsed (reported at the end of the run). */
  problems: { file: string; message: string }[];
  /** The claims to check, in file order, filtered by --only. */
  units: Unit[];
  texts: Map<string, string>;
  claims: Map<string, Claim[]>;
  lets: Map<string, FileAst['lets']>;
}

/** Finds and parses the claim files (diagnostics on stderr) and lists their claims as units. */
export function loadClaims(paths: string[], only: ((name: string) => boolean) | null, io: Streams, cwd: string): LoadedClaims {
  const found = findClaimFiles(paths.length > 0 ? paths : ['identities'], cwd);
  const problems = [...found.problems];
  if (found.files.length === 0 && problems.length === 0) {
    problems.push({ file: paths.join(' ') || 'identities', message: 'no .vet files found' });
  }
  const units: Unit[] = [];
  const texts = new Map<string, string>();
  const claims = new Map<string, Claim[]>();
  const lets = new Map<string, FileAst['lets']>();
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
    texts.set(file, text);
    claims.set(file, ast.claims);
    lets.set(file, ast.lets);
    ast.claims.forEach((claim, k) => {
      if (only !== null && !only(claim.name)) return;
      units.push({ index: units.length, file, text, claim: k });
    });
  }
  return { found, problems, units, texts, claims, lets };
}

export async function runCheck(paths: string[], flags: CheckFlags, io: Streams, cwd: string): Promise<number> {
  const cli = parseFlags(flags);
  const only = flags.only !== undefined ? namePattern(flags.only) : null;
  const jobs = flags.jobs !== undefined ? intOption('--jobs', flags.jobs, 1, 256) : Math.max(1, availableParallelism());
  const shard = flags.shard !== undefined ? shardOption(flags.shard) : null;
  if (flags.junit !== undefined && flags.junit.endsWith('.vet')) {
    throw new UsageError(`--junit ${flags.junit}: refusing to write a report over a claim file`);
  }
  if (flags.report !== undefined && flags.report.endsWith('.vet')) {
    throw new UsageError(`--report ${flags.report}: refusing to write a report over a claim file`);
  }
  const { found, problems, units, texts, claims } = loadClaims(paths, only, io, cwd);
  const color = io.color ?? false;
  const seed = cli.seed ?? DEFAULTS.seed;
  // --shard k/n: every n-th claim from the k-th on, so the parts together are the whole run
  const mine = shard === null ? units : units.filter((u) => u.index % shard.n === shard.k - 1);
  const selected = mine.map((u, k) => ({ ...u, index: k }));

  const settings: UnitSettings = { cli, seed, color, quiet: flags.quiet ?? false, ...(flags.report !== undefined ? { html: true } : {}) };
  const progress = io.progress === true && !flags.quiet && selected.length > 0 ? new Progress(selected.length, { write: io.err, ...(io.columns !== undefined ? { columns: io.columns } : {}) }) : null;
  // text lines are printed in claim order as soon as the claims before them are done
  const ready = new Map<number, UnitOutcome>();
  let next = 0;
  const flush = () => {
    for (let o = ready.get(next); o !== undefined; o = ready.get(next)) {
      if (!flags.json && o.lines.length > 0) {
        progress?.clear();
        for (const line of o.lines) io.out(line + '\n');
      }
      ready.delete(next);
      next++;
    }
  };
  let outcomes: UnitOutcome[];
  try {
    outcomes = await runUnits(selected, settings, jobs, {
      cost: unitCost(claims),
      started: (u) => progress?.started(u.index, claims.get(u.file)?.[u.claim]?.name ?? ''),
      finished: (o) => {
        progress?.finished(o.index);
        ready.set(o.index, o);
        flush();
      },
    });
  } finally {
    progress?.stop();
  }

  let fixFailed = false;
  if (flags.fix === true) {
    for (const [file, text] of texts) {
      const mineHere = selected.filter((u) => u.file === file).map((u) => outcomes[u.index]!);
      if (!mineHere.some((o) => o.verdict === 'refuted')) continue;
      const list = claims.get(file)!;
      const fixes: ClaimFix[] = mineHere
        .map((o) => o.fix)
        .filter((f): f is NonNullable<typeof f> => f !== null)
        .map((f) => ('edit' in f ? { claim: list[f.claim]!, edit: f.edit } : { claim: list[f.claim]!, rhs: f.rhs }));
      fixFailed = writeFixes(file, text, fixes, cwd, io) || fixFailed;
    }
  }
  for (const p of found.problems) io.err(`modvet: ${p.file}: ${p.message}\n`);
  const runSettings = {
    seed,
    digits: cli.digits ?? DEFAULTS.digits,
    samples: cli.samples ?? DEFAULTS.samples,
    yMin: cli.yMin ?? DEFAULTS.yMin,
  };
  if (flags.json) io.out(jsonDocument(VERSION, runSettings, outcomes.map((o) => o.json), outcomes, problems));
  else io.out(summaryLine(outcomes, seed, problems.length, color) + (shard !== null ? ` Shard ${shard.k}/${shard.n}: ${selected.length} of ${units.length} claims.` : '') + '\n');
  if (flags.junit !== undefined) {
    try {
      writeFileSync(resolve(cwd, flags.junit), junitDocument(outcomes.map((o) => o.junit), problems));
    } catch (e) {
      io.err(`modvet: cannot write the JUnit report ${flags.junit}: ${e instanceof Error ? e.message : String(e)}\n`);
      return 2;
    }
  }
  if (flags.report !== undefined) {
    const page = htmlDocument({
      version: VERSION,
      settings: runSettings,
      claims: outcomes.map((o) => o.html!),
      problems,
      ...(shard !== null ? { note: `Shard ${shard.k}/${shard.n}: ${selected.length} of ${units.length} claims.` } : {}),
    });
    try {
      writeFileSync(resolve(cwd, flags.report), page);
    } catch (e) {
      io.err(`modvet: cannot write the HTML report ${flags.report}: ${e instanceof Error ? e.message : String(e)}\n`);
      return 2;
    }
  }
  if (problems.length > 0 || fixFailed) return 2;
  return outcomes.every((r) => r.ok) ? 0 : 1;
}
