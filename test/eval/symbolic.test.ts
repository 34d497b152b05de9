// Exact derivatives of elementary operands (src/eval/symbolic.ts, through applyOperator in
// src/eval/derivative.ts) at 30 and 50 digits against closed forms derived by hand from the
// conventions tau = x + i y, d/dtau = (d_x - i d_y)/2, d/dtaubar = (d_x + i d_y)/2 (source
// beside each: "elementary calculus" is common practice); the error scale is the
// evaluator's, with no truncation part; fallbacks to finite differences.
import { describe, expect, it } from 'vitest';
import { Decimal } from 'decimal.js';
import type { Expr, Operator } from '../../src/lang/ast.js';
import { Complex } from '../../src/numeric/complex.js';
import { withDigits } from '../../src/numeric/precision.js';
import type { Val } from '../../src/eval/builtins.js';
import { applyOperator } from '../../src/eval/derivative.js';
import { EVAL_GUARD_DIGITS, evaluate, type EvalEnv } from '../../src/eval/evaluate.js';
import { isElementary, symbolicPartial } from '../../src/eval/symbolic.js';
import { expr, parse } from '../lang/util.js';
import { evalAt } from './util.js';

const TAU = Complex.of('0.1234', '1.1');
const TAU2 = Complex.of('-0.3711', '0.87');
const BOX = ['for s in box(-3 - 3i, 3 + 3i)'];
const WEIGHT = ['for s in box(-3 - 3i, 3 + 3i)', 'for k in [-12, 12]'];
const env = (s: [string, string], k = '0'): Partial<EvalEnv> => ({
  params: new Map([
    ['s', Complex.of(...s)],
    ['k', Complex.of(k)],
  ]),
});
const S_VALUES: [string, string][] = [
  ['2.5', '0'],
  ['-1.3', '0'],
  ['0.5', '3'],
  ['1.7', '-2.2'],
];

function operator(src: string, clauses: string[] = []): Operator {
  const e: Expr = expr(src, clauses);
  if (e.kind !== 'operator') throw new Error(`${src} is not an operator`);
  return e;
}

/** The error scale in units of |value| 10^-P: the evaluator's running bound, a few to ~50 here. */
function relScale(r: { value: Complex; scale: Decimal }): number {
  return r.scale.div(r.value.abs()).toNumber();
}

