/**
 * `modvet tex [paths...]`: check the claims exactly as `modvet check` does (same settings,
 * most specific first: the claim's clause, the command line, the file's `use` line, the
 * defaults), and write the LaTeX of those that hold (src/report/latex.ts) to stdout or to
 * --out FILE. Claims that do not hold are skipped and listed on stderr.
 *
 * Exit code: 2 when an input could not be read or parsed or the output cannot be written
 * (a message, never a stack trace); else 1 when some claim did not get its expected verdict
 * (as `check`); else 0.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { parseSource } from '../lang/parser.js';
import { renderDiagnostic } from '../lang/diagnostics.js';
import type { Settings } from '../lang/ast.js';
import { ModvetError } from '../numeric/errors.js';
import { toCheckable } from '../check/fromAst.js';
import { checkClaim } from '../check/run.js';
import { latexDocument, TexEntry } from '../report/latex.js';
import { DEFAULTS, parseFlags } from './check.js';
import { findClaimFiles } from './files.js';
import { namePattern, UsageError } from './options.js';
import type { Streams } from './program.js';
import { VERSION } from './version.js';

export interface TexFlags {
  digits?: string;
  samples?: string;
  seed?: string;
  ymin?: string;
  only?: string;
  out?: string;
  standalone?: boolean;
}

export function runTex(paths: string[], flags: TexFlags, io: Streams, cwd: string): number {
  const cli = parseFlags(flags);
  const only = flags.only !== undefined ? namePattern(flags.only) : null;
  if (flags.out !== undefined && flags.out.endsWith('.vet')) {
    throw new UsageError(`--out ${flags.out}: refusing to write LaTeX over a claim file`);
  }
  const found = findClaimFiles(paths.length > 0 ? paths : ['identities'], cwd);
  const problems = [...found.problems];
  if (found.files.length === 0 && problems.length === 0) {
    problems.push({ file: paths.join(' ') || 'identities', message: 'no .vet files found' });
  }
  const seed = cli.seed ?? DEFAULTS.seed;
  const entries: TexEntry[] = [];
  let checked = 0;
  let notAsExpected = 0;
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
    // as in check.ts: the command line overrides the file's `use` line; a claim's clauses override both
    const defaults: Settings = { ...ast.defaults, ...cli };
    const fileSeed = cli.seed ?? ast.defaults.seed;
    for (const claim of ast.claims) {
      if (only !== null && !only(claim.name)) continue;
      checked++;
      const where = `${file}:${claim.span.line}`;
      try {
        const checkable = toCheckable(claim, defaults);
        if (checkable.seed === undefined && fileSeed !== undefined) checkable.seed = fileSeed;
        const yMin = defaults.yMin ?? DEFAULTS.yMin;
        const r = checkClaim(checkable, {
          digits: defaults.digits ?? DEFAULTS.digits,
          samples: defaults.samples ?? DEFAULTS.samples,
          seed,
          yMin,
        });
        if (!r.ok) notAsExpected++;
        if (r.verdict !== 'holds') {
          const why = r.reason !== undefined ? `: ${r.reason}` : '';
          io.err(`modvet tex: skipped "${claim.name}" (${where}): ${r.verdict}${why} (expected ${claim.expect})\n`);
          continue;
        }
        entries.push({
          claim,
          lets: ast.lets,
          check: {
            file,
            line: claim.span.line,
            points: r.samples,
            digits: r.digits,
            requested: r.requested,
            seed: checkable.seed ?? seed,
            yMin: checkable.yMin ?? yMin,
            ...(r.limitedBy !== undefined ? { limitedBy: r.limitedBy } : {}),
            ...(r.worst?.assessment.vanishing === true ? { vanishing: true } : {}),
            version: VERSION,
          },
        });
      } catch (e) {
        if (!(e instanceof ModvetError)) throw e;
        notAsExpected++;
        io.err(`modvet tex: skipped "${claim.name}" (${where}): error: ${e.message}\n`);
      }
    }
  }
  for (const p of problems) io.err(`modvet: ${p.file}: ${p.message}\n`);
  const command = ['modvet tex', ...paths, ...flagWords(flags)].join(' ');
  const tex = latexDocument(entries, { standalone: flags.standalone === true, version: VERSION, command });
  const summary = `${entries.length} of ${checked} claims hold and were written${flags.out !== undefined ? ` to ${flags.out}` : ''}; ${checked - entries.length} skipped. Numerical agreement is evidence, not proof.\n`;
  if (flags.out !== undefined) {
    try {
      writeFileSync(resolve(cwd, flags.out), tex);
    } catch (e) {
      io.err(`modvet: cannot write the LaTeX file ${flags.out}: ${e instanceof Error ? e.message : String(e)}\n`);
      return 2;
    }
    io.out(summary);
  } else {
    io.out(tex);
    io.err(summary);
  }
  if (problems.length > 0) return 2;
  return notAsExpected === 0 ? 0 : 1;
}

/** The settings flags as given, for the header comment (the output file left out). */
function flagWords(f: TexFlags): string[] {
  const w: string[] = [];
  if (f.digits !== undefined) w.push(`--digits ${f.digits}`);
  if (f.samples !== undefined) w.push(`--samples ${f.samples}`);
  if (f.seed !== undefined) w.push(`--seed ${f.seed}`);
  if (f.ymin !== undefined) w.push(`--ymin ${f.ymin}`);
  if (f.only !== undefined) w.push(`--only '${f.only}'`);
  if (f.standalone === true) w.push('--standalone');
  return w;
}
