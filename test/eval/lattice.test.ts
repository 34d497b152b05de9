// Lattice sums evaluated (src/eval/lattice.ts): values against closed forms from outside the
// project, the honesty of the reported accuracy (the true error must stay below it), and
// the refusals. The right sides use modvet's E_k, zeta and beta, which are tested against
// mpmath in test/special and test/modular.
import { describe, expect, it } from 'vitest';
import { Decimal } from 'decimal.js';
import { Complex } from '../../src/numeric/complex.js';
import { withDigits } from '../../src/numeric/precision.js';
import { evaluate } from '../../src/eval/evaluate.js';
import { evalError } from './util.js';
import { expr } from '../lang/util.js';

/** The lattice side and a reference side at P digits: relative error and reported accuracy. */
function compare(lattice: string, reference: string, tau: Complex, P: number, params: [string, number][] = []) {
  const clauses = params.map(([n, v]) => `for ${n} in {${v}}`);
  const env = { tau, params: new Map(params.map(([n, v]) => [n, Complex.of(v)])) };
  return withDigits(P, () => {
    const a = evaluate(expr(lattice, clauses), env);
    const b = evaluate(expr(reference, clauses), env);
    const err = a.value.sub(b.value).abs().div(b.value.abs());
    return { err, rel: a.limit?.rel ?? new Decimal(0), by: a.limit?.by };
  });
}

const digits = (d: Decimal) => -Math.log10(d.toNumber());

describe('punctured lattice', () => {
  // Serre, A Course in Arithmetic, ch. VII, 2.3 and 4.2: sum' (m tau + n)^-k = 2 zeta(k) E_k
  it.each([
    ['0.1', '1.2', 4],
    ['-0.3', '0.9', 4],
    ['0.45', '0.6', 6],
  ])('G_k at tau = %s + %si, k = %i, to the accuracy it reports (>= 18 digits)', (x, y, k) => {
    const r = compare(`sum((m, n) != (0, 0), (m*tau + n)^(-${k}))`, `2*zeta(${k})*E(${k}, tau)`, Complex.of(x, y), 30);
    expect(r.by).toBe('a lattice sum');
    expect(digits(r.rel)).toBeGreaterThanOrEqual(18);
    expect(r.err.lte(r.rel)).toBe(true);
  });
  // Hardy and Wright, ch. XVI (r_2(n) = 4 sum_{d | n} chi_4(d), chapter from memory):
  // sum' (m^2 + n^2)^-s = 4 zeta(s) beta(s)
  it.each([1.5, 2, 3.5])('the square lattice: 4 zeta(s) beta(s) at s = %s', (s) => {
    const r = compare('sum((m, n) != (0, 0), abs(m*tau + n)^(-2*s))', '4*zeta(s)*beta(s)', Complex.I, 30, [['s', s]]);
    expect(digits(r.rel)).toBeGreaterThanOrEqual(16);
    expect(r.err.lte(r.rel)).toBe(true);
  });
  it('reaches more digits at 50 (the budget, not the precision, limits it)', () => {
    const r = compare('sum((m, n) != (0, 0), (m*tau + n)^(-8))', '2*zeta(8)*E(8, tau)', Complex.of('0.2', '1.1'), 50);
    expect(digits(r.rel)).toBeGreaterThanOrEqual(25);
    expect(r.err.lte(r.rel)).toBe(true);
  });
  it('an odd summand sums to 0 exactly, with no truncation limit', () => {
    // the terms of (m, n) and (-m, -n) cancel (common practice: G_k = 0 for odd k)
    const r = withDigits(30, () => evaluate(expr('sum((m, n) != (0, 0), (m*tau + n)^(-5))'), { tau: Complex.of('0.1', '1.2') }));
    expect(r.value.isZero()).toBe(true);
    expect(r.limit).toBeUndefined();
  });
});

describe('coprime pairs', () => {
  // Iwaniec, Spectral Methods of Automorphic Forms, ch. 3 (chapter from memory): E(s, tau) is
  // (1/2) sum_{gcd(c, d) = 1} y^s/|c tau + d|^(2s); Ens is the Fourier-Bessel built-in
  it.each([
    [2, '0.1', '1.2'],
    [3.25, '-0.4', '0.8'],
  ])('(1/2) sum over coprime pairs is E(s, tau) at s = %s', (s, x, y) => {
    const r = compare('sum(gcd(c, d) = 1, y^s/abs(c*tau + d)^(2*s))/2', 'Ens(s, tau)', Complex.of(x, y), 30, [['s', s]]);
    expect(digits(r.rel)).toBeGreaterThanOrEqual(16);
    expect(r.err.lte(r.rel)).toBe(true);
  });
});

describe('refusals, each with a clear reason', () => {
  const tau = Complex.of('0.1', '1.2');
  it('a conditionally convergent sum (degree -2) is not summed in an order the user did not choose', () => {
    const e = evalError(() => withDigits(30, () => evaluate(expr('sum((m, n) != (0, 0), (m*tau + n)^(-2))'), { tau })));
    expect(e.code).toBe('convergence');
    expect(e.message).toMatch(/absolutely/);
  });
  it('a summand that is not homogeneous', () => {
    const e = evalError(() => withDigits(30, () => evaluate(expr('sum((m, n) != (0, 0), exp(-m^2 - n^2))'), { tau })));
    expect(e.code).toBe('convergence');
    expect(e.message).toMatch(/homogeneous/);
  });
  it('a lattice sum under a differential operator', () => {
    const e = evalError(() => withDigits(30, () => evaluate(expr('qd(sum((m, n) != (0, 0), (m*tau + n)^(-4)))'), { tau })));
    expect(e.code).toBe('convergence');
    expect(e.message).toMatch(/operator/);
  });
});
