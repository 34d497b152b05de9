// LaTeX export (src/report/latex.ts): the LaTeX of single expressions (names, precedence,
// fractions, sums, operators), of claims (quantifiers, parameters, regions, let
// definitions, long equations), escaping, and a real compile: every claim of
// identities/*.vet, plus a fixture of awkward names and sources, as a --standalone
// document through pdflatex (Debian's texlive-latex-base; .ci/run installs it).
//
// The compile test is skipped, with a message, only when pdflatex is absent and
// MODVET_REQUIRE_PDFLATEX is unset; with it set, a missing pdflatex fails the test.
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseSource } from '../../src/lang/parser.js';
import type { FileAst } from '../../src/lang/ast.js';
import { claimLatex, commentLine, escapeText, exprLatex, identLatex, labelOf, latexDocument, TexEntry } from '../../src/report/latex.js';
import { eq, expr, parse } from '../lang/util.js';

const IDENTITIES = fileURLToPath(new URL('../../identities/', import.meta.url));

const tex = (e: string, clauses: string[] = []): string => exprLatex(expr(e, clauses));

/** A check record as `modvet tex` builds it from a ClaimResult. */
function record(file: string, line: number, limitedBy?: string) {
  return { file, line, points: 16, digits: 30, requested: 30, seed: 1, yMin: 0.02, version: '0.1.0', ...(limitedBy !== undefined ? { limitedBy } : {}) };
}

function entries(ast: FileAst): TexEntry[] {
  return ast.claims.map((claim) => ({ claim, lets: ast.lets, check: record(ast.file, claim.span.line) }));
}

/** The equation lines of a claim's LaTeX (comments and environment lines dropped). */
function body(src: string): string {
  const { ast, diagnostics } = parse(src);
  expect(diagnostics).toEqual([]);
  return claimLatex(entries(ast)[0]!).text
    .split('\n')
    .filter((l) => !l.startsWith('%') && !l.startsWith('\\begin') && !l.startsWith('\\end') && !l.includes('\\label'))
    .map((l) => l.trim())
    .join('\n');
}

describe('exprLatex: names', () => {
  const cases: [string, string, string[]?][] = [
    ['E(4, tau)', 'E_4(\\tau)'],
    ['E(10, tau)', 'E_{10}(\\tau)'],
    ['G(k, tau)', 'G_k(\\tau)', ['for k in {4, 6}']],
    ['E2star(tau)', 'E_2^*(\\tau)'],
    ['eta(tau)', '\\eta(\\tau)'],
    ['Delta(tau)', '\\Delta(\\tau)'],
    ['j(tau)', 'j(\\tau)'],
    ['theta2(tau) + theta3(tau) + theta4(tau)', '\\theta_2(\\tau) + \\theta_3(\\tau) + \\theta_4(\\tau)'],
    ['Ens(s, tau)', 'E(s, \\tau)', ['for s in [1, 2]']],
    ['EnsSplit(s, tau)', 'E(s, \\tau)', ['for s in [1, 2]']],
    ['Estar(s, tau)', 'E^*(s, \\tau)', ['for s in [1, 2]']],
    ['EstarSplit(s, tau)', 'E^*(s, \\tau)', ['for s in [1, 2]']],
    ['sigma(3, 5)', '\\sigma_3(5)'],
    ['sigma(1 - 2*s, 5)', '\\sigma_{1 - 2 s}(5)', ['for s in [1, 2]']],
    ['bernoulli(12)', 'B_{12}'],
    ['zeta(s) + xi(s) + beta(s)', '\\zeta(s) + \\xi(s) + \\beta(s)', ['for s in [2, 3]']],
    ['Gamma(s) + Gamma(s, 2)', '\\Gamma(s) + \\Gamma(s, 2)', ['for s in [2, 3]']],
    ['K(s - 1/2, 2*pi*y)', 'K_{s - 1/2}(2 \\pi y)', ['for s in [1, 2]']],
    ['sqrt(y)', '\\sqrt{y}'],
    ['abs(tau)', '\\left|\\tau\\right|'],
    ['conj(tau) + taubar', '\\overline{\\tau} + \\overline{\\tau}'],
    ['re(tau) + im(tau)', '\\operatorname{Re}(\\tau) + \\operatorname{Im}(\\tau)'],
    ['exp(x) + log(y) + cos(x) + sin(x)', '\\exp(x) + \\log(y) + \\cos(x) + \\sin(x)'],
    ['euler + rho + pi + i', '\\gamma_{\\mathrm{E}} + \\rho + \\pi + i'],
    ['q + x + y', 'q + x + y'],
    ['E(4, g(tau))', 'E_4(\\gamma\\tau)', ['for g in SL2Z']],
    ['c*tau + d', 'c \\tau + d', ['for g in Gamma0(4)']],
    ['nu + nu2 + k2', '\\nu + \\nu_{2} + k_{2}', ['for nu in [1, 2]', 'for nu2 in [1, 2]', 'for k2 in [1, 2]']],
  ];
  for (const [src, want, clauses] of cases) {
    it(`${src} -> ${want}`, () => expect(tex(src, clauses ?? [])).toBe(want));
  }
  it('multi-letter names in roman, underscores escaped', () => {
    expect(identLatex('Zlat')).toBe('\\mathrm{Zlat}');
    expect(identLatex('my_fn')).toBe('\\mathrm{my\\_fn}');
    expect(identLatex('x_1')).toBe('x_{1}');
  });
});

