// The search for a slip inside an expression (src/diagnose/repair.ts): the four deliberately
// wrong library claims that no global pattern fits get their slip named and an edit that
// holds; claims that hold, global slips and unrelated claims get null within the budget.
// Settings are the CLI defaults (30 digits, 16 samples, seed 1, y_min 0.02).
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { parseSource } from '../../src/lang/parser.js';
import { printExpr } from '../../src/lang/print.js';
import type { Claim, Settings } from '../../src/lang/ast.js';
import { toCheckable } from '../../src/check/fromAst.js';
import { checkClaim, type ClaimResult } from '../../src/check/run.js';
import { contextFromSamples, diagnosisSample } from '../../src/diagnose/context.js';
import { diagnose } from '../../src/diagnose/diagnose.js';
import { abbreviate, applyEdit, editCandidates, MAX_CANDIDATES, replaceSpan, repairSuggestion } from '../../src/diagnose/repair.js';

const OPTS = { digits: 30, samples: 16, seed: 1, yMin: 0.02 };
const dir = (f: string) => fileURLToPath(new URL(`../../identities/${f}`, import.meta.url));

interface Loaded {
  claim: Claim;
  fileText: string;
  defaults: Settings;
}

function fromText(fileText: string, name: string, file = 'test.vet'): Loaded {
  const { ast, diagnostics } = parseSource(fileText, file);
  expect(diagnostics).toEqual([]);
  const claim = ast.claims.find((c) => c.name === name);
  if (claim === undefined) throw new Error(`no claim ${name}`);
  return { claim, fileText, defaults: ast.defaults };
}

function fromLibrary(file: string, name: string): Loaded {
  return fromText(readFileSync(dir(file), 'utf8'), name, `identities/${file}`);
}

function inline(equation: string, clauses: string[] = []): Loaded {
  const text = `claim "c"\n  expect refuted\n${clauses.map((c) => `  ${c}\n`).join('')}  ${equation}\n`;
  return fromText(text, 'c');
}

function check(src: Loaded): ClaimResult {
  return checkClaim(toCheckable(src.claim, src.defaults), OPTS);
}

describe('repairSuggestion on the library', () => {
  const cases = [
    { file: 'fourier.vet', name: 'Fourier expansion with the factor 2 missing', edit: '4', side: 'lhs', has: '+ 4*sqrt(y)*sum(n = 1..inf,', words: 'needs a factor 2' },
    {
      file: 'fourier.vet',
      name: 'sigma_{2s-1} without the compensating power of n',
      edit: '(1/2 - s)',
      side: 'lhs',
      has: 'n^(1/2 - s)*sigma(2*s - 1, n)',
      words: 'wrong sign',
    },
    { file: 'theta.vet', name: 'q instead of q^(1/2): the nome doubled', edit: 'tau', side: 'lhs', has: 'theta3(tau)^4 = theta2(tau)^4 + theta4(tau)^4', words: 'needs a factor 1/2' },
    { file: 'theta.vet', name: "a sign in Jacobi's identity", edit: '+', side: 'rhs', has: 'theta3(tau)^4 = theta4(tau)^4 + theta2(tau)^4', words: 'wrong sign' },
  ];
  for (const c of cases) {
    it(`names the slip in "${c.name}"`, () => {
      const src = fromLibrary(c.file, c.name);
      const result = check(src);
      expect(result.verdict).toBe('refuted');
      // the global patterns do not fit: this is the repair's business
      const ctx = contextFromSamples(result.claim, result.requested, result.reports.map(diagnosisSample), OPTS.yMin);
      expect(diagnose(ctx).kind).toBe('unrecognised');

      const t0 = performance.now();
      const r = repairSuggestion(result, src, OPTS);
      const ms = performance.now() - t0;
      expect(r).not.toBeNull();
      console.log(`${c.name}: ${r!.diagnosis.text} (${ms.toFixed(0)} ms, check ${result.timeMs.toFixed(0)} ms)`);
      expect(r!.diagnosis.kind).toBe('term-slip');
      expect(r!.diagnosis.text).toContain(c.words);
      expect(r!.diagnosis.text.length).toBeLessThan(200);
      expect(r!.diagnosis.edit?.text).toBe(c.edit);
      expect(r!.diagnosis.edit?.side).toBe(c.side);
      expect(r!.suggestion.verdict).toBe('holds');
      expect(r!.suggestion.digits).toBeGreaterThanOrEqual(25);
      expect(r!.suggestion.equation).toContain(c.has);

      // the edited file parses, the claim no longer expects to be refuted, and it holds as parsed
      const again = fromText(r!.fileText, c.name, `identities/${c.file}`);
      expect(again.claim.expect).toBe('holds');
      expect(again.claim.text).toBe(r!.suggestion.equation);
      expect(r!.fileText.length).toBe(src.fileText.length - (src.claim.text.length - again.claim.text.length) - '  expect refuted\n'.length);
      expect(check(again).verdict).toBe('holds');
    });
  }
});

