// Every diagnostic code, asserted by code and position (line:column), never by wording;
// hints where they carry the fix (nearest names, expected counts); recovery (several
// errors at once, a bad claim followed by a good one); the renderer's layout.
import { describe, expect, it } from 'vitest';
import { renderDiagnostic } from '../../src/lang/diagnostics.js';
import { MAX_DEPTH } from '../../src/lang/parser.js';
import { diags, parse } from './util.js';

const claim = (...lines: string[]) => ['claim "t"', ...lines.map((l) => `  ${l}`)].join('\n') + '\n';
const first = (src: string) => parse(src).diagnostics[0]!;

describe('syntax errors', () => {
  it('unbalanced-paren points at the opener', () => {
    expect(diags(claim('E(4, tau = E(8, tau)'))).toEqual(['unbalanced-paren@2:4']);
    expect(diags(claim('((1 + 2) = 3'))).toEqual(['unbalanced-paren@2:3']);
    expect(diags(claim('{1, 2) = 3'))).toEqual(['unbalanced-paren@2:3']);
    // an opener on one line, the rest of the claim below it
    expect(diags(claim('for s in [1, 2', 'E(4, tau) = 1'))).toEqual(['unbalanced-paren@2:12']);
  });
  it('unbalanced-paren at a closer with no opener', () => {
    expect(diags(claim('E(4, tau)) = 1'))).toEqual(['unbalanced-paren@2:12']);
  });
  it('unexpected-token, with a hint for juxtaposition', () => {
    expect(diags(claim('2 x = 1'))).toEqual(['unexpected-token@2:5']);
    expect(first(claim('2 x = 1')).hint).toMatch(/\*/);
    expect(diags(claim('1 + = 2'))).toEqual(['unexpected-token@2:7']);
    expect(diags('claim t\n  1 = 1\n')).toEqual(['unexpected-token@1:7']);
  });
  it('missing-equals, on one line and when the next line starts another expression', () => {
    expect(diags(claim('E(4, tau)^2'))).toEqual(['missing-equals@2:3']);
    expect(diags(claim('E(4, tau)^2', 'E(8, tau)'))).toEqual(['missing-equals@2:3']);
  });
  it('extra-equals and missing-equation', () => {
    expect(diags(claim('1 = 1 = 1'))).toEqual(['extra-equals@2:9']);
    expect(diags(claim('samples 3'))).toEqual(['missing-equation@1:1']);
    expect(diags('claim "t"\n')).toEqual(['missing-equation@1:1']);
  });
  it('bad-top-level: an unknown item, indented text before any item', () => {
    expect(diags('lemma "t"\n  1 = 1\n')).toEqual(['bad-top-level@1:1']);
    expect(diags('  1 = 1\nclaim "t"\n  1 = 1\n')).toEqual(['bad-top-level@1:3']);
  });
  it('bad-clause: malformed clauses and misspelt keywords', () => {
    expect(diags(claim('for s in foo', '1 = 1'))).toEqual(['bad-clause@2:12']);
    expect(diags(claim('for s of [1, 2]', '1 = 1'))).toEqual(['bad-clause@2:9']);
    expect(diags(claim('for g in Gamma0', '1 = 1'))).toEqual(['bad-clause@2:12']);
    expect(diags(claim('at s in {1}', '1 = 1'))).toEqual(['bad-clause@2:6']);
    expect(diags(claim('expect maybe', '1 = 1'))).toEqual(['bad-clause@2:10']);
    expect(diags(claim('source Serre', '1 = 1'))).toEqual(['bad-clause@2:10']);
    expect(diags(claim('sampels 20', '1 = 1'))).toEqual(['bad-clause@2:3']);
    expect(first(claim('sampels 20', '1 = 1')).hint).toMatch(/samples/);
  });
  it('misplaced-clause: a clause after the equation', () => {
    expect(diags(claim('1 = 1', 'digits 40'))).toEqual(['misplaced-clause@3:3']);
  });
  it('duplicate-clause: twice the same clause or setting', () => {
    expect(diags(claim('expect holds', 'expect refuted', '1 = 1'))).toEqual(['duplicate-clause@3:3']);
    expect(diags(claim('for g in SL2Z', 'for h in Gamma0(2)', '1 = 1'))).toEqual(['duplicate-clause@3:3']);
    expect(diags(claim('digits 30, digits 40', '1 = 1'))).toEqual(['duplicate-clause@2:14']);
    expect(diags('use digits 30\nuse digits 40\n')).toEqual(['duplicate-clause@2:5']);
  });
  it('bad-setting: out of range, wrong type, unknown setting', () => {
    expect(diags('use digits 2\n')).toEqual(['bad-setting@1:12']);
    expect(diags('use digits 40.5\n')).toEqual(['bad-setting@1:12']);
    expect(diags('use samples 0\n')).toEqual(['bad-setting@1:13']);
    expect(diags('use precision 40\n')).toEqual(['bad-setting@1:5']);
    expect(diags(claim('digits x', '1 = 1'))).toEqual(['bad-setting@2:10']);
  });
  it('bad-region: no quantity, two quantities, a chain the wrong way, no comparison', () => {
    expect(diags(claim('region 1 < 2', '1 = 1'))).toEqual(['bad-region@2:10']);
    expect(diags(claim('region x < y', '1 = 1'))).toEqual(['bad-region@2:10']);
    expect(diags(claim('region 0 < y > 2', '1 = 1'))).toEqual(['bad-region@2:10']);
    expect(diags(claim('region y', '1 = 1'))).toEqual(['bad-region@2:10']);
  });
  it('bad-range: empty or non-integer ranges, bad levels', () => {
    expect(diags(claim('for n in 5..1', '1 = 1'))).toEqual(['bad-range@2:12']);
    expect(diags(claim('for n in 1..2.5', '1 = 1'))).toEqual(['bad-range@2:15']);
    expect(diags(claim('for g in Gamma0(0)', '1 = 1'))).toEqual(['bad-range@2:19']);
  });
  it('reserved-word: keywords are not names', () => {
    expect(diags(claim('for in in [1, 2]', '1 = 1'))).toEqual(['reserved-word@2:7']);
    expect(diags('let digits = 3\n')).toEqual(['reserved-word@1:5']);
    expect(diags(claim('1 + region = 1'))).toEqual(['reserved-word@2:7']);
  });
});

