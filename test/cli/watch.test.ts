// `check --watch` (src/cli/watch.ts): a changed file is checked again, a new file is
// picked up, --fix is refused. Project policy (the issue); no outside reference.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

const BIN = fileURLToPath(new URL('../../dist/src/cli/main.js', import.meta.url));
let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'modvet-watch-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Resolves when `text` has appeared `times` times in the stream's output, or after `ms`. */
function waitFor(buf: { s: string }, text: string, times: number, ms: number): Promise<boolean> {
  return new Promise((resolve) => {
    const t0 = Date.now();
    const tick = () => {
      if (buf.s.split(text).length - 1 >= times) return resolve(true);
      if (Date.now() - t0 > ms) return resolve(false);
      setTimeout(tick, 50);
    };
    tick();
  });
}

describe('check --watch', () => {
  it('checks a changed file again and picks up a new one', async () => {
    writeFileSync(join(dir, 'a.vet'), 'claim "a"\n  E(4, tau)^2 = E(8, tau)\n');
    const child = spawn(process.execPath, [BIN, 'check', dir, '--watch', '--jobs', '1'], { env: { ...process.env, NO_COLOR: '1' } });
    const out = { s: '' };
    const err = { s: '' };
    child.stdout.on('data', (d: Buffer) => (out.s += d.toString()));
    child.stderr.on('data', (d: Buffer) => (err.s += d.toString()));
    try {
      expect(await waitFor(err, 'watching for changes', 1, 30_000)).toBe(true);
      expect(out.s).toContain('holds     a');
      // a change that breaks the claim (E_4^2 = E_8: Serre, A Course in Arithmetic, ch. VII)
      writeFileSync(join(dir, 'a.vet'), 'claim "a"\n  E(4, tau)^2 = 2*E(8, tau)\n');
      expect(await waitFor(out, 'Seed 1 reproduces', 2, 30_000)).toBe(true);
      expect(out.s).toContain('refuted   a');
      writeFileSync(join(dir, 'b.vet'), 'claim "b"\n  E(4, tau) = E(4, tau)\n');
      expect(await waitFor(out, 'Seed 1 reproduces', 3, 30_000)).toBe(true);
      expect(out.s).toContain('holds     b');
    } finally {
      child.kill();
    }
  }, 120_000);
  it('refuses --fix', () => {
    const r = spawnSync(process.execPath, [BIN, 'check', dir, '--watch', '--fix'], { encoding: 'utf8' });
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('--fix');
  });
});
