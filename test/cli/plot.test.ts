// End to end: `modvet plot` through the built command (dist/, built by `pretest`), as
// test/cli/e2e.test.ts does. The SVG is read by an outside XML parser (Python's
// xml.dom.minidom); the numbers asserted on come from its <desc>.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

const BIN = fileURLToPath(new URL('../../dist/src/cli/main.js', import.meta.url));
let dir = '';

function modvet(...args: string[]): { code: number; out: string; err: string } {
  const r = spawnSync(process.execPath, [BIN, ...args], { cwd: dir, encoding: 'utf8', env: { ...process.env, NO_COLOR: '1' } });
  return { code: r.status ?? -1, out: r.stdout, err: r.stderr };
}

/** The <desc> text of an SVG file, read by minidom (which fails on malformed XML). */
function desc(file: string): string {
  const script = 'import sys, xml.dom.minidom as m\nd = m.parse(sys.argv[1])\nassert d.documentElement.tagName == "svg"\nprint(d.getElementsByTagName("desc")[0].firstChild.data)';
  const py = spawnSync('python3', ['-c', script, join(dir, file)], { encoding: 'utf8' });
  expect(py.status, py.stderr).toBe(0);
  return py.stdout.trim();
}

function maxDiff(text: string): number {
  const m = /max \|f - g\| = (\S+) over (\d+) points/.exec(text);
  expect(m, text).not.toBeNull();
  return Number(m![1]);
}

const CLAIMS = 'claim "E4 squared"\n  E(4, tau)^2 = E(8, tau)\n';
const NO_TRACE = /at .*\.js:\d+/;

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'modvet-plot-'));
  writeFileSync(join(dir, 'claims.vet'), CLAIMS);
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

