// The parser and resolver on every construct: file defaults, lets, claims with each clause,
// expression precedence (as s-expressions), name resolution, equation text and spans.
import { describe, expect, it } from 'vitest';
import { makeGroup } from '../../src/groups/subgroups.js';
import { eq, expr, onlyClaim, parse, sexpr } from './util.js';

describe('file structure', () => {
  it('use sets file-wide defaults; comments and blank lines are ignored', () => {
    const { ast, diagnostics } = parse('# header\nuse digits 40, samples 12\nuse seed 7, ymin 0.05\n\nclaim "t"\n  1 = 1  # trailing\n');
    expect(diagnostics).toEqual([]);
    expect(ast.defaults).toEqual({ digits: 40, samples: 12, seed: 7, yMin: 0.05 });
    expect(ast.file).toBe('t.vet');
  });
  it('a claim: header, clauses, equation; defaults when clauses are absent', () => {
    const c = onlyClaim('claim "E4 squared is E8"\n  E(4, tau)^2 = E(8, tau)\n');
    expect(c.name).toBe('E4 squared is E8');
    expect(c.expect).toBe('holds');
    expect(c.params).toEqual([]);
    expect(c.group).toBeUndefined();
    expect(c.span).toMatchObject({ line: 1, column: 1 });
    expect(c.text).toBe('E(4, tau)^2 = E(8, tau)');
    expect(c.lhsText).toBe('E(4, tau)^2');
    expect(c.rhsText).toBe('E(8, tau)');
    expect(c.equationSpan).toMatchObject({ line: 2, column: 3 });
    expect(sexpr(c.lhs)).toBe('(^ (E 4 tau) 2)');
  });
  it('the equation may continue over further indented lines (comments dropped from the text)', () => {
    const c = onlyClaim('claim "t"\n  E(4, tau)^2   # left\n    = E(8,\n        tau)\n');
    expect(c.text).toBe('E(4, tau)^2 = E(8, tau)');
    expect(sexpr(c.rhs)).toBe('(E 8 tau)');
  });
  it('several claims come back in file order', () => {
    const { ast } = parse('claim "a"\n  1 = 1\nclaim "b"\n  2 = 2\n');
    expect(ast.claims.map((c) => c.name)).toEqual(['a', 'b']);
  });
});

