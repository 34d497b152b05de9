// The evaluator against outside references (source beside each value), operator
// precedence as evaluated, exact literals, the group action, let expansions, the scale
// gauge (cancellation and zeros), runtime errors with spans, constants and regions.
import { describe, expect, it } from 'vitest';
import { Decimal } from 'decimal.js';
import { Mat2 } from '../../src/groups/matrix.js';
import { randomElement } from '../../src/groups/sample.js';
import { makeGroup } from '../../src/groups/subgroups.js';
import type { Expr } from '../../src/lang/ast.js';
import { Complex } from '../../src/numeric/complex.js';
import { withDigits } from '../../src/numeric/precision.js';
import { Random } from '../../src/numeric/random.js';
import { EvalError, evaluate, evaluateConstant, evaluateConstantWithError, evaluateRegion, inRegion, type EvalEnv } from '../../src/eval/evaluate.js';
import { eq, expr, parse } from '../lang/util.js';
import { evalAt, evalError } from './util.js';

const TAU = Complex.of('0.1234', '1.1');
const { ev, agree } = evalAt(TAU);

/** |a - b| relative to max(|b|, 1e-300), at P + 20 digits. */
function rel(a: Complex, b: Complex, P: number): number {
  return withDigits(P + 20, () => a.sub(b).abs().div(Decimal.max(b.abs(), '1e-300')).toNumber());
}

describe('outside references', () => {
  for (const P of [30, 60]) {
    it(`Euler: exp(i*pi) = -1; DLMF 5.4.6: Gamma(1/2)^2 = pi (${P} digits)`, () => {
      expect(agree('exp(i*pi) = -1', P)).toBeGreaterThan(P - 1);
      expect(agree('Gamma(1/2)^2 = pi', P)).toBeGreaterThan(P - 1);
    });
    it(`E_4(i) = 3 Gamma(1/4)^8 / (2 pi)^6 (math-reference.md closed form) (${P} digits)`, () => {
      expect(agree('E(4, i) = 3*Gamma(1/4)^8/(2*pi)^6', P)).toBeGreaterThan(P - 1);
    });
  }
  it('Gamma(1/4) = 3.62560990822190831193068515586767200299516768288 (OEIS A068466)', () => {
    expect(rel(ev('Gamma(1/4)', 45).value, Complex.of('3.62560990822190831193068515586767200299516768288'), 45)).toBeLessThan(1e-44);
  });
  it('Euler-Mascheroni gamma = 0.57721566490153286060651209008240243104215933594 (OEIS A001620)', () => {
    expect(rel(ev('euler', 45).value, Complex.of('0.57721566490153286060651209008240243104215933594'), 45)).toBeLessThan(1e-44);
  });
  it('rho = e^{2 pi i/3}: rho^3 = 1 and rho^2 + rho + 1 = 0 (definition)', () => {
    expect(agree('rho = exp(2*pi*i/3)')).toBeGreaterThan(29);
    expect(agree('rho^3 = 1')).toBeGreaterThan(29);
    expect(ev('rho^2 + rho + 1').value.abs().toNumber()).toBeLessThan(1e-29);
  });
  it('zeta(2) = pi^2/6 (DLMF 25.6.1); beta(1) = pi/4 (Leibniz, DLMF 25.11.?); xi(s) = xi(1 - s) (DLMF 25.4.?)', () => {
    expect(agree('zeta(2) = pi^2/6')).toBeGreaterThan(29);
    expect(agree('beta(1) = pi/4')).toBeGreaterThan(29);
    expect(agree('xi(0.3 + 2i) = xi(1 - (0.3 + 2i))')).toBeGreaterThan(28);
  });
  it('sigma(3, 10) = 1134 exactly (OEIS A001158); sigma(1/2, 6) = 1 + sqrt 2 + sqrt 3 + sqrt 6 (definition)', () => {
    const r = ev('sigma(3, 10)');
    expect(r.value.equals(Complex.of(1134))).toBe(true);
    expect(agree('sigma(1/2, 6) = 1 + sqrt(2) + sqrt(3) + sqrt(6)')).toBeGreaterThan(29);
  });
  it('bernoulli(12) = -691/2730 (DLMF table 24.2.1); bernoulli(1) = -1/2', () => {
    expect(agree('bernoulli(12) = -691/2730')).toBeGreaterThan(29);
    expect(ev('bernoulli(1)').value.equals(Complex.of('-0.5'))).toBe(true);
  });
  it('K_{1/2}(x) = sqrt(pi/(2x)) e^{-x} (DLMF 10.39.2); Gamma(1, x) = e^{-x} (DLMF 8.4.5, from memory)', () => {
    expect(agree('K(1/2, 2) = sqrt(pi/4)*exp(-2)')).toBeGreaterThan(29);
    expect(agree('Gamma(1, 3) = exp(-3)')).toBeGreaterThan(29);
  });
  it('eta(i) = Gamma(1/4) / (2 pi^{3/4}); j(i) = 1728; theta3(i) = pi^{1/4} / Gamma(3/4) (math-reference.md, theta.ts header)', () => {
    expect(agree('eta(i) = Gamma(1/4)/(2*pi^(3/4))')).toBeGreaterThan(29);
    expect(agree('j(i) = 1728')).toBeGreaterThan(29);
    expect(agree('theta3(i) = pi^(1/4)/Gamma(3/4)')).toBeGreaterThan(29);
  });
  it('Z(s, i) = 2 zeta(2s) Ens(s, i) = 4 zeta(s) beta(s) (math-reference.md) at s = 2', () => {
    expect(agree('2*zeta(4)*Ens(2, i) = 4*zeta(2)*beta(2)', 25)).toBeGreaterThan(24);
  });
  it('identities in tau: Delta = eta^24, Jacobi theta3^4 = theta2^4 + theta4^4 (DLMF 20.7.?), E_4^3 - E_6^2 = 1728 Delta', () => {
    expect(agree('Delta(tau) = eta(tau)^24')).toBeGreaterThan(28);
    expect(agree('theta3(tau)^4 = theta2(tau)^4 + theta4(tau)^4')).toBeGreaterThan(28);
    expect(agree('E(4, tau)^3 - E(6, tau)^2 = 1728*Delta(tau)')).toBeGreaterThan(27);
  });
});

