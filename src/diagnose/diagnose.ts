/**
 * What is off in a refuted claim: fit the samples' two sides to the slips people make, and
 * name the first one that fits exactly.
 *
 * Conventions:
 * - r = LHS/RHS and d = LHS - RHS at each sample (types.ts). Every pattern is a predicted
 *   left side pred = f(RHS, sample) (c RHS, c F(s) RHS, K (c tau + d)^m RHS, RHS + c, ...),
 *   and it fits when the corrected claim LHS = pred holds at EVERY sample (and at every
 *   extra point evaluated) to T = min(P, D) - FIT_SPARE digits, relative to
 *   max(|LHS|, |pred|) as the checker measures; D = the fewest correct digits of a sample.
 *   A wrong diagnosis is worse than none, so nothing is loosened sample by sample.
 * - A free constant (c, K, C) is read off one reference sample (the one whose value of it
 *   carries the most digits) and named with recogniseFactor / recogniseConstant
 *   (recognise.ts) at that sample's digits minus REC_SPARE. A pattern that fits at two or
 *   more distinct points with a constant that is not recognised (or when D is below the
 *   recogniser's 20 digits) is still reported, the constant shown to the digits it carries (at least 10) and
 *   without a fix; at a single point only a recognised constant is reported. Between 10 and
 *   20 digits (lattice sums) only small rationals +-p/q (q <= 24, p <= 100) are named; from
 *   20 digits, also decimals of at most 15 digits (1.000000000001) and, for factors, their
 *   reciprocals, which the recogniser's bounds leave out.
 * - When LHS and RHS are both constant, a factor and a shift both fit: the simpler
 *   recognised constant wins (j(i) = 1729 is RHS - 1, not 1728/1729 RHS).
 * - A fix rewrites the right side (types.ts): wrap templates with '#' for the old side.
 *
 * Order (the first exact fit wins):
 * 1. constant factor r = c; a parameter drawn from an interval or box that took only one
 *    value is probed at another value first (r could depend on it).
 * 2. parameter factor r = c F(s), F in FAMILY (normalisations of Eisenstein series) or its
 *    reciprocal; with one sampled value, up to two probes inside the declared domain.
 * 3. tau-dependent ratio: r = K (c tau + d)^m, 0 < |m| <= 24 (group clause); r = K y^a,
 *    a = p/q, q <= 12; r a 24th root of unity at every sample: all +-1 with both signs is a
 *    square-root branch, otherwise a multiplier system.
 * 4. differences: d = c; d = C c (c tau + d) (the E_2 anomaly, math-reference.md: E_2);
 *    then LHS = a RHS + b (a sign slip in a q-expansion gives 2 - E_6), at >= 4 points.
 * 5. symmetry slips: LHS = conj(RHS); LHS = RHS at s -> 1 - s; LHS = RHS at tau -> -1/tau
 *    (extra evaluations, which may leave the declared domain; failures just mean no fit).
 * 6. unrecognised, with r and d at the worst sample.
 * Ratio patterns are skipped when a side vanishes at some sample (relative to the other).
 * Extra evaluations: at most MAX_EXTRA per diagnosis (ctx.extraBudget, when set, instead).
 *
 *   diagnose(contextFor(claim, { digits: 30, seed: 1, samples: 16, yMin: 0.02 })).text
 *   // "LHS = 1/2 * RHS" for E(4, tau)^2 = 2*E(8, tau)
 */
import { Decimal } from 'decimal.js';
import type { ParamSpec, Sample } from '../check/claim.js';
import { Complex } from '../numeric/complex.js';
import { pi } from '../numeric/constants.js';
import { ModvetError } from '../numeric/errors.js';
import { MAX_DIGITS, withDigits } from '../numeric/precision.js';
import { gamma } from '../special/gamma.js';
import { xi, zeta } from '../special/zeta.js';
import { CONFIRM_SPARE, MIN_DIGITS, recogniseConstant, recogniseFactor, type Recognised } from './recognise.js';
import type { Diagnosis, DiagnosisContext, Fix } from './types.js';

/** A pattern must hold to min(P, D) - FIT_SPARE digits at every sample. */
export const FIT_SPARE = 5;
/** Digits withheld from the recognisers below those a constant carries. */
export const REC_SPARE = 2;
/** Largest |m| in (c tau + d)^m. */
export const MAX_WEIGHT = 24;
/** Largest denominator of a in y^a, and largest |a|. */
const MAX_Y_DEN = 12;
const MAX_Y_EXP = 48;
/** Distinct points an affine fit needs: two fix a and b, the rest test them. */
const AFFINE_MIN_POINTS = 4;
/** Extra evaluations (probes, s -> 1 - s, tau -> -1/tau) allowed per diagnosis. */
export const MAX_EXTRA = 10;
/** Fewest digits shown for a constant that is not recognised. */
export const LOOSE_DIGITS = 10;
/** Below this many fit digits nothing is diagnosed. */
const MIN_FIT = 5;
/** Decimal constants (decimalForm): at most this many significant digits, and the margin. */
const MAX_DECIMAL_DIGITS = 15;
const DECIMAL_MARGIN = 10;
/** Small rationals named below the recogniser's 20 digits (lowDigitRational). */
const LOW_MIN_DIGITS = 10;
const LOW_MAX_DEN = 24;
const LOW_MAX_NUM = 100;
/** Smallest Im(-1/tau) at which tau -> -1/tau is tried. */
const MIN_INVERTED_Y = 0.05;
/** Guard digits of the ratio arithmetic above the samples' own. */
const WORK_GUARD = 15;

