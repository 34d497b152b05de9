// Sums and products in the claim language: structure of the resolved nodes, scoping of the
// bound variable, and the diagnostics (by code and line:column) for bad ranges and names.
// Values against outside references (OEIS A000203 for sigma(12) = 28, Gauss's sum) are
// checked end to end through parse + evaluate.
import { describe, expect, it } from 'vitest';
import { withDigits } from '../../src/numeric/precision.js';
import { Complex } from '../../src/numeric/complex.js';
import { evaluate, evaluateConstant } from '../../src/eval/evaluate.js';
import { MAX_SERIES_TERMS } from '../../src/lang/names.js';
import { dependsOnTau, isHolomorphic } from '../../src/lang/depends.js';
import { diags, expr, parse, sexpr } from './util.js';

const claim = (...lines: string[]) => ['claim "t"', ...lines.map((l) => `  ${l}`)].join('\n') + '\n';

describe('parsing and resolution', () => {
  it('ranges, infinity and divisors', () => {
    expect(sexpr(expr('sum(n = 1..10, n^2)'))).toBe('(sum n 1..10 (^ %n 2))');
    expect(sexpr(expr('prod(n = 1..inf, 1 - q^n)'))).toBe('(prod n 1..inf (- 1 (^ (q tau) %n)))');
    expect(sexpr(expr('sum(d | 12, d)'))).toBe('(sum d | 12 %d)');
    expect(sexpr(expr('sum(n = 1..5, sum(d | n, d^3))'))).toBe('(sum n 1..5 (sum d | %n (^ %d 3)))');
    expect(sexpr(expr('sum(n = -2..2, n)'))).toBe('(sum n (neg 2)..2 %n)');
  });
  it('sum(d | 12, d) = 28 (OEIS A000203) and sum(n = 1..100, n) = 5050 (Gauss)', () => {
    withDigits(30, () => {
      expect(evaluateConstant(expr('sum(d | 12, d)')).re.toString()).toBe('28');
      expect(evaluateConstant(expr('sum(n = 1..100, n)')).re.toString()).toBe('5050');
    });
  });
  it('the variable may repeat in separate series; a let body sums over its own variable', () => {
    const src = 'let F(w) = sum(n = 1..3, w*n)\nclaim "t"\n  for n in {2}\n  sum(n2 = 1..2, n2) + F(n) = sum(m = 1..2, m) + 12\n';
    const { ast, diagnostics } = parse(src);
    expect(diagnostics).toEqual([]);
    const c = ast.claims[0]!;
    withDigits(30, () => {
      const env = { tau: Complex.of(0, 1), params: new Map([['n', Complex.of(2)]]) };
      const l = evaluate(c.lhs, env).value;
      const r = evaluate(c.rhs, env).value;
      expect(l.sub(r).isZero()).toBe(true); // 3 + 2*6 = 3 + 12
    });
    expect(diags(claim('sum(n = 1..2, n) + sum(n = 1..3, n) = 9'))).toEqual([]);
  });
  it('tau dependence and holomorphy are seen through the series', () => {
    expect(dependsOnTau(expr('sum(d | 6, d)'))).toBe(false);
    expect(dependsOnTau(expr('sum(n = 1..inf, q^n)'))).toBe(true);
    expect(isHolomorphic(expr('sum(n = 1..inf, q^n)'))).toBe(true);
    expect(isHolomorphic(expr('sum(n = 1..3, y^n)'))).toBe(false);
  });
  it('| outside sum/prod is still a bad character with the abs hint', () => {
    expect(diags(claim('|tau| = 1'))).toEqual(['bad-character@2:3', 'bad-character@2:7']);
  });
});