// each test spawns the CLI several times: allow for a loaded machine beyond vitest's 5 s default
describe('modvet plot', { timeout: 60_000 }, () => {
  it('plots E_4^2 against E_8 with differences at 10^-20 or below at 20 digits', () => {
    // E_4^2 = E_8 (Serre, A Course in Arithmetic, ch. VII; both with constant term 1)
    const r = modvet('plot', 'E(4, tau)^2', 'E(8, tau)', '--path', 'x=0.1, y=0.5..3', '--out', 'e8.svg');
    expect(r.code, r.err).toBe(0);
    expect(r.out).toContain('wrote e8.svg');
    const d = desc('e8.svg');
    expect(d).toContain('120 points at 20 digits');
    expect(maxDiff(d)).toBeLessThanOrEqual(1e-19);
    expect(d).toContain('0 points above the bound');
    expect(d).toContain('f: 0 gaps, g: 0 gaps');
    const svg = readFileSync(join(dir, 'e8.svg'), 'utf8');
    expect(svg).toContain('log10 |f - g|');
    expect(svg).not.toMatch(/<script|href=/);
  });
  it('writes byte-identical files for the same inputs', () => {
    const args = ['plot', 'E(4, tau)^2', 'E(8, tau)', '--path', 'y=1.2, x=-0.5..0.5', '--points', '30'];
    expect(modvet(...args, '--out', 'a.svg').code).toBe(0);
    expect(modvet(...args, '--out', 'b.svg').code).toBe(0);
    expect(readFileSync(join(dir, 'a.svg'), 'utf8')).toBe(readFileSync(join(dir, 'b.svg'), 'utf8'));
  });
  it('shows a lost factor 2: E_4^2 - 2 E_8 = -E_8, far above the error bound', () => {
    const r = modvet('plot', 'E(4, tau)^2', '2*E(8, tau)', '--path', 'x=0.1, y=1..3', '--points', '21', '--out', 'f2.svg');
    expect(r.code, r.err).toBe(0);
    const d = desc('f2.svg');
    expect(d).toContain('21 points above the bound');
    // |E_8| decreases from y = 1 to 3 here (q = e^{2 pi i tau} shrinks), so its maximum is at tau = 0.1 + i
    const e = modvet('eval', 'abs(E(8, tau))', '--at', 'tau=0.1+1i', '--digits', '10', '--json');
    const e8 = Number((JSON.parse(e.out.trim()) as { re: string }).re);
    expect(Math.abs(maxDiff(d) / e8 - 1)).toBeLessThan(0.05);
  });
  it('plots one expression, with parameters from --at, and no difference panel', () => {
    const r = modvet('plot', 'E(k, tau)', '--at', 'k=6', '--path', 'x=0, y=0.8..2', '--points', '11', '--out', 'one.svg');
    expect(r.code, r.err).toBe(0);
    const d = desc('one.svg');
    expect(d).toContain('k = 6');
    expect(d).not.toContain('|f - g|');
  });
  it('leaves gaps where an evaluation fails and says how many and why', () => {
    // Gamma has poles at 0, -1, -2 (DLMF 5.2(i))
    const r = modvet('plot', 'Gamma(x)', '--path', 'y=1, x=-2..2', '--points', '9', '--out', 'gaps.svg');
    expect(r.code, r.err).toBe(0);
    const d = desc('gaps.svg');
    expect(d).toContain('3 of 9 points not drawn (3 at a pole)');
    // y = 0.01 is below the default y_min 0.02
    const y = modvet('plot', 'E(4, tau)', 'E(4, tau)', '--path', 'x=0, y=0.01..0.05', '--points', '5', '--out', 'ymin.svg');
    expect(y.code, y.err).toBe(0);
    const dy = desc('ymin.svg');
    expect(dy).toMatch(/f: 1 of 5 points not drawn \(1 with Im tau below y_min\)/);
    // identical sides: every difference is an exact 0, drawn at the floor
    expect(dy).toContain('4 exactly 0');
    expect(readFileSync(join(dir, 'ymin.svg'), 'utf8')).toContain('exact 0 (at the floor)');
  });
  it('refuses a missing --out, a .vet file, and a bad --path, with exit code 2 and no stack trace', () => {
    const noOut = modvet('plot', 'E(4, tau)', '--path', 'x=0.1, y=1..2');
    expect(noOut.code).toBe(2);
    expect(noOut.err).toContain('--out');
    const vet = modvet('plot', 'E(4, tau)', '--path', 'x=0.1, y=1..2', '--out', 'claims.vet');
    expect(vet.code).toBe(2);
    expect(vet.err).toContain('claim file');
    expect(readFileSync(join(dir, 'claims.vet'), 'utf8')).toBe(CLAIMS);
    for (const path of ['x=0.1', 'x=0.1, y=1', 'x=0.1, x=1..2', 'x=0.1, y=-1..2', 'z=1, y=1..2', 'x=0.1, y=2..2']) {
      const r = modvet('plot', 'E(4, tau)', '--path', path, '--out', 'p.svg');
      expect(r.code, path).toBe(2);
      expect(r.err, path).toContain('expected "x=X0, y=Y0..Y1"');
      expect(r.err).not.toMatch(NO_TRACE);
    }
    expect(existsSync(join(dir, 'p.svg'))).toBe(false);
  });
  it('reports an unwritable --out plainly, with exit code 2', () => {
    const r = modvet('plot', 'E(4, tau)', '--path', 'x=0.1, y=1..2', '--out', join('no', 'such', 'folder', 'p.svg'));
    expect(r.code).toBe(2);
    expect(r.err).toContain('cannot write the plot');
    expect(r.err).not.toMatch(NO_TRACE);
    const folder = modvet('plot', 'E(4, tau)', '--path', 'x=0.1, y=1..2', '--out', '.', '--points', '3');
    expect(folder.code).toBe(2);
    expect(folder.err).toContain('cannot write the plot');
    // a write that fails after the checks (Linux: writes to /dev/full fail with ENOSPC)
    if (existsSync('/dev/full')) {
      const full = modvet('plot', 'E(4, tau)', '--path', 'x=0.1, y=1..2', '--out', '/dev/full', '--points', '3');
      expect(full.code).toBe(2);
      expect(full.err).toContain('cannot write the plot /dev/full');
      expect(full.err).not.toMatch(NO_TRACE);
    }
  });
  it('refuses an unknown name (with a caret), tau in --at, and three expressions', () => {
    const typo = modvet('plot', 'E(4, tau)', 'Delat(tau)', '--path', 'x=0.1, y=1..2', '--out', 't.svg');
    expect(typo.code).toBe(2);
    expect(typo.err).toContain('<g>:1:1:');
    expect(typo.err).toContain("'Delta'");
    const tau = modvet('plot', 'E(4, tau)', '--at', 'tau=i', '--path', 'x=0.1, y=1..2', '--out', 't.svg');
    expect(tau.code).toBe(2);
    expect(tau.err).toContain('--at tau=i');
    expect(modvet('plot', 'x', 'y', 'tau', '--path', 'x=0.1, y=1..2', '--out', 't.svg').code).toBe(2);
    const none = modvet('plot', 'E(4, tau)', '--path', 'x=0.1, y=0.001..0.01', '--out', 't.svg', '--points', '3');
    expect(none.code).toBe(2);
    expect(none.err).toContain('y_min');
    expect(existsSync(join(dir, 't.svg'))).toBe(false);
  });
});
