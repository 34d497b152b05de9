/**
 * Building a DiagnosisContext (types.ts) for a claim: the samples the checker would draw,
 * both sides evaluated at its two precisions, and an `evaluate` callback for extra points.
 *
 * Conventions:
 * - Precisions as in run.ts: P1 = P + 5, P2 = P1 + max(10, ceil(P/3)). The values kept are
 *   the P2 ones; a sample's `digits` is what the P1 evaluation got right: -log10 of the
 *   checker's error estimate (verdict.ts: |LHS1 - LHS2| + |RHS1 - RHS2| over the sample's
 *   scale, so a side that vanishes, E_6(i), does not count as inaccurate), capped at P1 and
 *   at the relative accuracy a truncated construct reported (SideValue.limit).
 * - `agree` is the checker's own assessment (verdict.ts assessSample).
 * - A sample whose evaluation needs a point below y_min is replaced from the redraw stream,
 *   as run.ts does; one whose series ran out of terms (code 'convergence') is left out.
 *
 *   const ctx = contextFor(claim, { digits: 30, seed: 1, samples: 16, yMin: 0.02 });
 *   diagnose(ctx).text   // "LHS = 1/2 * RHS"
 */
import type { Decimal } from 'decimal.js';
import type { CheckableClaim, Sample, SideValue } from '../check/claim.js';
import type { SampleReport } from '../check/run.js';
import { drawSamples, type SamplingOptions } from '../check/sampler.js';
import { assessSample } from '../check/verdict.js';
import { ModvetError } from '../numeric/errors.js';
import { MAX_DIGITS, withDigits } from '../numeric/precision.js';
import type { DiagnosisContext, DiagnosisSample } from './types.js';

export interface ContextOptions extends SamplingOptions {
  /** The requested digits P (the claim's own `digits` clause wins). */
  digits: number;
}

/** Replacement draws for a sample that needed a point below y_min (as run.ts). */
const REDRAWS = 12;

function precisions(P: number): [number, number] {
  const p1 = Math.min(MAX_DIGITS, P + 5);
  return [p1, Math.min(MAX_DIGITS, p1 + Math.max(10, Math.ceil(P / 3)))];
}

/** Digits a truncated construct (a lattice sum) allowed, or Infinity. */
function limitDigits(v: SideValue): number {
  return v.limit === undefined || v.limit.rel.isZero() ? Infinity : Math.max(0, Math.floor(-v.limit.rel.log(10).toNumber()));
}

/** Digits from an assessment's error estimate (relative to the sample's scale), capped. */
function digitsOf(error: Decimal, cap: number): number {
  return error.isZero() ? cap : Math.max(0, Math.min(cap, Math.floor(-error.log(10).toNumber())));
}

/** The claim's context: its samples evaluated at P1 and P2 (see the header). */
export function contextFor(claim: CheckableClaim, opts: ContextOptions): DiagnosisContext {
  const P = claim.digits ?? opts.digits;
  const yMin = claim.yMin ?? opts.yMin;
  const [p1, p2] = precisions(P);
  const at = (s: Sample, d: number) => withDigits(Math.min(d, MAX_DIGITS), () => claim.evaluate(s, yMin));
  const drawn = drawSamples(claim, opts);
  const samples: DiagnosisSample[] = [];
  for (let k = 0; k < drawn.length; k++) {
    let s = drawn[k]!;
    for (let attempt = 0; ; attempt++) {
      try {
        const a1 = at(s, p1);
        const a2 = at(s, p2);
        const a = assessSample(a1, a2, P);
        const cap = Math.min(p1, limitDigits(a1.lhs), limitDigits(a1.rhs), limitDigits(a2.lhs), limitDigits(a2.rhs));
        samples.push({ sample: s, lhs: a2.lhs.value, rhs: a2.rhs.value, agree: a.outcome === 'agree', digits: digitsOf(a.error, cap) });
        break;
      } catch (e) {
        if (!(e instanceof ModvetError)) throw e;
        if (e.code === 'convergence') break;
        if (e.code !== 'ymin' || attempt >= REDRAWS || claim.points !== undefined) throw e;
        s = drawSamples(claim, opts, `redraw ${attempt}`)[k]!;
      }
    }
  }
  return {
    claim,
    P,
    samples,
    evaluate: (s, d) => at(s, d),
    params: claim.params.map((p) => p.name),
    ...(claim.group !== undefined ? { group: claim.group.variable } : {}),
  };
}

/**
 * A checker's SampleReport (run.ts) as a DiagnosisSample: the P2 values, with the digits
 * read off the assessment's error estimate (relative to the sample's scale) and capped at P1.
 */
export function diagnosisSample(r: SampleReport): DiagnosisSample {
  const cap = Math.min(r.p1, limitDigits(r.lhs), limitDigits(r.rhs));
  return { sample: r.sample, lhs: r.lhs.value, rhs: r.rhs.value, agree: r.assessment.outcome === 'agree', digits: digitsOf(r.assessment.error, cap) };
}

/** The context for samples the caller already has (e.g. every SampleReport of a run). */
export function contextFromSamples(claim: CheckableClaim, P: number, samples: DiagnosisSample[], yMin: number): DiagnosisContext {
  return {
    claim,
    P,
    samples,
    evaluate: (s, d) => withDigits(Math.min(d, MAX_DIGITS), () => claim.evaluate(s, yMin)),
    params: claim.params.map((p) => p.name),
    ...(claim.group !== undefined ? { group: claim.group.variable } : {}),
  };
}