describe('operators and literals', () => {
  it('-2^2 = -4 and 2^3^2 = 512 (common practice precedence), 2^-1 = 1/2', () => {
    expect(ev('-2^2').value.equals(Complex.of(-4))).toBe(true);
    expect(ev('2^3^2').value.equals(Complex.of(512))).toBe(true);
    expect(ev('2^-1').value.equals(Complex.of('0.5'))).toBe(true);
    expect(ev('(-8)^(1/3)').value.im.gt(0)).toBe(true); // principal branch
  });
  it('literals are parsed exactly by decimal.js: 1e-3, 0.5i, 0.1 + 0.2 = 0.3, 1/3', () => {
    const a = ev('1e-3');
    expect(a.value.re.eq('0.001') && a.value.im.isZero()).toBe(true);
    expect(ev('0.5i').value.equals(Complex.of(0, '0.5'))).toBe(true);
    expect(ev('4i').value.equals(Complex.of(0, 4))).toBe(true);
    expect(ev('0.1 + 0.2').value.equals(Complex.of('0.3'))).toBe(true);
    expect(ev('1/3', 40).value.re.toString()).toBe('0.' + '3'.repeat(40));
  });
  it('the parts of tau and q', () => {
    expect(ev('x').value.equals(Complex.of('0.1234'))).toBe(true);
    expect(ev('y').value.equals(Complex.of('1.1'))).toBe(true);
    expect(ev('taubar').value.equals(TAU.conj())).toBe(true);
    expect(agree('q = exp(2*pi*i*tau)')).toBeGreaterThan(29);
    expect(ev('tau - x - y*i').value.isZero()).toBe(true);
  });
  it('results carry the precision in force, and the precision is restored', () => {
    for (const P of [20, 50, 100]) {
      const v = ev('pi', P).value.re;
      expect(v.sd()).toBe(P);
    }
    expect(Decimal.precision).toBe(30);
  });
});

