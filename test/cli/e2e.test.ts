// End-to-end: the built `modvet` command (dist/, built by `pretest`) on fixture files in a
// temporary folder. Exit codes, the JSON schema, byte-identical JSON for the same seed,
// JUnit XML checked by an outside parser (Python's xml.dom.minidom), parse errors with
// position and caret, and `eval` against a published value.
import { Decimal } from 'decimal.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

const BIN = fileURLToPath(new URL('../../dist/src/cli/main.js', import.meta.url));
let dir = '';

function modvet(...args: string[]): { code: number; out: string; err: string } {
  const r = spawnSync(process.execPath, [BIN, ...args], { cwd: dir, encoding: 'utf8', env: { ...process.env, NO_COLOR: '1' } });
  return { code: r.status ?? -1, out: r.stdout, err: r.stderr };
}

const GOOD = `# fixtures: true and deliberately wrong claims
claim "E4 squared is E8"
  source "Serre, A Course in Arithmetic, ch. VII"
  E(4, tau)^2 = E(8, tau)

claim "eta under T"
  eta(tau + 1) = exp(pi*i/12)*eta(tau)

claim "a lost factor 2"
  expect refuted
  E(4, tau)^2 = 2*E(8, tau)
`;
const WRONG = `claim "wrong but expected to hold"
  E(4, tau)^2 = 2*E(8, tau)
`;
const BAD = `claim "a typo"
  Delat(tau) = eta(tau)^24

claim "still checked"
  Delta(tau) = eta(tau)^24
`;

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'modvet-e2e-'));
  writeFileSync(join(dir, 'good.vet'), GOOD);
  writeFileSync(join(dir, 'wrong.vet'), WRONG);
  writeFileSync(join(dir, 'bad.vet'), BAD);
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('modvet check', () => {
  it('exits 0 when every claim gets its expected verdict, with a summary naming the seed', () => {
    const r = modvet('check', 'good.vet', '--samples', '6');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/3 claims: 2 hold, 1 refuted, 0 undecided, 0 error; all as expected\. Seed 1/);
    expect(r.out).toMatch(/evidence, not proof/);
    // not a terminal and NO_COLOR set: no escape sequences
    expect(r.out).not.toMatch(/\u001b\[/);
  });
  it('exits 1 when a claim does not get its expected verdict', () => {
    expect(modvet('check', 'wrong.vet', '--samples', '4').code).toBe(1);
  });
  it('exits 2 on a parse error, shows file:line:col, the line, a caret and a hint, and checks the rest', () => {
    const r = modvet('check', 'bad.vet', '--samples', '4');
    expect(r.code).toBe(2);
    expect(r.err).toContain('bad.vet:2:3:');
    expect(r.err).toContain('  Delat(tau) = eta(tau)^24');
    expect(r.err).toMatch(/\n\s+\^\^\^\^\^/);
    expect(r.err).toContain("'Delta'");
    expect(r.out).toContain('still checked');
  });
  it('exits 2 for a missing file and for a bad option value', () => {
    expect(modvet('check', 'nowhere.vet').code).toBe(2);
    const r = modvet('check', 'good.vet', '--digits', '3');
    expect(r.code).toBe(2);
    expect(r.err).toContain('--digits');
    expect(r.err).not.toMatch(/at .*\.js:\d+/); // no stack trace
  });
  it('prints the documented JSON schema, byte-identical for the same seed', () => {
    const a = modvet('check', 'good.vet', '--json', '--seed', '7', '--samples', '4');
    const b = modvet('check', 'good.vet', '--json', '--seed', '7', '--samples', '4');
    expect(a.code).toBe(0);
    expect(a.out).toBe(b.out);
    const doc = JSON.parse(a.out) as Record<string, unknown>;
    expect(doc.schema).toBe('modvet-check/1');
    expect(doc.settings).toEqual({ seed: 7, digits: 30, samples: 4, ymin: 0.02 });
    const claims = doc.claims as Record<string, unknown>[];
    expect(claims.map((c) => c.verdict)).toEqual(['holds', 'holds', 'refuted']);
    for (const c of claims) {
      for (const k of ['file', 'line', 'name', 'source', 'equation', 'expected', 'verdict', 'ok', 'digits', 'requested_digits', 'samples', 'reason', 'worst']) {
        expect(c, k).toHaveProperty(k);
      }
    }
    const worst = claims[2]!.worst as Record<string, unknown>;
    for (const k of ['tau', 'group', 'params', 'lhs', 'rhs', 'residual', 'precisions']) expect(worst).toHaveProperty(k);
    expect(doc.summary).toEqual({ claims: 3, holds: 2, refuted: 1, undecided: 0, error: 0, unexpected: 0 });
    const c = modvet('check', 'good.vet', '--json', '--seed', '8', '--samples', '4');
    expect(c.out).not.toBe(a.out);
  });
  it('writes JUnit XML that an XML parser accepts (Python xml.dom.minidom)', () => {
    const r = modvet('check', '.', '--samples', '3', '--junit', 'report.xml');
    expect(r.code).toBe(2); // bad.vet is among the inputs
    const xml = readFileSync(join(dir, 'report.xml'), 'utf8');
    expect(xml).toContain('<testsuites');
    const py = spawnSync('python3', ['-c', 'import sys, xml.dom.minidom as m; d = m.parse(sys.argv[1]); print(len(d.getElementsByTagName("testcase")))', join(dir, 'report.xml')], { encoding: 'utf8' });
    expect(py.status, py.stderr).toBe(0);
    // good.vet 3 claims, wrong.vet 1, bad.vet 1 parsed claim + 1 parse error entry
    expect(Number(py.stdout.trim())).toBe(6);
    expect(xml).toContain('<failure');
  });
  it('refuses to write a JUnit report over a claim file', () => {
    const r = modvet('check', 'good.vet', '--junit', 'good.vet');
    expect(r.code).toBe(2);
    expect(readFileSync(join(dir, 'good.vet'), 'utf8')).toBe(GOOD);
  });
});