/** A point with both sides: a sample of the checker or an extra evaluation. */
interface Point {
  sample: Sample;
  lhs: Complex;
  rhs: Complex;
  digits: number;
  agree?: boolean;
}

type Pred = (p: Point) => Complex | null;

interface Work {
  ctx: DiagnosisContext;
  points: Point[];
  /** Fewest / most digits of a sample. */
  D: number;
  Dmax: number;
  /** Required fit digits. */
  T: number;
  extra: number;
  /** Probe points per parameter, cached between steps 1 and 2. */
  probes: Map<string, Point[]>;
}

// ---------------------------------------------------------------------------
// Small numeric helpers

const ten = (e: number): Decimal => new Decimal(10).pow(e);

function log10(d: Decimal): number {
  return d.isZero() ? -Infinity : d.log(10).toNumber();
}

/**
 * Digits to which LHS = pred at every point (Infinity when exact everywhere), relative to
 * max(|LHS|, |pred|) and, for a sum such as RHS + c, the gauge of its terms (as verdict.ts
 * measures a corrected claim whose sides vanish, E_6(i) + 1 = 1).
 */
function fitDigits(points: readonly Point[], pred: Pred, gauge?: (p: Point) => Decimal): number {
  let worst = Infinity;
  for (const p of points) {
    const v = pred(p);
    if (v === null || !v.isFinite()) return -Infinity;
    const S = Decimal.max(p.lhs.abs(), v.abs(), gauge?.(p) ?? 0);
    if (S.isZero()) continue;
    const res = p.lhs.sub(v).abs().div(S);
    if (!res.isZero()) worst = Math.min(worst, -log10(res));
  }
  return worst;
}

/** A number for the report: negligible parts dropped, `sd` significant digits. */
function show(z: Complex, sd: number, D: number): string {
  const m = z.abs();
  if (m.isZero()) return '0';
  const tiny = m.times(ten(-(Math.max(D, 8) - 2)));
  const re = z.re.abs().lt(tiny) ? new Decimal(0) : z.re;
  const im = z.im.abs().lt(tiny) ? new Decimal(0) : z.im;
  return new Complex(re, im).toString(sd);
}

function distinctCount(xs: readonly Complex[]): number {
  const out: Complex[] = [];
  for (const x of xs) if (!out.some((y) => y.equals(x))) out.push(x);
  return out.length;
}

function samePoint(a: Sample, b: Sample): boolean {
  if (!a.tau.equals(b.tau)) return false;
  if ((a.gamma === undefined) !== (b.gamma === undefined)) return false;
  if (a.gamma !== undefined && b.gamma !== undefined && !a.gamma.equals(b.gamma)) return false;
  for (const [k, v] of a.params) {
    const w = b.params.get(k);
    if (w === undefined || !w.equals(v)) return false;
  }
  return true;
}

function distinctPoints(points: readonly Point[]): number {
  const seen: Sample[] = [];
  for (const p of points) if (!seen.some((s) => samePoint(s, p.sample))) seen.push(p.sample);
  return seen.length;
}

/** Whether LHS/RHS is meaningful at every point: neither side vanishes against the other. */
function ratioUsable(w: Work): boolean {
  const small = ten(-(w.D - 2));
  return w.points.every((p) => {
    const [l, r] = [p.lhs.abs(), p.rhs.abs()];
    return !l.isZero() && !r.isZero() && !l.lt(r.times(small)) && !r.lt(l.times(small));
  });
}

/**
 * Correct digits of LHS/RHS at a point: a sample's digits are relative to its scale
 * max(|LHS|, |RHS|), so the smaller side carries fewer of its own.
 */
function ratioDigits(p: Point): number {
  const [l, r] = [p.lhs.abs(), p.rhs.abs()];
  if (l.isZero() || r.isZero()) return 0;
  return p.digits - Math.abs(log10(l.div(r)));
}

/** The point with the most digits (the first such). */
function bestPoint(points: readonly Point[]): Point {
  return points.reduce((a, p) => (p.digits > a.digits ? p : a));
}

/** The claim-language form of a constant inside a product: parenthesised unless atomic. */
function factorExpr(expr: string): string {
  return /^[\w.]+$/.test(expr) ? expr : `(${expr})`;
}

function factorText(text: string): string {
  return /[/+]/.test(text) ? `(${text})` : text;
}

function matText(g: NonNullable<Sample['gamma']>): string {
  return `(${g.a} ${g.b}; ${g.c} ${g.d})`;
}

// ---------------------------------------------------------------------------
// Extra evaluations

/** Both sides at another sample, or null when the evaluation fails or the budget is spent. */
function extraPoint(w: Work, sample: Sample): Point | null {
  if (w.extra >= (w.ctx.extraBudget ?? MAX_EXTRA)) return null;
  w.extra++;
  try {
    const d = Math.min(MAX_DIGITS, w.Dmax + 5);
    const v = w.ctx.evaluate(sample, d);
    return { sample, lhs: v.lhs.value, rhs: v.rhs.value, digits: w.D };
  } catch (e) {
    if (e instanceof ModvetError) return null;
    throw e;
  }
}

function specOf(w: Work, name: string): ParamSpec | undefined {
  return w.ctx.claim.params.find((p) => p.name === name);
}

