/**
 * Shrinking a refuted claim to its simplest counterexample: the first candidate sample, in
 * order of simplicity, at which the two sides clearly disagree.
 *
 * Conventions:
 * - Candidates combine a point tau, a group element (claims with a group clause) and a
 *   value per parameter. Cost = point cost + word cost + parameter costs; ties go to the
 *   simpler point, then the simpler parameters, then the shorter word.
 *   Points: i, 2i, 1/2 + i, 1/4 + i, 3i, -1/2 + 2i, 1/3 + i/2, 1/2 + i/2 (costs 0, 1, 1, 2,
 *   2, 2, 3, 3), kept when Im tau >= y_min and inside the claim's region; a claim with
 *   fixed points (`at tau in {...}`) uses only those, in their order.
 *   Group elements: the identity, then elements with small bottom rows, by the length of
 *   their word in S and T (src/groups/words.ts: the sum of |powers|, 2 more for a leading
 *   minus since S^2 = -I), then height: at most 4 with c = 0 and 12 in all, members of the
 *   claim's group with Im(g tau) >= y_min. An element with |c| >= 2 also gets its own point
 *   (-d + i)/|c| (cost 3), where g tau is as high as tau: at i it would fall below y_min
 *   for Gamma0(11). Their cost is the rank of their word length
 *   among those chosen (SL2Z: I 0; S, T, T^-1 1; ...), so that the first elements with
 *   c != 0 of Gamma0(11), whose words are long, are tried early too.
 *   Parameters: for an interval, interior integers (cost 0), interior halves (1), the
 *   end points when integers or halves (2), smallest |v| first: [1.2, 3] gives 2, 3/2, 5/2,
 *   3 (a decimal inside when none of those lies there); for a box, such real parts with
 *   imaginary part 0 first, then +-i, ...; for value lists, the listed values by |v|.
 * - Each candidate is evaluated and assessed as the checker does (run.ts, verdict.ts):
 *   P1 = P + 5, P2 = P1 + max(10, ceil(P/3)), one escalation when precision was lost.
 *   Candidates whose evaluation fails (ModvetError: a point below y_min, a pole, a series
 *   out of terms) are skipped. At most `maxEvaluations` candidates are evaluated.
 * - Texts are exact: each candidate carries the string it was built from ("1/2 + i"), not a
 *   re-printed decimal; listed values and fixed points are printed as small fractions when
 *   they are ones, rho as rho.
 *
 *   shrink(toCheckable(claim, {}), 30, 0.02)?.text   // "g = S at tau = i"
 */
import { Decimal } from 'decimal.js';
import type { CheckableClaim, ParamSpec, Sample, SideValue } from '../check/claim.js';
import { assessSample, GUARD_DIGITS, type SampleAssessment } from '../check/verdict.js';
import { Mat2 } from '../groups/matrix.js';
import { contains, type Group } from '../groups/subgroups.js';
import { toWord, wordToString } from '../groups/words.js';
import { Complex } from '../numeric/complex.js';
import { ModvetError } from '../numeric/errors.js';
import { MAX_DIGITS, withDigits } from '../numeric/precision.js';
import type { SimplestFailure } from './types.js';

export interface ShrinkOptions {
  /** Candidates evaluated at most (default 40). */
  maxEvaluations?: number;
  /** Stop looking after this many milliseconds (default: no limit, so results do not depend on the machine). */
  timeLimitMs?: number;
}

const DEFAULT_EVALUATIONS = 40;
/** Choices kept per dimension (the candidate list is their product). */
const MAX_ELEMENTS = 12;
/** Of which at most this many with c = 0 (I, T, T^-1, -I for SL2Z). */
const MAX_TRANSLATIONS = 4;
const MAX_PARAM_CHOICES = 5;
const ESCALATION_GUARD = 5;

interface Choice<T> {
  value: T;
  text: string;
  cost: number;
}

// ---------------------------------------------------------------------------
// Points

