// The progress line (src/cli/progress.ts): what it shows, when it is drawn, that it is
// erased. A run whose stderr is not a terminal must not show it (checked end to end).
// Project policy (the description of the progress display); no outside reference.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { Progress, SHOW_AFTER_MS } from '../../src/cli/progress.js';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const BIN = fileURLToPath(new URL('../../dist/src/cli/main.js', import.meta.url));

afterEach(() => {
  vi.useRealTimers();
});

describe('Progress', () => {
  it('shows done of total, the elapsed time and the earliest claim still running', () => {
    vi.useFakeTimers();
    const out: string[] = [];
    const p = new Progress(10, { write: (s) => out.push(s), columns: 60 });
    p.started(3, 'E4 squared is E8');
    p.started(1, 'eta under T');
    p.finished(0);
    vi.advanceTimersByTime(2500);
    expect(p.line()).toBe('[1/10] 00:02 eta under T');
    p.stop();
  });
  it('draws nothing during the first second, then redraws in place, and erases itself', () => {
    vi.useFakeTimers();
    const out: string[] = [];
    const p = new Progress(2, { write: (s) => out.push(s) });
    p.started(0, 'a');
    vi.advanceTimersByTime(SHOW_AFTER_MS - 300);
    expect(out).toEqual([]);
    vi.advanceTimersByTime(600);
    expect(out.length).toBeGreaterThan(0);
    expect(out.at(-1)!.startsWith('\r\x1b[2K[0/2]')).toBe(true);
    p.stop();
    expect(out.at(-1)).toBe('\r\x1b[2K');
  });
  it('cuts a long claim name to the terminal width', () => {
    const p = new Progress(1, { write: () => {}, columns: 30 });
    p.started(0, 'a very long claim name that does not fit');
    expect(p.line().length).toBeLessThanOrEqual(29);
    expect(p.line().endsWith('...')).toBe(true);
    p.stop();
  });
  it('is absent when stderr is not a terminal', () => {
    const r = spawnSync(process.execPath, [BIN, 'check', 'identities/theta.vet', '--jobs', '1'], { cwd: ROOT, encoding: 'utf8' });
    expect(r.status).toBe(0);
    expect(r.stderr).not.toContain('\r');
  });
});