/** Up to `n` parameter values inside the declared domain that no point has yet. */
function probeValues(spec: ParamSpec, have: readonly Complex[], n: number): Complex[] {
  const fresh = (v: Complex) => !have.some((h) => h.sub(v).abs().lt(1e-6));
  const out: Complex[] = [];
  const fractions = [0.381966, 0.786151, 0.142857];
  if (spec.kind === 'values') {
    for (const v of spec.values) if (out.length < n && fresh(v)) out.push(v);
    return out;
  }
  for (const f of fractions) {
    if (out.length >= n) break;
    const v =
      spec.kind === 'interval'
        ? Complex.of((spec.lo + (spec.hi - spec.lo) * f).toPrecision(6))
        : Complex.of((spec.reLo + (spec.reHi - spec.reLo) * f).toPrecision(6), (spec.imLo + (spec.imHi - spec.imLo) * (1 - f)).toPrecision(6));
    if (fresh(v)) out.push(v);
  }
  return out;
}

/**
 * Points at other values of the parameter (same tau and group element as the best sample),
 * up to `n` in all, cached. Only inside the declared domain.
 */
function probes(w: Work, name: string, n: number): Point[] {
  const cached = w.probes.get(name) ?? [];
  const spec = specOf(w, name);
  if (spec === undefined || cached.length >= n) return cached;
  const base = bestPoint(w.points).sample;
  const have = [...w.points, ...cached].map((p) => p.sample.params.get(name)).filter((v): v is Complex => v !== undefined);
  for (const v of probeValues(spec, have, n - cached.length)) {
    const p = extraPoint(w, { ...base, params: new Map(base.params).set(name, v) });
    if (p !== null) cached.push(p);
  }
  w.probes.set(name, cached);
  return cached;
}

/** Parameters from an interval or box that took a single value at every point. */
function frozenParams(w: Work): string[] {
  return w.ctx.params.filter((name) => {
    const spec = specOf(w, name);
    if (spec === undefined || spec.kind === 'values') return false;
    const vals = w.points.map((p) => p.sample.params.get(name)).filter((v): v is Complex => v !== undefined);
    return distinctCount(vals) === 1;
  });
}

// ---------------------------------------------------------------------------
// Results

function done(kind: Diagnosis['kind'], text: string, digits: number, D: number, extra: { constant?: Recognised; offset?: Recognised; fix?: Fix } = {}): Diagnosis {
  const d = Math.max(0, Math.min(D, Math.floor(digits)));
  return {
    kind,
    text,
    digits: d,
    ...(extra.constant !== undefined ? { constant: extra.constant } : {}),
    ...(extra.offset !== undefined ? { offset: extra.offset } : {}),
    ...(extra.fix !== undefined ? { fix: extra.fix } : {}),
  };
}

/**
 * z = +-p/q with q <= LOW_MAX_DEN, p <= LOW_MAX_NUM, to D - CONFIRM_SPARE digits: the only
 * forms named with fewer than the recogniser's 20 digits (lattice sums reach 15-25). With
 * about 2400 such rationals, a chance match to 10^-(D-3) has probability below 10^-(D-7).
 */
function lowDigitRational(z: Complex, D: number): Recognised | null {
  if (D < LOW_MIN_DIGITS) return null;
  const tol = ten(-(D - CONFIRM_SPARE));
  const m = z.abs();
  if (z.im.abs().gt(m.times(tol))) return null;
  const x = z.re.abs();
  for (let q = 1; q <= LOW_MAX_DEN; q++) {
    const p = x.times(q).round();
    if (p.isZero() || p.gt(LOW_MAX_NUM)) continue;
    const rel = x.sub(p.div(q)).abs().div(x);
    if (rel.gt(tol)) continue;
    const [num, den] = [BigInt(p.toFixed(0)), BigInt(q)];
    let g = num;
    for (let b = den; b !== 0n; ) [g, b] = [b, g % b];
    if (g !== 1n) continue; // the lowest terms come with a smaller q
    const neg = z.re.isNegative();
    const body = den === 1n ? `${num}` : `${num}/${den}`;
    const text = neg ? `-${body}` : body;
    const digits = rel.isZero() ? D : Math.min(D, Math.floor(-log10(rel)));
    return { unit: { n: neg ? 12 : 0 }, num, den, powers: [], text, expr: text, digits };
  }
  return null;
}

/**
 * recogniseFactor / recogniseConstant at `digits` correct digits less REC_SPARE; between
 * LOW_MIN_DIGITS and 20 digits only small rationals (lowDigitRational).
 */
function recognise(z: Complex, digits: number, kind: 'factor' | 'constant'): Recognised | null {
  const D = Math.floor(digits) - REC_SPARE;
  if (D < MIN_DIGITS) return lowDigitRational(z, D);
  const rec = kind === 'factor' ? recogniseFactor(z, D) : recogniseConstant(z, D);
  return rec ?? decimalForm(z, D, false) ?? (kind === 'factor' ? decimalForm(z.inv(), D, true) : null);
}

/**
 * z (or 1/z when `reciprocal`, reported as 1/z) a decimal with k <= MAX_DECIMAL_DIGITS
 * significant digits, as a user writes a constant (1.000000000001), to D - CONFIRM_SPARE
 * digits, with k <= D - CONFIRM_SPARE - DECIMAL_MARGIN: a chance match then has
 * probability below 10^-DECIMAL_MARGIN. Only after the recogniser found nothing (it covers
 * p/q with p, q <= 10^6, so k is large here).
 */