describe('closed forms (elementary calculus, common practice)', () => {
  for (const P of [30, 50]) {
    for (const tau of [TAU, TAU2]) {
      const { ev, agree } = evalAt(tau);
      it(`lap(y^s) = s(s-1) y^s, real and complex s (${P} digits, tau = ${tau})`, () => {
        for (const s of S_VALUES) {
          expect(agree('lap(y^s) = s*(s - 1)*y^s', P, env(s), BOX)).toBeGreaterThan(P - 2);
          expect(relScale(ev('lap(y^s)', P, env(s), BOX))).toBeLessThan(100);
        }
      });
      it(`dtau(tau^3) = 3 tau^2, dtaubar(taubar^2) = 2 taubar, qd(q) = q (${P} digits)`, () => {
        expect(agree('dtau(tau^3) = 3*tau^2', P)).toBeGreaterThan(P - 2);
        expect(agree('dtaubar(taubar^2) = 2*taubar', P)).toBeGreaterThan(P - 2);
        // q = exp(2 pi i tau): q d/dq q = q
        expect(agree('qd(q) = q', P)).toBeGreaterThan(P - 2);
        for (const e of ['dtau(tau^3)', 'dtaubar(taubar^2)', 'qd(q)']) expect(relScale(ev(e, P))).toBeLessThan(100);
      });
      it(`raise(k, y^s) = (s + k) y^(s-1) (${P} digits)`, () => {
        // d/dtau y^s = (1/2)(0 - i s y^(s-1)); 2i (-i/2) s y^(s-1) = s y^(s-1); plus (k/y) y^s
        for (const s of S_VALUES) {
          expect(agree('raise(k, y^s) = (s + k)*y^(s - 1)', P, env(s, '12'), WEIGHT)).toBeGreaterThan(P - 2);
          expect(relScale(ev('raise(k, y^s)', P, env(s, '12'), WEIGHT))).toBeLessThan(100);
        }
      });
      it(`lower(y^s) = s y^(s+1) (${P} digits)`, () => {
        // d/dtaubar y^s = (1/2)(0 + i s y^(s-1)); -2i y^2 (i/2) s y^(s-1) = s y^(s+1)
        for (const s of S_VALUES) {
          expect(agree('lower(y^s) = s*y^(s + 1)', P, env(s), BOX)).toBeGreaterThan(P - 2);
          expect(relScale(ev('lower(y^s)', P, env(s), BOX))).toBeLessThan(100);
        }
      });
      it(`serre(k, y^s) = -s y^(s-1)/(4 pi) - (k/12) E_2 y^s (${P} digits)`, () => {
        // qd y^s = (1/(2 pi i)) (-i/2) s y^(s-1) = -s y^(s-1)/(4 pi)
        for (const s of S_VALUES) {
          expect(agree('serre(k, y^s) = -s*y^(s - 1)/(4*pi) - k/12*E(2, tau)*y^s', P, env(s, '12'), WEIGHT)).toBeGreaterThan(P - 2);
        }
      });
      it(`lap(y q) = -4 pi y^2 q, lap(x^2 y^3) = y^2 (2 y^3 + 6 x^2 y) (${P} digits)`, () => {
        // Delta(y f) = y Delta f + 2 f_y for holomorphic f; f_y = i f' = -2 pi q for f = q
        expect(agree('lap(y*q) = -4*pi*y^2*q', P)).toBeGreaterThan(P - 2);
        expect(agree('lap(x^2*y^3) = y^2*(2*y^3 + 6*x^2*y)', P)).toBeGreaterThan(P - 2);
        expect(relScale(ev('lap(y*q)', P))).toBeLessThan(100);
      });
      it(`sqrt, log, exp and trigonometric operands (${P} digits)`, () => {
        // principal branches; d/dtau sqrt(tau) = 1/(2 sqrt(tau)); d/dtaubar log(taubar) = 1/taubar
        expect(agree('dtau(sqrt(tau)) = 1/(2*sqrt(tau))', P)).toBeGreaterThan(P - 2);
        expect(agree('dtaubar(log(taubar)) = 1/taubar', P)).toBeGreaterThan(P - 2);
        // d_y^2 sqrt(y) = -y^(-3/2)/4 and d_x^2 cosh(x) = cosh(x)
        expect(agree('lap(sqrt(y)*cosh(x)) = y^2*(cosh(x)*sqrt(y) - cosh(x)/(4*y^(3/2)))', P)).toBeGreaterThan(P - 2);
        // d/dtau of exp(-2 pi y) sin(x): (1/2)(cos(x) + 2 pi i sin(x)) exp(-2 pi y)
        expect(agree('dtau(exp(-2*pi*y)*sin(x)) = (cos(x) + 2*pi*i*sin(x))*exp(-2*pi*y)/2', P)).toBeGreaterThan(P - 2);
      });
    }
    it(`lap(exp(2 pi i tau)) = 0 exactly (holomorphic; ${P} digits)`, () => {
      const r = evalAt(TAU).ev('lap(exp(2*pi*i*tau))', P);
      expect(r.value.isZero()).toBe(true);
      expect(r.scale.isZero()).toBe(true);
    });
  }
});