describe('exprLatex: precedence and fractions', () => {
  const cases: [string, string, string[]?][] = [
    ['a/b', '\\frac{a}{b}', ['for a in [1, 2]', 'for b in [1, 2]']],
    ['6*c*(c*tau + d)/(pi*i)', '\\frac{6 c \\left(c \\tau + d\\right)}{\\pi i}', ['for g in SL2Z']],
    ['-E(6, tau)/3', '-\\frac{E_6(\\tau)}{3}'],
    ['(E(2, tau)^2 - E(4, tau))/12', '\\frac{E_2(\\tau)^{2} - E_4(\\tau)}{12}'],
    // powers: braces, a closed base in parentheses, the exponent in script style
    ['(2*pi)^6', '\\left(2 \\pi\\right)^{6}'],
    ['pi^(3/4)', '\\pi^{3/4}'],
    ['y^(1 - s)', 'y^{1 - s}', ['for s in [1, 2]']],
    ['n^(s - 1/2)', 'n^{s - 1/2}', ['for s in [1, 2]', 'for n in {1, 2}']],
    ['(1/2)^2', '\\left(\\frac{1}{2}\\right)^{2}'],
    ['sqrt(y)^2', '\\left(\\sqrt{y}\\right)^{2}'],
    ['(y^2)^3', '\\left(y^{2}\\right)^{3}'],
    ['y^2^3', 'y^{2^{3}}'],
    ['y^(-2)', 'y^{-2}'],
    ['(y/(x*y))^2', '\\left(\\frac{y}{x y}\\right)^{2}'],
    ['y^(x/(x*y))', 'y^{x/\\left(x y\\right)}'],
    // unary minus binds looser than ^: -2^2 = -(2^2)
    ['-2^2', '-2^{2}'],
    ['(-2)^2', '\\left(-2\\right)^{2}'],
    ['x - (-y)', 'x - \\left(-y\\right)'],
    ['x*(-y)', 'x \\left(-y\\right)'],
    ['-(x + y)', '-\\left(x + y\\right)'],
    ['x - (y - 1)', 'x - \\left(y - 1\\right)'],
    ['x - y*2', 'x - y \\cdot 2'],
    ['(x + y)*(x - y)', '\\left(x + y\\right) \\left(x - y\\right)'],
    // juxtaposition, \cdot before a digit or a fraction after a number
    ['2*pi*i', '2 \\pi i'],
    ['2*3', '2 \\cdot 3'],
    ['2*(1/3)', '2 \\cdot \\frac{1}{3}'],
    ['pi^4/45*E(4, tau)', '\\frac{\\pi^{4}}{45} E_4(\\tau)'],
    // numbers
    ['1e-3 + 2.5e10 + 0.25 + 4i', '10^{-3} + 2.5 \\cdot 10^{10} + 0.25 + 4i'],
    // fractions inside calls get \left( \right)
    ['eta(-1/tau)', '\\eta\\left(-\\frac{1}{\\tau}\\right)'],
    ['Gamma(1/4)^8', '\\Gamma\\left(\\frac{1}{4}\\right)^{8}'],
    ['exp(pi*i/12)', '\\exp\\left(\\frac{\\pi i}{12}\\right)'],
  ];
  for (const [src, want, clauses] of cases) {
    it(`${src} -> ${want}`, () => expect(tex(src, clauses ?? [])).toBe(want));
  }
});

