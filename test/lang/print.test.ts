// Printing resolved expressions back in the claim language (src/lang/print.ts): precedence
// corner cases, substitution, fixes, and a round trip over every claim of identities/*.vet
// (print, re-parse in the same file, evaluate at a drawn sample at 30 digits).
import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Decimal } from 'decimal.js';
import { parseSource } from '../../src/lang/parser.js';
import { applyFix, printExpr, PrintError, rewriteEquation } from '../../src/lang/print.js';
import type { Claim } from '../../src/lang/ast.js';
import { toCheckable } from '../../src/check/fromAst.js';
import { drawSamples } from '../../src/check/sampler.js';
import type { Sample } from '../../src/check/claim.js';
import { withDigits } from '../../src/numeric/precision.js';
import { ModvetError } from '../../src/numeric/errors.js';
import { Complex } from '../../src/numeric/complex.js';
import { evaluate } from '../../src/eval/evaluate.js';
import { eq, expr, onlyClaim } from './util.js';

const IDENTITIES = fileURLToPath(new URL('../../identities/', import.meta.url));
/** Replay: MODVET_TEST_SEED=<n> npx vitest run test/lang/print.test.ts */
const SEED = Number(process.env.MODVET_TEST_SEED ?? 1);

const roundTrip = (e: string, clauses: string[] = []): string => printExpr(expr(e, clauses));

describe('printExpr: precedence', () => {
  const cases: [string, string][] = [
    ['-(x^2)', '-x^2'],
    ['-x^2', '-x^2'],
    ['(-x)^2', '(-x)^2'],
    ['-2^2', '-2^2'],
    ['x - (y - tau)', 'x - (y - tau)'],
    ['x - y - tau', 'x - y - tau'],
    ['x + (y + tau)', 'x + (y + tau)'],
    ['(x + y)*tau', '(x + y)*tau'],
    ['x/(y*tau)', 'x/(y*tau)'],
    ['x/y*tau', 'x/y*tau'],
    ['x*(y/tau)', 'x*(y/tau)'],
    ['2^-1', '2^-1'],
    ['2^(-1)', '2^-1'],
    ['2^3^2', '2^3^2'],
    ['(2^3)^2', '(2^3)^2'],
    ['2^(x*y)', '2^(x*y)'],
    ['x*-y', 'x*(-y)'],
    ['x - -y', 'x - (-y)'],
    ['--x', '-(-x)'],
    ['-x*y', '-x*y'],
    ['-(x*y)', '-(x*y)'],
    ['-(x + y)', '-(x + y)'],
    ['((x))', 'x'],
    ['2i^2 + 1e-3 + 0.5i', '2i^2 + 1e-3 + 0.5i'],
    ['E(4, tau)^2*E( 6 ,tau)', 'E(4, tau)^2*E(6, tau)'],
    ['exp(2*pi*i/3) + rho + euler', 'exp(2*pi*i/3) + rho + euler'],
    ['y^2*taubar + q', 'y^2*taubar + q'],
  ];
  for (const [src, want] of cases) {
    it(`${src} prints as ${want}`, () => {
      expect(roundTrip(src)).toBe(want);
      // and the printed form re-parses to the same print
      expect(roundTrip(want)).toBe(want);
    });
  }

  it('prints the group, parameters, operators, series, lattice sums and limits', () => {
    const g = ['for g in Gamma0(4)'];
    expect(roundTrip('E(4, g(tau))*(c*tau + d)^-4 + a*b', g)).toBe('E(4, g(tau))*(c*tau + d)^-4 + a*b');
    expect(roundTrip('lap(Ens(s, tau)) - s*(s - 1)*Ens(s, tau)', ['for s in [1.2, 3]'])).toBe('lap(Ens(s, tau)) - s*(s - 1)*Ens(s, tau)');
    expect(roundTrip('raise(k, E(k, tau)) + serre(4, E(4, tau)) + dtau(tau^2) + qd(q)', ['for k in {4, 6}'])).toBe(
      'raise(k, E(k, tau)) + serre(4, E(4, tau)) + dtau(tau^2) + qd(q)',
    );
    expect(roundTrip('sum(n = 1..inf, sigma(3, n)*q^n) + prod(n = 1..10, (1 - q^n)) + sum(d | 12, d^3)')).toBe(
      'sum(n = 1..inf, sigma(3, n)*q^n) + prod(n = 1..10, 1 - q^n) + sum(d | 12, d^3)',
    );
    expect(roundTrip('sum(n = -2..2, n^2)')).toBe('sum(n = -2..2, n^2)');
    expect(roundTrip('sum((m, n) != (0, 0), (m*tau + n)^-4) + sum(gcd(u, v) = 1, y^2/abs(u*tau + v)^4)')).toBe(
      'sum((m, n) != (0, 0), (m*tau + n)^-4) + sum(gcd(u, v) = 1, y^2/abs(u*tau + v)^4)',
    );
    expect(roundTrip('limit(s -> 1, (s - 1)*zeta(s)) + limit(t -> -1, t)')).toBe('limit(s -> 1, (s - 1)*zeta(s)) + limit(t -> -1, t)');
  });

  it('prints let calls as written, nested, without expanding them', () => {
    const src = [
      'let C = 2*pi',
      'let F(t) = t^2 + 1',
      'let Gw(s, tau) = F(s)*E(4, tau)',
      'claim "t"',
      '  Gw(F(2), tau)*C - F(Gw(1, 2*tau)) = 0',
      '',
    ].join('\n');
    expect(printExpr(onlyClaim(src).lhs)).toBe('Gw(F(2), tau)*C - F(Gw(1, 2*tau))');
  });
});