describe('lets, points and frozen arguments', () => {
  const agreeLets = (lets: string, equation: string, P = 30): number => {
    const { ast, diagnostics } = parse(`${lets}claim "t"\n  for s in box(-3 - 3i, 3 + 3i)\n  ${equation}\n`);
    expect(diagnostics.map((d) => `${d.code} ${d.message}`)).toEqual([]);
    const c = ast.claims[0]!;
    return withDigits(P, () => {
      const e = { tau: TAU, ...env(['0.5', '3']) };
      const l = evaluate(c.lhs, e).value;
      const r = evaluate(c.rhs, e).value;
      const d = withDigits(P + 20, () => l.sub(r).abs().div(Decimal.max(l.abs(), r.abs())).toNumber());
      return d === 0 ? Infinity : -Math.log10(d);
    });
  };
  it('the derivative is taken at the point of the let call: F(2 tau) (elementary calculus)', () => {
    expect(agreeLets('let F(tau, s) = lap(y^s)\n', 'F(2*tau, s) = s*(s - 1)*(2*y)^s')).toBeGreaterThan(28);
    expect(agreeLets('let H(tau) = dtau(tau^3)\n', 'H(tau + 1/3) = 3*(tau + 1/3)^2')).toBeGreaterThan(28);
  });
  it('frozen let arguments stay constant: F(tau, y) = dtau(y tau^2) held at y is 2 y tau', () => {
    expect(agreeLets('let F(tau, w) = dtau(w*tau^2)\n', 'F(tau, y) = 2*y*tau')).toBeGreaterThan(28);
    expect(agreeLets('let F(tau, w, s) = lap(w*y^s)\n', 'F(tau, x, s) = x*s*(s - 1)*y^s')).toBeGreaterThan(28);
  });
});

describe('the exact path in applyOperator', () => {
  /** applyOperator with a context that records the digits of every operand evaluation. */
  function run(src: string, P: number, clauses: string[] = [], e: Partial<EvalEnv> = {}): { v: Val; digits: number[] } {
    const op = operator(src, clauses);
    const base = { tau: TAU, ...e };
    const digits: number[] = [];
    const val = (x: Expr, tau: Complex): Val => {
      const r = evaluate(x, { ...base, tau });
      return { v: r.value, s: r.scale };
    };
    const v = withDigits(P + EVAL_GUARD_DIGITS, () =>
      applyOperator(op, {
        run: (x) => val(x, TAU),
        evalAt: (x, tau) => {
          digits.push(Decimal.precision);
          return val(x, tau);
        },
        tau: () => TAU,
        yMin: undefined,
        guard: EVAL_GUARD_DIGITS,
      }),
    );
    return { v, digits };
  }
  it('one evaluation at the working precision; the check differences at CHECK_DIGITS only', () => {
    for (const [src, clauses, e] of [
      ['lap(y^s)', BOX, env(['0.5', '3'])],
      ['lower(y^s)', BOX, env(['0.5', '3'])],
      ['dtau(tau^3)', [], {}],
      ['lap(y*q)', [], {}],
    ] as const) {
      const { v, digits } = run(src, 50, [...clauses], e);
      expect(digits.filter((d) => d >= 50)).toEqual([55]);
      expect(v.s.div(v.v.abs()).toNumber()).toBeLessThan(100);
    }
    // a mixed operand: every evaluation is a node of a difference at raised precision
    const { digits } = run('lap(E(4, tau)*y)', 50);
    expect(digits.length).toBeGreaterThan(8);
    expect(Math.min(...digits)).toBeGreaterThan(55);
  });
});