function decimalForm(z: Complex, D: number, reciprocal: boolean): Recognised | null {
  const x = z.re.abs();
  if (x.isZero() || z.im.abs().gt(x.times(ten(-(D - CONFIRM_SPARE))))) return null;
  const e = Math.floor(log10(x));
  if (Math.abs(e) > 20) return null;
  const tol = ten(-(D - CONFIRM_SPARE));
  for (let k = 1; k <= Math.min(MAX_DECIMAL_DIGITS, D - CONFIRM_SPARE - DECIMAL_MARGIN); k++) {
    const scale = ten(k - 1 - e);
    const m = x.times(scale).round();
    if (m.isZero()) continue;
    const v = m.div(scale);
    const rel = x.sub(v).abs().div(x);
    if (rel.gt(tol)) continue;
    const neg = z.re.isNegative();
    const body = v.toFixed();
    // the exact rational v = num/den in lowest terms
    let num = BigInt(m.toFixed(0));
    let den = 1n;
    const shift = k - 1 - e;
    if (shift > 0) den = 10n ** BigInt(shift);
    else num *= 10n ** BigInt(-shift);
    let g = num;
    for (let b = den; b !== 0n; ) [g, b] = [b, g % b];
    [num, den] = [num / g, den / g];
    if (reciprocal) [num, den] = [den, num];
    const text = `${neg ? '-' : ''}${reciprocal ? `1/${body}` : body}`;
    const digits = rel.isZero() ? D : Math.min(D, Math.floor(-log10(rel)));
    return { unit: { n: neg ? 12 : 0 }, num, den, powers: [], text, expr: text, digits };
  }
  return null;
}

function isOne(z: Complex, T: number): boolean {
  return z.sub(Complex.ONE).abs().lt(ten(-T));
}

// ---------------------------------------------------------------------------
// 1. constant factor

function constantFactor(w: Work): Diagnosis | null {
  const ref = bestPoint(w.points);
  const c = ref.lhs.div(ref.rhs);
  if (isOne(c, w.T)) return null;
  const pred: Pred = (p) => p.rhs.mul(c);
  let fit = fitDigits(w.points, pred);
  if (fit < w.T) return null;
  // a parameter seen at one value only: r may still depend on it
  for (const name of frozenParams(w)) {
    const extra = probes(w, name, 1);
    if (extra.length > 0) {
      fit = Math.min(fit, fitDigits(extra, pred));
      if (fit < w.T) return null;
    }
  }
  const rec = recognise(c, ratioDigits(ref), 'factor');
  // LHS and RHS constant (a fixed point, or sides free of tau and the parameters): a shift
  // fits as well; the simpler constant names the slip (j(i) = 1729: RHS - 1, not 1728/1729)
  const dRef = ref.lhs.sub(ref.rhs);
  if (fitDigits(w.points, (p) => p.rhs.add(dRef), (p) => Decimal.max(p.rhs.abs(), dRef.abs())) >= w.T) {
    const alt = constantDifference(w);
    if (alt?.constant !== undefined && (rec === null || complexity(alt.constant) < complexity(rec))) return alt;
  }
  if (rec !== null) {
    return done('constant-factor', `LHS = ${rec.text} * RHS`, Math.min(fit, rec.digits), w.D, {
      constant: rec,
      fix: { kind: 'wrap', template: `${rec.expr}*#` },
    });
  }
  if (distinctPoints(w.points) < 2) return null;
  return done('constant-factor', `LHS = ${show(c, looseDigits(ref.digits), w.D)} * RHS (a constant factor${unrecognisedWhy(ref.digits)})`, fit, w.D);
}

/** A size of a recognised form: digits of p and of q > 1, exponents, a unit other than +-1. */
function complexity(r: Recognised): number {
  const size = (b: bigint) => b.toString().length;
  return size(r.num) + (r.den === 1n ? 0 : size(r.den)) + r.powers.reduce((a, p) => a + Math.abs(p.expNum) + p.expDen, 0) + (r.unit.n % 12 === 0 ? 0 : 1);
}

function unrecognisedWhy(digits: number): string {
  const D = Math.floor(digits) - REC_SPARE;
  if (D < LOW_MIN_DIGITS) return `; too few digits (${Math.floor(digits)}) to recognise it`;
  if (D < MIN_DIGITS) return `; with ${Math.floor(digits)} digits only small rationals are recognised`;
  return ' not recognised as a closed form';
}

/** Digits to show a constant that was not recognised: all it carries, so a near miss of
 * 1/2 does not print as 0.5000000000. */
function looseDigits(digits: number): number {
  return Math.max(LOOSE_DIGITS, Math.min(40, Math.floor(digits) - REC_SPARE));
}

// ---------------------------------------------------------------------------
// 2. parameter factor

interface Family {
  /** F(s) at the current precision. */
  f: (s: Complex) => Complex;
  /** Numerator and denominator in text and in the claim language, for the parameter name p. */
  text: (p: string) => [string, string];
  expr: (p: string) => [string, string];
}

const two = (p: string): string => (p.length === 1 ? `2${p}` : `2 ${p}`);
const piPow = (s: Complex): Complex => Complex.of(pi()).pow(s);
const twoPiPow = (s: Complex): Complex => Complex.of(pi().times(2)).pow(s);