/** [text, re, im as exact fractions p/q, cost]. */
const POINTS: readonly [string, [number, number], [number, number], number][] = [
  ['i', [0, 1], [1, 1], 0],
  ['2i', [0, 1], [2, 1], 1],
  ['1/2 + i', [1, 2], [1, 1], 1],
  ['1/4 + i', [1, 4], [1, 1], 2],
  ['3i', [0, 1], [3, 1], 2],
  ['-1/2 + 2i', [-1, 2], [2, 1], 2],
  ['1/3 + i/2', [1, 3], [1, 2], 3],
  ['1/2 + i/2', [1, 2], [1, 2], 3],
];

function frac([p, q]: [number, number]): Decimal {
  return new Decimal(p).div(q);
}

/** The candidate points, at the precision in force (1/3 is rounded to it). */
function pointChoices(claim: CheckableClaim, yMin: number): Choice<Complex>[] {
  if (claim.points !== undefined) return claim.points.map((tau, k) => ({ value: tau, text: formatComplex(tau), cost: k }));
  const out: Choice<Complex>[] = [];
  for (const [text, re, im, cost] of POINTS) {
    const tau = new Complex(frac(re), frac(im));
    if (tau.im.lt(yMin)) continue;
    if (claim.region !== undefined && !claim.region(tau)) continue;
    out.push({ value: tau, text, cost });
  }
  return out;
}

// ---------------------------------------------------------------------------
// Group elements

function gcd(a: number, b: number): number {
  a = Math.abs(a);
  b = Math.abs(b);
  while (b) [a, b] = [b, a % b];
  return a;
}

/** [u, v] with u d - v c = 1 for coprime (c, d), c != 0. */
function completion(c: number, d: number): [number, number] {
  // extended Euclid on (d, c): s d + t c = g = +-1
  let [r0, r1] = [d, c];
  let [s0, s1] = [1, 0];
  let [t0, t1] = [0, 1];
  while (r1 !== 0) {
    const q = Math.trunc(r0 / r1);
    [r0, r1] = [r1, r0 - q * r1];
    [s0, s1] = [s1, s0 - q * s1];
    [t0, t1] = [t1, t0 - q * t1];
  }
  return r0 < 0 ? [-s0, t0] : [s0, -t0];
}

/** Cost of a word: the sum of |powers|, plus 2 for a leading minus (S^2 = -I). */
function wordCost(m: Mat2): { cost: number; text: string; letters: number } {
  const w = toWord(m);
  const cost = w.letters.reduce((s, l) => s + Math.abs(l.pow), 0) + (w.sign === -1 ? 2 : 0);
  return { cost, text: wordToString(w), letters: w.letters.length };
}

/**
 * The simplest members of the group: bottom rows (c, d) with c in {0, +-N, +-2N} and small
 * d, each completed to matrices with small top rows; sorted by word cost, height, text.
 */
function groupChoices(group: Group): Choice<Mat2>[] {
  const N = group.kind === 'SL2Z' ? 1 : group.N;
  const D = Math.min(N, 50) + 3;
  const T = Math.min(N, 20) + 2;
  const seen = new Map<string, Mat2>();
  const add = (m: Mat2) => {
    if (contains(group, m)) seen.set(m.toString(), m);
  };
  for (const d of [1, -1]) for (let b = -T; b <= T; b++) add(new Mat2(BigInt(d), BigInt(b), 0n, BigInt(d)));
  for (const c of [N, -N, 2 * N, -2 * N]) {
    for (let d = -D; d <= D; d++) {
      if (gcd(c, d) !== 1) continue;
      const [a0, b0] = completion(c, d);
      // a = a0 + t c, b = b0 + t d: start near the smallest |a|
      const t0 = Math.round(-a0 / c);
      for (let t = t0 - T; t <= t0 + T; t++) add(new Mat2(BigInt(a0 + t * c), BigInt(b0 + t * d), BigInt(c), BigInt(d)));
    }
  }
  const ranked = [...seen.values()].map((m) => ({ m, ...wordCost(m), height: m.height() }));
  ranked.sort((x, y) => x.cost - y.cost || (x.height < y.height ? -1 : x.height > y.height ? 1 : 0) || (x.text < y.text ? -1 : x.text > y.text ? 1 : 0));
  // a few translations, so that a subgroup's simplest elements with c != 0 are tried too
  const translations = ranked.filter((r) => r.m.c === 0n).slice(0, MAX_TRANSLATIONS);
  const others = ranked.filter((r) => r.m.c !== 0n).slice(0, MAX_ELEMENTS - translations.length);
  const chosen = ranked.filter((r) => translations.includes(r) || others.includes(r));
  // cost: the dense rank of the word cost, so that long words of a subgroup of high level
  // do not come after every point and parameter
  const levels = [...new Set(chosen.map((r) => r.cost))];
  // a long word says less than the matrix itself
  const text = (r: (typeof chosen)[number]): string => (r.letters <= 2 ? r.text : r.letters <= 4 ? `${r.text} = ${r.m}` : r.m.toString());
  return chosen.map((r) => ({ value: r.m, text: text(r), cost: levels.indexOf(r.cost) }));
}

