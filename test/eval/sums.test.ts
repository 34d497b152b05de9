// Sums and products (src/eval/series.ts) against outside references named beside each value:
// closed forms, the q-expansions of E_4 and Delta against the built-ins, divisor sums
// (OEIS), the convergence budget, the scale under cancellation, runtime errors with spans.
import { describe, expect, it } from 'vitest';
import { Decimal } from 'decimal.js';
import { Complex } from '../../src/numeric/complex.js';
import { withDigits } from '../../src/numeric/precision.js';
import { EvalError, evaluate, type EvalEnv } from '../../src/eval/evaluate.js';
import { INFINITE_SERIES_BUDGET } from '../../src/lang/names.js';
import { divisors } from '../../src/eval/series.js';
import { eq, expr } from '../lang/util.js';
import { evalAt, evalError } from './util.js';

const TAU = Complex.of('0.1234', '0.6');
const { ev, agree } = evalAt(TAU);


describe('finite sums and products', () => {
  it('exact integer sums: Gauss sum_{n=1}^{100} n = 5050; sum n^2 to 10 = 385', () => {
    expect(ev('sum(n = 1..100, n)').value.re.toString()).toBe('5050');
    expect(ev('sum(k = 1..10, k^2)').value.re.toString()).toBe('385');
    expect(ev('prod(n = 1..10, n)').value.re.toString()).toBe('3628800'); // 10! (OEIS A000142)
  });
  it('divisor sums: sigma(12) = 28 (OEIS A000203), sigma_0(12) = 6 (A000005)', () => {
    expect(ev('sum(d | 12, d)').value.re.toString()).toBe('28');
    expect(ev('sum(d | 12, 1)').value.re.toString()).toBe('6');
    expect(divisors(36)).toEqual([1, 2, 3, 4, 6, 9, 12, 18, 36]);
  });
  it('nested: sum_{n<=6} sum_{d|n} d^3 = 1+9+28+73+126+252 = 489 (OEIS A001158), inner range from the outer variable', () => {
    expect(ev('sum(n = 1..6, sum(d | n, d^3))').value.re.toString()).toBe('489');
    // sum_{n=1}^{4} sum_{m=1}^{n} m = 1 + 3 + 6 + 10 = 20 (tetrahedral numbers, A000292)
    expect(ev('sum(n = 1..4, sum(m = 1..n, m))').value.re.toString()).toBe('20');
  });
  it('a computed empty range gives 0 (sum) and 1 (prod)', () => {
    expect(ev('sum(n = 1..1, sum(m = 1..n - 1, m))').value.isZero()).toBe(true);
    expect(ev('sum(n = 1..1, prod(m = 1..n - 1, m))').value.re.toString()).toBe('1');
  });
  it('the scale keeps the size of cancelling terms', () => {
    const r = ev('sum(n = 1..2, (-1)^n * 10^20)');
    expect(r.value.isZero()).toBe(true);
    expect(r.scale.gte('1e20')).toBe(true);
  });
});

