/**
 * One claim's piece of the HTML report (html.ts HtmlClaim), computed where the claim was
 * checked (src/cli/unit.ts, possibly a worker thread): its plots as inline SVG strings
 * (svg.ts) and its results as plain text.
 *
 *   const piece = htmlClaim(result, { claim, index, yMin })   // result: ExplainedResult
 *
 * Conventions:
 * - Path plot: both sides along the vertical path x = x0, x0 = Re tau of the worst sample
 *   (0.1 when there is none), y from the claim's y_min, or its region's lower bound on y
 *   when that is higher, to 2 (or the region's upper bound on y; a path that would be empty
 *   runs 1.5 up from its start). PATH_POINTS points y_k = y0 + (y1 - y0) k / (N - 1), each
 *   evaluated once at PATH_DIGITS digits with the worst sample's group element and
 *   parameters fixed. A point outside the claim's region or where an evaluation fails is
 *   a gap; the caption says how many and why.
 * - Real and imaginary parts when |value| stays within VALUE_SPREAD decades along the path;
 *   otherwise (modular forms grow like y^-k near the axis) log10 |value| and arg/pi.
 * - No path plot for claims at fixed points (`at tau in {...}`), nor for costly claims:
 *   a lattice sum, or an estimated cost (evaluationCost, from the AST alone, so that the
 *   report does not depend on the machine) above PATH_BUDGET.
 * - Residual plot: log10 of the relative residual (verdict.ts) at each checked sample,
 *   against the sample's number in the order checked, with the tolerance 10^-(P - 2) (or
 *   the accuracy a lattice sum reached) as a dashed line. Exact zeros sit at the floor.
 */
import { Decimal } from 'decimal.js';
import type { Claim, Expr } from '../lang/ast.js';
import { Complex } from '../numeric/complex.js';
import { ModvetError, type NumericErrorCode } from '../numeric/errors.js';
import { withDigits } from '../numeric/precision.js';
import { evaluateRegion } from '../eval/evaluate.js';
import { isElementary } from '../eval/symbolic.js';
import type { ParamSpec, Sample, SideValue } from '../check/claim.js';
import type { SampleReport } from '../check/run.js';
import { GUARD_DIGITS } from '../check/verdict.js';
import type { ExplainedResult } from '../diagnose/explain.js';
import { showComplex, showMatrix } from './describe.js';
import { linePlot, PALETTE, type Panel, type Series } from './svg.js';
import type { HtmlClaim, HtmlSampleRow } from './html.js';

export const PATH_POINTS = 40;
export const PATH_DIGITS = 12;
/** Largest evaluationCost of a claim whose path is plotted (about 40 x that many built-in calls). */
export const PATH_BUDGET = 60;
/** Decades of |value| along the path above which modulus and phase are drawn. */
export const VALUE_SPREAD = 3;
const DEFAULT_X0 = '0.1';
const PATH_TOP = 2;
/** Digits of the numbers shown in the samples table and the worst sample. */
const SHOWN = 12;

// ---------------------------------------------------------------------------
// Cost, from the AST

/** Built-ins summed from Fourier-Bessel or incomplete-gamma expansions: several times a q-series. */
const SLOW_CALLS: ReadonlySet<string> = new Set(['Ens', 'Estar', 'EnsSplit', 'EstarSplit', 'K', 'Gamma', 'zeta', 'xi', 'beta']);
const ELEMENTARY_CALLS: ReadonlySet<string> = new Set(['exp', 'log', 'sqrt', 'abs', 're', 'im', 'conj', 'arg', 'sin', 'cos', 'sinh', 'cosh']);
/** Re-evaluations of a non-elementary operand by the finite differences (derivative.ts). */
const OPERATOR_FACTOR = 30;
/** Terms assumed for a series whose length is not a literal (infinite: q-series converge geometrically). */
const SERIES_TERMS = 10;
/** Terms assumed for a sum over divisors. */
const DIVISOR_TERMS = 5;
/** Evaluations of the body of a limit (extrapolation at several points, src/eval/limit.ts). */
const LIMIT_FACTOR = 40;

/**
 * An estimate of one evaluation of both sides, in units of one modular built-in call
 * (E(4, tau) costs 1): Infinity for a lattice sum. Shared subtrees (let expansions) are
 * counted at each use, which over-estimates and so errs on the side of skipping.
 */