// ---------------------------------------------------------------------------
// Parameters

/** "2", "3/2", "-1/2" for a multiple of 1/2 given as twice its value. */
function halfText(twice: number): string {
  return twice % 2 === 0 ? String(twice / 2) : `${twice}/2`;
}

/** Integers and halves in [lo, hi] (cost 0 interior integers, 1 interior halves, 2 end points), else a short decimal inside. */
function realChoices(lo: number, hi: number): Choice<Decimal>[] {
  const out: Choice<Decimal>[] = [];
  let first = Math.ceil(2 * lo);
  let last = Math.floor(2 * hi);
  if (last - first > 40) {
    // a wide interval: the values nearest to 0 (or to the end nearest 0)
    const centre = Math.round(2 * Math.min(Math.max(0, lo), hi));
    first = Math.max(first, centre - 20);
    last = Math.min(last, centre + 20);
  }
  for (let k = first; k <= last; k++) {
    const v = k / 2;
    const end = v === lo || v === hi;
    out.push({ value: new Decimal(k).div(2), text: halfText(k), cost: end ? 2 : k % 2 === 0 ? 0 : 1 });
  }
  out.sort((a, b) => a.cost - b.cost || a.value.abs().cmp(b.value.abs()) || b.value.cmp(a.value));
  if (out.length > 0) return out;
  // no integer or half inside: the shortest decimal near the middle
  const mid = (lo + hi) / 2;
  for (let sd = 1; sd <= 15; sd++) {
    const v = Number(mid.toPrecision(sd));
    if (v >= lo && v <= hi) return [{ value: new Decimal(mid.toPrecision(sd)), text: String(v), cost: 3 }];
  }
  return [{ value: new Decimal(mid), text: String(mid), cost: 3 }];
}

/** "2", "2 + i", "3/2 - 2i", "i/2", "-i" from the texts of the parts. */
function joinParts(re: Choice<Decimal>, im: Choice<Decimal> | null): string {
  if (im === null || im.value.isZero()) return re.text;
  const neg = im.value.isNegative();
  const mag = im.text.replace(/^-/, '');
  const imText = mag === '1' ? 'i' : mag.includes('/') ? mag.replace('/', 'i/') : `${mag}i`;
  if (re.value.isZero()) return `${neg ? '-' : ''}${imText}`;
  return `${re.text} ${neg ? '-' : '+'} ${imText}`;
}