describe('clauses', () => {
  it('group clauses bind any variable name; a, b, c, d and g(expr)', () => {
    const c = eq('Delta(h(tau)) = (c*tau + d)^12 * Delta(tau)', ['for h in SL2Z']);
    expect(c.group).toMatchObject({ kind: 'group', variable: 'h', group: makeGroup('SL2Z') });
    expect(sexpr(c.lhs)).toBe('(Delta (act h tau))');
    expect(sexpr(c.rhs)).toBe('(* (^ (+ (* @c tau) @d) 12) (Delta tau))');
    // g acts on any expression
    expect(sexpr(expr('E(4, g(-1/tau)) + a*b', ['for g in Gamma0(4)']))).toBe('(+ (E 4 (act g (/ (neg 1) tau))) (* @a @b))');
  });
  it('each congruence subgroup with its level', () => {
    expect(eq('1 = 1', ['for g in Gamma0(4)']).group!.group).toEqual(makeGroup('Gamma0', 4));
    expect(eq('1 = 1', ['for g in Gamma1(5)']).group!.group).toEqual(makeGroup('Gamma1', 5));
    expect(eq('1 = 1', ['for g in Gamma(2)']).group!.group).toEqual(makeGroup('Gamma', 2));
  });
  it('parameter clauses: interval, box, list, integer range; parameters resolve in the equation', () => {
    const c = eq('s*k + n + t = 0', ['for s in [1/2, 3]', 'for t in box(1.2 - 4i, 3.5 + 4i)', 'for k in {4, 6, 8}', 'for n in -2..20']);
    expect(c.params.map((p) => [p.kind, p.name])).toEqual([
      ['interval', 's'], ['box', 't'], ['list', 'k'], ['intRange', 'n'],
    ]);
    const [iv, bx, ls, rg] = c.params;
    expect(iv!.kind === 'interval' && [sexpr(iv.lo), sexpr(iv.hi)]).toEqual(['(/ 1 2)', '3']);
    expect(bx!.kind === 'box' && [sexpr(bx.corner1), sexpr(bx.corner2)]).toEqual(['(- 1.2 4i)', '(+ 3.5 4i)']);
    expect(ls!.kind === 'list' && ls.values.map(sexpr)).toEqual(['4', '6', '8']);
    expect(rg).toMatchObject({ kind: 'intRange', lo: -2, hi: 20 });
    expect(sexpr(c.lhs)).toBe('(+ (+ (* $s $k) $n) $t)');
  });
  it('at tau in {...}: fixed points as constant expressions', () => {
    const c = eq('j(tau) = 1728', ['at tau in {i, rho, 0.3 + 1.2i, (-1 + sqrt(3)*i)/2}']);
    expect(c.at!.points.map(sexpr)).toEqual(['i', 'rho', '(+ 0.3 1.2i)', '(/ (+ (neg 1) (* (sqrt 3) i)) 2)']);
  });
  it('a clause may continue over lines inside its brackets; Windows line ends and tabs are fine', () => {
    const c = onlyClaim('claim "t"\r\n\tat tau in {i,\r\n\t  rho}\r\n\tj(tau) = j(tau)\r\n');
    expect(c.at!.points.map(sexpr)).toEqual(['i', 'rho']);
    expect(c.text).toBe('j(tau) = j(tau)');
  });
  it('region: bounds on x, y, abs(x), abs(tau); chains split; constants on the left flip', () => {
    const c = eq('1 = 1', ['region y >= 0.5 and abs(x) <= 1/2, 1 < abs(tau)', 'samples 3']);
    expect(c.region!.bounds.map((b) => [b.quantity, b.op, sexpr(b.bound)])).toEqual([
      ['y', '>=', '0.5'], ['absx', '<=', '(/ 1 2)'], ['abstau', '>', '1'],
    ]);
    const d = eq('1 = 1', ['region 0.5 <= y <= 2 and -1/2 < re(tau) < 1/2']);
    expect(d.region!.bounds.map((b) => [b.quantity, b.op, sexpr(b.bound)])).toEqual([
      ['y', '>=', '0.5'], ['y', '<=', '2'], ['x', '>', '(/ (neg 1) 2)'], ['x', '<', '(/ 1 2)'],
    ]);
  });
  it('digits, samples, seed, ymin (also several on one line), expect, source', () => {
    const c = eq('1 = 1', ['digits 60', 'samples 20, seed 3', 'ymin 0.1', 'expect refuted', 'source "Serre, VII.4"']);
    expect([c.digits, c.samples, c.seed, c.yMin, c.expect, c.source]).toEqual([60, 20, 3, 0.1, 'refuted', 'Serre, VII.4']);
    expect(eq('1 = 1', ['expect holds']).expect).toBe('holds');
  });
});