describe('the group action', () => {
  it('g(tau) = (a tau + b)/(c tau + d) for a given matrix: (2 1; 1 1) i = (3 + i)/2', () => {
    const g = { name: 'g', matrix: new Mat2(2n, 1n, 1n, 1n) };
    expect(ev('g(tau)', 30, { tau: Complex.I, group: g }, ['for g in SL2Z']).value.equals(Complex.of('1.5', '0.5'))).toBe(true);
    expect(ev('a*d - b*c', 30, { group: g }, ['for g in SL2Z']).value.equals(Complex.ONE)).toBe(true);
    // Im(g tau) = y / |c tau + d|^2 (math-reference.md)
    expect(agree('im(g(tau)) = y/abs(c*tau + d)^2', 30, { group: g }, ['for g in SL2Z'])).toBeGreaterThan(29);
  });
  it('weight-12 law of Delta at random elements of SL2Z and Gamma0(4) (math-reference.md)', () => {
    const rng = new Random(2024);
    for (const G of [makeGroup('SL2Z'), makeGroup('Gamma0', 4)]) {
      for (let k = 0; k < 3; k++) {
        const tau = Complex.of(rng.uniform(-0.5, 0.5).toFixed(6), rng.uniform(0.8, 1.5).toFixed(6));
        const matrix = randomElement(G, rng, tau, { yMin: 0.1 });
        const d = agree('Delta(g(tau)) = (c*tau + d)^12*Delta(tau)', 25, { tau, group: { name: 'g', matrix } }, ['for g in SL2Z']);
        expect(d, `tau = ${tau}, g = ${matrix}`).toBeGreaterThan(23);
      }
    }
  });
  it('lets with a tau parameter: F(g(tau)) uses Im(g tau) for y', () => {
    const { ast } = parse('let F(tau) = y^6*abs(Delta(tau))\nclaim "t"\n  for g in SL2Z\n  F(g(tau)) = F(tau)\n');
    const c = ast.claims[0]!;
    const env: EvalEnv = { tau: TAU, group: { name: 'g', matrix: new Mat2(1n, -1n, 1n, 0n) } };
    withDigits(30, () => {
      expect(rel(evaluate(c.lhs, env).value, evaluate(c.rhs, env).value, 30)).toBeLessThan(1e-28);
    });
  });
});

describe('the scale gauge', () => {
  it('exact inputs carry no error; rounded constants carry their size', () => {
    expect(ev('1e-3').scale.toNumber()).toBeCloseTo(0.001, 10); // only the final rounding
    expect(ev('pi').scale.toNumber()).toBeGreaterThan(3);
  });
  it('cancellation: the scale keeps the size of the terms that cancelled', () => {
    const r = ev('(1 + 1e-25) - 1');
    expect(r.value.re.eq('1e-25')).toBe(true);
    expect(r.scale.gte(1)).toBe(true);
    const s = ev('E(4, tau)^3 - E(6, tau)^2 - 1728*Delta(tau)', 30);
    const E43 = ev('abs(E(4, tau))^3', 30).value.re;
    expect(s.scale.gte(E43)).toBe(true);
    // the residual is rounding noise relative to the scale
    expect(s.value.abs().lte(s.scale.times('1e-28'))).toBe(true);
  });
  it('products carry scales through: 10^10 (A - B) scales the cancelled terms by 10^10', () => {
    const r = ev('10^10*((1 + 1e-25) - 1)');
    expect(r.scale.gte(1e10)).toBe(true);
  });
  it('zeros of E_6 and j: the value is tiny, the scale is the floor of the series terms (qseries.ts)', () => {
    for (const [e, P] of [['E(6, i)', 30], ['j(rho)', 30], ['E(4, rho)', 40]] as const) {
      const r = ev(e, P);
      expect(r.scale.gt(0), e).toBe(true);
      expect(r.value.abs().lte(r.scale.times(`1e-${P - 2}`)), e).toBe(true);
    }
  });
});