describe('modvet eval and list', () => {
  it('prints Gamma(1/2)^2 = pi to 30 digits alone on its last line', () => {
    // pi to 30 significant digits: OEIS A000796
    const r = modvet('eval', 'Gamma(1/2)^2', '--digits', '30');
    expect(r.code).toBe(0);
    const last = r.out.trim().split('\n').pop();
    expect(last).toBe('3.14159265358979323846264338328 + 0 i');
  });
  it('takes tau and parameters with --at and prints JSON with --json', () => {
    // j(i) = 1728 (Serre, A Course in Arithmetic, ch. VII, 3.3)
    const r = modvet('eval', 'j(tau)', '--at', 'tau=i', '--json');
    expect(r.code).toBe(0);
    expect(JSON.parse(r.out.trim())).toEqual({ re: '1728', im: '0' });
  });
  it('prints a lattice sum only to the digits its extrapolation reached, each of them right', () => {
    // sum' (m^2 + n^2)^-2 = 4 zeta(2) beta(2) (Hardy and Wright, ch. XVI; from memory), the
    // reference evaluated by modvet's zeta and beta (tested against mpmath)
    const r = modvet('eval', 'sum((m, n) != (0, 0), abs(m*tau + n)^(-4))', '--at', 'tau=i', '--digits', '30', '--json');
    expect(r.code).toBe(0);
    const m = /printed to (\d+) digits \(30 requested\)/.exec(r.err);
    expect(r.err).toContain('limited by a lattice sum');
    expect(m).not.toBeNull();
    const D = Number(m![1]);
    expect(D).toBeGreaterThanOrEqual(16);
    const ref = modvet('eval', '4*zeta(2)*beta(2)', '--digits', '40', '--json');
    const got = new Decimal((JSON.parse(r.out.trim()) as { re: string }).re);
    const want = new Decimal((JSON.parse(ref.out.trim()) as { re: string }).re);
    expect(got.toString()).toBe(want.toSignificantDigits(D).toString());
  });
  it('shows an unknown name in the expression with a caret', () => {
    const r = modvet('eval', 'E(4, tau) + Delat(tau)', '--at', 'tau=i');
    expect(r.code).toBe(2);
    expect(r.err).toContain('<expression>:1:13:');
  });
  it('lists claims with their clauses', () => {
    const r = modvet('list', 'good.vet');
    expect(r.code).toBe(0);
    expect(r.out).toContain('expect refuted');
    expect(r.out).toContain('3 claims in 1 files');
  });
});