describe('exprLatex: sums, products, limits, operators', () => {
  const cases: [string, string, string[]?][] = [
    ['sum(n = 1..inf, sigma(3, n)*q^n)', '\\sum_{n \\ge 1} \\sigma_3(n) q^{n}'],
    ['sum(n = 1..10, n^2)', '\\sum_{n = 1}^{10} n^{2}'],
    ['sum(n = 1..inf, sum(d | n, d^3)*q^n)', '\\sum_{n \\ge 1} \\left(\\sum_{d \\mid n} d^{3}\\right) q^{n}'],
    ['prod(n = 1..inf, (1 - q^n)^24)', '\\prod_{n \\ge 1} \\left(1 - q^{n}\\right)^{24}'],
    ['sum(n = 1..inf, q^n + q^(2*n))', '\\sum_{n \\ge 1} \\left(q^{n} + q^{2 n}\\right)'],
    // a sum followed by a factor is parenthesised; one preceded by a factor is not
    ['sum(n = 1..5, n)*y', '\\left(\\sum_{n = 1}^{5} n\\right) y'],
    ['y*sum(n = 1..5, n)', 'y \\sum_{n = 1}^{5} n'],
    ['sum((m, n) != (0, 0), (m*tau + n)^(-4))', '\\sum_{(m, n) \\ne (0, 0)} \\left(m \\tau + n\\right)^{-4}'],
    ['sum(gcd(c, d) = 1, y^s/abs(c*tau + d)^(2*s))/2', '\\frac{1}{2} \\sum_{\\gcd(c, d) = 1} \\frac{y^{s}}{\\left|c \\tau + d\\right|^{2 s}}', ['for s in [2, 3]']],
    ['limit(s -> 1, zeta(s) - 1/(s - 1))', '\\lim_{s \\to 1} \\left(\\zeta(s) - \\frac{1}{s - 1}\\right)'],
    ['lap(Ens(s, tau))', '\\Delta_{\\mathrm{hyp}} E(s, \\tau)', ['for s in [2, 3]']],
    ['lap(y^s)', '\\Delta_{\\mathrm{hyp}} y^{s}', ['for s in [2, 3]']],
    ['dtau(E(4, tau)) + dtaubar(y)', '\\frac{\\partial}{\\partial\\tau} E_4(\\tau) + \\frac{\\partial}{\\partial\\overline{\\tau}} y'],
    ['qd(E(2, tau))', 'q\\frac{d}{dq} E_2(\\tau)'],
    ['lower(raise(0, Ens(s, tau)))', 'L \\, R_0 \\, E(s, \\tau)', ['for s in [2, 3]']],
    ['serre(4, E(4, tau))', '\\vartheta_4 \\, E_4(\\tau)'],
    ['dtau(x*y)', '\\frac{\\partial}{\\partial\\tau} \\left(x y\\right)'],
    ['lap(y)^2', '\\left(\\Delta_{\\mathrm{hyp}} y\\right)^{2}'],
  ];
  for (const [src, want, clauses] of cases) {
    it(`${src} -> ${want}`, () => expect(tex(src, clauses ?? [])).toBe(want));
  }
});