function paramChoices(p: ParamSpec): Choice<Complex>[] {
  switch (p.kind) {
    case 'interval':
      return realChoices(p.lo, p.hi)
        .slice(0, MAX_PARAM_CHOICES)
        .map((c) => ({ value: new Complex(c.value, 0), text: c.text, cost: c.cost }));
    case 'box': {
      const res = realChoices(p.reLo, p.reHi).slice(0, MAX_PARAM_CHOICES);
      const ims = realChoices(p.imLo, p.imHi);
      // the imaginary part counts double, by rank of |Im|: 0 first, then +-1, ...
      const mags = [...new Set(ims.filter((c) => !c.value.isZero()).map((c) => c.value.abs().toString()))];
      const out: Choice<Complex>[] = [];
      for (const re of res) {
        for (const im of ims.slice(0, MAX_PARAM_CHOICES)) {
          const imCost = im.value.isZero() ? 0 : 2 * (1 + mags.indexOf(im.value.abs().toString()));
          out.push({ value: new Complex(re.value, im.value), text: joinParts(re, im), cost: re.cost + imCost });
        }
      }
      return out.sort((a, b) => a.cost - b.cost).slice(0, MAX_PARAM_CHOICES);
    }
    case 'values':
      return p.values
        .map((v, k) => ({ v, k }))
        .sort((a, b) => a.v.abs().cmp(b.v.abs()) || a.k - b.k)
        .slice(0, MAX_PARAM_CHOICES)
        .map(({ v }, rank) => ({ value: v, text: formatComplex(v), cost: rank }));
  }
}

// ---------------------------------------------------------------------------
// Formatting of values that came without their text (listed values, fixed points)

/** p/q with q <= 12 when x is one to 20 digits, else a 6-digit decimal. */
function formatReal(x: Decimal): string {
  for (let q = 1; q <= 12; q++) {
    const p = x.times(q).round();
    if (x.times(q).minus(p).abs().lte(new Decimal(10).pow(-20).times(Decimal.max(1, x.abs().times(q))))) {
      if (gcd(p.toNumber(), q) !== 1) continue;
      return q === 1 ? p.toString() : `${p.toString()}/${q}`;
    }
  }
  return x.toSignificantDigits(6).toString();
}

function formatComplex(z: Complex): string {
  const rho = new Complex(-0.5, new Decimal(3).sqrt().div(2));
  const tol = new Decimal(10).pow(-20);
  if (z.sub(rho).abs().lt(tol)) return 'rho';
  if (z.sub(rho).sub(Complex.ONE).abs().lt(tol)) return 'rho + 1';
  const choice = (x: Decimal): Choice<Decimal> => ({ value: x, text: formatReal(x), cost: 0 });
  return joinParts(choice(z.re), z.im.isZero() ? null : choice(z.im));
}

// ---------------------------------------------------------------------------
// The search

interface Candidate {
  sample: Sample;
  text: string;
  cost: number;
  /** Tie-break: point index, parameter indices, group index. */
  order: number[];
}

/**
 * For g with |c| >= 2 the fixed points are mostly too low after g (Im(g i) = 1/(c^2 + d^2)):
 * tau = (-d + i)/|c| has |c tau + d| = 1, so Im tau = Im(g tau) = 1/|c|.
 */
function adaptedPoint(g: Mat2): Choice<Complex> | null {
  const c = Number(g.c);
  const d = Number(g.d);
  if (Math.abs(c) < 2) return null;
  const q = Math.abs(c);
  const re = fractionText(-d * Math.sign(c), q);
  const text = re === '0' ? `i/${q}` : `${re} + i/${q}`;
  return { value: new Complex(new Decimal(-d).div(c), new Decimal(1).div(q)), text, cost: 3 };
}

function fractionText(p: number, q: number): string {
  const g = gcd(p, q);
  const [pp, qq] = [p / g, q / g];
  return qq === 1 ? String(pp) : `${pp}/${qq}`;
}

function compareOrder(a: Candidate, b: Candidate): number {
  if (a.cost !== b.cost) return a.cost - b.cost;
  for (let k = 0; k < a.order.length; k++) if (a.order[k] !== b.order[k]) return a.order[k]! - b.order[k]!;
  return 0;
}