describe('diagnostics', () => {
  it('bad-range: non-integer literal bounds, a literal empty range, a too long literal range', () => {
    expect(diags(claim('sum(n = 1.5..3, n) = 1'))).toEqual(['bad-range@2:11']);
    expect(diags(claim('sum(n = 1..2.5, n) = 1'))).toEqual(['bad-range@2:14']);
    expect(diags(claim('sum(n = 1..0, n) = 0'))).toEqual(['bad-range@2:14']);
    expect(diags(claim(`sum(n = 1..${MAX_SERIES_TERMS + 1}, n) = 0`))).toEqual(['bad-range@2:14']);
    expect(diags(claim(`sum(n = 1..${MAX_SERIES_TERMS}, 1) = ${MAX_SERIES_TERMS}`))).toEqual([]);
    expect(diags(claim('sum(n = inf..3, n) = 1'))).toEqual(['bad-range@2:11']);
  });
  it('unknown summation variable: the body names another variable (with a hint)', () => {
    const { diagnostics } = parse(claim('sum(n = 1..3, m) = 6'));
    expect(diagnostics.map((d) => `${d.code}@${d.span.line}:${d.span.column}`)).toEqual(['unknown-name@2:17']);
    expect(parse(claim('sum(count = 1..3, cuont) = 6')).diagnostics[0]!.hint).toMatch(/'count'/);
    // outside its series the variable is unknown
    expect(diags(claim('sum(n = 1..3, n) + n = 6'))).toEqual(['unknown-name@2:22']);
  });
  it('the variable must not clash with a parameter, a built-in, a let, the group or an enclosing variable', () => {
    expect(diags(claim('for s in [1, 2]', 'sum(s = 1..3, s) = 6'))).toEqual(['duplicate-name@3:7']);
    expect(diags(claim('sum(pi = 1..3, 1) = 3'))).toEqual(['duplicate-name@2:7']);
    expect(diags(claim('sum(E = 1..3, 1) = 3'))).toEqual(['duplicate-name@2:7']);
    expect(diags(claim('sum(y = 1..3, 1) = 3'))).toEqual(['duplicate-name@2:7']);
    expect(diags(claim('sum(inf = 1..3, 1) = 3'))).toEqual(['duplicate-name@2:7']);
    expect(diags('let F = 1\n' + claim('sum(F = 1..3, 1) = 3'))).toEqual(['duplicate-name@3:7']);
    expect(diags(claim('for g in SL2Z', 'sum(d | 6, d) = 12'))).toEqual(['duplicate-name@3:7']);
    expect(diags(claim('sum(d | 6, d) = 12'))).toEqual([]); // no group clause: d is free to bind
    expect(diags(claim('sum(n = 1..3, sum(n = 1..2, n)) = 9'))).toEqual(['duplicate-name@2:21']);
    expect(diags('let F(n) = sum(n = 1..3, n)\n' + claim('F(1) = 6'))).toEqual(['duplicate-name@1:16']);
  });
  it('malformed series', () => {
    expect(diags(claim('sum(1, 2) = 3'))).toEqual(['unexpected-token@2:7']);
    expect(diags(claim('sum(n, 2) = 3'))).toEqual(['unexpected-token@2:8']);
    expect(diags(claim('sum(n = 1, 2) = 3'))).toEqual(['unexpected-token@2:12']);
    expect(diags(claim('sum + 1 = 3'))).toEqual(['not-a-value@2:3']);
    expect(diags('let sum = 1\n')).toEqual(['duplicate-name@1:5']);
  });
});

describe('limit', () => {
  it('parses limit(s -> a, f) with s bound in f', () => {
    expect(diags(claim('limit(s -> 0, sin(s)/s) = 1'))).toEqual([]);
    expect(dependsOnTau(expr('limit(s -> 0, sin(s)/s)'))).toBe(false);
    expect(dependsOnTau(expr('limit(h -> 0, E(4, tau + h))'))).toBe(true);
  });
  it('diagnostics: a missing arrow, a clashing variable, the variable outside', () => {
    expect(diags(claim('limit(s, 1) = 1'))).toEqual(['unexpected-token@2:10']);
    expect(diags(claim('for s in [1, 2]', 'limit(s -> 0, s) = 0'))).toEqual(['duplicate-name@3:9']);
    expect(diags(claim('limit(s -> 0, s) + s = 0'))).toEqual(['unknown-name@2:22']);
  });
});
