/**
 * `modvet plot "<f>" ["<g>"] --path "x=-0.4, y=0.5..3" --out plot.svg [--points N]
 * [--digits D] [--at name=value] [--ymin Y]`: f (and g) sampled along a vertical path
 * (x fixed, y from y0 to y1) or a horizontal one ("y=1.2, x=-0.5..0.5"), drawn as one SVG
 * (src/report/svg.ts): real and imaginary parts of each expression in the upper panel and,
 * with two expressions, log10 |f - g| in the lower one.
 *
 * Conventions:
 * - The expressions and --at values are read as in `modvet eval` (src/cli/eval.ts): each
 *   expression is the left side of a one-claim source whose --at values are one-value
 *   parameter lists; tau comes from the path, so `--at tau=...` is refused.
 * - The N sample points are t_k = t0 + (t1 - t0) k / (N - 1), computed at D digits (so they
 *   are exact inputs at that precision). Each value is evaluated once at D digits.
 * - The difference f - g is taken in Decimal from the D-digit values, before log10, so the
 *   panel shows differences far below double precision. Beside it, as a dashed line, the
 *   evaluations' own error bound 10^-D (S_f + S_g) (EvalResult.scale, evaluate.ts), plus
 *   rel |value| for a value limited by a truncated construct (a lattice sum): a difference
 *   at or under that line is rounding noise, one far above it is a real disagreement.
 * - The difference panel's floor is 10^-(D+2), or lower when the data go lower; an exact
 *   0 difference is drawn at the floor with a triangle mark.
 * - A point where an evaluation fails (a pole, Im tau below y_min, a series that did not
 *   converge, a domain error) is a gap, never a number; the caption and the SVG's <desc>
 *   say how many and why. A value too large for a double is a gap in the upper panel only.
 * - The file is written only at the end; a .vet name is refused (claim files are never
 *   overwritten), as is a missing --out. Same inputs, byte-identical file.
 */