export function evaluationCost(claim: Claim): number {
  const memo = new Map<Expr, number>();
  const cost = (e: Expr): number => {
    const hit = memo.get(e);
    if (hit !== undefined) return hit;
    let c: number;
    switch (e.kind) {
      case 'number':
      case 'constant':
      case 'tau':
      case 'param':
      case 'groupEntry':
      case 'boundVar':
        c = 0;
        break;
      case 'tauPart':
      case 'neg':
      case 'moebius':
        c = cost(e.arg);
        break;
      case 'binary':
        c = cost(e.left) + cost(e.right);
        break;
      case 'letCall':
        c = cost(e.body);
        break;
      case 'call': {
        const own = ELEMENTARY_CALLS.has(e.fn) ? 0 : SLOW_CALLS.has(e.fn) ? 3 : 1;
        c = own + e.args.reduce((a, x) => a + cost(x), 0);
        break;
      }
      case 'operator': {
        const inner = cost(e.arg) + (e.weight !== null ? cost(e.weight) : 0);
        c = 1 + (e.at !== null ? cost(e.at) : 0) + (isElementary(e) ? inner : OPERATOR_FACTOR * Math.max(1, inner));
        break;
      }
      case 'series': {
        const r = e.range;
        let n = r.kind === 'divisors' ? DIVISOR_TERMS : SERIES_TERMS;
        if (r.kind === 'range' && r.to !== null && r.from.kind === 'number' && r.to.kind === 'number') n = Number(r.to.text) - Number(r.from.text) + 1;
        c = Math.max(1, Number.isFinite(n) ? n : SERIES_TERMS) * Math.max(0.1, cost(e.body));
        break;
      }
      case 'limit':
        c = LIMIT_FACTOR * Math.max(0.1, cost(e.body)) + cost(e.at);
        break;
      case 'lattice':
        c = Infinity;
        break;
    }
    memo.set(e, c);
    return c;
  };
  return cost(claim.lhs) + cost(claim.rhs);
}

function hasLattice(claim: Claim): boolean {
  return evaluationCost(claim) === Infinity;
}

// ---------------------------------------------------------------------------
// The path

export interface ClaimPath {
  x0: Decimal;
  from: Decimal;
  to: Decimal;
}

/** The vertical path of a claim (module header); region bounds from the AST. */
export function claimPath(claim: Claim | null, worst: Sample | undefined, yMin: number): ClaimPath {
  return withDigits(30, () => {
    const x0 = worst !== undefined ? worst.tau.re : new Decimal(DEFAULT_X0);
    let from = new Decimal(yMin);
    let to = new Decimal(PATH_TOP);
    if (claim?.region !== undefined) {
      for (const b of evaluateRegion(claim.region)) {
        if (b.quantity !== 'y') continue;
        if ((b.op === '>' || b.op === '>=') && b.value.gt(from)) from = b.value;
        if ((b.op === '<' || b.op === '<=') && b.value.lt(to)) to = b.value;
      }
    }
    if (to.lte(from)) to = from.plus(1.5);
    return { x0, from, to };
  });
}

type PathOutcome = { ok: true; lhs: SideValue; rhs: SideValue } | { ok: false; why: string };

const WHY: Record<NumericErrorCode, string> = {
  ymin: 'an argument below y_min',
  pole: 'at a pole',
  convergence: 'did not converge',
  domain: 'a domain error',
  precision: 'lost precision',
  overflow: 'overflowed',
};

/** log10 |z| as a double (exponents beyond double range are fine); -Infinity for 0. */
function log10Abs(z: Complex): number {
  return withDigits(PATH_DIGITS, () => (z.isZero() ? -Infinity : z.abs().log(10).toNumber()));
}

function finiteOrNull(d: Decimal): number | null {
  const v = d.toNumber();
  return Number.isFinite(v) ? v : null;
}

/** "3 of 40 points not drawn (2 outside the region, 1 at a pole)", or null. */
function gapText(outcomes: PathOutcome[]): string | null {
  const counts = new Map<string, number>();
  for (const o of outcomes) if (!o.ok) counts.set(o.why, (counts.get(o.why) ?? 0) + 1);
  if (counts.size === 0) return null;
  const total = [...counts.values()].reduce((a, b) => a + b, 0);
  const why = [...counts.entries()].sort((a, b) => (a[0] < b[0] ? -1 : 1)).map(([w, n]) => `${n} ${w}`);
  return `${total} of ${outcomes.length} points not drawn (${why.join(', ')})`;
}

function short(d: Decimal, sd = 6): string {
  return withDigits(Math.max(sd, 5), () => d.toSD(sd).toString());
}