describe('repairSuggestion gives null', () => {
  it('for a claim that holds', () => {
    const src = fromLibrary('theta.vet', "Jacobi's quartic identity");
    const result = check(src);
    expect(result.verdict).toBe('holds');
    expect(repairSuggestion(result, src, OPTS)).toBeNull();
  });

  it('for a global factor (diagnose names it; no edit of a term is tried)', () => {
    const src = inline('E(4, tau)^2 = 2*E(8, tau)');
    const result = check(src);
    const ctx = contextFromSamples(result.claim, result.requested, result.reports.map(diagnosisSample), OPTS.yMin);
    expect(diagnose(ctx).kind).toBe('constant-factor');
    expect(editCandidates(src.claim, src.fileText).some((c) => c.label.startsWith('factor'))).toBe(false);
    expect(repairSuggestion(result, src, OPTS)).toBeNull();
  });

  it('for an unrelated wrong claim, within the caps', () => {
    const src = inline('E(4, tau) = E(6, tau)');
    const result = check(src);
    expect(result.verdict).toBe('refuted');
    expect(editCandidates(src.claim, src.fileText).length).toBeLessThanOrEqual(MAX_CANDIDATES);
    const t0 = performance.now();
    expect(repairSuggestion(result, src, OPTS)).toBeNull();
    expect(performance.now() - t0).toBeLessThan(10_000);
  });

  it('within a tiny budget', () => {
    const src = fromLibrary('theta.vet', "a sign in Jacobi's identity");
    expect(repairSuggestion(check(src), src, OPTS, { maxCandidates: 0 })).toBeNull();
  });
});

