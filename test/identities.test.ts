// The shipped library: every claim marked `expect refuted` is refuted and every other claim
// holds, at the default settings, for seeds 1 to 5.
import { describe, expect, it } from 'vitest';
import { fileURLToPath } from 'node:url';
import { run } from '../src/cli/program.js';

const ROOT = fileURLToPath(new URL('..', import.meta.url));

describe('identities/', () => {
  for (const seed of [1, 2, 3, 4, 5]) {
    it(`every claim gets its expected verdict at seed ${seed}`, async () => {
      let out = '';
      const code = await run(['check', 'identities', '--json', '--seed', String(seed)], {
        out: (s) => (out += s),
        err: () => {},
        cwd: ROOT,
      });
      const doc = JSON.parse(out) as { claims: { name: string; verdict: string; expected: string; reason: string | null }[]; summary: { claims: number; refuted: number } };
      const wrong = doc.claims.filter((c) => c.verdict !== c.expected).map((c) => `${c.name}: ${c.verdict} (${c.reason ?? ''})`);
      expect(wrong).toEqual([]);
      expect(code).toBe(0);
      expect(doc.summary.claims).toBeGreaterThanOrEqual(60);
      expect(doc.summary.refuted).toBeGreaterThanOrEqual(10);
    }, 300_000);
  }
});