describe('argument errors near zeros (builtins.ts probe)', () => {
  // E_4(rho) = 0 and j(rho) = 0 (math-reference.md); rho is never exact, so the value at a
  // rounded rho is E_4'(rho) times the rounding: the scale must cover it
  it('a rounded point computed to many digits counts as rounded (error: its last digit)', () => {
    const rho100 = withDigits(100, () => evaluateConstant(expr('rho')));
    for (const e of ['E(4, tau)', 'j(tau)']) {
      const r = withDigits(30, () => evaluate(expr(e), { tau: rho100 }));
      expect(r.value.abs().lte(r.scale.times('1e-28')), e).toBe(true);
    }
  });
  it('a computed argument: E_2*(g(i)) = (c i + d)^2 E_2*(i) = 0 with g(i) = (5 + i)/13 rounded (math-reference.md)', () => {
    const g = { name: 'g', matrix: new Mat2(1n, 1n, 2n, 3n) };
    const r = ev('E2star(g(tau))', 30, { tau: Complex.I, group: g }, ['for g in SL2Z']);
    expect(r.value.abs().gt(0)).toBe(true);
    expect(r.value.abs().lte(r.scale.times('1e-28'))).toBe(true);
  });
  it('a stated tauError is used as given (evaluateConstantWithError gives one)', () => {
    const { value, error } = withDigits(30, () => evaluateConstantWithError(expr('rho')));
    expect(error.gt(0) && error.lt('1e-28')).toBe(true);
    const r = withDigits(30, () => evaluate(expr('E(4, tau)'), { tau: value, tauError: error }));
    expect(r.value.abs().lte(r.scale.times('1e-28'))).toBe(true);
    // stated as exact: only E_4's own (tiny) error counts, so the rounding of rho shows
    const exact = withDigits(30, () => evaluate(expr('E(4, tau)'), { tau: value, tauError: new Decimal(0) }));
    expect(exact.value.abs().gt(exact.scale.times('1e-28'))).toBe(true);
  });
  it('away from zeros no probe runs: the scale stays about |value|', () => {
    const g = { name: 'g', matrix: new Mat2(2n, 1n, 1n, 1n) };
    const r = ev('E(4, g(tau))', 30, { group: g }, ['for g in SL2Z']);
    expect(r.scale.div(r.value.abs()).toNumber()).toBeLessThan(3);
  });
});

describe('runtime errors carry the node span', () => {
  it('E(k, tau) with k not an even integer >= 2', () => {
    const e = evalError(() => ev('1 + E(3, tau)'));
    expect([e.code, e.span.line, e.span.column, e.fn]).toEqual(['domain', 2, 7, 'E']);
    expect(evalError(() => ev('E(k, tau)', 30, { params: new Map([['k', Complex.of('4.5')]]) }, ['for k in {4.5}'])).code).toBe('domain');
    expect(evalError(() => ev('E(4i, tau)')).code).toBe('domain');
    expect(ev('E(2*3, tau)').value.isFinite()).toBe(true);
  });
  it('division by zero, poles of log, Gamma and zeta', () => {
    const d = evalError(() => ev('2 + 1/(tau - tau)'));
    expect([d.code, d.span.column, d.fn]).toEqual(['pole', 7, '/']);
    expect(evalError(() => ev('log(0)')).code).toBe('pole');
    expect(evalError(() => ev('Gamma(-2)')).code).toBe('pole');
    expect(evalError(() => ev('zeta(1)')).code).toBe('pole');
  });
  it('domain errors of built-ins: tau below yMin or in the lower half plane, x <= 0 or not real', () => {
    expect(evalError(() => ev('eta(tau - 2*y*i)')).code).toBe('domain');
    const low = evalError(() => ev('eta(tau)', 30, { tau: Complex.of(0, '0.05'), yMin: 0.1 }));
    expect([low.code, low.span.column]).toEqual(['ymin', 3]); // the checker draws another point on 'ymin'
    expect(evalError(() => ev('K(1, -1)')).code).toBe('domain');
    expect(evalError(() => ev('K(1, 1 + i)')).code).toBe('domain');
    expect(evalError(() => ev('sigma(2, 4.5)')).code).toBe('domain');
    expect(evalError(() => ev('sigma(2, 0)')).code).toBe('domain');
  });
  it('a failure inside a let: the span is in the definition, the trace lists the call site', () => {
    const { ast } = parse('let f(s) = 1/s\nclaim "t"\n  2*f(0) = 1\n');
    const e = evalError(() => withDigits(30, () => evaluate(ast.claims[0]!.lhs, { tau: TAU })));
    expect([e.code, e.span.line, e.span.column]).toEqual(['pole', 1, 12]);
    expect(e.trace.map((s) => [s.line, s.column])).toEqual([[3, 5]]);
  });
  it("'unbound' when the environment lacks what the expression needs", () => {
    const c = eq('c + g(tau) = s', ['for g in SL2Z', 'for s in [0, 1]']);
    expect(evalError(() => withDigits(30, () => evaluate(c.lhs, { tau: TAU }))).code).toBe('unbound');
    expect(evalError(() => withDigits(30, () => evaluate(c.rhs, { tau: TAU }))).code).toBe('unbound');
    expect(evalError(() => evaluateConstant(expr('tau'))).code).toBe('unbound');
  });
});