describe('claimLatex: quantifiers, conditions, lets', () => {
  it('a group clause: for all gamma = (a b; c d) in the group, with gamma tau', () => {
    const b = body('claim "t"\n  for g in SL2Z\n  Delta(g(tau)) = (c*tau + d)^12*Delta(tau)\n');
    expect(b).toContain('\\Delta(\\gamma\\tau) = \\left(c \\tau + d\\right)^{12} \\Delta(\\tau)');
    expect(b).toContain('\\text{for all } \\gamma = \\left(\\begin{smallmatrix} a & b \\\\ c & d \\end{smallmatrix}\\right) \\in \\mathrm{SL}_2(\\mathbb{Z})');
    expect(body('claim "t"\n  for g in Gamma0(11)\n  j(g(tau)) = j(g(tau))\n')).toContain('\\in \\Gamma_0(11)');
    expect(body('claim "t"\n  for g in Gamma1(4)\n  j(g(tau)) = j(g(tau))\n')).toContain('\\in \\Gamma_1(4)');
    expect(body('claim "t"\n  for g in Gamma(2)\n  j(g(tau)) = j(g(tau))\n')).toContain('\\in \\Gamma(2)');
  });
  it('parameters: an interval, a list, an integer range, a box', () => {
    expect(body('claim "t"\n  for s in [1.2, 3]\n  s = s\n')).toContain('\\text{for all } s \\in [1.2, 3]');
    expect(body('claim "t"\n  for k in {4, 6}\n  k = k\n')).toContain('k \\in \\{4, 6\\}');
    expect(body('claim "t"\n  for n in 1..20\n  n = n\n')).toContain('n \\in \\{1, \\dots, 20\\}');
    // corners in either order: the sides are sorted
    expect(body('claim "t"\n  for s in box(4 + 5i, 1.2 - 5i)\n  s = s\n')).toContain('\\operatorname{Re} s \\in [1.2, 4],\\ \\operatorname{Im} s \\in [-5, 5]');
  });
  it('fixed points and regions are conditions', () => {
    expect(body('claim "t"\n  at tau in {i}\n  j(tau) = 1728\n')).toContain('j(\\tau) = 1728, \\qquad \\text{at } \\tau = i');
    expect(body('claim "t"\n  at tau in {i, rho}\n  j(tau) = j(tau)\n')).toContain('\\text{at } \\tau \\in \\{i, \\rho\\}');
    expect(body('claim "t"\n  region y >= 0.5\n  j(tau) = j(tau)\n')).toContain('\\operatorname{Im}\\tau \\ge 0.5');
    expect(body('claim "t"\n  region abs(x) <= 1/2\n  j(tau) = j(tau)\n')).toContain('\\left|\\operatorname{Re}\\tau\\right| \\le \\frac{1}{2}');
  });
  it('a let call prints as the name; its definition once, in a where line', () => {
    const src = [
      'let Z(s, tau) = 2*zeta(2*s)*Ens(s, tau)',
      'let W(tau) = y*Z(2, tau)',
      'let F(tau, w) = dtau(w*tau)',
      'claim "one"',
      '  for s in [1.5, 2]',
      '  Z(s, i) = 4*zeta(s)*beta(s)',
      'claim "two"',
      '  for s in [1.5, 2]',
      '  Z(s, tau) + W(tau) = Z(s, tau) + W(tau)',
      'claim "three"',
      '  F(tau, y) = y',
    ].join('\n');
    const { ast, diagnostics } = parse(src + '\n');
    expect(diagnostics).toEqual([]);
    const doc = latexDocument(entries(ast), { standalone: false, version: '0.1.0' });
    expect(doc).toContain('Z(s, i) = 4 \\zeta(s) \\beta(s)');
    expect(doc).toContain('where \\(Z(s, \\tau) = 2 \\zeta(2 s) E(s, \\tau)\\).');
    // W is defined in claim two; Z, already defined in claim one, is not repeated
    expect(doc).toContain('where \\(W(\\tau) = y Z(2, \\tau)\\).');
    expect(doc.match(/Z\(s, \\tau\) = /g)).toHaveLength(1);
    // an operator inside a let: its operand's tau is the let's tau
    expect(doc).toContain('F(\\tau, y) = y');
    expect(doc).toContain('where \\(F(\\tau, w) = \\frac{\\partial}{\\partial\\tau} \\left(w \\tau\\right)\\).');
  });
  it('a long equation becomes align, broken at top-level + and -', () => {
    const b = claimLatex(
      entries(
        parse(
          'claim "long"\n  for s in [0.6, 2.5]\n  region y >= 0.5\n  xi(2*s)*y^s + xi(2*s - 1)*y^(1 - s) + 4*sqrt(y)*sum(n = 1..inf, n^(s - 1/2)*sigma(1 - 2*s, n)*K(s - 1/2, 2*pi*n*y)*cos(2*pi*n*x)) = EstarSplit(s, tau)\n',
        ).ast,
      )[0]!,
    ).text;
    expect(b).toContain('\\begin{align}');
    expect(b).toContain('&\\quad + 4 \\sqrt{y} \\sum_{n \\ge 1}');
    expect(b).toContain('&= E^*(s, \\tau)');
    // one number for the whole display: every line but the last is \nonumber
    const lines = b.slice(b.indexOf('\\begin{align}'), b.indexOf('\\end{align}')).split('\n').slice(1, -1);
    expect(lines.slice(0, -1).every((l) => l.endsWith('\\nonumber \\\\'))).toBe(true);
    expect(lines[lines.length - 1]).toContain('\\label{modvet:long}');
  });
  it('the check is recorded in comments: points, digits, seed, version, evidence not proof', () => {
    const c = eq('lap(y^s) = s*(s - 1)*y^s', ['for s in [1, 2]']);
    const t = claimLatex({ claim: c, lets: [], check: record('t.vet', 1, 'a lattice sum') }).text;
    expect(t).toContain('% checked by modvet 0.1.0: holds at 16 points, agreeing to 30 digits, limited by a lattice sum (requested 30), seed 1');
    expect(t).toContain('% numerical agreement at the sampled points is evidence, not proof');
    expect(t).toContain('% notation: sign convention: \\Delta_{\\mathrm{hyp}} = y^2(\\partial_x^2 + \\partial_y^2)');
    expect(t).toContain('\\label{modvet:t}');
  });
  it('labels are unique in a document', () => {
    const a = parse('claim "E4 at i!"\n  j(tau) = j(tau)\nclaim "E4 at i?"\n  j(tau) = j(tau)\n').ast;
    const doc = latexDocument(entries(a), { standalone: false, version: '0.1.0' });
    expect(doc).toContain('\\label{modvet:e4-at-i}');
    expect(doc).toContain('\\label{modvet:e4-at-i-2}');
  });
});