/** The normalisations of Eisenstein series and their L-functions (math-reference.md). */
const FAMILY: readonly Family[] = [
  { f: (s) => zeta(s.scale(2)), text: (p) => [`zeta(${two(p)})`, ''], expr: (p) => [`zeta(2*${p})`, ''] },
  { f: (s) => xi(s.scale(2)), text: (p) => [`xi(${two(p)})`, ''], expr: (p) => [`xi(2*${p})`, ''] },
  { f: (s) => piPow(s), text: (p) => [`pi^${p}`, ''], expr: (p) => [`pi^${p}`, ''] },
  { f: (s) => gamma(s), text: (p) => [`Gamma(${p})`, ''], expr: (p) => [`Gamma(${p})`, ''] },
  { f: (s) => gamma(s).div(piPow(s)), text: (p) => [`Gamma(${p})`, `pi^${p}`], expr: (p) => [`Gamma(${p})`, `pi^${p}`] },
  { f: (s) => gamma(s).div(twoPiPow(s)), text: (p) => [`Gamma(${p})`, `(2 pi)^${p}`], expr: (p) => [`Gamma(${p})`, `(2*pi)^${p}`] },
  // physics normalisation: sum' (y/(pi |m tau + n|^2))^s = 2 zeta(2s) pi^-s E(s, tau)
  { f: (s) => zeta(s.scale(2)).div(piPow(s)), text: (p) => [`zeta(${two(p)})`, `pi^${p}`], expr: (p) => [`zeta(2*${p})`, `pi^${p}`] },
  { f: (s) => Complex.of(2).pow(s), text: (p) => [`2^${p}`, ''], expr: (p) => [`2^${p}`, ''] },
  { f: (s) => twoPiPow(s), text: (p) => [`(2 pi)^${p}`, ''], expr: (p) => [`(2*pi)^${p}`, ''] },
  { f: (s) => s, text: (p) => [p, ''], expr: (p) => [p, ''] },
  { f: (s) => s.sub(Complex.ONE), text: (p) => [`(${p} - 1)`, ''], expr: (p) => [`(${p} - 1)`, ''] },
  { f: (s) => s.mul(s.sub(Complex.ONE)), text: (p) => [`${p} (${p} - 1)`, ''], expr: (p) => [`${p}*(${p} - 1)`, ''] },
];

/** "2 zeta(2s)", "(1/2) Gamma(s)/pi^s", "1/zeta(2s)" and the claim-language twin. */
function compose(c: { text: string; expr: string } | null, num: string, den: string, lang: 'text' | 'expr'): string {
  const parts: string[] = [];
  if (c !== null && c.text !== '1') {
    if (c.text === '-1') parts.push('-');
    else parts.push(lang === 'text' ? factorText(c.text) : factorExpr(c.expr));
  }
  if (num !== '') parts.push(num);
  const atomDen = den === '' || /^[\w.]+(\^\w+)?$|^\(.*\)(\^\w+)?$|^\w+\(.*\)$/.test(den) ? den : `(${den})`;
  let s: string;
  if (parts.length === 0) s = '1';
  else if (parts[0] === '-') s = parts.length === 1 ? '-1' : `-${parts.slice(1).join(lang === 'text' ? ' ' : '*')}`;
  else s = parts.join(lang === 'text' ? ' ' : '*');
  return den === '' ? s : `${s}/${atomDen}`;
}

function parameterFactor(w: Work): Diagnosis | null {
  for (const name of w.ctx.params) {
    let pts = w.points.filter((p) => p.sample.params.has(name));
    if (pts.length === 0) continue;
    const values = () => distinctCount(pts.map((p) => p.sample.params.get(name)!));
    // probes from step 1 count too; new ones only when the samples show one value
    pts = [...pts, ...(values() < 2 ? probes(w, name, 2) : (w.probes.get(name) ?? []))];
    if (values() < 2) continue;
    const ref = bestPoint(pts);
    for (const fam of FAMILY) {
      for (const recip of [false, true]) {
        let Fref: Complex;
        const Fs = new Map<Point, Complex>();
        try {
          for (const p of pts) {
            const v = fam.f(p.sample.params.get(name)!);
            Fs.set(p, recip ? v.inv() : v);
          }
          Fref = Fs.get(ref)!;
        } catch (e) {
          if (e instanceof ModvetError) continue;
          throw e;
        }
        if (Fref.isZero()) continue;
        const c = ref.lhs.div(ref.rhs.mul(Fref));
        const fit = fitDigits(pts, (p) => p.rhs.mul(Fs.get(p)!).mul(c));
        if (fit < w.T) continue;
        const [tn, td] = recip ? fam.text(name).reverse() : fam.text(name);
        const [en, ed] = recip ? fam.expr(name).reverse() : fam.expr(name);
        const rec = isOne(c, w.T) ? null : recognise(c, ratioDigits(ref), 'factor');
        const k = isOne(c, w.T) ? { text: '1', expr: '1' } : rec;
        if (k !== null) {
          const factor = compose(k, tn!, td!, 'text');
          return done('parameter-factor', `LHS = ${factor} * RHS`, Math.min(fit, rec?.digits ?? Infinity), w.D, {
            ...(rec !== null ? { constant: rec } : {}),
            fix: { kind: 'wrap', template: `${compose(k, en!, ed!, 'expr')}*#` },
          });
        }
        const shown = { text: show(c, looseDigits(ref.digits), w.D), expr: '' };
        return done('parameter-factor', `LHS = ${compose(shown, tn!, td!, 'text')} * RHS (the constant${unrecognisedWhy(ref.digits)})`, fit, w.D);
      }
    }
  }
  return null;
}

// ---------------------------------------------------------------------------
// 3. tau-dependent ratios

