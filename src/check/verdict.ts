/**
 * Deciding a claim from its samples.
 *
 * Each sample is evaluated at two precisions P1 < P2 (both above the requested P). With
 * S the scale of the sample (below), at each sample:
 *   residual r  = |LHS - RHS| / S at P2 (and r1 the same at P1),
 *   error    e  = (|LHS1 - LHS2| + |RHS1 - RHS2|) / S, which bounds the error of the P1
 *                 evaluation (the P2 one is far smaller),
 *   tolerance t = 10^-(P - GUARD_DIGITS).
 * The sample agrees when r < t and e < t; it disagrees when r > t, r > SEPARATION e and r1,
 * r agree to a factor 2 (the residual is real, not noise); otherwise it is undecided.
 * Scale: S = max(|LHS|, |RHS|), except where both sides vanish against the terms that
 * formed them (max(|LHS|, |RHS|) < t G, G the larger cancellation gauge of the two sides),
 * where S = G: then "agree" means "agree to P digits of the terms".
 * Limited accuracy: when a side carries a truncation limit (evaluate.ts: a lattice sum
 * reached only the relative accuracy L > t), the tolerance is L instead of t: the sample
 * agrees when r < L and e < L, and reports at most -log10 L digits ("limited by a lattice
 * sum"); it disagrees only when r > SEPARATION L as well, so that an extrapolation that
 * fell short of its estimate cannot refute a claim.
 * A claim holds when every sample agrees, is refuted when some sample disagrees, and is
 * undecided otherwise. Agreement is numerical evidence, not proof.
 */
import { Decimal } from 'decimal.js';
import { SideValue, Verdict } from './claim.js';

export const GUARD_DIGITS = 2;
/** How much larger than the error estimate a residual must be to refute. */
export const SEPARATION = 1000;

export interface SampleAssessment {
  outcome: 'agree' | 'disagree' | 'undecided';
  /** Relative residual at P2 (see the header); 0 when both sides are exactly equal. */
  residual: Decimal;
  /** Estimated relative error of the P1 evaluation. */
  error: Decimal;
  /** Digits of agreement, capped at the requested digits. */
  digits: number;
  /** Why the sample is undecided. */
  reason?: string;
  /** Whether the terms' gauge, not the values, set the scale. */
  vanishing: boolean;
  /** What limited the digits below the requested ones (e.g. 'a lattice sum'). */
  limitedBy?: string;
}

function log10(d: Decimal): number {
  if (d.isZero()) return -Infinity;
  return d.e + Math.log10(d.div(new Decimal(10).pow(d.e)).toNumber());
}

export function assessSample(
  at1: { lhs: SideValue; rhs: SideValue },
  at2: { lhs: SideValue; rhs: SideValue },
  P: number,
): SampleAssessment {
  const t0 = new Decimal(10).pow(-(P - GUARD_DIGITS));
  const limit = [at1.lhs.limit, at1.rhs.limit, at2.lhs.limit, at2.rhs.limit].reduce<SideValue['limit']>(
    (a, l) => (l !== undefined && (a === undefined || l.rel.gt(a.rel)) ? l : a),
    undefined,
  );
  const limited = limit !== undefined && limit.rel.gt(t0);
  const t = limited ? limit.rel : t0;
  const cap = limited ? Math.floor(-log10(limit.rel) * 10) / 10 : P;
  const by = limited ? { limitedBy: limit.by } : {};
  const mag = Decimal.max(at2.lhs.value.abs(), at2.rhs.value.abs());
  const gauge = Decimal.max(at2.lhs.scale, at2.rhs.scale, mag);
  const vanishing = mag.lt(gauge.times(t));
  const S = vanishing ? gauge : mag;
  if (S.isZero()) {
    return { outcome: 'agree', residual: new Decimal(0), error: new Decimal(0), digits: cap, vanishing, ...by };
  }
  const r = at2.lhs.value.sub(at2.rhs.value).abs().div(S);
  const r1 = at1.lhs.value.sub(at1.rhs.value).abs().div(S);
  const e = at1.lhs.value.sub(at2.lhs.value).abs().plus(at1.rhs.value.sub(at2.rhs.value).abs()).div(S);
  const digits = Math.max(0, Math.min(cap, Math.floor(-log10(r) * 10) / 10));
  if (r.lt(t) && e.lt(t)) return { outcome: 'agree', residual: r, error: e, digits, vanishing, ...by };
  const beyondLimit = !limited || r.gt(t.times(SEPARATION));
  if (r.gt(t) && beyondLimit && r.gt(e.times(SEPARATION)) && r1.div(r).gt(0.5) && r1.div(r).lt(2)) {
    return { outcome: 'disagree', residual: r, error: e, digits, vanishing };
  }
  const reason = e.gte(t)
    ? `the evaluations at two precisions differ by ${e.toSD(2).toString()} (relative): precision was lost`
    : !beyondLimit
      ? `the residual ${r.toSD(2).toString()} is above the accuracy ${t.toSD(2).toString()} that ${limit!.by} reached, but not clearly beyond it`
      : `the residual ${r.toSD(2).toString()} is above the tolerance but not clearly beyond the error estimate ${e.toSD(2).toString()}`;
  return { outcome: 'undecided', residual: r, error: e, digits, reason, vanishing, ...by };
}

/** The claim's verdict from its samples' outcomes. */
export function aggregate(outcomes: SampleAssessment['outcome'][]): Verdict {
  if (outcomes.some((o) => o === 'disagree')) return 'refuted';
  if (outcomes.length > 0 && outcomes.every((o) => o === 'agree')) return 'holds';
  return 'undecided';
}