function candidates(claim: CheckableClaim, yMin: number): Candidate[] {
  const points = pointChoices(claim, yMin);
  const group = claim.group;
  const elements: (Choice<Mat2> | null)[] = group !== undefined ? groupChoices(group.group) : [null];
  // every combination of parameter choices (one empty combination without parameters)
  let combos: { choices: Choice<Complex>[]; idx: number[] }[] = [{ choices: [], idx: [] }];
  for (const p of claim.params) {
    const cs = paramChoices(p);
    combos = combos.flatMap((c) => cs.map((x, k) => ({ choices: [...c.choices, x], idx: [...c.idx, k] })));
  }
  const out: Candidate[] = [];
  const push = (pt: Choice<Complex>, pi: number, el: Choice<Mat2> | null, gi: number) => {
    // the element must keep g tau above y_min (Im(g tau) = Im tau / |c tau + d|^2)
    if (el !== null && pt.value.im.div(el.value.automorphy(pt.value).abs2()).lt(yMin)) return;
    for (const combo of combos) {
      const params = new Map<string, Complex>();
      claim.params.forEach((p, k) => params.set(p.name, combo.choices[k]!.value));
      const sample: Sample = { tau: pt.value, params, origin: 'fixed' };
      if (el !== null) sample.gamma = el.value;
      // parameters in source order, then the group element
      const parts = claim.params.map((p, k) => `${p.name} = ${combo.choices[k]!.text}`);
      if (el !== null && group !== undefined) parts.push(`${group.variable} = ${el.text}`);
      const head = parts.join(', ');
      const text = head === '' ? `tau = ${pt.text}` : `${head} at tau = ${pt.text}`;
      const cost = pt.cost + (el?.cost ?? 0) + combo.choices.reduce((sum, c) => sum + c.cost, 0);
      out.push({ sample, text, cost, order: [pi, ...combo.idx, gi] });
    }
  };
  elements.forEach((el, gi) => {
    points.forEach((pt, pi) => push(pt, pi, el, gi));
    const own = el === null || claim.points !== undefined ? null : adaptedPoint(el.value);
    if (own !== null && (claim.region === undefined || claim.region(own.value))) push(own, points.length, el, gi);
  });
  return out.sort(compareOrder);
}

function precisions(P: number, extra = 0): [number, number] {
  const p1 = Math.min(MAX_DIGITS, P + 5 + extra);
  return [p1, Math.min(MAX_DIGITS, p1 + Math.max(10, Math.ceil(P / 3)))];
}

function assess(claim: CheckableClaim, s: Sample, P: number, yMin: number): SampleAssessment {
  const at = (p: number): { lhs: SideValue; rhs: SideValue } => withDigits(p, () => claim.evaluate(s, yMin));
  const [p1, p2] = precisions(P);
  let a = assessSample(at(p1), at(p2), P);
  const tol = new Decimal(10).pow(-(P - GUARD_DIGITS));
  if (a.outcome === 'undecided' && a.error.gte(tol) && !a.error.isZero()) {
    // precision was lost: add what was lost and try once more (as run.ts)
    const lost = Math.ceil(a.error.div(tol).log(10).toNumber()) + ESCALATION_GUARD;
    const [q1, q2] = precisions(P, lost);
    if (q1 > p1) a = assessSample(at(q1), at(q2), P);
  }
  return a;
}

/**
 * The simplest sample (module header) at which the claim's sides clearly disagree at P
 * digits, or null when none of the candidates tried does.
 */
export function shrink(claim: CheckableClaim, P: number, yMin: number, opts: ShrinkOptions = {}): SimplestFailure | null {
  const max = opts.maxEvaluations ?? DEFAULT_EVALUATIONS;
  const deadline = opts.timeLimitMs === undefined ? Infinity : performance.now() + opts.timeLimitMs;
  // the points are exact or rounded far below the checked precision (1/3)
  const list = withDigits(Math.min(MAX_DIGITS, Math.max(60, 2 * P + 40)), () => candidates(claim, yMin));
  let evaluated = 0;
  for (const c of list) {
    if (evaluated >= max || performance.now() > deadline) break;
    evaluated++;
    let a: SampleAssessment;
    try {
      a = assess(claim, c.sample, P, yMin);
    } catch (e) {
      if (e instanceof ModvetError) continue;
      throw e;
    }
    if (a.outcome === 'disagree') return { sample: c.sample, text: c.text, residual: a.residual.toSD(3).toString() };
  }
  return null;
}