function automorphyFactor(w: Work): Diagnosis | null {
  if (w.ctx.group === undefined || w.points.some((p) => p.sample.gamma === undefined)) return null;
  const A = new Map<Point, Complex>(w.points.map((p) => [p, p.sample.gamma!.automorphy(p.sample.tau)]));
  const moving = w.points.filter((p) => p.sample.gamma!.c !== 0n);
  if (moving.length === 0) return null;
  const ref = bestPoint(w.points);
  for (let k = 1; k <= 2 * MAX_WEIGHT; k++) {
    const m = k % 2 === 1 ? (k + 1) / 2 : -k / 2; // 1, -1, 2, -2, ...
    const K = ref.lhs.div(ref.rhs.mul(A.get(ref)!.powInt(m)));
    const fit = fitDigits(w.points, (p) => p.rhs.mul(A.get(p)!.powInt(m)).mul(K));
    if (fit < w.T) continue;
    const power = m < 0 ? `(${m})` : `${m}`;
    if (isOne(K, w.T)) {
      return done('automorphy-factor', `the weights differ by ${m}: LHS = (c tau + d)^${power} * RHS`, fit, w.D, {
        fix: { kind: 'wrap', template: `(c*tau + d)^${power}*#` },
      });
    }
    if (distinctPoints(w.points) < 2) return null;
    const rec = recognise(K, ratioDigits(ref), 'factor');
    if (rec !== null) {
      return done('automorphy-factor', `the weights differ by ${m}: LHS = ${factorText(rec.text)} (c tau + d)^${power} * RHS`, Math.min(fit, rec.digits), w.D, {
        constant: rec,
        fix: { kind: 'wrap', template: `${factorExpr(rec.expr)}*(c*tau + d)^${power}*#` },
      });
    }
    return done('automorphy-factor', `the weights differ by ${m}: LHS = ${show(K, looseDigits(ref.digits), w.D)} (c tau + d)^${power} * RHS (the constant${unrecognisedWhy(ref.digits)})`, fit, w.D);
  }
  return null;
}

/** p/q with q <= MAX_Y_DEN within 1e-6 of a, or null. */
function smallRational(a: number): [number, number] | null {
  for (let q = 1; q <= MAX_Y_DEN; q++) {
    const p = Math.round(a * q);
    if (p !== 0 && Math.abs(a - p / q) < 1e-6 && Math.abs(p / q) <= MAX_Y_EXP) return [p, q];
  }
  return null;
}

function yPower(w: Work): Diagnosis | null {
  const ys = w.points.map((p) => p.sample.tau.im);
  if (distinctCount(ys.map((y) => Complex.of(y))) < 2) return null;
  const ref = bestPoint(w.points);
  const yRef = ref.sample.tau.im;
  // the point farthest from ref in log y fixes a
  let far = w.points[0]!;
  for (const p of w.points) if (p.sample.tau.im.div(yRef).ln().abs().gt(far.sample.tau.im.div(yRef).ln().abs())) far = p;
  const t = far.lhs.div(far.rhs).div(ref.lhs.div(ref.rhs));
  const a = t.abs().ln().div(far.sample.tau.im.div(yRef).ln()).toNumber();
  const pq = smallRational(a);
  if (pq === null) return null;
  const [p, q] = pq;
  const e = new Decimal(p).div(q);
  const ya = (pt: Point): Complex => Complex.of(pt.sample.tau.im.pow(e));
  const K = ref.lhs.div(ref.rhs.mul(ya(ref)));
  const fit = fitDigits(w.points, (pt) => pt.rhs.mul(ya(pt)).mul(K));
  if (fit < w.T) return null;
  const power = q === 1 && p > 0 ? `${p}` : q === 1 ? `(${p})` : `(${p}/${q})`;
  if (isOne(K, w.T)) {
    return done('y-power', `LHS = y^${power} * RHS`, fit, w.D, { fix: { kind: 'wrap', template: `y^${power}*#` } });
  }
  const rec = recognise(K, ratioDigits(ref), 'factor');
  if (rec !== null) {
    return done('y-power', `LHS = ${factorText(rec.text)} y^${power} * RHS`, Math.min(fit, rec.digits), w.D, {
      constant: rec,
      fix: { kind: 'wrap', template: `${factorExpr(rec.expr)}*y^${power}*#` },
    });
  }
  return done('y-power', `LHS = ${show(K, looseDigits(ref.digits), w.D)} y^${power} * RHS (the constant${unrecognisedWhy(ref.digits)})`, fit, w.D);
}

/** r a 24th root of unity at every point: a branch (+-1) or a multiplier system. */
function rootsOfUnity(w: Work): Diagnosis | null {
  const twoPi = pi().times(2);
  const ns = new Map<Point, number>();
  for (const p of w.points) {
    const r = p.lhs.div(p.rhs);
    const turns = r.arg().div(twoPi).times(24);
    ns.set(p, ((turns.round().toNumber() % 24) + 24) % 24);
  }
  const unit = (n: number): Complex => (n === 0 ? Complex.ONE : n === 12 ? Complex.ONE.neg() : Complex.of(0, pi().times(n).div(12)).exp());
  const fit = fitDigits(w.points, (p) => p.rhs.mul(unit(ns.get(p)!)));
  if (fit < w.T) return null;
  const values = [...new Set(ns.values())];
  if (values.length < 2) return null; // one unit is a constant factor (step 1)
  const N = w.points.length;
  if (values.every((n) => n === 0 || n === 12)) {
    const k = [...ns.values()].filter((n) => n === 12).length;
    return done('branch', `a square-root branch: LHS = -RHS at ${k} of ${N} samples, LHS = RHS at the others`, fit, w.D);
  }
  const examples: string[] = [];
  const seen = new Set<number>();
  for (const p of w.points) {
    const n = ns.get(p)!;
    if (seen.has(n) || examples.length >= 3) continue;
    seen.add(n);
    const at = p.sample.gamma !== undefined ? `g = ${matText(p.sample.gamma)}` : `tau = ${p.sample.tau.toString(6)}`;
    examples.push(`n = ${n} at ${at}`);
  }
  const on = w.ctx.group !== undefined ? 'g' : 'tau';
  return done('multiplier', `a multiplier system: LHS/RHS = e^(2 pi i n/24) with n depending on ${on} (${examples.join(', ')})`, fit, w.D);
}

// ---------------------------------------------------------------------------
// 4. differences

