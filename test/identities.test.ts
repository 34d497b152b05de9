// The shipped library: every claim marked `expect refuted` is refuted and every other claim
// holds, at the default settings, for seeds 1 to 5. The built command runs in a child
// process (asynchronously, so the test worker stays responsive during the long runs).
import { describe, expect, it } from 'vitest';
import { execFile } from 'node:child_process';
import { promisify } from 'node:util';
import { fileURLToPath } from 'node:url';

const ROOT = fileURLToPath(new URL('..', import.meta.url));
const BIN = fileURLToPath(new URL('../dist/src/cli/main.js', import.meta.url));
const run = promisify(execFile);

interface Report {
  claims: { name: string; verdict: string; expected: string; reason: string | null }[];
  summary: { claims: number; refuted: number; unexpected: number };
}

describe('identities/', () => {
  for (const seed of [1, 2, 3, 4, 5]) {
    it(`every claim gets its expected verdict at seed ${seed}`, async () => {
      const { stdout } = await run(process.execPath, [BIN, 'check', 'identities', '--json', '--seed', String(seed)], {
        cwd: ROOT,
        maxBuffer: 1 << 26,
      });
      const doc = JSON.parse(stdout) as Report;
      const wrong = doc.claims.filter((c) => c.verdict !== c.expected).map((c) => `${c.name}: ${c.verdict} (${c.reason ?? ''})`);
      expect(wrong).toEqual([]);
      expect(doc.summary.unexpected).toBe(0);
      expect(doc.summary.claims).toBeGreaterThanOrEqual(60);
      expect(doc.summary.refuted).toBeGreaterThanOrEqual(10);
    }, 300_000);
  }
});