describe('escaping', () => {
  it('text: the ten special characters, Latin-1 letters kept, others as ?', () => {
    expect(escapeText('a_b & 50% #1 {x} $y ^ ~ \\ <|>')).toBe('a\\_b \\& 50\\% \\#1 \\{x\\} $\\$$y \\^{} \\~{} \\textbackslash{} $<$$|$$>$');
    expect(escapeText('Zagier é ß → ∑')).toBe('Zagier é ß ? ?');
  });
  it('comments: a line break would end the comment', () => {
    expect(commentLine('a\nb\r\nc % d')).toBe('% a b c % d');
  });
  it('labels: lower case letters, digits and -', () => {
    expect(labelOf('E(s, tau) as a sum over Gamma_inf \\ SL(2, Z)')).toBe('modvet:e-s-tau-as-a-sum-over-gamma-inf-sl-2-z');
    expect(labelOf('%%%')).toBe('modvet:claim');
  });
});

// ---------------------------------------------------------------------------
// A real compile

function hasPdflatex(): boolean {
  return spawnSync('pdflatex', ['--version'], { encoding: 'utf8' }).status === 0;
}
const PDFLATEX = hasPdflatex();
const REQUIRED = process.env.MODVET_REQUIRE_PDFLATEX !== undefined && process.env.MODVET_REQUIRE_PDFLATEX !== '';
if (!PDFLATEX && !REQUIRED) {
  console.warn(
    'test/report/latex.test.ts: pdflatex not found, the compile test is skipped ' +
      '(apt-get install --no-install-recommends texlive-latex-base; set MODVET_REQUIRE_PDFLATEX=1 to make this an error)',
  );
}

