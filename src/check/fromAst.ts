/**
 * From a parsed claim (src/lang/ast.ts) to the checker's CheckableClaim: clause values are
 * evaluated once (they are constant expressions), and both sides are wrapped in a closure
 * over the evaluator. Evaluation failures become ModvetErrors whose message starts with the
 * file:line:column of the failing node, so reports can point at it.
 */
import { Complex } from '../numeric/complex.js';
import { ModvetError } from '../numeric/errors.js';
import { withDigits } from '../numeric/precision.js';
import type { Claim, Settings } from '../lang/ast.js';
import { Decimal } from 'decimal.js';
import { EvalError, evaluate, evaluateConstant, evaluateRegion, EvaluationMemo, inRegion, NumericBound } from '../eval/evaluate.js';
import { CheckableClaim, ParamSpec, Sample, SideValue } from './claim.js';

/** Digits used to evaluate clause values (box corners, list values, region bounds). */
const CLAUSE_DIGITS = 60;
/** Fixed points (e.g. rho) are inputs at which zeros are tested: far more digits than checked. */
function pointDigits(checked: number): number {
  return Math.min(2000, 2 * checked + 40);
}

function where(e: EvalError): string {
  return `${e.span.file}:${e.span.line}:${e.span.column}`;
}

/** Re-throws evaluator failures as ModvetErrors that name the spot. */
export function asModvetError(e: unknown): unknown {
  if (e instanceof EvalError) {
    const code = e.code === 'unbound' ? 'domain' : e.code;
    return new ModvetError(code, where(e), e.message);
  }
  return e;
}

function constant(e: Parameters<typeof evaluateConstant>[0], digits = CLAUSE_DIGITS): Complex {
  try {
    return withDigits(digits, () => evaluateConstant(e));
  } catch (err) {
    throw asModvetError(err);
  }
}

function realOf(z: Complex, what: string): number {
  if (!z.im.isZero()) throw new ModvetError('domain', what, `${z} must be real`);
  return z.re.toNumber();
}

function paramSpecs(claim: Claim): ParamSpec[] {
  return claim.params.map((p): ParamSpec => {
    switch (p.kind) {
      case 'interval':
        return { kind: 'interval', name: p.name, lo: realOf(constant(p.lo), p.name), hi: realOf(constant(p.hi), p.name) };
      case 'box': {
        const c1 = constant(p.corner1);
        const c2 = constant(p.corner2);
        const [r1, r2] = [c1.re.toNumber(), c2.re.toNumber()];
        const [i1, i2] = [c1.im.toNumber(), c2.im.toNumber()];
        return { kind: 'box', name: p.name, reLo: Math.min(r1, r2), reHi: Math.max(r1, r2), imLo: Math.min(i1, i2), imHi: Math.max(i1, i2) };
      }
      case 'list':
        return { kind: 'values', name: p.name, values: p.values.map((v) => constant(v)) };
      case 'intRange': {
        const values: Complex[] = [];
        for (let n = p.lo; n <= p.hi; n++) values.push(Complex.of(n));
        return { kind: 'values', name: p.name, values };
      }
    }
  });
}

/** The claim's settings after the file's `use` defaults. */
export function claimSettings(claim: Claim, defaults: Settings): Settings {
  const s: Settings = {};
  const digits = claim.digits ?? defaults.digits;
  const samples = claim.samples ?? defaults.samples;
  const yMin = claim.yMin ?? defaults.yMin;
  if (digits !== undefined) s.digits = digits;
  if (samples !== undefined) s.samples = samples;
  if (yMin !== undefined) s.yMin = yMin;
  return s;
}

/**
 * Memos of evaluated nodes per sample and precision (evaluate.ts EvaluationMemo), for a
 * claim and its variants checked at the same samples: the unchanged parts are evaluated once.
 */
export class SampleMemos {
  private readonly byKey = new Map<string, EvaluationMemo>();
  /** Most memos kept (each holds the values of one sample at one precision). */
  private static readonly LIMIT = 2000;

  at(s: Sample, yMin: number): EvaluationMemo {
    const params = [...s.params].map(([k, v]) => `${k}=${v.toString()}`).join(',');
    const g = s.gamma === undefined ? '' : `${s.gamma.a},${s.gamma.b},${s.gamma.c},${s.gamma.d}`;
    const key = `${s.tau.toString()}|${params}|${g}|${yMin}|${Decimal.precision}`;
    let m = this.byKey.get(key);
    if (m === undefined) {
      if (this.byKey.size >= SampleMemos.LIMIT) this.byKey.clear();
      m = new EvaluationMemo();
      this.byKey.set(key, m);
    }
    return m;
  }
}

export function toCheckable(claim: Claim, defaults: Settings, memos?: SampleMemos): CheckableClaim {
  const settings = claimSettings(claim, defaults);
  let bounds: NumericBound[] | undefined;
  if (claim.region !== undefined) {
    const region = claim.region;
    try {
      bounds = withDigits(CLAUSE_DIGITS, () => evaluateRegion(region));
    } catch (err) {
      throw asModvetError(err);
    }
  }
  const side = (which: 'lhs' | 'rhs', s: Sample, yMin: number): SideValue => {
    try {
      return evaluate(claim[which], {
        tau: s.tau,
        ...(s.gamma !== undefined && claim.group !== undefined ? { group: { name: claim.group.variable, matrix: s.gamma } } : {}),
        params: s.params,
        yMin,
      }, memos?.at(s, yMin));
    } catch (err) {
      throw asModvetError(err);
    }
  };
  const out: CheckableClaim = {
    file: claim.span.file,
    line: claim.span.line,
    name: claim.name,
    text: claim.text,
    expect: claim.expect,
    params: paramSpecs(claim),
    evaluate: (s, yMin) => ({ lhs: side('lhs', s, yMin), rhs: side('rhs', s, yMin) }),
  };
  if (claim.source !== undefined) out.source = claim.source;
  if (settings.digits !== undefined) out.digits = settings.digits;
  if (settings.samples !== undefined) out.samples = settings.samples;
  if (settings.yMin !== undefined) out.yMin = settings.yMin;
  if (claim.seed !== undefined) out.seed = claim.seed;
  if (claim.group !== undefined) out.group = { variable: claim.group.variable, group: claim.group.group };
  if (claim.at !== undefined) {
    const d = pointDigits(settings.digits ?? 30);
    out.points = claim.at.points.map((p) => constant(p, d));
  }
  if (bounds !== undefined) {
    const b = bounds;
    out.region = (tau: Complex) => inRegion(b, tau);
  }
  return out;
}