describe('nesting limits', () => {
  it('too-complex: deep nesting and long chains are diagnosed, not a stack overflow', () => {
    expect(diags(claim('('.repeat(3000) + '1' + ')'.repeat(3000) + ' = 1'))).toEqual([`too-complex@2:${3 + MAX_DEPTH}`]);
    expect(diags(claim('-'.repeat(20000) + '1 = 1'))[0]).toMatch(/^too-complex@2:/);
    expect(diags(claim(Array(20000).fill('1').join(' + ') + ' = 1'))).toEqual(['too-complex@2:3']);
    expect(diags(claim('2^'.repeat(5000) + '2 = 1'))[0]).toMatch(/^too-complex@2:/);
    expect(diags(claim(Array(MAX_DEPTH - 10).fill('1').join(' + ') + ' = 1'))).toEqual([]);
  });
  it('too-complex: lets within lets that expand too deeply, reported at the claim', () => {
    const lets = ['let f0(t) = t'];
    for (let k = 1; k <= 200; k++) lets.push(`let f${k}(t) = ${'-'.repeat(400)}f${k - 1}(t)`);
    const src = lets.join('\n') + '\nclaim "deep"\n  f200(tau) = 0\nclaim "ok"\n  1 = 1\n';
    const { ast, diagnostics } = parse(src);
    expect(diagnostics.map((d) => `${d.code}@${d.span.line}:${d.span.column}`)).toEqual(['too-complex@202:1']);
    expect(ast.claims.map((c) => c.name)).toEqual(['ok']);
  });
});