describe('which operands are elementary', () => {
  it('elementary operands have symbolic partials, cached on the node', () => {
    for (const e of ['lap(y^s)', 'dtau(tau^3)', 'qd(q)', 'lap(Gamma(s)*y^s + euler*x)', 'dtau(sqrt(tau)*log(y))']) {
      const op = operator(e, BOX);
      expect(isElementary(op)).toBe(true);
      const yy = symbolicPartial(op, 'yy');
      expect(yy).not.toBeNull();
      expect(symbolicPartial(op, 'yy')).toBe(yy);
    }
  });
  it('every new node carries the operand span', () => {
    const op = operator('lap(y^s)', BOX);
    const spans: string[] = [];
    const walk = (e: Expr): void => {
      spans.push(`${e.span.start}-${e.span.end}`);
      if (e.kind === 'binary') [e.left, e.right].forEach(walk);
      else if (e.kind === 'neg' || e.kind === 'tauPart') walk(e.arg);
      else if (e.kind === 'call') e.args.forEach(walk);
    };
    walk(symbolicPartial(op, 'yy')!);
    const s = op.arg.span;
    // the parameter s keeps its own span; everything else is the operand's
    const param = op.arg.kind === 'binary' ? op.arg.right.span : s;
    for (const sp of spans) expect([`${s.start}-${s.end}`, `${param.start}-${param.end}`]).toContain(sp);
  });
  it('abs, re, modular and special functions of tau are not elementary', () => {
    for (const e of ['lap(abs(y)^s)', 'dtau(re(tau))', 'lap(y^s*Ens(s, tau))', 'lap(E(4, tau)*y)', 'dtau(Gamma(tau))', 'dtau(dtau(tau^3))']) {
      const op = operator(e, BOX);
      expect(isElementary(op)).toBe(false);
      expect(symbolicPartial(op, 'x')).toBeNull();
    }
  });
});

describe('finite differences where symbolic differentiation does not apply', () => {
  for (const P of [30, 50]) {
    it(`mixed operands: lap(E_4 y) = -4 pi y^2 (E_2 E_4 - E_6)/3 (Ramanujan 1916; ${P} digits)`, () => {
      // Delta(y f) = 2 f_y = 2 i f' for holomorphic f; f' = 2 pi i qd f, qd E_4 = (E_2 E_4 - E_6)/3
      const { agree, ev } = evalAt(TAU);
      expect(agree('lap(E(4, tau)*y) = -4*pi*y^2*(E(2, tau)*E(4, tau) - E(6, tau))/3', P)).toBeGreaterThan(P - 3);
      // lap(y^s Ens(s)) = y^2 (y^s Delta Ens + 2 s y^(s-1) d_y Ens + s(s-1) y^(s-2) Ens) checked
      // against the same finite differences of its parts: the mixed operand is differenced
      const l = ev('lap(y^s*Ens(s, tau))', P, env(['2.5', '0']), BOX);
      const r = ev('y^s*lap(Ens(s, tau)) + 2*s*y^(s + 1)*i*(dtau(Ens(s, tau)) - dtaubar(Ens(s, tau))) + s*(s - 1)*y^s*Ens(s, tau)', P, env(['2.5', '0']), BOX);
      const err = l.scale.plus(r.scale).times(new Decimal(10).pow(-P));
      expect(l.value.sub(r.value).abs().lte(err)).toBe(true);
    });
  }
  it('a wrong symbolic form is caught by the numeric check: d_x (x^2)^s at x < 0', () => {
    // nerdamer 1.1.13 simplifies (x^2)^s to x^(2s), false for x < 0 and non-integer s
    const op = operator('dtau((x^2)^s)', BOX);
    const dx = symbolicPartial(op, 'x');
    expect(dx).not.toBeNull();
    const e = { tau: TAU2, ...env(['0.3', '0']) };
    withDigits(30, () => {
      const claimed = evaluate(dx!, e).value;
      // d_x (x^2)^s = 2 s x (x^2)^(s-1)
      const truth = evaluate(expr('2*s*x*(x^2)^(s - 1)', BOX), e).value;
      expect(claimed.sub(truth).abs().gt(truth.abs().div(10))).toBe(true);
    });
    // applyOperator falls back to differences: d/dtau = (1/2) d_x here
    expect(evalAt(TAU2).agree('dtau((x^2)^s) = s*x*(x^2)^(s - 1)', 30, env(['0.3', '0']), BOX)).toBeGreaterThan(27);
    // at x > 0 the symbolic form is right and used
    expect(evalAt(TAU).agree('dtau((x^2)^s) = s*x*(x^2)^(s - 1)', 30, env(['0.3', '0']), BOX)).toBeGreaterThan(28);
  });
});