describe('editCandidates', () => {
  /** The candidates' texts after the edit, for a one-claim file. */
  const edited = (equation: string, clauses: string[] = []) => {
    const src = inline(equation, clauses);
    return editCandidates(src.claim, src.fileText).map((c) => ({ label: c.label, eq: fromText(applyEdit(src.fileText, src.claim, c.edit), 'c').claim.text }));
  };

  it('flips signs, scales terms and literals, and parenthesises where the grammar needs it', () => {
    const eqs = edited('3*E(4, tau) - E(4, tau)/2 = -E(4, tau)*E(6, tau) + E(6, tau)').map((e) => `${e.label}: ${e.eq}`);
    expect(eqs).toContain('sign: 3*E(4, tau) + E(4, tau)/2 = -E(4, tau)*E(6, tau) + E(6, tau)');
    expect(eqs).toContain('factor 2: 6*E(4, tau) - E(4, tau)/2 = -E(4, tau)*E(6, tau) + E(6, tau)');
    expect(eqs).toContain('factor 1/2: 1.5*E(4, tau) - E(4, tau)/2 = -E(4, tau)*E(6, tau) + E(6, tau)');
    expect(eqs).toContain('factor -1: -3*E(4, tau) - E(4, tau)/2 = -E(4, tau)*E(6, tau) + E(6, tau)');
    // a literal in a denominator: /2 times 2 is /1, dropped
    expect(eqs).toContain('factor 2: 3*E(4, tau) - E(4, tau) = -E(4, tau)*E(6, tau) + E(6, tau)');
    expect(eqs).toContain('factor -1: 3*E(4, tau) - E(4, tau)/2 = E(4, tau)*E(6, tau) + E(6, tau)');
    expect(eqs).toContain('factor 2: 3*E(4, tau) - E(4, tau)/2 = 2*(-E(4, tau))*E(6, tau) + E(6, tau)');
    expect(eqs).toContain('argument 1/2: 3*E(4, tau/2) - E(4, tau)/2 = -E(4, tau)*E(6, tau) + E(6, tau)');
  });

  it('negates exponents of series variables, sigma indices, and the nome', () => {
    const eqs = edited('sum(n = 1..inf, n^-s*sigma(k, n)*q^n) = exp(2*pi*i*tau)', ['for s in {2}', 'for k in {3}']).map((e) => `${e.label}: ${e.eq}`);
    expect(eqs).toContain('exponent sign: sum(n = 1..inf, n^s*sigma(k, n)*q^n) = exp(2*pi*i*tau)');
    expect(eqs).toContain('index sign: sum(n = 1..inf, n^-s*sigma(-k, n)*q^n) = exp(2*pi*i*tau)');
    expect(eqs).toContain('q -> q^2: sum(n = 1..inf, n^-s*sigma(k, n)*(q^2)^n) = exp(2*pi*i*tau)');
    expect(eqs).toContain('q -> q^(1/2): sum(n = 1..inf, n^-s*sigma(k, n)*exp(pi*i*tau)^n) = exp(2*pi*i*tau)');
    expect(eqs).toContain('argument 1/2: sum(n = 1..inf, n^-s*sigma(k, n)*q^n) = exp(pi*i*tau)');
  });

  it('gives edits that re-parse to the tree it evaluates, on every library claim', () => {
    let n = 0;
    for (const file of ['eisenstein.vet', 'eta.vet', 'expansions.vet', 'fourier.vet', 'lattice.vet', 'nonholomorphic.vet', 'operators.vet', 'theta.vet']) {
      const text = readFileSync(dir(file), 'utf8');
      const { ast } = parseSource(text, file);
      for (const claim of ast.claims) {
        for (const c of editCandidates(claim, text)) {
          const again = parseSource(applyEdit(text, claim, c.edit), file).ast.claims.find((x) => x.span.line === claim.span.line);
          expect(again, `${claim.name}: ${c.label}`).toBeDefined();
          const printed = (x: Claim) => `${printExpr(x.lhs)} = ${printExpr(x.rhs)}`;
          let want: string;
          try {
            want = printed(c.claim);
          } catch {
            continue; // no surface form to compare (an operator taken at a let's argument)
          }
          expect(printed(again!), `${claim.name}: ${c.label}`).toBe(want);
          n++;
        }
      }
    }
    expect(n).toBeGreaterThan(50);
  });
});

describe('text helpers', () => {
  it('replaceSpan and abbreviate', () => {
    expect(replaceSpan('a + b', 2, 3, '-')).toBe('a - b');
    expect(abbreviate('2*sqrt(y)*sum(n = 1..inf, n^(s - 1/2)*sigma(1 - 2*s, n)*K(s - 1/2, 2*pi*n*y)*cos(2*pi*n*x))')).toBe('2*sqrt(y)*sum(...)');
    expect(abbreviate('theta4(tau)^4 +   theta2(tau)^4')).toBe('theta4(tau)^4 + theta2(tau)^4');
    expect(abbreviate('x'.repeat(100)).length).toBe(60);
  });
});