/** What is held fixed along the path: the group element and the parameters. */
function fixedText(s: Pick<Sample, 'gamma' | 'params'>, groupVar: string | undefined): string[] {
  const out: string[] = [];
  if (s.gamma !== undefined) out.push(`${groupVar ?? 'g'} = ${showMatrix(s.gamma)}`);
  for (const [k, v] of [...s.params].sort((a, b) => (a[0] < b[0] ? -1 : 1))) out.push(`${k} = ${showComplex(v, 8)}`);
  return out;
}

/** Parameters for a claim with no evaluated sample: the first listed value, the middle of a range. */
function defaultParams(specs: readonly ParamSpec[]): Map<string, Complex> {
  const m = new Map<string, Complex>();
  for (const p of specs) {
    if (p.kind === 'values') m.set(p.name, p.values[0] ?? Complex.ZERO);
    else if (p.kind === 'interval') m.set(p.name, Complex.of((p.lo + p.hi) / 2));
    else m.set(p.name, Complex.of((p.reLo + p.reHi) / 2, (p.imLo + p.imHi) / 2));
  }
  return m;
}

/** A gap where the phase jumps across the cut at +-1 (a jump of more than 1 between neighbours), not a vertical line. */
function unwrapGaps(x: readonly number[], y: readonly (number | null)[]): { x: number[]; y: (number | null)[] } {
  const ox: number[] = [];
  const oy: (number | null)[] = [];
  y.forEach((v, k) => {
    const prev = k > 0 ? y[k - 1] : null;
    if (v !== null && prev !== null && prev !== undefined && Math.abs(v - prev) > 1) {
      ox.push((x[k - 1]! + x[k]!) / 2);
      oy.push(null);
    }
    ox.push(x[k]!);
    oy.push(v);
  });
  return { x: ox, y: oy };
}

/** Both sides along the path, as an inline SVG (no XML declaration). */
export function pathPlotSvg(result: ExplainedResult, path: ClaimPath, idPrefix: string): string {
  const claim = result.claim;
  const base = result.worst?.sample ?? result.reports[0]?.sample;
  const params = base?.params ?? defaultParams(claim.params);
  const yMin = claim.yMin ?? 0;
  const ys: number[] = [];
  const outcomes: PathOutcome[] = [];
  for (let k = 0; k < PATH_POINTS; k++) {
    outcomes.push(
      withDigits(PATH_DIGITS, (): PathOutcome => {
        const y = path.from.plus(path.to.minus(path.from).times(k).div(PATH_POINTS - 1));
        ys.push(y.toNumber());
        const tau = new Complex(path.x0, y);
        if (claim.region !== undefined && !claim.region(tau)) return { ok: false, why: 'outside the region' };
        const sample: Sample = { tau, params, origin: 'F', ...(base?.gamma !== undefined ? { gamma: base.gamma } : {}) };
        try {
          const v = claim.evaluate(sample, yMin);
          return { ok: true, lhs: v.lhs, rhs: v.rhs };
        } catch (e) {
          if (!(e instanceof ModvetError)) throw e;
          return { ok: false, why: WHY[e.code] };
        }
      }),
    );
  }
  const logs = outcomes.flatMap((o) => (o.ok ? [log10Abs(o.lhs.value), log10Abs(o.rhs.value)] : [])).filter((v) => Number.isFinite(v));
  const polar = logs.length > 0 && (Math.max(...logs) - Math.min(...logs) > VALUE_SPREAD || Math.max(...logs.map(Math.abs)) > 300);
  const sides = [
    { name: 'LHS', get: (o: PathOutcome) => (o.ok ? o.lhs.value : null), color: PALETTE[0], width: 4 },
    { name: 'RHS', get: (o: PathOutcome) => (o.ok ? o.rhs.value : null), color: PALETTE[1], width: 1.6 },
  ];
  const panels: Panel[] = [];
  const xLabel = 'y = Im tau';
  if (polar) {
    const mod: Series[] = sides.map((s) => ({ label: `|${s.name}|`, x: ys, y: outcomes.map((o) => { const z = s.get(o); return z === null ? null : log10Abs(z); }), color: s.color, width: s.width }));
    const phase: Series[] = sides.map((s) => {
      const args = outcomes.map((o) => {
        const z = s.get(o);
        return z === null || z.isZero() ? null : withDigits(PATH_DIGITS, () => z.arg().div(Math.PI).toNumber());
      });
      return { label: `arg ${s.name} / pi`, ...unwrapGaps(ys, args), color: s.color, width: s.width };
    });
    panels.push({ title: 'modulus of both sides (log scale)', yLabel: '|value|', yScale: 'log10', weight: 3, series: mod });
    panels.push({ title: 'phase of both sides, arg / pi', yLabel: 'arg / pi', weight: 2, xLabel, series: phase });
  } else {
    const parts: Series[] = sides.flatMap((s) => [
      { label: `Re ${s.name}`, x: ys, y: outcomes.map((o) => { const z = s.get(o); return z === null ? null : finiteOrNull(z.re); }), color: s.color, width: s.width },
      { label: `Im ${s.name}`, x: ys, y: outcomes.map((o) => { const z = s.get(o); return z === null ? null : finiteOrNull(z.im); }), color: s.color, width: s.width, dash: 'dashed' as const },
    ]);
    panels.push({ title: 'real and imaginary parts of both sides', yLabel: 'value', xLabel, series: parts });
  }
  const held = fixedText({ params, ...(base?.gamma !== undefined ? { gamma: base.gamma } : {}) }, claim.group?.variable);
  const along = `x = ${short(path.x0)}, y from ${short(path.from)} to ${short(path.to)}`;
  const caption: string[] = [];
  const gaps = gapText(outcomes);
  if (gaps !== null) caption.push(gaps);
  caption.push(`${polar ? 'log10 |value| and arg/pi: |value| spans more than ' + VALUE_SPREAD + ' decades' : 'real parts solid, imaginary parts dashed'}; LHS wide underneath, RHS narrow on top.`);
  const subtitle = [`along ${along}; ${PATH_POINTS} points at ${PATH_DIGITS} digits`];
  if (held.length > 0) subtitle.push(`held fixed${result.worst !== undefined ? ' (as at the worst sample)' : ''}: ${held.join(', ')}`);
  const svg = linePlot({
    width: 760,
    height: polar ? 500 : 380,
    title: 'both sides along a vertical path',
    subtitle,
    caption,
    description: `Both sides of ${claim.text} along ${along}. ${caption.join(' ')}`,
    idPrefix,
    panels,
  });
  return inline(svg);
}

