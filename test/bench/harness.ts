/**
 * Benchmark harness: times modvet and mpmath on the same arguments in the same run.
 *
 * Method (identical on both sides): for each argument, one warm-up call, then repeated
 * calls until at least MIN_MS have passed (at least MIN_REPS calls); the time per call is
 * the total over the count. A row reports the median over its arguments, in microseconds.
 * mpmath runs in test/bench/mpmath_bench.py under /usr/bin/python3 (Debian's python3-mpmath);
 * when that is missing the ratio column says so.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { withDigits } from '../../src/numeric/precision.js';

export const MIN_MS = 30;
export const MIN_REPS = 3;

/** One benchmarked computation: arguments are decimal strings, shared with mpmath. */
export interface BenchRow {
  /** Row label, e.g. "Gamma(z)". */
  label: string;
  /** Name of the mpmath-side computation in test/bench/mpmath_bench.py. */
  mpmath: string;
  /** Argument tuples; each argument is [re, im] as decimal strings. */
  args: [string, string][][];
  /** The modvet computation on one argument tuple (at the current precision). */
  run: (args: [string, string][]) => unknown;
  /** Argument set label, e.g. "Im tau in [0.87, 2]". */
  set?: string;
}

export interface Timing {
  label: string;
  set: string;
  digits: number;
  modvetUs: number;
  mpmathUs: number | null;
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 === 1 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

function timeOne(f: () => unknown): number {
  f();
  let reps = 0;
  const t0 = process.hrtime.bigint();
  let elapsed = 0;
  while (reps < MIN_REPS || elapsed < MIN_MS * 1e6) {
    f();
    reps++;
    elapsed = Number(process.hrtime.bigint() - t0);
  }
  return elapsed / reps / 1000;
}

/** Median microseconds per call of a row at a precision. */
export function timeRow(row: BenchRow, digits: number): number {
  return withDigits(digits, () => median(row.args.map((a) => timeOne(() => row.run(a)))));
}

const PYTHON = '/usr/bin/python3';

/** Runs the mpmath side for all rows and precisions; null where mpmath is unavailable. */
export function timeMpmath(rows: BenchRow[], precisions: number[]): Map<string, number> | null {
  if (!existsSync(PYTHON)) return null;
  const probe = spawnSync(PYTHON, ['-c', 'import mpmath'], { encoding: 'utf8' });
  if (probe.status !== 0) return null;
  const dir = mkdtempSync(join(tmpdir(), 'modvet-bench-'));
  try {
    const spec = join(dir, 'spec.json');
    const jobs = rows.flatMap((r, i) =>
      precisions.map((d) => ({ key: `${i}@${d}`, name: r.mpmath, digits: d, args: r.args })),
    );
    writeFileSync(spec, JSON.stringify({ minMs: MIN_MS, minReps: MIN_REPS, jobs }));
    const script = fileURLToPath(new URL('../../../test/bench/mpmath_bench.py', import.meta.url));
    const res = spawnSync(PYTHON, [script, spec], { encoding: 'utf8', maxBuffer: 1 << 24 });
    if (res.status !== 0) {
      process.stderr.write(`mpmath side failed:\n${res.stderr}\n`);
      return null;
    }
    const out = JSON.parse(readFileSync(join(dir, 'spec.json.out'), 'utf8')) as Record<string, number>;
    return new Map(Object.entries(out));
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

export function mpmathVersion(): string | null {
  if (!existsSync(PYTHON)) return null;
  const r = spawnSync(PYTHON, ['-c', 'import mpmath, sys; print(mpmath.__version__, mpmath.libmp.BACKEND)'], {
    encoding: 'utf8',
  });
  return r.status === 0 ? r.stdout.trim() : null;
}

/** Prints the table; ratio = modvet / mpmath (below 1: modvet is faster). */
export function printTable(ts: Timing[]): void {
  const head = ['computation', 'argument set', 'digits', 'modvet us', 'mpmath us', 'ratio'];
  const rows = ts.map((t) => [
    t.label,
    t.set,
    String(t.digits),
    t.modvetUs.toFixed(1),
    t.mpmathUs === null ? 'n/a' : t.mpmathUs.toFixed(1),
    t.mpmathUs === null ? 'n/a' : (t.modvetUs / t.mpmathUs).toFixed(2),
  ]);
  const w = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i]!.length)));
  const line = (r: string[]) => r.map((c, i) => (i < 2 ? c.padEnd(w[i]!) : c.padStart(w[i]!))).join('  ');
  console.log(line(head));
  console.log(w.map((n) => '-'.repeat(n)).join('  '));
  for (const r of rows) console.log(line(r));
}
