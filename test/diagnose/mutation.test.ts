// Mutation tests on the shipped library: every claim of identities/ that holds is broken on
// purpose (src/diagnose/mutate.ts: RHS times 2, 1/2, pi, 2 pi, -1, i, 1 + 10^-12; RHS + 1;
// the automorphy exponent + 2; s -> 1 - s), and every mutant must be refuted at 30 digits
// (kill rate 100%), and for at least 90% of the scalar-factor and shift mutants the
// diagnosis must name the injected constant exactly (LHS = (1/c) RHS', LHS = RHS' - 1).
// A mutant whose right side equals the original's at every sample (a right side that is 0,
// or symmetric under s -> 1 - s) cannot be refuted by any checker: it is counted as
// equivalent and listed, not as a survivor. The mutants draw 4 samples each (the original
// claims are checked at 16 by test/identities.test.ts); the shared evaluation memos
// (fromAst.ts SampleMemos) evaluate each original side once per sample and precision.
import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { Decimal } from 'decimal.js';
import { parseSource } from '../../src/lang/parser.js';
import type { Claim, Settings } from '../../src/lang/ast.js';
import { SampleMemos, toCheckable } from '../../src/check/fromAst.js';
import { checkClaim, type ClaimResult } from '../../src/check/run.js';
import { withDigits } from '../../src/numeric/precision.js';
import { evaluateConstant } from '../../src/eval/evaluate.js';
import { mutants, type Mutant } from '../../src/diagnose/mutate.js';
import { contextFromSamples, diagnosisSample } from '../../src/diagnose/context.js';
import { diagnose } from '../../src/diagnose/diagnose.js';
import { diagnosisBudget } from '../../src/diagnose/explain.js';
import type { Diagnosis } from '../../src/diagnose/types.js';

const DIR = fileURLToPath(new URL('../../identities', import.meta.url));
const P = 30;
const SAMPLES = 4;
const OPTS = { digits: P, samples: SAMPLES, seed: 1, yMin: 0.02 };

interface Outcome {
  claim: string;
  mutant: string;
  kind: Mutant['kind'];
  verdict: string;
  equivalent: boolean;
  recognised: boolean | null;
  diagnosis?: string;
}
const outcomes: Outcome[] = [];

/** The value of a claim-language constant expression at `digits` digits. */
function constantValue(text: string, digits: number) {
  const { ast, diagnostics } = parseSource(`claim "c"\n  ${text} = 0\n`, 'c.vet');
  if (diagnostics.length > 0 || ast.claims.length !== 1) return null;
  return withDigits(digits, () => evaluateConstant(ast.claims[0]!.lhs));
}

/** Whether the diagnosis names the injected constant: LHS = (1/c) RHS' for a factor c, LHS = RHS' - 1 for the shift. */
function namesInjected(m: Mutant, d: Diagnosis): boolean {
  if (d.constant === undefined || m.injected === undefined) return false;
  const wantKind = m.kind === 'factor' ? 'constant-factor' : 'constant-difference';
  if (d.kind !== wantKind) return false;
  return withDigits(60, () => {
    const found = constantValue(d.constant!.expr, 60);
    const c = constantValue(m.injected!, 60);
    if (found === null || c === null) return false;
    const want = m.kind === 'factor' ? c.inv() : c.neg();
    return found.sub(want).abs().lte(want.abs().times(new Decimal(10).pow(-20)));
  });
}

/** Whether the mutant's right side equals the original's at every common sample. */
function equivalent(base: ClaimResult, mutant: ClaimResult): boolean {
  if (base.reports.length === 0 || base.reports.length !== mutant.reports.length) return false;
  return base.reports.every((b, k) => {
    const m = mutant.reports[k]!;
    const scale = Decimal.max(b.rhs.scale, b.rhs.value.abs(), new Decimal('1e-300'));
    return m.rhs.value.sub(b.rhs.value).abs().lte(scale.times(new Decimal(10).pow(-(P - 2))));
  });
}

/**
 * Lets the test runner's worker answer its messages between claims: a synchronous stretch
 * of more than a minute makes vitest report a timeout of its own RPC, and fail the run.
 */
const breather = () => new Promise<void>((resolve) => setImmediate(resolve));

function claimsOf(file: string): { claim: Claim; defaults: Settings }[] {
  const text = readFileSync(join(DIR, file), 'utf8');
  const { ast } = parseSource(text, `identities/${file}`);
  return ast.claims.filter((c) => c.expect === 'holds').map((claim) => ({ claim, defaults: ast.defaults }));
}

const files = readdirSync(DIR).filter((f) => f.endsWith('.vet')).sort();

describe('mutants of the shipped claims', () => {
  for (const file of files) {
    it(`are refuted and diagnosed: ${file}`, async () => {
      for (const { claim, defaults } of claimsOf(file)) {
        await breather();
        const memos = new SampleMemos();
        const few = { ...claim, samples: Math.min(claim.samples ?? defaults.samples ?? SAMPLES, SAMPLES) };
        const base = checkClaim(toCheckable(few, defaults, memos), OPTS);
        expect(base.verdict, `${claim.name} itself`).toBe('holds');
        for (const m of mutants(claim)) {
          await breather();
          const r = checkClaim(toCheckable({ ...m.claim, samples: few.samples }, defaults, memos), OPTS);
          const eq = r.verdict !== 'refuted' && equivalent(base, r);
          let recognised: boolean | null = null;
          let text: string | undefined;
          if (r.verdict === 'refuted') {
            const ctx = { ...contextFromSamples(r.claim, P, r.reports.map(diagnosisSample), OPTS.yMin), extraBudget: diagnosisBudget(claim) };
            const d = diagnose(ctx);
            text = d.text;
            if (m.kind === 'factor' || m.kind === 'shift') recognised = namesInjected(m, d);
          }
          outcomes.push({ claim: `${file}: ${claim.name}`, mutant: m.label, kind: m.kind, verdict: r.verdict, equivalent: eq, recognised, ...(text !== undefined ? { diagnosis: text } : {}) });
        }
      }
    }, 600_000);
  }
});

it('kill rate 100%, recognition rate at least 90% (printed)', () => {
  const live = outcomes.filter((o) => !o.equivalent);
  const killed = live.filter((o) => o.verdict === 'refuted');
  const scalar = live.filter((o) => o.recognised !== null || ((o.kind === 'factor' || o.kind === 'shift') && o.verdict !== 'refuted'));
  const named = scalar.filter((o) => o.recognised === true);
  const pct = (a: number, b: number) => (b === 0 ? 'n/a' : `${((100 * a) / b).toFixed(1)}%`);
  console.log(`mutation kill rate: ${killed.length}/${live.length} = ${pct(killed.length, live.length)} (${outcomes.length - live.length} equivalent mutants left out)`);
  console.log(`recognition rate (scalar factors and shifts): ${named.length}/${scalar.length} = ${pct(named.length, scalar.length)}`);
  for (const o of outcomes.filter((x) => x.equivalent)) console.log(`  equivalent: ${o.claim} [${o.mutant}]`);
  for (const o of live.filter((x) => x.verdict !== 'refuted')) console.log(`  SURVIVED: ${o.claim} [${o.mutant}] -> ${o.verdict}`);
  for (const o of scalar.filter((x) => x.recognised === false)) console.log(`  not named: ${o.claim} [${o.mutant}] -> ${o.diagnosis ?? ''}`);
  expect(killed.length).toBe(live.length);
  expect(named.length / scalar.length).toBeGreaterThanOrEqual(0.9);
});