// ---------------------------------------------------------------------------
// The residuals

function log10Decimal(d: Decimal): number {
  return d.isZero() ? -Infinity : withDigits(PATH_DIGITS, () => d.abs().log(10).toNumber());
}

/** The tolerance the sample was judged against (verdict.ts): 10^-(P-2), or a lattice sum's accuracy. */
function tolerance(r: SampleReport, P: number): number {
  let t = -(P - GUARD_DIGITS);
  for (const l of [r.lhs.limit, r.rhs.limit]) if (l !== undefined) t = Math.max(t, log10Decimal(l.rel));
  return t;
}

/** log10 of the relative residual at each sample, as an inline SVG. */
export function residualPlotSvg(result: ExplainedResult, idPrefix: string): string {
  const reports = result.reports;
  const P = result.requested;
  const n = reports.length;
  // each residual is a dot: a gap between consecutive samples
  const rx: number[] = [];
  const ry: (number | null)[] = [];
  reports.forEach((r, k) => {
    if (k > 0) {
      rx.push(k + 0.5);
      ry.push(null);
    }
    rx.push(k + 1);
    ry.push(log10Decimal(r.assessment.residual));
  });
  // the tolerance line spans the frame; its ends also set an x range with whole-number ticks
  const tol = reports.map((r) => tolerance(r, P));
  const end = Math.max(n + 1, 6);
  const tx = [0, ...reports.map((_, k) => k + 1), end];
  const ty = [tol[0]!, ...tol, tol[n - 1]!];
  const finite = [...ry, ...ty].filter((v): v is number => v !== null && Number.isFinite(v));
  const floor = Math.min(-(P + 2), Math.floor(Math.min(...finite)) - 1);
  const zeros = ry.filter((v) => v === -Infinity).length;
  const caption = [`Relative residual |LHS - RHS| / max(|LHS|, |RHS|) (or / the size of the terms where both sides vanish) at ${n === 1 ? 'the checked sample' : `each of the ${n} checked samples, in the order checked`} (the table below lists ${n === 1 ? 'it' : 'them'}); dashed: the tolerance a sample must stay under to agree.`];
  if (zeros > 0) caption.push(`${zeros} exactly 0 (drawn at the floor 10^${floor}).`);
  if (result.samples > n) caption.push(`${result.samples - n} samples did not converge and are not drawn.`);
  const svg = linePlot({
    width: 760,
    height: 320,
    title: 'log10 of the relative residual per sample',
    caption,
    description: `Residuals of ${result.claim.text} at ${n} samples, log scale. ${caption.join(' ')}`,
    idPrefix,
    panels: [
      {
        yLabel: 'residual',
        xLabel: 'sample number (order checked)',
        yScale: 'log10',
        floor,
        series: [
          { label: 'residual', x: rx, y: ry, color: result.verdict === 'refuted' ? PALETTE[1] : PALETTE[2], width: 3.5 },
          // drawn wide: with no residual above it, the line is the frame's top edge
          { label: 'tolerance', x: tx, y: ty, color: PALETTE[3], width: 2.4, dash: 'dashed' },
        ],
      },
    ],
  });
  return inline(svg);
}

