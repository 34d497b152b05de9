/**
 * Checking one claim: draw its samples, evaluate both sides at two precisions, assess each
 * sample (verdict.ts) and aggregate.
 *
 * Precisions: P1 = P + 5 and P2 = P1 + max(10, ceil(P/3)) for the requested P. A sample
 * whose two evaluations disagree (precision lost to cancellation) is evaluated once more
 * with the lost digits added, up to ESCALATION_LIMIT digits, before it is called undecided.
 */
import { Decimal } from 'decimal.js';
import { ModvetError } from '../numeric/errors.js';
import { MAX_DIGITS, withDigits } from '../numeric/precision.js';
import { CheckableClaim, Sample, SideValue, Verdict } from './claim.js';
import { drawSamples, SamplingOptions } from './sampler.js';
import { aggregate, assessSample, GUARD_DIGITS, SampleAssessment } from './verdict.js';

export interface CheckOptions extends SamplingOptions {
  digits: number;
}

export interface SampleReport {
  sample: Sample;
  lhs: SideValue;
  rhs: SideValue;
  assessment: SampleAssessment;
  /** The precisions the assessment used. */
  p1: number;
  p2: number;
}

export interface ClaimResult {
  claim: CheckableClaim;
  verdict: Verdict;
  /** Whether the verdict is the expected one. */
  ok: boolean;
  /** Digits of agreement at the worst sample (0 when refuted or not evaluated). */
  digits: number;
  /** The requested digits. */
  requested: number;
  samples: number;
  timeMs: number;
  /** Why a claim is undecided or in error. */
  reason?: string;
  /** The worst sample: the largest residual. */
  worst?: SampleReport;
  /** What limited `digits` below the requested digits (a holding claim), e.g. 'a lattice sum'. */
  limitedBy?: string;
  /** Every evaluated sample, in order (for the diagnosis of a refuted claim; not reported). */
  reports: SampleReport[];
}

const ESCALATION_GUARD = 5;
/** Replacement draws for a sample whose evaluation needed a point below y_min. */
const REDRAWS = 12;

function precisions(P: number, extra = 0): [number, number] {
  const p1 = Math.min(MAX_DIGITS, P + 5 + extra);
  return [p1, Math.min(MAX_DIGITS + 200, p1 + Math.max(10, Math.ceil(P / 3)))];
}

function evaluateAt(claim: CheckableClaim, s: Sample, yMin: number, p: number) {
  return withDigits(Math.min(p, MAX_DIGITS), () => claim.evaluate(s, yMin));
}

function measure(claim: CheckableClaim, s: Sample, P: number, yMin: number): SampleReport {
  let [p1, p2] = precisions(P);
  let at1 = evaluateAt(claim, s, yMin, p1);
  let at2 = evaluateAt(claim, s, yMin, p2);
  let a = assessSample(at1, at2, P);
  const tol = new Decimal(10).pow(-(P - GUARD_DIGITS));
  if (a.outcome === 'undecided' && a.error.gte(tol) && !a.error.isZero()) {
    // precision was lost: add what was lost and try once more
    const lost = Math.ceil(a.error.div(tol).log(10).toNumber()) + ESCALATION_GUARD;
    const [q1, q2] = precisions(P, lost);
    if (q1 > p1 && q1 <= MAX_DIGITS) {
      [p1, p2] = [q1, q2];
      at1 = evaluateAt(claim, s, yMin, p1);
      at2 = evaluateAt(claim, s, yMin, p2);
      a = assessSample(at1, at2, P);
    }
  }
  return { sample: s, lhs: at2.lhs, rhs: at2.rhs, assessment: a, p1, p2 };
}

export function checkClaim(claim: CheckableClaim, opts: CheckOptions): ClaimResult {
  const t0 = performance.now();
  const P = claim.digits ?? opts.digits;
  const reports: SampleReport[] = [];
  const done = (r: Omit<ClaimResult, 'claim' | 'ok' | 'timeMs' | 'requested' | 'reports'>): ClaimResult => ({
    claim,
    ok: r.verdict === claim.expect,
    timeMs: performance.now() - t0,
    requested: P,
    reports,
    ...r,
  });
  let samples: Sample[];
  try {
    samples = drawSamples(claim, opts);
  } catch (e) {
    if (e instanceof ModvetError) return done({ verdict: 'error', digits: 0, samples: 0, reason: e.message });
    throw e;
  }
  // samples that ran out of terms have no values to show, only an outcome
  let unfinished = 0;
  let undecidedReason: string | undefined;
  const yMin = claim.yMin ?? opts.yMin;
  for (let k = 0; k < samples.length; k++) {
    let s = samples[k]!;
    try {
      let r: SampleReport | undefined;
      for (let attempt = 0; r === undefined; attempt++) {
        try {
          r = measure(claim, s, P, yMin);
        } catch (e) {
          // a transformed argument (e.g. -1/tau) fell below y_min: draw another point
          if (!(e instanceof ModvetError) || e.code !== 'ymin' || attempt >= REDRAWS || claim.points !== undefined) throw e;
          s = drawSamples(claim, opts, `redraw ${attempt}`)[k]!;
        }
      }
      reports.push(r);
      if (r.assessment.outcome === 'undecided') undecidedReason ??= r.assessment.reason;
    } catch (e) {
      if (!(e instanceof ModvetError)) throw e;
      if (e.code === 'convergence') {
        // a series that ran out of terms never passes: the claim cannot be decided here
        undecidedReason ??= e.message;
        unfinished++;
        continue;
      }
      return done({ verdict: 'error', digits: 0, samples: reports.length, reason: e.message });
    }
  }
  const outcomes = reports.map((r) => r.assessment.outcome);
  for (let k = 0; k < unfinished; k++) outcomes.push('undecided');
  const verdict = aggregate(outcomes);
  let worst: SampleReport | undefined;
  for (const r of reports) {
    if (worst === undefined || r.assessment.residual.gt(worst.assessment.residual)) worst = r;
  }
  const digits = verdict === 'refuted' || unfinished > 0 || reports.length === 0 ? 0 : Math.min(...reports.map((r) => r.assessment.digits));
  // the sample that set the digits says what limited them
  const limitedBy = verdict === 'holds' ? reports.find((r) => r.assessment.digits === digits)?.assessment.limitedBy : undefined;
  return done({
    ...(limitedBy !== undefined ? { limitedBy } : {}),
    verdict,
    digits,
    samples: reports.length + unfinished,
    ...(verdict === 'undecided' && undecidedReason !== undefined ? { reason: undecidedReason } : {}),
    ...(worst !== undefined ? { worst } : {}),
  });
}
