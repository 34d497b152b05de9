// Differential operators (src/eval/derivative.ts) at 30 and 50 digits against outside
// references, the source beside each: eigenvalues of the Laplacian, Ramanujan's identities,
// Serre derivatives, the q-series of E_4' term by term, the Maass operators on y^s by hand;
// exact answers for tau-free and holomorphic operands; the error estimate; the one-sided
// stencil at y_min; nesting; the let semantics.
import { describe, expect, it } from 'vitest';
import { Decimal } from 'decimal.js';
import { Mat2 } from '../../src/groups/matrix.js';
import { Complex } from '../../src/numeric/complex.js';
import { pi } from '../../src/numeric/constants.js';
import { withDigits } from '../../src/numeric/precision.js';
import { sigma } from '../../src/special/divisors.js';
import { fornbergWeights } from '../../src/eval/derivative.js';
import { evaluate, type EvalEnv } from '../../src/eval/evaluate.js';
import { eq, expr, parse } from '../lang/util.js';

const TAU = Complex.of('0.1234', '1.1');
const TAU2 = Complex.of('-0.3711', '0.87');

/** Digits of agreement of `lhs = rhs` at P digits (P + 20 when exactly equal after rounding). */
function agree(equation: string, P: number, env: Partial<EvalEnv> = {}, clauses: string[] = [], lets = ''): number {
  const src = `${lets}claim "t"\n${clauses.map((c) => `  ${c}\n`).join('')}  ${equation}\n`;
  const { ast, diagnostics } = parse(src);
  expect(diagnostics).toEqual([]);
  const c = ast.claims[0]!;
  return withDigits(P, () => {
    const l = evaluate(c.lhs, { tau: TAU, ...env }).value;
    const r = evaluate(c.rhs, { tau: TAU, ...env }).value;
    const d = withDigits(P + 20, () => l.sub(r).abs().div(Decimal.max(l.abs(), r.abs())).toNumber());
    return d === 0 ? P + 20 : -Math.log10(d);
  });
}
const params = (s: string, im = '0') => ({ params: new Map([['s', Complex.of(s, im)]]) });

describe('Laplacian eigenvalues (sign: lap y^s = s(s-1) y^s)', () => {
  for (const P of [30, 50]) {
    it(`lap(y^s) = s(s-1) y^s, real and complex s (direct computation, common practice) (${P} digits)`, () => {
      for (const [re, im] of [['2.5', '0'], ['-1.3', '0'], ['0.5', '3'], ['1.7', '-2.2']] as const) {
        expect(agree('lap(y^s) = s*(s - 1)*y^s', P, params(re, im), ['for s in box(-3 - 3i, 3 + 3i)'])).toBeGreaterThan(P - 1);
      }
    });
    it(`lap Ens(s) = s(s-1) Ens(s) at real s (Zagier 1981; math-reference.md) (${P} digits)`, () => {
      for (const tau of [TAU, TAU2]) {
        expect(agree('lap(Ens(s, tau)) = s*(s - 1)*Ens(s, tau)', P, { tau, ...params('2.5') }, ['for s in [1, 3]'])).toBeGreaterThan(P - 3);
      }
    });
    it(`lap Ens(s) = s(s-1) Ens(s) at complex s (Zagier 1981; math-reference.md) (${P} digits)`, () => {
      expect(agree('lap(Ens(s, tau)) = s*(s - 1)*Ens(s, tau)', P, params('0.5', '3'), ['for s in box(0, 1 + 4i)'])).toBeGreaterThan(P - 3);
    });
  }
  it('the opposite sign convention is clearly wrong', () => {
    expect(agree('lap(Ens(s, tau)) = s*(1 - s)*Ens(s, tau)', 30, params('2.5'), ['for s in [1, 3]'])).toBeLessThan(1);
  });
});

