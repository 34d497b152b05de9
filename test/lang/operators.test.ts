// The differential operators as AST nodes: structure (operand, weight, the point `at` inside
// a let with a tau parameter), spans, and their diagnostics by code and position.
import { describe, expect, it } from 'vitest';
import type { Expr } from '../../src/lang/ast.js';
import { MAX_OPERATOR_DEPTH, knownNames } from '../../src/lang/names.js';
import { diags, eq, expr, parse, sexpr } from './util.js';

const claim = (...lines: string[]) => ['claim "t"', ...lines.map((l) => `  ${l}`)].join('\n') + '\n';

function asOperator(e: Expr) {
  if (e.kind !== 'operator') throw new Error(`not an operator: ${e.kind}`);
  return e;
}

describe('operator nodes', () => {
  it('each operator parses to an operator node over its operand', () => {
    expect(sexpr(expr('lap(Ens(s, tau))', ['for s in [2, 3]']))).toBe('(lap (Ens $s tau))');
    expect(sexpr(expr('dtau(x*y)'))).toBe('(dtau (* (x tau) (y tau)))');
    expect(sexpr(expr('dtaubar(taubar)'))).toBe('(dtaubar (taubar tau))');
    expect(sexpr(expr('qd(E(4, tau))'))).toBe('(qd (E 4 tau))');
    expect(sexpr(expr('raise(2, y^2)'))).toBe('(raise 2 (^ (y tau) 2))');
    expect(sexpr(expr('lower(y^2)'))).toBe('(lower (^ (y tau) 2))');
    expect(sexpr(expr('serre(k, E(k, tau))', ['for k in {4, 6}']))).toBe('(serre $k (E $k tau))');
  });
  it('nesting and operators inside arithmetic', () => {
    expect(sexpr(expr('lap(lap(y^3)) + 1'))).toBe('(+ (lap (lap (^ (y tau) 3))) 1)');
  });
  it('spans: the whole call and the name alone', () => {
    const op = asOperator(eq('qd(E(4, tau)) = 0').lhs);
    expect([op.span.line, op.span.column, op.span.end - op.span.start]).toEqual([2, 3, 'qd(E(4, tau))'.length]);
    expect([op.nameSpan.column, op.nameSpan.end - op.nameSpan.start]).toEqual([3, 2]);
    expect(op.at).toBeNull();
  });
  it('in a let with a tau parameter, the operand is a function of tau and the result is taken at the argument', () => {
    const { ast, diagnostics } = parse('let F(tau) = dtau(tau^2)\nclaim "t"\n  F(2*tau) = 0\n');
    expect(diagnostics).toEqual([]);
    expect(sexpr(ast.claims[0]!.lhs)).toBe('(let F (dtau (^ tau 2) @(* 2 tau)))');
  });
  it("a let's other arguments that depend on tau are frozen (held at the caller's values)", () => {
    const { ast, diagnostics } = parse('let F(tau, w) = dtau(w*tau)\nclaim "t"\n  F(2*tau, y) + F(tau, 3) = 0\n');
    expect(diagnostics).toEqual([]);
    const lhs = ast.claims[0]!.lhs;
    if (lhs.kind !== 'binary' || lhs.left.kind !== 'letCall' || lhs.right.kind !== 'letCall') throw new Error('shape');
    const [a, b] = [lhs.left.body, lhs.right.body];
    if (a.kind !== 'operator' || b.kind !== 'operator') throw new Error('shape');
    expect(a.frozen.map(sexpr)).toEqual(['(y tau)']);
    expect(b.frozen).toEqual([]);
  });
  it('a let without a tau parameter differentiates in the claim tau; its other arguments pass through', () => {
    const { ast, diagnostics } = parse('let L(s) = lap(y^s)\nclaim "t"\n  for s in [1, 2]\n  L(s) = 0\n');
    expect(diagnostics).toEqual([]);
    expect(sexpr(ast.claims[0]!.lhs)).toBe('(let L (lap (^ (y tau) $s)))');
  });
  it('operators are listed among the known names, with the Laplacian sign in the summary', () => {
    const lap = knownNames().find((n) => n.name === 'lap');
    expect(lap?.arities).toEqual([1]);
    expect(lap?.summary).toMatch(/s\(s-1\)/);
    expect(knownNames().find((n) => n.name === 'serre')?.arities).toEqual([2]);
  });
});

describe('operator diagnostics', () => {
  it('unknown-name inside the operand, at the name', () => {
    expect(diags(claim('lap(Enz(2, tau)) = 0'))).toEqual(['unknown-name@2:7']);
  });
  it('arity: too many or too few arguments, at the call', () => {
    expect(diags(claim('lap(y, 2) = 0'))).toEqual(['arity@2:3']);
    expect(diags(claim('raise(y^2) = 0'))).toEqual(['arity@2:3']);
    expect(diags(claim('1 + serre(4) = 0'))).toEqual(['arity@2:7']);
  });
  it('not-constant: a weight that depends on tau', () => {
    expect(diags(claim('raise(y, y^2) = 0'))).toEqual(['not-constant@2:9']);
  });
  it(`operator-depth: more than ${MAX_OPERATOR_DEPTH} nested, at the outermost operator`, () => {
    const nest = (n: number) => 'lap('.repeat(n) + 'y^2' + ')'.repeat(n);
    expect(diags(claim(`${nest(MAX_OPERATOR_DEPTH)} = 0`))).toEqual([]);
    expect(diags(claim(`${nest(MAX_OPERATOR_DEPTH + 1)} = 0`))).toEqual(['operator-depth@2:3']);
    expect(diags(claim(`1 = 2 + dtau(${nest(MAX_OPERATOR_DEPTH)})`))).toEqual(['operator-depth@2:11']);
    // through a let: reported at the call site
    expect(diags('let L = lap(lap(lap(y^2)))\nclaim "t"\n  1 + lap(lap(L)) = 0\n')).toEqual(['operator-depth@3:7']);
  });
  it('operator names are reserved: not values, not let or parameter names', () => {
    expect(diags(claim('lap + 1 = 0'))).toEqual(['not-a-value@2:3']);
    expect(diags('let qd(t) = t\n')).toEqual(['duplicate-name@1:5']);
    expect(diags(claim('for dtau in [1, 2]', 'dtau = 1'))).toEqual(['duplicate-name@2:7']);
  });
  it('a clause value cannot hold an operator at the claim tau', () => {
    expect(diags(claim('for s in [0, lap(y)]', 's = s'))).toEqual(['not-constant@2:16']);
  });
});