/** Correct digits of d = LHS - RHS at a point: the sides' digits less the cancellation. */
function diffDigits(p: Point): number {
  const d = p.lhs.sub(p.rhs).abs();
  if (d.isZero()) return 0;
  const S = Decimal.max(p.lhs.abs(), p.rhs.abs());
  return p.digits - log10(S.div(d));
}

/** "LHS = RHS + 744", "# - 3/pi": a constant added, sign pulled out. */
function plus(text: string): string {
  return text.startsWith('-') ? ` - ${text.slice(1)}` : ` + ${text}`;
}

function constantDifference(w: Work): Diagnosis | null {
  const ref = w.points.reduce((a, p) => (diffDigits(p) > diffDigits(a) ? p : a));
  const d = ref.lhs.sub(ref.rhs);
  if (d.isZero()) return null;
  const fit = fitDigits(w.points, (p) => p.rhs.add(d), (p) => Decimal.max(p.rhs.abs(), d.abs()));
  if (fit < w.T) return null;
  const rec = recognise(d, diffDigits(ref), 'constant');
  if (rec !== null) {
    return done('constant-difference', `LHS = RHS${plus(rec.text)}`, Math.min(fit, rec.digits), w.D, {
      constant: rec,
      fix: { kind: 'wrap', template: `#${plus(rec.expr)}` },
    });
  }
  if (distinctPoints(w.points) < 2) return null;
  return done('constant-difference', `LHS = RHS${plus(show(d, looseDigits(diffDigits(ref)), w.D))} (a constant difference${unrecognisedWhy(diffDigits(ref))})`, fit, w.D);
}

function anomaly(w: Work): Diagnosis | null {
  if (w.ctx.group === undefined || w.points.some((p) => p.sample.gamma === undefined)) return null;
  const term = (p: Point): Complex => p.sample.gamma!.automorphy(p.sample.tau).scale(p.sample.gamma!.c.toString());
  const moving = w.points.filter((p) => p.sample.gamma!.c !== 0n);
  if (moving.length === 0) return null;
  const ref = moving.reduce((a, p) => (diffDigits(p) > diffDigits(a) ? p : a));
  const C = ref.lhs.sub(ref.rhs).div(term(ref));
  if (C.isZero()) return null;
  const fit = fitDigits(w.points, (p) => p.rhs.add(term(p).mul(C)), (p) => Decimal.max(p.rhs.abs(), term(p).mul(C).abs()));
  if (fit < w.T) return null;
  const rec = recognise(C, diffDigits(ref), 'constant');
  const what = 'the anomaly term c (c tau + d) is missing or has the wrong coefficient';
  if (rec !== null) {
    return done('anomaly', `${what}: LHS = RHS + (${rec.text}) c (c tau + d)`, Math.min(fit, rec.digits), w.D, {
      constant: rec,
      fix: { kind: 'wrap', template: `# + (${rec.expr})*c*(c*tau + d)` },
    });
  }
  if (distinctPoints(moving) < 2) return null;
  return done('anomaly', `${what}: LHS = RHS + (${show(C, looseDigits(diffDigits(ref)), w.D)}) c (c tau + d) (the coefficient${unrecognisedWhy(diffDigits(ref))})`, fit, w.D);
}

/**
 * LHS = a RHS + b with a != 1, b != 0, read off the two points farthest apart in RHS and
 * tested at the others (at least AFFINE_MIN_POINTS distinct points in all).
 */
function affine(w: Work): Diagnosis | null {
  if (distinctPoints(w.points) < AFFINE_MIN_POINTS) return null;
  const ref = bestPoint(w.points);
  const far = w.points.reduce((a, p) => (p.rhs.sub(ref.rhs).abs().gt(a.rhs.sub(ref.rhs).abs()) ? p : a));
  const dR = far.rhs.sub(ref.rhs);
  if (dR.isZero()) return null;
  const a = far.lhs.sub(ref.lhs).div(dR);
  const b = ref.lhs.sub(ref.rhs.mul(a));
  if (isOne(a, w.T) || b.isZero()) return null;
  const fit = fitDigits(w.points, (p) => p.rhs.mul(a).add(b), (p) => Decimal.max(p.rhs.mul(a).abs(), b.abs()));
  if (fit < w.T) return null;
  // digits: a loses the cancellation in RHS_far - RHS_ref, b that in LHS - a RHS as well
  const scaleR = Decimal.max(far.rhs.abs(), ref.rhs.abs());
  const aDigits = Math.min(ref.digits, far.digits) - log10(scaleR.div(dR.abs()));
  const bDigits = aDigits - log10(Decimal.max(ref.lhs.abs(), ref.rhs.mul(a).abs()).div(b.abs()));
  const ra = recognise(a, aDigits, 'factor');
  const rb = recognise(b, bDigits, 'constant');
  if (ra !== null && rb !== null) {
    const lead = ra.text === '-1' ? '-RHS' : `${factorText(ra.text)} RHS`;
    const leadExpr = ra.expr === '-1' ? '-#' : `${factorExpr(ra.expr)}*#`;
    return done('affine', `LHS = ${lead}${plus(rb.text)}`, Math.min(fit, ra.digits, rb.digits), w.D, {
      constant: ra,
      offset: rb,
      fix: { kind: 'wrap', template: `${leadExpr}${plus(rb.expr)}` },
    });
  }
  return done('affine', `LHS = (${show(a, looseDigits(aDigits), w.D)}) RHS${plus(show(b, looseDigits(bDigits), w.D))} (a and b not both recognised)`, fit, w.D);
}

// ---------------------------------------------------------------------------
// 5. symmetry slips