describe('Ramanujan and Serre (Ramanujan 1916; Zagier, Elliptic modular forms and their applications, Prop. 15)', () => {
  for (const P of [30, 50]) {
    it(`qd(E_2), qd(E_4), qd(E_6) (${P} digits)`, () => {
      for (const tau of [TAU, TAU2]) {
        expect(agree('qd(E(2, tau)) = (E(2, tau)^2 - E(4, tau))/12', P, { tau })).toBeGreaterThan(P - 2);
        expect(agree('qd(E(4, tau)) = (E(2, tau)*E(4, tau) - E(6, tau))/3', P, { tau })).toBeGreaterThan(P - 2);
        expect(agree('qd(E(6, tau)) = (E(2, tau)*E(6, tau) - E(4, tau)^2)/2', P, { tau })).toBeGreaterThan(P - 2);
      }
    });
    it(`serre(4, E_4) = -E_6/3 and serre(6, E_6) = -E_4^2/2 (${P} digits)`, () => {
      expect(agree('serre(4, E(4, tau)) = -E(6, tau)/3', P)).toBeGreaterThan(P - 2);
      expect(agree('serre(6, E(6, tau)) = -E(4, tau)^2/2', P)).toBeGreaterThan(P - 2);
    });
    it(`qd(E_4) = 240 sum n sigma_3(n) q^n, summed here with exact sigma (divisors.ts) (${P} digits)`, () => {
      withDigits(P, () => {
        const got = evaluate(expr('qd(E(4, tau))'), { tau: TAU }).value;
        const ref = withDigits(P + 10, () => {
          const q = TAU.scale(pi().times(2)).mulI().exp();
          let sum = Complex.ZERO;
          let qn = Complex.ONE;
          // |q| = e^{-2 pi 1.1} < 1e-2.9: 60 terms are far beyond 60 digits
          for (let n = 1; n <= 60; n++) {
            qn = qn.mul(q);
            sum = sum.add(qn.scale(new Decimal((BigInt(n) * sigma(3, n)).toString())));
          }
          return sum.scale(240);
        });
        const d = withDigits(P + 20, () => got.sub(ref).abs().div(ref.abs()).toNumber());
        expect(d).toBeLessThan(10 ** -(P - 2));
      });
    });
  }
});

describe('Maass operators on y^s, by hand', () => {
  // d/dtau y^s = (1/2)(d_x - i d_y) y^s = -(i/2) s y^(s-1), d/dtaubar y^s = (i/2) s y^(s-1), so
  // L y^s = -2i y^2 (i/2) s y^(s-1) = s y^(s+1) and R_k y^s = 2i (-(i/2)) s y^(s-1) + k y^(s-1) = (s + k) y^(s-1)
  for (const P of [30, 50]) {
    it(`lower(y^s) = s y^(s+1), raise(0, y^s) = s y^(s-1), raise(k, y^s) = (s + k) y^(s-1) (${P} digits)`, () => {
      for (const [re, im] of [['2.5', '0'], ['0.5', '3']] as const) {
        const c = ['for s in box(-3 - 3i, 3 + 3i)'];
        expect(agree('lower(y^s) = s*y^(s + 1)', P, params(re, im), c)).toBeGreaterThan(P - 1);
        expect(agree('raise(0, y^s) = s*y^(s - 1)', P, params(re, im), c)).toBeGreaterThan(P - 1);
        expect(agree('raise(12, y^s) = (s + 12)*y^(s - 1)', P, params(re, im), c)).toBeGreaterThan(P - 1);
      }
    });
  }
  it('dtau and dtaubar of x, y, taubar: 1/2, -i/2, 0 and 1/2, i/2, 1', () => {
    expect(agree('dtau(x) = 1/2', 30)).toBeGreaterThan(29);
    expect(agree('dtau(y) = -i/2', 30)).toBeGreaterThan(29);
    expect(agree('dtaubar(y) = i/2', 30)).toBeGreaterThan(29);
    expect(agree('dtaubar(taubar) = 1', 30)).toBeGreaterThan(29);
    withDigits(30, () => expect(evaluate(expr('dtau(taubar)'), { tau: TAU }).value.abs().toNumber()).toBeLessThan(1e-29));
  });
});

