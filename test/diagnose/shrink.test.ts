// Shrinking refuted claims to their simplest counterexample (src/diagnose/shrink.ts), on
// real claims built through parseSource + toCheckable. The expected failures follow from
// the values: E_4(i) != 0 (E_4(i) = 3 Gamma(1/4)^8 / (2 pi)^6, from memory), E_6(i) = 0,
// E_4(rho) = 0 (Serre, A Course in Arithmetic, ch. VII, 3.2), Gamma(3) = 2 Gamma(2).
import { describe, expect, it } from 'vitest';
import { parseSource } from '../../src/lang/parser.js';
import { toCheckable } from '../../src/check/fromAst.js';
import type { CheckableClaim } from '../../src/check/claim.js';
import { shrink } from '../../src/diagnose/shrink.js';

const P = 30;
const Y_MIN = 0.02;

function claim(equation: string, clauses: string[] = []): CheckableClaim {
  const src = ['claim "t"', ...clauses.map((c) => `  ${c}`), `  ${equation}`, ''].join('\n');
  const { ast, diagnostics } = parseSource(src, 't.vet');
  expect(diagnostics.map((d) => d.message)).toEqual([]);
  return toCheckable(ast.claims[0]!, ast.defaults);
}

describe('shrink', () => {
  it('a wrong weight fails first at g = S (T has c tau + d = 1)', () => {
    const f = shrink(claim('E(4, g(tau)) = (c*tau + d)^6*E(4, tau)', ['for g in SL2Z']), P, Y_MIN);
    expect(f?.text).toBe('g = S at tau = i');
    expect(f?.sample.gamma?.toString()).toBe('(0 -1; 1 0)');
    expect(Number(f?.residual)).toBeGreaterThan(0.5);
  });

  it('a missing factor fails at tau = i', () => {
    const f = shrink(claim('E(4, tau)^2 = 2*E(8, tau)'), P, Y_MIN);
    expect(f?.text).toBe('tau = i');
    expect(f?.sample.tau.re.isZero() && f.sample.tau.im.eq(1)).toBe(true);
  });

  it('skips points where both sides vanish: E_6(i) = 0', () => {
    const f = shrink(claim('E(6, tau)^2 = 2*E(6, tau)^2'), P, Y_MIN);
    expect(f?.text).toBe('tau = 2i');
  });

  it('returns null for a claim that holds', () => {
    expect(shrink(claim('E(4, tau)^2 = E(8, tau)'), P, Y_MIN)).toBeNull();
    expect(shrink(claim('Delta(g(tau)) = (c*tau + d)^12*Delta(tau)', ['for g in SL2Z']), P, Y_MIN, { maxEvaluations: 15 })).toBeNull();
  });

  it('parameters: the simplest value that fails, skipping a coincidence', () => {
    // s = 2 satisfies Gamma(s + 1) = 2 Gamma(s); s = 3/2 is the next simplest in [1.2, 3]
    expect(shrink(claim('Gamma(s + 1) = 2*Gamma(s)', ['for s in [1.2, 3]']), P, Y_MIN)?.text).toBe('s = 3/2 at tau = i');
    // listed values by |v|: k = 4 holds (E_4^2 = E_8), k = 6 fails
    expect(shrink(claim('E(k, tau)^2 = E(2*k, tau)', ['for k in {8, 6, 4}']), P, Y_MIN)?.text).toBe('k = 6 at tau = i');
    // a box: real values first, then +-i
    const f = shrink(claim('zeta(s) = zeta(conj(s))', ['for s in box(1.2 - 2i, 3 + 2i)']), P, Y_MIN);
    expect(f?.text).toBe('s = 2 + i at tau = i');
    expect(f?.sample.params.get('s')?.toString()).toBe('2 + 1i');
  });

  it('respects the group: Gamma0(4) elements only, with c != 0 for a law that needs it', () => {
    const f = shrink(claim('E(2, g(tau)) = (c*tau + d)^2*E(2, tau)', ['for g in Gamma0(4)']), P, Y_MIN);
    expect(f).not.toBeNull();
    const g = f!.sample.gamma!;
    expect(g.c % 4n).toBe(0n);
    expect(g.c).not.toBe(0n);
    expect(f!.text).toBe('g = S T^-4 S = (-1 0; -4 -1) at tau = i');
  });

  it('a subgroup of higher level: the element gets a point where g tau stays above y_min', () => {
    // weight 2 is right (Ono, The Web of Modularity, Theorem 1.64); weight 4 is not
    const c = claim('(eta(g(tau))*eta(11*g(tau)))^2 = (c*tau + d)^4*(eta(tau)*eta(11*tau))^2', ['for g in Gamma0(11)']);
    const f = shrink(c, P, Y_MIN);
    expect(f).not.toBeNull();
    const { gamma, tau } = f!.sample;
    expect(gamma!.c % 11n).toBe(0n);
    expect(gamma!.c).not.toBe(0n);
    expect(gamma!.act(tau).im.gte(Y_MIN)).toBe(true);
    expect(f!.text).toMatch(/^g = \(.*\) at tau = -?\d+\/11 \+ i\/11$/);
  });

  it('respects fixed points and regions', () => {
    expect(shrink(claim('E(4, tau) = 1', ['at tau in {2i, rho}']), P, Y_MIN)?.text).toBe('tau = 2i');
    expect(shrink(claim('E(4, tau)*E(6, tau) = E(6, tau)', ['at tau in {i, rho}']), P, Y_MIN)?.text).toBe('tau = rho');
    expect(shrink(claim('E(4, tau)^2 = 2*E(8, tau)', ['region y >= 2.5']), P, Y_MIN)?.text).toBe('tau = 3i');
  });

  it('skips candidates whose evaluation needs a point below y_min', () => {
    // wrong everywhere by a factor 2; at y_min = 1.5 every candidate (2i, 3i, -1/2 + 2i) has
    // Im(-1/tau) < 1/2, so none can be evaluated
    const c = claim('eta(-1/tau) = 2*sqrt(-i*tau)*eta(tau)');
    expect(shrink(c, P, 0.9)?.text).toBe('tau = i');
    expect(shrink(c, P, 1.5)).toBeNull();
  });

  it('stays within the evaluation budget', () => {
    const c = claim('E(4, tau)^2 = E(8, tau)');
    let calls = 0;
    const counted: CheckableClaim = { ...c, evaluate: (s, y) => (calls++, c.evaluate(s, y)) };
    expect(shrink(counted, P, Y_MIN, { maxEvaluations: 3 })).toBeNull();
    // two precisions per candidate
    expect(calls).toBe(6);
  });
});