function conjugate(w: Work): Diagnosis | null {
  const real = w.points.every((p) => p.rhs.im.abs().lte(p.rhs.abs().times(ten(-w.T))));
  if (real) return null;
  const fit = fitDigits(w.points, (p) => p.rhs.conj());
  if (fit < w.T) return null;
  return done('conjugate', 'LHS = conj(RHS): the right side is the complex conjugate of the left', fit, w.D, {
    fix: { kind: 'wrap', template: 'conj(#)' },
  });
}

/** The points to test a substitution at: disagreeing samples first, at most `n`. */
function trialPoints(w: Work, n: number, usable: (p: Point) => boolean): Point[] {
  const order = [...w.points.filter((p) => p.agree === false), ...w.points.filter((p) => p.agree !== false)];
  return order.filter(usable).slice(0, n);
}

/**
 * Whether LHS at each trial point equals RHS at the moved sample (the LHS evaluated there is
 * not used); at least min(2, points) of them must evaluate, and every one that does must fit.
 */
function substitutionFit(w: Work, trials: Point[], move: (s: Sample) => Sample | null): number {
  let fit = Infinity;
  let ok = 0;
  for (const p of trials) {
    const moved = move(p.sample);
    if (moved === null) continue;
    const q = extraPoint(w, moved);
    if (q === null) continue;
    ok++;
    fit = Math.min(fit, fitDigits([p], () => q.rhs));
    if (fit < w.T) return -Infinity;
  }
  return ok >= Math.min(2, distinctPoints(w.points)) ? fit : -Infinity;
}

function reflection(w: Work): Diagnosis | null {
  for (const name of w.ctx.params) {
    const trials = trialPoints(w, 3, (p) => {
      const s = p.sample.params.get(name);
      return s !== undefined && !Complex.ONE.sub(s).equals(s);
    });
    if (trials.length === 0) continue;
    const fit = substitutionFit(w, trials, (s) => ({ ...s, params: new Map(s.params).set(name, Complex.ONE.sub(s.params.get(name)!)) }));
    if (fit < w.T) continue;
    return done('reflection', `LHS = RHS at ${name} -> 1 - ${name}: the two sides are each other's reflection`, fit, w.D, {
      fix: { kind: 'substitute', name, by: `1 - ${name}` },
    });
  }
  return null;
}

function inversion(w: Work): Diagnosis | null {
  // Im(-1/tau) = y/|tau|^2: points where it is small would only fail on y_min
  const inverted = (s: Sample): Complex => Complex.ONE.neg().div(s.tau);
  const trials = trialPoints(w, 3, (p) => inverted(p.sample).im.gte(MIN_INVERTED_Y));
  const fit = substitutionFit(w, trials, (s) => ({ ...s, tau: inverted(s) }));
  if (fit < w.T) return null;
  return done('inversion', 'LHS = RHS at tau -> -1/tau', fit, w.D, { fix: { kind: 'substitute', name: 'tau', by: '-1/tau' } });
}

// ---------------------------------------------------------------------------
// 6. nothing fits

function unrecognised(w: Work): Diagnosis {
  let worst = w.points[0]!;
  let res = new Decimal(-1);
  for (const p of w.points) {
    const S = Decimal.max(p.lhs.abs(), p.rhs.abs());
    const r = S.isZero() ? new Decimal(0) : p.lhs.sub(p.rhs).abs().div(S);
    if (r.gt(res)) [worst, res] = [p, r];
  }
  const d = worst.lhs.sub(worst.rhs);
  const r = worst.rhs.isZero() ? null : worst.lhs.div(worst.rhs);
  // a ratio within 10^-5 of 1 would print as 1: show how far it is
  const ratio = r === null ? 'undefined (RHS = 0)' : isOne(r, 5) ? `1 + (${show(r.sub(Complex.ONE), 6, w.D)})` : show(r, 6, w.D);
  return done(
    'unrecognised',
    `no pattern fits (constant or parameter factor, (c tau + d)^m, y^a, roots of unity, constant or anomaly difference, a RHS + b, conj, s -> 1 - s, tau -> -1/tau); at the worst sample LHS/RHS = ${ratio} and LHS - RHS = ${show(d, 6, w.D)}`,
    0,
    w.D,
  );
}

/** What is off in a refuted claim (see the module header for the patterns and their order). */
export function diagnose(ctx: DiagnosisContext): Diagnosis {
  if (ctx.samples.length === 0) return { kind: 'unrecognised', text: 'no samples to diagnose', digits: 0 };
  const D = Math.floor(Math.min(...ctx.samples.map((s) => s.digits)));
  const Dmax = Math.floor(Math.max(...ctx.samples.map((s) => s.digits)));
  return withDigits(Math.min(MAX_DIGITS, Dmax + WORK_GUARD), () => {
    const w: Work = {
      ctx,
      points: ctx.samples.map((s) => ({ ...s })),
      D,
      Dmax,
      T: Math.min(ctx.P, D) - FIT_SPARE,
      extra: 0,
      probes: new Map(),
    };
    if (w.points.every((p) => p.agree === true)) {
      return { kind: 'unrecognised', text: 'the two sides agree at every sample: nothing to diagnose', digits: 0 };
    }
    if (w.T < MIN_FIT) return unrecognised(w);
    const steps: ((w: Work) => Diagnosis | null)[] = ratioUsable(w)
      ? [constantFactor, parameterFactor, automorphyFactor, yPower, rootsOfUnity]
      : [];
    steps.push(constantDifference, anomaly, affine, conjugate, reflection, inversion);
    for (const step of steps) {
      const d = step(w);
      if (d !== null) return d;
    }
    return unrecognised(w);
  });
}