describe('name errors', () => {
  it('unknown-name with the nearest known names as a hint', () => {
    expect(diags(claim('Delat(tau) = 1'))).toEqual(['unknown-name@2:3']);
    expect(first(claim('Delat(tau) = 1')).hint).toContain("'Delta'");
    expect(first(claim('eta(tua) = 1')).hint).toContain("'tau'");
    expect(first(claim('zeta(2) = PI^2/6')).hint).toContain("'pi'");
    expect(first('let Zed(s) = s\nclaim "t"\n  zed(2) = 1\n').hint).toContain("'Zed'");
  });
  it('several unknown names in one claim are all reported', () => {
    expect(diags(claim('foo(tau) + bar = baz'))).toEqual(['unknown-name@2:3', 'unknown-name@2:14', 'unknown-name@2:20']);
  });
  it('arity: the message names the expected count', () => {
    const d = first(claim('E(tau) = 1'));
    expect([d.code, d.span.line, d.span.column]).toEqual(['arity', 2, 3]);
    expect(d.message).toContain('2');
    expect(first(claim('Gamma(1, 2, 3) = 1')).message).toMatch(/1 or 2/);
    expect(diags('let f(s, t) = s + t\nclaim "t"\n  f(1) = f\n')).toEqual(['arity@3:3', 'arity@3:10']);
    expect(first('let f(s, t) = s + t\nclaim "t"\n  f(1) = 1\n').message).toContain('2 arguments');
    expect(diags(claim('for g in SL2Z', 'g(tau, 1) = 1'))).toEqual(['arity@3:3']);
  });
  it('not-callable and not-a-value', () => {
    expect(diags(claim('pi(2) = 1'))).toEqual(['not-callable@2:3']);
    expect(diags(claim('for s in [1, 2]', 's(2) = 1'))).toEqual(['not-callable@3:3']);
    expect(diags(claim('exp + 1 = 1'))).toEqual(['not-a-value@2:3']);
    expect(diags(claim('for g in SL2Z', 'g = 1'))).toEqual(['not-a-value@3:3']);
  });
  it('group-outside: a, b, c, d and g(...) need a group clause; never inside a let', () => {
    expect(diags(claim('(c*tau + d)^4 = 1'))).toEqual(['group-outside@2:4', 'group-outside@2:12']);
    expect(diags(claim('E(4, g(tau)) = 1'))).toEqual(['unknown-name@2:8']);
    expect(first(claim('E(4, g(tau)) = 1')).hint).toMatch(/for g in SL2Z/);
    expect(diags('let f(tau) = c*tau\n')).toEqual(['group-outside@1:14']);
  });
  it('parameters only where bound: not in other claims, not in let bodies', () => {
    const src = 'claim "a"\n  for s in [1, 2]\n  s = s\nclaim "b"\n  s = 1\nlet f(t) = t + s\n';
    expect(diags(src)).toEqual(['unknown-name@5:3', 'unknown-name@6:16']);
  });
  it('not-constant: clause values cannot depend on tau, parameters or the group', () => {
    expect(diags(claim('for s in [0, y]', '1 = 1'))).toEqual(['not-constant@2:16']);
    expect(diags(claim('for s in [0, 1]', 'for t in {s, 2}', '1 = 1'))).toEqual(['not-constant@3:13']);
    expect(diags(claim('for g in SL2Z', 'at tau in {c*i}', '1 = 1'))).toEqual(['not-constant@3:14']);
    expect(diags(claim('region y > abs(tau)', '1 = 1'))).toEqual(['bad-region@2:10']);
    expect(diags('let w = x\nclaim "t"\n  at tau in {w}\n  1 = 1\n')).toEqual(['not-constant@3:14']);
  });
  it('duplicate-name: lets, bound variables, claims', () => {
    expect(diags('let f = 1\nlet f = 2\n')).toEqual(['duplicate-name@2:5']);
    expect(diags('let E(k) = k\n')).toEqual(['duplicate-name@1:5']);
    expect(diags('let f(s, s) = s\n')).toEqual(['duplicate-name@1:10']);
    expect(diags(claim('for pi in [1, 2]', '1 = 1'))).toEqual(['duplicate-name@2:7']);
    expect(diags(claim('for s in [1, 2]', 'for s in {3}', '1 = 1'))).toEqual(['duplicate-name@3:7']);
    expect(diags(claim('for a in SL2Z', '1 = 1'))).toEqual(['duplicate-name@2:7']);
    expect(diags(claim('for g in SL2Z', 'for c in [1, 2]', '1 = 1'))).toEqual(['duplicate-name@3:7']);
    expect(diags('claim "t"\n  1 = 1\nclaim "t"\n  2 = 2\n')).toEqual(['duplicate-name@3:1']);
  });
  it('recursive-let: direct and mutual, reported once at the let; uses stay silent', () => {
    expect(diags('let f(s) = f(s - 1)\n')).toEqual(['recursive-let@1:5']);
    expect(diags('let f(s) = g(s)\nlet g(s) = h(s) + 1\nlet h(s) = f(s)\nclaim "t"\n  f(1) = 1\n')).toEqual(['recursive-let@1:5']);
    expect(first('let f(s) = g(s)\nlet g(s) = f(s)\n').message).toMatch(/f -> g -> f/);
    // a let depending on a recursive one is unusable, without a second report
    const { ast, diagnostics } = parse('let f(s) = f(s)\nlet k(s) = f(s)\nclaim "t"\n  k(1) = 1\n');
    expect(diagnostics.map((d) => d.code)).toEqual(['recursive-let']);
    expect(ast.claims).toEqual([]);
  });
  it('not-implemented: nothing is planned now (sum, prod, limit are implemented); misuse is still diagnosed', () => {
    expect(diags(claim('for s in box(2, 3 + i)', 'limit(Ens(s, tau)) = s*(s - 1)*Ens(s, tau)'))).toEqual(['unexpected-token@3:12']);
  });
});