/** An SVG document as an element for an HTML page: without its XML declaration. */
function inline(svg: string): string {
  return svg.replace(/^<\?xml[^>]*\?>\n/, '').trimEnd();
}

// ---------------------------------------------------------------------------
// The piece

export interface HtmlClaimContext {
  /** The claim's AST (null when it could not be set up: no plots). */
  claim: Claim | null;
  /** Position in the run: makes the SVG element ids unique in the page. */
  index: number;
  /** The y_min of the run (the claim's own clause wins). */
  yMin: number;
}

function pointText(s: Sample, groupVar: string | undefined): string {
  const parts = [`tau = ${showComplex(s.tau, SHOWN)}`];
  parts.push(...fixedText(s, groupVar));
  return parts.join(', ');
}

function sci(d: Decimal): string {
  return d.isZero() ? '0' : withDigits(10, () => d.toSD(3).toExponential().replace('e+', 'e'));
}

/** Why a claim has no path plot, or null when it gets one. */
export function pathSkipReason(claim: Claim | null, result: ExplainedResult): string | null {
  if (claim === null) return 'no path plot: the claim could not be set up';
  if (claim.at !== undefined || result.claim.points !== undefined) return 'no path plot: the claim is checked at fixed points only';
  if (hasLattice(claim)) return 'path plot skipped: costly claim (a lattice sum)';
  const c = evaluationCost(claim);
  if (c > PATH_BUDGET) return `path plot skipped: costly claim (estimated cost ${Math.round(c)} built-in evaluations per point, budget ${PATH_BUDGET})`;
  return null;
}

/** The claim's piece of the HTML report (module header). */
export function htmlClaim(result: ExplainedResult, ctx: HtmlClaimContext): HtmlClaim {
  const c = result.claim;
  const groupVar = c.group?.variable;
  const out: HtmlClaim = {
    name: c.name,
    file: c.file,
    line: c.line,
    equation: c.text,
    verdict: result.verdict,
    expect: c.expect,
    ok: result.ok,
    digits: result.digits,
    requested: result.requested,
    vanishing: result.worst?.assessment.vanishing === true,
    samples: result.samples,
    timeMs: result.timeMs,
    sampleRows: result.reports.map(
      (r): HtmlSampleRow => ({ point: pointText(r.sample, groupVar), outcome: r.assessment.outcome, residual: sci(r.assessment.residual), digits: r.assessment.digits }),
    ),
  };
  if (c.source !== undefined) out.source = c.source;
  if (result.limitedBy !== undefined) out.limitedBy = result.limitedBy;
  if (result.reason !== undefined) out.reason = result.reason;
  const w = result.worst;
  if (w !== undefined) {
    out.worst = { point: pointText(w.sample, groupVar), lhs: showComplex(w.lhs.value), rhs: showComplex(w.rhs.value), residual: sci(w.assessment.residual) };
  }
  const x = result.explanation;
  if (x !== undefined) {
    out.diagnosis = x.diagnosis.text;
    if (x.simplest !== null) out.simplest = `${x.simplest.text} (relative residual ${x.simplest.residual})`;
    if (x.suggestion !== undefined) {
      const s = x.suggestion;
      out.suggestion = { equation: s.equation, verdict: s.verdict, digits: s.digits, ...(s.limitedBy !== undefined ? { limitedBy: s.limitedBy } : {}), ...(s.reason !== undefined ? { reason: s.reason } : {}) };
    }
  }
  const skip = pathSkipReason(ctx.claim, result);
  if (skip !== null) out.pathNote = skip;
  else {
    const yMin = c.yMin ?? ctx.yMin;
    const path = claimPath(ctx.claim, w?.sample, yMin);
    out.pathSvg = pathPlotSvg({ ...result, claim: { ...c, yMin } }, path, `c${ctx.index}-path`);
  }
  if (result.reports.length > 0) out.residualSvg = residualPlotSvg(result, `c${ctx.index}-res`);
  else out.residualNote = 'no residual plot: no sample was evaluated';
  return out;
}