describe('expressions', () => {
  const p = (s: string) => sexpr(expr(s));
  it('^ is right-associative and binds tighter than unary minus', () => {
    expect(p('-2^2')).toBe('(neg (^ 2 2))');
    expect(p('2^3^2')).toBe('(^ 2 (^ 3 2))');
    expect(p('2^-1')).toBe('(^ 2 (neg 1))');
    expect(p('-x^-y^2')).toBe('(neg (^ (x tau) (neg (^ (y tau) 2))))');
  });
  it('* and / bind tighter than + and -, both left-associative; unary minus between them and ^', () => {
    expect(p('-1/2')).toBe('(/ (neg 1) 2)');
    expect(p('1 - 2 - 3')).toBe('(- (- 1 2) 3)');
    expect(p('1/2/3')).toBe('(/ (/ 1 2) 3)');
    expect(p('1 + 2*3^2/4')).toBe('(+ 1 (/ (* 2 (^ 3 2)) 4))');
    expect(p('(1 + 2)*3')).toBe('(* (+ 1 2) 3)');
    expect(p('+2 - -3')).toBe('(- 2 (neg 3))');
  });
  it('literals: 1/3 is a quotient, 0.25, 1e-3, 4i, 0.5i', () => {
    expect(p('1/3 + 0.25 + 1e-3 + 4i + 0.5i')).toBe('(+ (+ (+ (+ (/ 1 3) 0.25) 1e-3) 4i) 0.5i)');
  });
  it('constants and the parts of tau', () => {
    expect(p('i + pi + euler + rho')).toBe('(+ (+ (+ i pi) euler) rho)');
    expect(p('tau + x + y + taubar + q')).toBe('(+ (+ (+ (+ tau (x tau)) (y tau)) (taubar tau)) (q tau))');
  });
  it('every built-in resolves with its arity', () => {
    const calls = [
      'exp(1)', 'log(2)', 'sqrt(2)', 'abs(i)', 're(i)', 'im(i)', 'conj(i)', 'arg(i)', 'sin(1)', 'cos(1)', 'sinh(1)', 'cosh(1)',
      'sigma(3, 10)', 'bernoulli(4)', 'zeta(2)', 'xi(2)', 'Gamma(1/2)', 'Gamma(2, 1)', 'beta(1)', 'K(0, 1)',
      'E(4, tau)', 'G(4, tau)', 'E2star(tau)', 'eta(tau)', 'Delta(tau)', 'j(tau)', 'theta2(tau)', 'theta3(tau)', 'theta4(tau)',
      'Ens(2, tau)', 'Estar(2, tau)',
    ];
    expect(calls.map((s) => p(s).split(' ')[0]!.slice(1))).toEqual(calls.map((s) => s.slice(0, s.indexOf('('))));
  });
  it('modular built-ins take any expression for tau', () => {
    expect(p('eta(-1/tau)')).toBe('(eta (/ (neg 1) tau))');
    expect(p('theta3(tau + 1)')).toBe('(theta3 (+ tau 1))');
  });
  it('node spans: line and column of each node', () => {
    const c = eq('E(4, tau) + eta(tau) = 0');
    const lhs = c.lhs;
    expect(lhs.kind).toBe('binary');
    if (lhs.kind !== 'binary' || lhs.left.kind !== 'call') throw new Error('shape');
    expect(lhs.span).toMatchObject({ line: 2, column: 3 });
    expect(lhs.left.nameSpan).toMatchObject({ line: 2, column: 3, start: 12, end: 13 });
    expect(lhs.left.args[1]!.span).toMatchObject({ line: 2, column: 8 });
    expect(lhs.right.span).toMatchObject({ line: 2, column: 15 });
  });
});

describe('lets', () => {
  it('expand by substitution; order-independent; zero-parameter lets are used bare', () => {
    const { ast, diagnostics } = parse('claim "t"\n  Z(2, tau) = c4\nlet Z(s, tau) = 2*zeta(2*s)*Ens(s, tau)\nlet c4 = 240\n');
    expect(diagnostics).toEqual([]);
    expect(ast.lets.map((l) => [l.name, l.params, l.text])).toEqual([
      ['Z', ['s', 'tau'], '2*zeta(2*s)*Ens(s, tau)'],
      ['c4', [], '240'],
    ]);
    const c = ast.claims[0]!;
    expect(sexpr(c.lhs)).toBe('(let Z (* (* 2 (zeta (* 2 2))) (Ens 2 tau)))');
    expect(sexpr(c.rhs)).toBe('(let c4 240)');
  });
  it('a tau parameter carries x, y, taubar, q with it', () => {
    const { ast } = parse('let F(tau) = y^2 * E(4, tau)\nclaim "t"\n  for g in SL2Z\n  F(g(tau)) = 0\n');
    expect(sexpr(ast.claims[0]!.lhs)).toBe('(let F (* (^ (y (act g tau)) 2) (E 4 (act g tau))))');
  });
  it('without a tau parameter, tau in a let body is the claim tau', () => {
    const { ast } = parse('let h(k) = E(k, tau)/y\nclaim "t"\n  for k in {4, 6}\n  h(k) = 0\n');
    expect(sexpr(ast.claims[0]!.lhs)).toBe('(let h (/ (E $k tau) (y tau)))');
  });
  it('nested lets share one expansion per distinct call (no exponential growth)', () => {
    const lets = ['let f0(t) = t'];
    for (let k = 1; k <= 30; k++) lets.push(`let f${k}(t) = f${k - 1}(t) + f${k - 1}(t)`);
    const { ast, diagnostics } = parse(lets.join('\n') + '\nclaim "t"\n  f30(tau) = 0\n');
    expect(diagnostics).toEqual([]);
    const lhs = ast.claims[0]!.lhs;
    if (lhs.kind !== 'letCall' || lhs.body.kind !== 'binary') throw new Error('shape');
    const [l, r] = [lhs.body.left, lhs.body.right];
    if (l.kind !== 'letCall' || r.kind !== 'letCall') throw new Error('shape');
    expect(l.body).toBe(r.body);
  });
});