describe('recovery', () => {
  it('a bad claim followed by a good one: the error is reported and the good claim parsed', () => {
    const { ast, diagnostics } = parse(claim('E(4, tau = 1').replace('"t"', '"bad"') + 'claim "good"\n  E(4, tau)^2 = E(8, tau)\n');
    expect(diagnostics.map((d) => `${d.code}@${d.span.line}:${d.span.column}`)).toEqual(['unbalanced-paren@2:4']);
    expect(ast.claims.map((c) => c.name)).toEqual(['good']);
  });
  it('errors in several claims and lets are all reported, in file order', () => {
    const src = 'let f(s) = zeta(s\nclaim "a"\n  Delat(tau) = 1\nclaim "b"\n  for s in [1, 2\n  1 = 1\nclaim "c"\n  1 = 1\nuse digits 1\n';
    expect(diags(src)).toEqual(['unbalanced-paren@1:16', 'unknown-name@3:3', 'unbalanced-paren@5:12', 'bad-setting@9:12']);
    expect(parse(src).ast.claims.map((c) => c.name)).toEqual(['c']);
  });
  it('a clause error does not hide an error in the equation of the same claim', () => {
    expect(diags(claim('for s in foo', 'Delat(tau) = 1'))).toEqual(['bad-clause@2:12', 'unknown-name@3:3']);
  });
});

describe('renderer', () => {
  it('file:line:col: message, the source line, carets under the span, the hint', () => {
    const src = 'claim "t"\n  for g in SL2Z\n  Delat(g(tau)) = (c*tau + d)^12 * Delta(tau)\n';
    const out = renderDiagnostic(first(src), src).split('\n');
    expect(out[0]).toMatch(/^t\.vet:3:3: /);
    expect(out[1]).toBe('    Delat(g(tau)) = (c*tau + d)^12 * Delta(tau)');
    expect(out[2]).toBe('    ^^^^^');
    expect(out[3]).toMatch(/^ {2}hint: .*'Delta'/);
  });
  it('one caret for an empty span; tabs kept in the padding; multi-line spans stop at the line end', () => {
    const src = 'claim "t"\n\tE(4, tau\n\t  ) = 1 = 2\n';
    const d = first(src);
    expect(d.code).toBe('extra-equals');
    const out = renderDiagnostic(d, src).split('\n');
    expect(out[1]).toBe('  \t  ) = 1 = 2');
    expect(out[2]).toBe('  \t        ^');
    const m = renderDiagnostic({ code: 'missing-equals', message: 'm', span: { file: 'f', start: 11, end: 30, line: 2, column: 2 } }, src).split('\n');
    expect(m[2]).toBe('  \t^^^^^^^^');
  });
});