describe('printExpr: substitution', () => {
  const s1 = new Map([['s', '1 - s']]);
  const inv = new Map([['tau', '-1/tau']]);
  it('s -> 1 - s', () => {
    const c = eq('Estar(s, tau) = s*(s - 1)*Ens(s, tau)^2', ['for s in [1.2, 3]']);
    expect(printExpr(c.rhs, { substitute: s1 })).toBe('(1 - s)*(1 - s - 1)*Ens(1 - s, tau)^2');
    expect(printExpr(c.lhs, { substitute: s1 })).toBe('Estar(1 - s, tau)');
    expect(printExpr(c.rhs, { substitute: new Map([['s', 's']]) })).toBe('s*(s - 1)*Ens(s, tau)^2');
  });
  it('tau -> -1/tau, including the parts of tau', () => {
    expect(printExpr(expr('E(4, tau)*tau^2 + y + x*taubar + q'), { substitute: inv })).toBe(
      'E(4, -1/tau)*(-1/tau)^2 + im(-1/tau) + re(-1/tau)*conj(-1/tau) + exp(2*pi*i*(-1/tau))',
    );
    expect(printExpr(expr('2*tau'), { substitute: new Map([['tau', '4*tau']]) })).toBe('2*(4*tau)');
    expect(printExpr(expr('tau^2'), { substitute: new Map([['tau', '2i']]) })).toBe('2i^2');
  });
  it('tau -> -1/tau through lets: the call where tau is an argument, the expansion where the body uses tau', () => {
    const src = ['let F(tau) = y^2*E(4, tau)', 'let H(w) = w*E(6, tau)', 'claim "t"', '  F(tau) + H(2) = 0', ''].join('\n');
    expect(printExpr(onlyClaim(src).lhs, { substitute: inv })).toBe('F(-1/tau) + 2*E(6, -1/tau)');
  });
  it('the substituted text evaluates to the original at the substituted point', () => {
    const src = ['let F(tau) = y^2*E(4, tau)', 'let H(w) = w*E(6, tau)', 'claim "t"', '  F(tau) + H(2)*x + theta3(tau)*q = 0', ''].join('\n');
    const e = onlyClaim(src).lhs;
    const printed = printExpr(e, { substitute: inv });
    const back = onlyClaim(src.replace('F(tau) + H(2)*x + theta3(tau)*q', printed)).lhs;
    const tau = Complex.of('0.21', '0.93');
    const atInv = Complex.ONE.neg().div(tau);
    withDigits(30, () => {
      const want = evaluate(e, { tau: atInv }).value;
      const got = evaluate(back, { tau }).value;
      expect(got.sub(want).abs().div(want.abs()).lt(1e-25), `${got} vs ${want}`).toBe(true);
    });
  });
  it('refuses tau through a differential operator', () => {
    expect(() => printExpr(expr('lap(Ens(2, tau))'), { substitute: inv })).toThrow(PrintError);
    // a parameter substitution is fine there
    expect(printExpr(expr('lap(Ens(s, tau))', ['for s in [1.2, 3]']), { substitute: s1 })).toBe('lap(Ens(1 - s, tau))');
  });
});

