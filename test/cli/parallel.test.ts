// Parallel and sharded runs (src/cli/pool.ts, check.ts): the report must not depend on the
// number of worker threads, and the shards of a run must add up to the run. Checked on
// shipped claim files through the built command (the JSON report has no timings; the text
// report's times are blanked before comparing). The rules are the project's own (README,
// "Commands"); no outside reference applies.
import { describe, expect, it } from 'vitest';
import { execFile } from 'node:child_process';
import { promisify } from 'node:util';
import { fileURLToPath } from 'node:url';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const BIN = fileURLToPath(new URL('../../dist/src/cli/main.js', import.meta.url));
const run = promisify(execFile);
// cheap files with holding, refuted (diagnosed) and group-clause claims
const FILES = ['identities/eisenstein.vet', 'identities/eta.vet', 'identities/theta.vet', 'identities/expansions.vet'];

async function modvet(...args: string[]): Promise<{ code: number; out: string }> {
  try {
    const r = await run(process.execPath, [BIN, 'check', ...FILES, ...args], { cwd: ROOT, env: { ...process.env, NO_COLOR: '1' }, maxBuffer: 1 << 26 });
    return { code: 0, out: r.stdout };
  } catch (e) {
    const x = e as { code?: number; stdout?: string };
    return { code: x.code ?? -1, out: x.stdout ?? '' };
  }
}

interface Doc {
  claims: { file: string; line: number; name: string }[];
  summary: Record<string, number>;
}

describe('--jobs and --shard', () => {
  it('the JSON and the text reports are the same for --jobs 1 and --jobs 2', async () => {
    const [j1, j2] = [await modvet('--json', '--jobs', '1'), await modvet('--json', '--jobs', '2')];
    expect(j1.code).toBe(0);
    expect(j2.out).toBe(j1.out);
    const blank = (s: string) => s.replace(/\d+\.\d\d s/g, 'T s');
    const [t1, t2] = [await modvet('--jobs', '1'), await modvet('--jobs', '2')];
    expect(blank(t2.out)).toBe(blank(t1.out));
    expect(t1.out).toContain('diagnosis:');
  }, 300_000);

  it('the shards 1/3, 2/3, 3/3 are disjoint and together give the whole run', async () => {
    const whole = JSON.parse((await modvet('--json', '--jobs', '2')).out) as Doc;
    const parts = await Promise.all([1, 2, 3].map((k) => modvet('--json', '--jobs', '1', '--shard', `${k}/3`)));
    const docs = parts.map((p) => JSON.parse(p.out) as Doc);
    const key = (c: { file: string; line: number }) => `${c.file}:${c.line}`;
    const union = docs.flatMap((d) => d.claims);
    expect(new Set(union.map(key)).size).toBe(union.length);
    const order = new Map(whole.claims.map((c, k) => [key(c), k]));
    union.sort((a, b) => order.get(key(a))! - order.get(key(b))!);
    expect(union).toEqual(whole.claims);
    for (const k of ['claims', 'holds', 'refuted', 'undecided', 'error', 'unexpected']) {
      expect(docs.reduce((t, d) => t + d.summary[k]!, 0)).toBe(whole.summary[k]);
    }
  }, 300_000);

  it('a bad --shard or --jobs is a usage error', async () => {
    for (const bad of [['--shard', '0/3'], ['--shard', '4/3'], ['--shard', 'x'], ['--jobs', '0']]) {
      const r = await modvet(...bad);
      expect(r.code, bad.join(' ')).toBe(2);
    }
  });
});
