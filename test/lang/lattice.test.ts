// Lattice sums in the claim language: the two forms, their resolved structure, and the
// diagnostics (by code and line:column) for malformed pairs, excluded points and names.
import { describe, expect, it } from 'vitest';
import { dependsOnTau, freeBoundKeys, isHolomorphic } from '../../src/lang/depends.js';
import { diags, expr, sexpr } from './util.js';

const claim = (...lines: string[]) => ['claim "t"', ...lines.map((l) => `  ${l}`)].join('\n') + '\n';

describe('parsing and resolution', () => {
  it('the punctured lattice and the coprime pairs', () => {
    expect(sexpr(expr('sum((m, n) != (0, 0), (m*tau + n)^(-4))'))).toBe('(punctured m n (^ (+ (* %m tau) %n) (neg 4)))');
    expect(sexpr(expr('sum(gcd(c, d) = 1, y^2/abs(c*tau + d)^4)'))).toBe('(coprime c d (/ (^ (y tau) 2) (^ (abs (+ (* %c tau) %d)) 4)))');
  });
  it('binds both variables inside the body only, and keeps holomorphy of a holomorphic body', () => {
    const e = expr('sum((m, n) != (0, 0), (m*tau + n)^(-4))');
    expect(freeBoundKeys(e).size).toBe(0);
    expect(dependsOnTau(e)).toBe(true);
    expect(isHolomorphic(e)).toBe(true);
    expect(isHolomorphic(expr('sum((m, n) != (0, 0), y^3/abs(m*tau + n)^6)'))).toBe(false);
  });
  it('gcd stays usable as a variable name elsewhere', () => {
    expect(sexpr(expr('sum(gcd = 1..2, gcd)'))).toBe('(sum gcd 1..2 %gcd)');
  });
});

describe('diagnostics', () => {
  it('the same name twice', () => {
    expect(diags(claim('sum((m, m) != (0, 0), m) = 0'))).toEqual(['duplicate-name@2:11']);
  });
  it('only the origin may be excluded, and only gcd 1 is a coprime pair', () => {
    expect(diags(claim('sum((m, n) != (1, 0), m) = 0'))).toEqual(['bad-range@2:18']);
    expect(diags(claim('sum(gcd(c, d) = 2, c) = 0'))).toEqual(['bad-range@2:19']);
  });
  it('no products over a lattice', () => {
    expect(diags(claim('prod((m, n) != (0, 0), m) = 0'))).toEqual(['bad-range@2:3']);
  });
  it('a missing != or a malformed pair', () => {
    expect(diags(claim('sum((m, n) = (0, 0), m) = 0'))).toEqual(['unexpected-token@2:14']);
    expect(diags(claim('sum((m) != (0, 0), m) = 0'))).toEqual(['unexpected-token@2:9']);
  });
  it('variables clash with the group entries under a group clause, and with parameters', () => {
    expect(diags(claim('for g in SL2Z', 'sum(gcd(c, d) = 1, abs(c*tau + d)^(-4)) = 0'))).toEqual(['duplicate-name@3:11']);
    expect(diags(claim('for s in [2, 3]', 'sum((s, n) != (0, 0), abs(s*tau + n)^(-4)) = 0'))).toEqual(['duplicate-name@3:8']);
  });
});
