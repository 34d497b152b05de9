// `modvet tex` (src/cli/tex.ts) through the CLI function: the claims are checked with the
// settings of `check`, those that hold are written, the others listed on stderr; --out
// (never over a .vet file; an unwritable path is exit 2), --standalone, exit codes.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { run } from '../../src/cli/program.js';

let dir = '';

const GOOD = `use samples 2
let Z(s, tau) = 2*zeta(2*s)*Ens(s, tau)

claim "E4 squared is E8"
  source "Serre, A Course in Arithmetic, ch. VII & 3.2 (100%)"
  E(4, tau)^2 = E(8, tau)

claim "the lattice sum at tau = i"
  for s in [1.5, 3]
  Z(s, i) = 4*zeta(s)*beta(s)

claim "a lost factor 2"
  expect refuted
  E(4, tau)^2 = 2*E(8, tau)
`;
const WRONG = `claim "wrong but expected to hold"
  samples 2
  E(4, tau)^2 = 2*E(8, tau)

claim "eta under T"
  samples 2
  eta(tau + 1) = exp(pi*i/12)*eta(tau)
`;
const LATTICE = `claim "G_4 as a lattice sum"
  samples 2
  region y >= 0.5
  sum((m, n) != (0, 0), (m*tau + n)^(-4)) = 2*zeta(4)*E(4, tau)
`;

async function modvet(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const code = await run(argv, { out: (s) => (out += s), err: (s) => (err += s), cwd: dir });
  return { code, out, err };
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'modvet-tex-'));
  writeFileSync(join(dir, 'good.vet'), GOOD);
  writeFileSync(join(dir, 'wrong.vet'), WRONG);
  writeFileSync(join(dir, 'lattice.vet'), LATTICE);
  writeFileSync(join(dir, 'bad.vet'), 'claim "a typo"\n  Delat(tau) = eta(tau)^24\n');
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

// each test runs real checks: allow for a loaded machine
describe('modvet tex', { timeout: 120000 }, () => {
  it('writes the claims that hold to stdout and lists the others on stderr', async () => {
    const r = await modvet('tex', 'good.vet', '--digits', '12', '--seed', '7');
    expect(r.code).toBe(0);
    expect(r.out).toContain('E_4(\\tau)^{2} = E_8(\\tau)');
    expect(r.out).toContain('Z(s, i) = 4 \\zeta(s) \\beta(s)');
    expect(r.out).toContain('where \\(Z(s, \\tau) = 2 \\zeta(2 s) E(s, \\tau)\\).');
    expect(r.out).not.toContain('2 E_8(\\tau)');
    expect(r.out).not.toContain('\\documentclass');
    // the check as run: the file's `use samples 2`, the command line's digits and seed
    expect(r.out).toContain('% checked by modvet 0.1.0: holds at 2 points, agreeing to 12 digits (requested 12), seed 7');
    expect(r.out).toContain('evidence, not proof');
    expect(r.out).toContain('% source: Serre, A Course in Arithmetic, ch. VII & 3.2 (100%)');
    expect(r.err).toMatch(/skipped "a lost factor 2" \(good\.vet:\d+\): refuted/);
    expect(r.err).toContain('2 of 3 claims hold');
  });

  it('exit 1 when a claim does not get its expected verdict (as check); --only selects claims', async () => {
    const r = await modvet('tex', 'wrong.vet', '--digits', '12');
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/skipped "wrong but expected to hold" \(wrong\.vet:1\): refuted .*expected holds/);
    expect(r.out).toContain('\\eta(\\tau + 1)');
    const only = await modvet('tex', 'wrong.vet', '--digits', '12', '--only', 'eta*');
    expect(only.code).toBe(0);
    expect(only.err).not.toContain('skipped "');
  });

  it('says when a lattice sum limited the digits', async () => {
    const r = await modvet('tex', 'lattice.vet', '--digits', '30');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/agreeing to [\d.]+ digits, limited by a lattice sum \(requested 30\)/);
  });

  it('--out writes the file, --standalone a whole document', async () => {
    const r = await modvet('tex', 'good.vet', '--digits', '12', '--out', 'claims.tex', '--standalone');
    expect(r.code).toBe(0);
    expect(r.out).toContain('2 of 3 claims hold and were written to claims.tex');
    const t = readFileSync(join(dir, 'claims.tex'), 'utf8');
    expect(t).toContain('\\documentclass{article}');
    expect(t).toContain('\\usepackage{amsmath}');
    expect(t).toContain('\\end{document}');
    expect(t).toContain('\\paragraph{E4 squared is E8}');
    expect(t).toContain('Source: Serre, A Course in Arithmetic, ch. VII \\& 3.2 (100\\%).');
  });

  it('never writes over a .vet file; an unwritable path is a message and exit 2', async () => {
    const before = readFileSync(join(dir, 'good.vet'), 'utf8');
    const r = await modvet('tex', 'good.vet', '--out', 'wrong.vet');
    expect(r.code).toBe(2);
    expect(r.err).toContain('refusing to write LaTeX over a claim file');
    expect(readFileSync(join(dir, 'good.vet'), 'utf8')).toBe(before);
    const u = await modvet('tex', 'good.vet', '--digits', '8', '--out', join(dir, 'no', 'such', 'dir', 'x.tex'));
    expect(u.code).toBe(2);
    expect(u.err).toMatch(/cannot write the LaTeX file .*x\.tex: ENOENT/);
    expect(u.err).not.toMatch(/\n\s+at /);
    expect(existsSync(join(dir, 'no'))).toBe(false);
  });

  it('bad options and unparsable files are exit 2', async () => {
    expect((await modvet('tex', 'good.vet', '--digits', 'many')).code).toBe(2);
    const r = await modvet('tex', 'bad.vet');
    expect(r.code).toBe(2);
    expect(r.err).toContain('Delat');
    expect((await modvet('tex', 'missing.vet')).code).toBe(2);
  });

  const hasPdflatex = spawnSync('pdflatex', ['--version']).status === 0;
  it.skipIf(!hasPdflatex)('the --standalone output compiles with pdflatex (when installed; test/report/latex.test.ts requires it in CI)', async () => {
    const r = await modvet('tex', 'good.vet', 'lattice.vet', '--digits', '12', '--standalone', '--out', 'compile.tex');
    expect(r.code).toBe(0);
    const c = spawnSync('pdflatex', ['-interaction=nonstopmode', '-halt-on-error', 'compile.tex'], { cwd: dir, encoding: 'utf8', timeout: 60000 });
    expect(c.status, c.stdout.slice(-2000)).toBe(0);
    expect(readFileSync(join(dir, 'compile.log'), 'utf8')).not.toMatch(/Undefined control sequence|^! /m);
  });
});