/** Claims whose names, sources and notation exercise the escaping and the rarer forms. */
const AWKWARD = `let Zlat(s, tau) = 2*zeta(2*s)*Ens(s, tau)
let F(tau, w) = dtau(w*tau)
claim "odd name: 100% of $x_1 & #2 {brace} ^ ~ \\\\ <|> é"
  source "Someone & Other, \\"Title\\", p. 5_6; ~ é ∑"
  for nu in box(1 + i, 2 - i)
  for k2 in 1..3
  region 0.5 <= y <= 2
  Zlat(nu, tau)/sum(n = 1..k2, n) + F(tau, y) + lap(y^nu) - re(conj(tau))*1e-3 = limit(s -> 1, (s - 1)*zeta(s))*G(4, tau)/G(4, tau)*Zlat(nu, tau)/sum(n = 1..k2, n) + y + nu*(nu - 1)*y^nu - x*1e-3 + 0*(bernoulli(2) + K(1/2, 2) + Gamma(2, 1) + sinh(x) + cosh(x) + arg(i) + sqrt(2)^3 + theta2(tau))
claim "qd, serre, lower, raise, coprime sums"
  for g in Gamma1(3)
  serre(4, E(4, g(tau))) + qd(j(tau)) + lower(raise(2, y)) = sum(gcd(m, n) = 1, 1/abs(m*tau + n)^4)*0 + serre(4, E(4, g(tau))) + qd(j(tau)) + lower(raise(2, y))
`;

describe.skipIf(!PDFLATEX && !REQUIRED)('the --standalone document compiles with pdflatex', () => {
  it('every claim of identities/ and the awkward fixture', () => {
    expect(PDFLATEX, 'MODVET_REQUIRE_PDFLATEX is set but pdflatex is not on PATH').toBe(true);
    const all: TexEntry[] = [];
    const files = readdirSync(IDENTITIES).filter((f) => f.endsWith('.vet')).sort();
    expect(files.length).toBeGreaterThan(0);
    for (const f of files) {
      const { ast, diagnostics } = parseSource(readFileSync(join(IDENTITIES, f), 'utf8'), `identities/${f}`);
      expect(diagnostics).toEqual([]);
      all.push(...entries(ast));
    }
    const awkward = parse(AWKWARD);
    expect(awkward.diagnostics).toEqual([]);
    all.push(...entries(awkward.ast));
    const doc = latexDocument(all, { standalone: true, version: '0.1.0', command: 'modvet tex identities --standalone' });
    const dir = mkdtempSync(join(tmpdir(), 'modvet-latex-'));
    try {
      writeFileSync(join(dir, 'claims.tex'), doc);
      const r = spawnSync('pdflatex', ['-interaction=nonstopmode', '-halt-on-error', 'claims.tex'], { cwd: dir, encoding: 'utf8', timeout: 60000 });
      const log = readFileSync(join(dir, 'claims.log'), 'utf8');
      const errors = log.split('\n').filter((l) => l.startsWith('!') || /Undefined control sequence|Missing .* inserted|not set up for use with LaTeX/.test(l));
      expect(errors, log.slice(-3000)).toEqual([]);
      expect(r.status, r.stdout.slice(-3000)).toBe(0);
      // one numbered display per claim
      expect(log).toMatch(/Output written on claims\.pdf/);
      expect((doc.match(/\\label\{/g) ?? []).length).toBe(all.length);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 120000);
});
