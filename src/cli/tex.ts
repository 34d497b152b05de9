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
import { writeFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { resolve } from 'node:path';
import { latexDocument, TexEntry } from '../report/latex.js';
import { DEFAULTS, loadClaims, parseFlags } from './check.js';
import { intOption, namePattern, UsageError } from './options.js';
import { runUnits } from './pool.js';
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
  jobs?: string;
}

export async function runTex(paths: string[], flags: TexFlags, io: Streams, cwd: string): Promise<number> {
  const cli = parseFlags(flags);
  const only = flags.only !== undefined ? namePattern(flags.only) : null;
  const jobs = flags.jobs !== undefined ? intOption('--jobs', flags.jobs, 1, 256) : Math.max(1, availableParallelism());
  if (flags.out !== undefined && flags.out.endsWith('.vet')) {
    throw new UsageError(`--out ${flags.out}: refusing to write LaTeX over a claim file`);
  }
  // the claims are found, parsed and checked exactly as `check` does (check.ts, unit.ts)
  const { problems, units, claims, lets } = loadClaims(paths, only, io, cwd);
  const seed = cli.seed ?? DEFAULTS.seed;
  const outcomes = await runUnits(units, { cli, seed, color: false, quiet: true, explain: false }, jobs);
  const entries: TexEntry[] = [];
  let notAsExpected = 0;
  for (const u of units) {
    const o = outcomes[u.index]!;
    const claim = claims.get(u.file)![u.claim]!;
    if (!o.ok) notAsExpected++;
    if (o.verdict !== 'holds') {
      const why = o.record.reason !== undefined ? `: ${o.record.reason}` : '';
      io.err(`modvet tex: skipped "${claim.name}" (${u.file}:${claim.span.line}): ${o.verdict}${why} (expected ${claim.expect})\n`);
      continue;
    }
    const r = o.record;
    entries.push({
      claim,
      lets: lets.get(u.file)!,
      check: {
        file: u.file,
        line: claim.span.line,
        points: r.samples,
        digits: r.digits,
        requested: r.requested,
        seed: r.seed,
        yMin: r.yMin,
        ...(r.limitedBy !== undefined ? { limitedBy: r.limitedBy } : {}),
        ...(r.vanishing === true ? { vanishing: true } : {}),
        version: VERSION,
      },
    });
  }
  const checked = units.length;
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