describe('clause values', () => {
  it('evaluateConstant: box corners, points', () => {
    const c = eq('1 = 1', ['for s in box(1.2 - 4i, 3.5 + 4i)', 'at tau in {i, rho, 0.3 + 1.2i}']);
    const p = c.params[0]!;
    if (p.kind !== 'box') throw new Error('shape');
    withDigits(30, () => {
      expect(evaluateConstant(p.corner1).equals(Complex.of('1.2', -4))).toBe(true);
      expect(evaluateConstant(p.corner2).equals(Complex.of('3.5', 4))).toBe(true);
      const pts = c.at!.points.map((e: Expr) => evaluateConstant(e));
      expect(pts[0]!.equals(Complex.I)).toBe(true);
      expect(pts[2]!.equals(Complex.of('0.3', '1.2'))).toBe(true);
    });
  });
  it('regions: numeric bounds and membership', () => {
    const c = eq('1 = 1', ['region y >= 1/2 and abs(x) <= 1/2 and abs(tau) > 1']);
    const b = withDigits(30, () => evaluateRegion(c.region!));
    expect(b.map((x) => [x.quantity, x.op, x.value.toNumber()])).toEqual([
      ['y', '>=', 0.5], ['absx', '<=', 0.5], ['abstau', '>', 1],
    ]);
    expect(inRegion(b, Complex.of('0.1', '1.2'))).toBe(true);
    expect(inRegion(b, Complex.of('0.6', '1.2'))).toBe(false);
    expect(inRegion(b, Complex.of('0.1', '0.9'))).toBe(false);
    expect(inRegion(b, Complex.of('0', '1'))).toBe(false);
  });
});

describe('arguments beyond the supported ranges are typed errors, not hangs', () => {
  // common practice: every built-in bounds its own cost
  it('zeta far up the critical line, a huge weight, a huge Bernoulli index', async () => {
    const { parseSource } = await import('../../src/lang/parser.js');
    const { evaluate: ev, EvalError: EE } = await import('../../src/eval/evaluate.js');
    const { withDigits: wd } = await import('../../src/numeric/precision.js');
    const { Complex: C } = await import('../../src/numeric/complex.js');
    for (const text of ['zeta(1e10*i)', 'E(100000, tau)', 'bernoulli(100000)', 'beta(0.5 + 1e9*i)']) {
      const { ast, diagnostics } = parseSource(`claim "limit"\n  ${text} = 0\n`, 'limits.vet');
      expect(diagnostics).toEqual([]);
      const claim = ast.claims[0]!;
      let code: string | undefined;
      try {
        wd(20, () => ev(claim.lhs, { tau: C.I }));
      } catch (e) {
        code = e instanceof EE ? e.code : 'other';
      }
      expect(code, text).toBe('domain');
    }
  });
});