describe('applyFix and rewriteEquation', () => {
  it('wraps the user text, parenthesised only where the template needs it', () => {
    const atomic = eq('E(4, tau)^2 = E(8, tau)');
    const product = eq('E(4, tau)^2 = 2*E(8, tau)');
    const power = eq('E(4, tau)^2 = E(4, tau)^2');
    const sum = eq('j(tau) = E(4, tau)^3/Delta(tau) - 744');
    const neg = eq('j(tau) = -E(4, tau)');
    const paren = eq('j(tau) = (E(4, tau) + 1)');
    const wrap = (template: string, c: Claim) => applyFix({ kind: 'wrap', template }, c);
    expect(wrap('2*pi*#', atomic)).toBe('2*pi*E(8, tau)');
    expect(wrap('2*pi*#', product)).toBe('2*pi*(2*E(8, tau))');
    expect(wrap('#/2', product)).toBe('2*E(8, tau)/2');
    expect(wrap('conj(#)', product)).toBe('conj(2*E(8, tau))');
    expect(wrap('(c*tau + d)^2*#', atomic)).toBe('(c*tau + d)^2*E(8, tau)');
    expect(wrap('#^2', power)).toBe('(E(4, tau)^2)^2');
    expect(wrap('2^#', power)).toBe('2^E(4, tau)^2');
    expect(wrap('# + 744', sum)).toBe('E(4, tau)^3/Delta(tau) - 744 + 744');
    expect(wrap('1 + #', sum)).toBe('1 + (E(4, tau)^3/Delta(tau) - 744)');
    expect(wrap('1 - #', neg)).toBe('1 - (-E(4, tau))');
    expect(wrap('-#', neg)).toBe('-(-E(4, tau))');
    expect(wrap('#*2', neg)).toBe('-E(4, tau)*2');
    expect(wrap('3*#', paren)).toBe('3*(E(4, tau) + 1)');
    expect(wrap('# + conj(#)', atomic)).toBe('E(8, tau) + conj(E(8, tau))');
  });
  it('substitutes in the printed right side', () => {
    const c = eq('Estar(s, tau) = Estar(s, tau)*s', ['for s in [1.2, 3]']);
    expect(applyFix({ kind: 'substitute', name: 's', by: '1 - s' }, c)).toBe('Estar(1 - s, tau)*(1 - s)');
    const t = eq('eta(-1/tau) = eta(tau)*sqrt(-i*tau)');
    expect(applyFix({ kind: 'substitute', name: 'tau', by: '-1/tau' }, t)).toBe('eta(-1/tau)*sqrt(-i*(-1/tau))');
  });
  it('rewrites the right side in the file text, over several lines too', () => {
    const text = ['# a file', 'claim "one"', '  E(4, tau)^2 =', '    2*E(8, tau)   # wrong', '', 'claim "two"', '  x = (y)', ''].join('\n');
    const { ast } = parseSource(text, 'r.vet');
    const [one, two] = ast.claims as [Claim, Claim];
    const fixed = rewriteEquation(text, one, applyFix({ kind: 'wrap', template: '#/2' }, one));
    expect(fixed).toBe(text.replace('2*E(8, tau)', '2*E(8, tau)/2'));
    const again = parseSource(fixed, 'r.vet');
    expect(again.diagnostics).toEqual([]);
    expect(again.ast.claims[0]!.rhsText).toBe('2*E(8, tau)/2');
    // the span of a parenthesised side covers its parentheses
    expect(rewriteEquation(text, two, 'tau')).toBe(text.replace('x = (y)', 'x = tau'));
  });
});

/** Both sides at the sample, at 30 digits. */
function values(c: Claim, defaults: Parameters<typeof toCheckable>[1], s: Sample): [Complex, Complex] {
  const ch = toCheckable(c, defaults);
  const r = withDigits(30, () => ch.evaluate(s, ch.yMin ?? 0.02));
  return [r.lhs.value, r.rhs.value];
}

function close(a: Complex, b: Complex): boolean {
  const d = a.sub(b).abs();
  return d.isZero() || d.lte(Decimal.max(a.abs(), b.abs()).times(1e-25));
}

describe('round trip over identities/*.vet', () => {
  const files = readdirSync(IDENTITIES).filter((f) => f.endsWith('.vet'));
  for (const f of files) {
    it(`${f}: print, re-parse and evaluate every claim side`, () => {
      const text = readFileSync(IDENTITIES + f, 'utf8');
      const { ast } = parseSource(text, f);
      expect(ast.claims.length).toBeGreaterThan(0);
      for (const c of ast.claims) {
        const lhs = printExpr(c.lhs);
        const rhs = printExpr(c.rhs);
        const newText = text.slice(0, c.equationSpan.start) + `${lhs} = ${rhs}` + text.slice(c.equationSpan.end);
        const re = parseSource(newText, f);
        const what = `${f}: "${c.name}": ${lhs} = ${rhs}`;
        expect(re.diagnostics.map((d) => d.message), what).toEqual([]);
        const c2 = re.ast.claims.find((k) => k.name === c.name)!;
        // idempotent
        expect(printExpr(c2.lhs), what).toBe(lhs);
        expect(printExpr(c2.rhs), what).toBe(rhs);
        // same values at a drawn sample (the next one when a transformed point is below y_min)
        const samples = drawSamples(toCheckable(c, ast.defaults), { seed: SEED, samples: 4, yMin: 0.02 });
        let done = false;
        for (const s of samples) {
          let before: [Complex, Complex];
          try {
            before = values(c, ast.defaults, s);
          } catch (e) {
            if (e instanceof ModvetError) continue;
            throw e;
          }
          const after = values(c2, ast.defaults, s);
          const at = `${what} at tau = ${s.tau}${s.gamma ? `, g = ${s.gamma}` : ''} ${[...s.params].map(([k, v]) => `${k} = ${v}`).join(', ')} (seed ${SEED})`;
          expect(close(before[0], after[0]), `LHS ${at}: ${before[0]} vs ${after[0]}`).toBe(true);
          expect(close(before[1], after[1]), `RHS ${at}: ${before[1]} vs ${after[1]}`).toBe(true);
          done = true;
          break;
        }
        expect(done, `${what}: no sample could be evaluated`).toBe(true);
      }
    }, 120_000);
  }
});