import { writeFileSync, statSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { Decimal } from 'decimal.js';
import { Complex } from '../numeric/complex.js';
import { ModvetError, type NumericErrorCode } from '../numeric/errors.js';
import { MAX_DIGITS, withDigits } from '../numeric/precision.js';
import { parseSource } from '../lang/parser.js';
import { renderDiagnostic, type Diagnostic } from '../lang/diagnostics.js';
import type { Claim } from '../lang/ast.js';
import { evaluate, evaluateConstant, type EvalResult } from '../eval/evaluate.js';
import { asModvetError } from '../check/fromAst.js';
import { linePlot, PALETTE, type Panel, type Series } from '../report/svg.js';
import { digitsOption, intOption, UsageError, yMinOption } from './options.js';
import type { Streams } from './program.js';

export interface PlotFlags {
  path?: string;
  out?: string;
  points?: string;
  digits?: string;
  at?: string[];
  ymin?: string;
}

export const DEFAULT_POINTS = 120;
export const DEFAULT_PLOT_DIGITS = 20;

const NAME = /^[A-Za-z][A-Za-z0-9_]*$/;
const NUM = '[+-]?(?:\\d+(?:\\.\\d*)?|\\.\\d+)(?:[eE][+-]?\\d+)?';
const PART = new RegExp(`^\\s*([xy])\\s*=\\s*(${NUM})\\s*(?:\\.\\.\\s*(${NUM}))?\\s*$`);
const PATH_FORM = 'expected "x=X0, y=Y0..Y1" (vertical) or "y=Y0, x=X0..X1" (horizontal), with y > 0';

export interface PlotPath {
  /** The coordinate that varies along the path. */
  along: 'x' | 'y';
  /** The value of the other coordinate. */
  fixed: Decimal;
  from: Decimal;
  to: Decimal;
}

/** Reads --path (PATH_FORM); a bad value is a UsageError naming the expected form. */
export function parsePath(raw: string): PlotPath {
  const bad = (why: string) => new UsageError(`--path ${raw}: ${why}; ${PATH_FORM}`);
  const parts = raw.split(',');
  if (parts.length !== 2) throw bad('two parts separated by a comma are needed');
  let fixed: { name: string; v: Decimal } | null = null;
  let range: { name: string; from: Decimal; to: Decimal } | null = null;
  for (const p of parts) {
    const m = PART.exec(p);
    if (m === null) throw bad(`cannot read "${p.trim()}"`);
    const [name, a, b] = [m[1]!, m[2]!, m[3]];
    if (b === undefined) {
      if (fixed !== null) throw bad('one coordinate must be a range lo..hi');
      fixed = { name, v: new Decimal(a) };
    } else {
      if (range !== null) throw bad('one coordinate must be a single value');
      range = { name, from: new Decimal(a), to: new Decimal(b) };
    }
  }
  if (fixed === null || range === null || fixed.name === range.name) throw bad('give x once and y once');
  if (range.from.eq(range.to)) throw bad('the range is empty');
  const path: PlotPath = { along: range.name as 'x' | 'y', fixed: fixed.v, from: range.from, to: range.to };
  const yOk = path.along === 'y' ? path.from.gt(0) && path.to.gt(0) : path.fixed.gt(0);
  if (!yOk) throw bad('y must be positive (tau in the upper half plane)');
  return path;
}

/** The k-th of n points of the path, at the precision in force. */
export function pathPoint(p: PlotPath, k: number, n: number): { t: Decimal; tau: Complex } {
  const t = p.from.plus(p.to.minus(p.from).times(k).div(n - 1));
  return { t, tau: p.along === 'y' ? new Complex(p.fixed, t) : new Complex(t, p.fixed) };
}

/** One parsed expression: the claim whose left side it is, and how to show its diagnostics. */
interface Parsed {
  text: string;
  claim: Claim;
}

function parseExpression(expression: string, which: string, atLines: string[], io: Streams): Parsed | null {
  const prefix = ['claim "plot"', ...atLines].join('\n') + '\n  ';
  const text = `${prefix}${expression.replace(/\n/g, ' ')} = 0\n`;
  const { ast, diagnostics } = parseSource(text, '<plot>');
  if (diagnostics.length > 0) {
    for (const d of diagnostics) io.err(renderForUser(d, text, prefix.length, expression, which) + '\n');
    return null;
  }
  const claim = ast.claims[0];
  if (claim === undefined) throw new UsageError(`${which}: nothing to plot`);
  return { text, claim };
}

/** Diagnostics inside an expression are shown against the expression as typed (as eval does). */
function renderForUser(d: Diagnostic, text: string, offset: number, expression: string, which: string): string {
  if (d.span.start >= offset && d.span.start <= offset + expression.length) {
    const start = d.span.start - offset;
    const end = Math.min(expression.length, Math.max(start, d.span.end - offset));
    return renderDiagnostic({ ...d, span: { file: which, start, end, line: 1, column: start + 1 } }, expression);
  }
  return renderDiagnostic(d, text);
}

type Outcome = { ok: true; r: EvalResult } | { ok: false; code: NumericErrorCode; message: string };

const WHY: Record<NumericErrorCode, string> = {
  ymin: 'with Im tau below y_min',
  pole: 'at a pole',
  convergence: 'did not converge',
  domain: 'with a domain error',
  precision: 'lost precision',
  overflow: 'overflowed',
};

function evaluateAt(claim: Claim, tau: Complex, P: number, yMin: number | undefined): Outcome {
  try {
    return withDigits(P, () => {
      const params = new Map<string, Complex>();
      for (const p of claim.params) if (p.kind === 'list') params.set(p.name, evaluateConstant(p.values[0]!));
      return { ok: true as const, r: evaluate(claim.lhs, { tau, params, ...(yMin !== undefined ? { yMin } : {}) }) };
    });
  } catch (e) {
    const m = asModvetError(e);
    // the position refers to the internal one-claim source, not to anything the user typed
    if (m instanceof ModvetError) return { ok: false, code: m.code, message: m.message.replace(/^<plot>:\d+:\d+: /, '') };
    throw m;
  }
}

/** A Decimal in a fixed short form: 3.1e-20. */
function sci(d: Decimal): string {
  return d.isZero() ? '0' : d.toExponential(1).replace('e+', 'e');
}

/** log10 |d| for a nonzero Decimal, as a double (exponents beyond double range are fine). */
function log10(d: Decimal): number {
  return withDigits(12, () => d.abs().log(10).toNumber());
}

/** "3 of 120 points not drawn: 2 Im tau below y_min, 1 a pole", or null when none. */
function gapText(what: string, outcomes: Outcome[]): string | null {
  const counts = new Map<string, number>();
  for (const o of outcomes) if (!o.ok) counts.set(WHY[o.code], (counts.get(WHY[o.code]) ?? 0) + 1);
  const total = [...counts.values()].reduce((a, b) => a + b, 0);
  if (total === 0) return null;
  const why = [...counts.entries()].sort((a, b) => (a[0] < b[0] ? -1 : 1)).map(([w, n]) => `${n} ${w}`);
  return `${what}: ${total} of ${outcomes.length} points not drawn (${why.join(', ')})`;
}

export function runPlot(expressions: string[], flags: PlotFlags, io: Streams, cwd: string): number {
  if (expressions.length < 1 || expressions.length > 2) throw new UsageError('plot takes one or two expressions');
  if (flags.out === undefined || flags.out.trim() === '') throw new UsageError('--out <file.svg> is required: the file to write the plot to');
  if (flags.out.endsWith('.vet')) throw new UsageError(`--out ${flags.out}: refusing to write a plot over a claim file (.vet)`);
  if (flags.path === undefined) throw new UsageError(`--path is required: ${PATH_FORM}`);
  const path = parsePath(flags.path);
  const N = flags.points !== undefined ? intOption('--points', flags.points, 2, 10000) : DEFAULT_POINTS;
  const P = flags.digits !== undefined ? digitsOption(flags.digits) : DEFAULT_PLOT_DIGITS;
  const yMin = flags.ymin !== undefined ? yMinOption(flags.ymin) : undefined;

  const outPath = resolve(cwd, flags.out);
  const folder = dirname(outPath);
  const isDir = (p: string) => {
    try {
      return statSync(p).isDirectory();
    } catch {
      return false;
    }
  };
  // fail before the evaluation, not after it
  if (!isDir(folder)) return cannotWrite(flags.out, `no such folder ${folder}`, io);
  if (isDir(outPath)) return cannotWrite(flags.out, 'it is a folder', io);

  const atLines: string[] = [];
  const shown: string[] = [];
  const names = new Set<string>();
  for (const a of flags.at ?? []) {
    const eq = a.indexOf('=');
    const name = eq < 0 ? '' : a.slice(0, eq).trim();
    const value = eq < 0 ? '' : a.slice(eq + 1).trim();
    if (!NAME.test(name) || value === '') throw new UsageError(`--at ${a}: expected name=value, e.g. --at "s=2.5"`);
    if (name === 'tau') throw new UsageError(`--at ${a}: tau runs along --path; --at gives parameters only`);
    if (names.has(name)) throw new UsageError(`--at ${a}: ${name} is given twice`);
    names.add(name);
    atLines.push(`  for ${name} in {${value}}`);
    shown.push(`${name} = ${value}`);
  }
  const which = expressions.length === 2 ? ['<f>', '<g>'] : ['<expression>'];
  const parsed = expressions.map((e, i) => parseExpression(e, which[i]!, atLines, io));
  if (parsed.some((p) => p === null)) return 2;
  const claims = parsed.map((p) => p!.claim);

  const xs: number[] = [];
  const outcomes: Outcome[][] = claims.map(() => []);
  for (let k = 0; k < N; k++) {
    const { t, tau } = withDigits(P, () => pathPoint(path, k, N));
    xs.push(t.toNumber());
    claims.forEach((c, i) => outcomes[i]!.push(evaluateAt(c, tau, P, yMin)));
  }
  // nothing to draw for an expression: an error, not an empty plot
  outcomes.forEach((os, i) => {
    const first = os[0]!;
    if (!first.ok && os.every((o) => !o.ok)) {
      throw new ModvetError(first.code, 'plot', `no point of ${i === 0 ? 'f' : 'g'} = ${expressions[i]} could be evaluated: ${first.message}`);
    }
  });

  const svg = plotSvg(expressions, path, P, N, xs, outcomes, shown.sort());
  try {
    writeFileSync(outPath, svg.text);
  } catch (e) {
    return cannotWrite(flags.out, e instanceof Error ? e.message : String(e), io);
  }
  io.out(`wrote ${flags.out}: ${svg.summary}\n`);
  return 0;
}

function cannotWrite(file: string, why: string, io: Streams): number {
  io.err(`modvet: cannot write the plot ${file}: ${why}\n`);
  return 2;
}

/** The SVG and a one-line summary, from the evaluated samples. */
function plotSvg(expressions: string[], path: PlotPath, P: number, N: number, xs: number[], outcomes: Outcome[][], params: string[]): { text: string; summary: string } {
  const two = expressions.length === 2;
  const names = two ? ['f', 'g'] : ['f'];
  const valueSeries: Series[] = [];
  const tooLarge: number[] = [];
  outcomes.forEach((os, i) => {
    const colour = PALETTE[i]!;
    // the first expression wide underneath, the second narrow on top: both stay visible where they agree
    const width = two && i === 0 ? 4 : 1.6;
    let big = 0;
    const part = (get: (z: Complex) => Decimal) =>
      os.map((o) => {
        if (!o.ok) return null;
        const v = get(o.r.value).toNumber();
        return Number.isFinite(v) ? v : null;
      });
    for (const o of os) if (o.ok && !(Number.isFinite(o.r.value.re.toNumber()) && Number.isFinite(o.r.value.im.toNumber()))) big++;
    tooLarge.push(big);
    valueSeries.push({ label: `Re ${names[i]}`, x: xs, y: part((z) => z.re), color: colour, width });
    valueSeries.push({ label: `Im ${names[i]}`, x: xs, y: part((z) => z.im), color: colour, width, dash: 'dashed' });
  });

  const along = path.along === 'y' ? `x = ${path.fixed.toString()}, y from ${path.from.toString()} to ${path.to.toString()}` : `y = ${path.fixed.toString()}, x from ${path.from.toString()} to ${path.to.toString()}`;
  const subtitle = expressions.map((e, i) => `${names[i]} = ${e}`);
  subtitle.push(`along ${along}; ${N} points at ${P} digits${params.length > 0 ? '; ' + params.join(', ') : ''}`);
  const caption: string[] = [];
  const desc: string[] = [`modvet plot of ${subtitle.join('; ')}.`];
  outcomes.forEach((os, i) => {
    const g = gapText(names[i]!, os);
    if (g !== null) caption.push(g);
    if (tooLarge[i]! > 0) caption.push(`${names[i]}: ${tooLarge[i]} values too large to draw`);
  });

  const panels: Panel[] = [
    { title: two ? 'real and imaginary parts of f and g' : 'real and imaginary parts of f', yLabel: 'value', weight: two ? 3 : 1, series: valueSeries, ...(two ? {} : { xLabel: path.along === 'y' ? 'y = Im tau' : 'x = Re tau' }) },
  ];
  let summary = `${N} points`;
  if (two) {
    const diff: (number | null)[] = [];
    const bound: (number | null)[] = [];
    let maxDiff: Decimal | null = null;
    let maxBound: Decimal | null = null;
    let zeros = 0;
    let above = 0;
    let both = 0;
    const D = Math.min(MAX_DIGITS, 2 * P + 10);
    for (let k = 0; k < N; k++) {
      const a = outcomes[0]![k]!;
      const b = outcomes[1]![k]!;
      if (!a.ok || !b.ok) {
        diff.push(null);
        bound.push(null);
        continue;
      }
      both++;
      // the difference of the D-digit values, exactly (2P + 10 digits hold it), then its size
      const d = withDigits(D, () => a.r.value.sub(b.r.value).abs());
      const e = withDigits(D, () => {
        let s = a.r.scale.plus(b.r.scale).times(new Decimal(10).pow(-P));
        for (const r of [a.r, b.r]) if (r.limit !== undefined) s = s.plus(r.limit.rel.times(r.value.abs()));
        return s;
      });
      if (d.isZero()) zeros++;
      if (d.gt(e)) above++;
      diff.push(d.isZero() ? -Infinity : log10(d));
      bound.push(e.isZero() ? null : log10(e));
      if (maxDiff === null || d.gt(maxDiff)) maxDiff = d;
      if (maxBound === null || e.gt(maxBound)) maxBound = e;
    }
    const finite = [...diff, ...bound].filter((v): v is number => v !== null && Number.isFinite(v));
    const floor = Math.min(-(P + 2), finite.length > 0 ? Math.floor(Math.min(...finite)) - 1 : -(P + 2));
    panels.push({
      title: 'log10 |f - g|, computed in Decimal at the working digits',
      yLabel: '|f - g|',
      xLabel: path.along === 'y' ? 'y = Im tau' : 'x = Re tau',
      yScale: 'log10',
      floor,
      weight: 2,
      series: [
        { label: '|f - g|', x: xs, y: diff, color: PALETTE[2], width: 1.8 },
        { label: 'error bound', x: xs, y: bound, color: '#777777', width: 1.2, dash: 'dashed' },
      ],
    });
    if (maxDiff !== null && maxBound !== null) {
      const line = `max |f - g| = ${sci(maxDiff)} over ${both} points (error bound of the evaluations up to ${sci(maxBound)}); ${above} points above the bound; ${zeros} exactly 0 (drawn at the floor 10^${floor})`;
      caption.unshift(line);
      summary += `; ${line}`;
    }
  }
  const gaps = outcomes.map((os) => os.filter((o) => !o.ok).length);
  const gapLine = names.map((n, i) => `${n}: ${gaps[i]} gaps`).join(', ');
  summary += `; ${gapLine}`;
  desc.push(...caption.map((c) => c + '.'));
  desc.push(`Points not drawn: ${gapLine}.`);
  const text = linePlot({
    width: 760,
    height: two ? 600 : 420,
    title: 'modvet plot',
    subtitle,
    caption,
    description: desc.join(' '),
    idPrefix: 'modvet-plot',
    panels,
  });
  return { text, summary };
}