describe('infinite series', () => {
  it('geometric series at tau = i: sum_{n>=0} q^n = 1/(1 - e^{-2 pi}) (geometric series)', () => {
    expect(agree('sum(n = 0..inf, q^n) = 1/(1 - exp(-2*pi))', 30, { tau: Complex.of(0, 1) })).toBeGreaterThan(29);
  });
  it('exponential series: sum_{n>=0} 1/Gamma(n+1) = e (DLMF 4.2.19 at z = 1)', () => {
    expect(agree('sum(n = 0..inf, 1/Gamma(n + 1)) = exp(1)', 40)).toBeGreaterThan(39);
  });
  it('E_4 = 1 + 240 sum sigma_3(n) q^n (Serre, A Course in Arithmetic, VII 4.2) against E(4, tau), Im tau >= 0.5', () => {
    expect(agree('1 + 240*sum(n = 1..inf, sigma(3, n)*q^n) = E(4, tau)', 40)).toBeGreaterThan(39);
    // with the divisor sum written out
    expect(agree('1 + 240*sum(n = 1..inf, sum(d | n, d^3)*q^n) = E(4, tau)', 30)).toBeGreaterThan(29);
  });
  it('Delta = q prod (1 - q^n)^24 (Jacobi, Serre VII 4.4) against Delta(tau)', () => {
    expect(agree('q*prod(n = 1..inf, (1 - q^n)^24) = Delta(tau)', 40)).toBeGreaterThan(39);
    expect(agree('q*prod(n = 1..inf, (1 - q^n)^24) = Delta(tau)', 30, { tau: Complex.of('-0.45', '0.5') })).toBeGreaterThan(29);
  });
  it('sum 1/n^2 = pi^2/6 (DLMF 25.6.1) converges algebraically: the budget runs out, a convergence error', () => {
    const e = evalError(() => ev('sum(n = 1..inf, 1/n^2)', 30));
    expect(e.code).toBe('convergence');
    expect(e.message).toMatch(new RegExp(`did not converge after ${INFINITE_SERIES_BUDGET} terms`));
    expect(e.fn).toBe('sum');
  });
  it('a parameter and tau together in the body', () => {
    // sum_{n>=0} (s q)^n = 1/(1 - s q)
    expect(agree('sum(n = 0..inf, (s*q)^n) = 1/(1 - s*q)', 30, { params: new Map([['s', Complex.of('0.5', '0.25')]]) }, ['for s in [0, 1]'])).toBeGreaterThan(29);
  });
});

describe('runtime errors with spans', () => {
  it('a non-integer divisor argument is a domain error at that argument', () => {
    const e = evalError(() => ev('sum(n = 1..2, sum(d | n/2, d))'));
    expect(e.code).toBe('domain');
    expect(e.span.column).toBe(25);
  });
  it('a non-integer computed bound is a domain error at the bound', () => {
    const e = evalError(() => ev('sum(n = 1..pi, n)'));
    expect(e.code).toBe('domain');
    expect(e.span.column).toBe(14);
  });
  it('a computed range beyond the maximum length', () => {
    const e = evalError(() => ev('sum(n = 1..10^6, n)'));
    expect(e.code).toBe('domain');
    expect(e.message).toMatch(/more than 100000 terms/);
  });
});

describe('limits (removable singularities)', () => {
  it('sin(s)/s -> 1 and (e^s - 1)/s -> 1 at s = 0 (DLMF 4.14, 4.2), (s - 1) zeta(s) -> 1 at s = 1 (DLMF 25.2.4)', () => {
    for (const P of [30, 60]) {
      expect(agree('limit(s -> 0, sin(s)/s) = 1', P)).toBeGreaterThan(P - 1);
      expect(agree('limit(s -> 0, (exp(s) - 1)/s) = 1', P)).toBeGreaterThan(P - 1);
      expect(agree('limit(s -> 1, (s - 1)*zeta(s)) = 1', P)).toBeGreaterThan(P - 1);
    }
  });
  it('a difference quotient of E_4 tends to its derivative (against dtau); a limit 0 converges', () => {
    expect(agree('limit(h -> 0, (E(4, tau + h) - E(4, tau))/h) = dtau(E(4, tau))', 30)).toBeGreaterThan(28);
    const r = ev('limit(s -> 0, sin(s))');
    expect(r.value.isZero() || r.value.abs().lt(r.scale.times('1e-30'))).toBe(true);
  });
  it('a pole or a jump is a convergence error at the limit', () => {
    for (const bad of ['limit(s -> 0, 1/s)', 'limit(s -> 0, abs(s)/s)']) {
      const e = evalError(() => ev(bad));
      expect(e.code).toBe('convergence');
      expect(e.message).toMatch(/did not converge after/);
      expect(e.span.column).toBe(3);
    }
  });
});

describe('series and operators together', () => {
  it('an operator in a sum body, and a sum under an operator', () => {
    // sum_{n=1}^{3} d/dtau tau^n = 1 + 2 tau + 3 tau^2
    expect(agree('sum(n = 1..3, dtau(tau^n)) = 1 + 2*tau + 3*tau^2', 30)).toBeGreaterThan(25);
    // q d/dq sum q^n = sum n q^n = q/(1 - q)^2
    expect(agree('qd(sum(n = 0..inf, q^n)) = q/(1 - q)^2', 30)).toBeGreaterThan(25);
  });
});