describe('exact answers, nesting, lets', () => {
  it('a tau-free operand: 0 exactly, or its multiple', () => {
    withDigits(30, () => {
      for (const e of ['lap(Gamma(1/3))', 'dtau(pi)', 'dtaubar(zeta(3))', 'qd(2)', 'lower(s)']) {
        const r = evaluate(expr(e, ['for s in [1, 2]']), { tau: TAU, ...params('1.5') });
        expect(r.value.isZero()).toBe(true);
        expect(r.scale.isZero()).toBe(true);
      }
    });
    expect(agree('raise(2, pi) = 2*pi/y', 30)).toBeGreaterThan(29);
    expect(agree('serre(4, 3) = -E(2, tau)', 30)).toBeGreaterThan(29);
  });
  it('holomorphic operands: lap, dtaubar and lower are exactly 0 (proved from the AST)', () => {
    withDigits(30, () => {
      for (const e of ['lap(E(4, tau))', 'dtaubar(eta(tau)^2 / j(tau))', 'lower(exp(tau) + q)']) {
        expect(evaluate(expr(e), { tau: TAU }).value.isZero()).toBe(true);
      }
    });
  });
  it('nesting: lap(lap(y^s)) = (s(s-1))^2 y^s and dtau(dtau(tau^3)) = 6 tau', () => {
    expect(agree('lap(lap(y^s)) = (s*(s - 1))^2*y^s', 30, params('1.5', '0.5'), ['for s in box(0, 2 + i)'])).toBeGreaterThan(28);
    expect(agree('dtau(dtau(tau^3)) = 6*tau', 30)).toBeGreaterThan(28);
  });
  it('non-holomorphic operands use both directions: dtau(E2star) = 2 pi i qd(E_2) - 3i/(2 pi y^2)', () => {
    // E2* = E_2 - 3/(pi y); d/dtau (1/y) = (-i/2)(-1/y^2) = i/(2 y^2)
    expect(agree('dtau(E2star(tau)) = 2*pi*i*(E(2, tau)^2 - E(4, tau))/12 - 3*i/(2*pi*y^2)', 30)).toBeGreaterThan(28);
  });
  it('in a let with a tau parameter the result is taken at the argument: F(2 tau) = 2 (2 tau)', () => {
    expect(agree('F(2*tau) = 4*tau', 30, {}, [], 'let F(tau) = dtau(tau^2)\n')).toBeGreaterThan(29);
    // the let's other arguments are held at their values while the operand's tau moves
    const lets = 'let F(tau, w) = dtau(w*tau^2)\n';
    expect(agree('F(tau, y) = 2*y*tau', 30, {}, [], lets)).toBeGreaterThan(29);
    expect(agree('F(2*tau, y) = 4*y*tau', 30, {}, [], lets)).toBeGreaterThan(29);
    withDigits(30, () => {
      const c = parse('let H(tau, w) = dtaubar(w*E(4, tau))\nclaim "t"\n  H(tau, x) = 0\n').ast.claims[0]!;
      const r = evaluate(c.lhs, { tau: TAU });
      expect(r.value.abs().toNumber()).toBeLessThan(1e-28);
    });
    // the operator commutes with the Moebius action for lap (SL(2,R) invariance)
    expect(agree('L(g(tau)) = lap(Ens(2.5, g(tau)))', 30, { group: { name: 'g', matrix: new Mat2(0n, -1n, 1n, 0n) } }, ['for g in SL2Z'], 'let L(tau) = lap(Ens(2.5, tau))\n')).toBeGreaterThan(27);
  });
});

describe('step, precision and error estimate', () => {
  it('Fornberg weights: the classical central formulas', () => {
    const w = (nodes: number[], k: number) => fornbergWeights(nodes, k).map((f) => `${f.n}/${f.d}`);
    expect(w([-1, 0, 1], 1)).toEqual(['-1/2', '0/1', '1/2']);
    expect(w([-1, 0, 1], 2)).toEqual(['1/1', '-2/1', '1/1']);
    expect(w([-2, -1, 0, 1, 2], 2)).toEqual(['-1/12', '4/3', '-5/2', '4/3', '-1/12']);
    expect(w([0, 1, 2], 1)).toEqual(['-3/2', '2/1', '-1/2']);
  });
  it('the scale bounds the actual error and stays near the working precision', () => {
    for (const P of [30, 50]) {
      withDigits(P, () => {
        const r = evaluate(expr('qd(E(4, tau))'), { tau: TAU });
        const ref = evaluate(expr('(E(2, tau)*E(4, tau) - E(6, tau))/3'), { tau: TAU }).value;
        const err = r.value.sub(ref).abs();
        const bound = r.scale.times(new Decimal(10).pow(-P));
        expect(err.lte(bound)).toBe(true);
        // not a hidden loss: the bound is within 100 units of |value|
        expect(r.scale.div(r.value.abs()).toNumber()).toBeLessThan(100);
      });
    }
  });
  it('at y = y_min the y-stencil turns one-sided and keeps its accuracy', () => {
    const tau = Complex.of('0.21', '0.5');
    for (const P of [30, 50]) {
      expect(agree('lap(Ens(s, tau)) = s*(s - 1)*Ens(s, tau)', P, { tau, yMin: 0.5, ...params('2.5') }, ['for s in [1, 3]'])).toBeGreaterThan(P - 3);
    }
  });
  it('a kink inside the stencil: the step adapts past it, or it is a convergence error, never a pass', () => {
    // the kink of |x| 1e-11 from tau: the refined step gets below it, d/dtau |x| = 1/2
    expect(agree('dtau(abs(x)) = 1/2', 30, { tau: Complex.of('1e-11', '1.1') })).toBeGreaterThan(28);
    // 1e-30 from tau: no step the refinements reach is below it
    let code = '';
    try {
      withDigits(30, () => evaluate(expr('dtau(abs(x))'), { tau: Complex.of('1e-30', '1.1') }));
    } catch (e) {
      code = (e as { code: string }).code;
    }
    expect(code).toBe('convergence');
  });
  it('an operand that fails at a shifted point reports the operand node', () => {
    const c = eq('lap(Ens(2, tau)) = 0');
    let code = '';
    try {
      withDigits(30, () => evaluate(c.lhs, { tau: Complex.of('0', '0.3'), yMin: 0.5 }));
    } catch (e) {
      code = (e as { code: string }).code;
    }
    expect(code).toBe('ymin');
  });
});
