/**
 * A small SVG plotting library: pure functions from data to a self-contained SVG string
 * (no scripts, no external fonts, links or images; the generic `sans-serif` font).
 *
 *   linePlot({ width: 720, height: 480, title: 'E_8 along x = 0.1',
 *              panels: [{ yLabel: 'value', series: [{ label: 'Re f', x: [1, 2], y: [0.5, null] }] }] })
 *
 * Conventions:
 * - Panels are stacked top to bottom and share one x range (the data's exact extent);
 *   each panel has its own y range, widened to the nearest ticks (1, 2 or 5 times a power
 *   of ten, at most about 6 of them).
 * - A y value `null` (or a non-finite value in a linear panel) is a gap: the line is broken
 *   there, and a point with gaps on both sides is drawn as a dot.
 * - Log panels ('log10') take the exponents, log10 of the values, so that values far
 *   outside double range (10^-400) can be drawn; ticks are labelled 10^k. Exponents below
 *   the panel's floor, and -Infinity (an exact zero), are drawn at the floor with a
 *   downward triangle, and the legend explains the mark.
 * - Output is deterministic: coordinates have two decimals, tick labels are formatted from
 *   the tick step, nothing depends on time or locale. Element ids start with `idPrefix`
 *   (default 'plot'), so several plots can live in one HTML page.
 * - Text is escaped for XML (escapeXml); characters XML 1.0 forbids are dropped.
 */

export type YScale = 'linear' | 'log10';
export type Dash = 'solid' | 'dashed' | 'dotted';

export interface Series {
  label: string;
  x: readonly number[];
  /** Aligned with x; null is a gap. In a 'log10' panel: exponents (-Infinity: exact zero). */
  y: readonly (number | null)[];
  /** Any SVG colour; default: the palette, in order. */
  color?: string;
  /** Stroke width in px (default 1.6). */
  width?: number;
  dash?: Dash;
}

export interface Panel {
  title?: string;
  yLabel?: string;
  xLabel?: string;
  yScale?: YScale;
  /** 'log10' panels: the lowest exponent shown (default: one below the smallest finite one). */
  floor?: number;
  /** Share of the height relative to the other panels (default 1). */
  weight?: number;
  series: readonly Series[];
}

export interface LinePlotSpec {
  width?: number;
  height?: number;
  title?: string;
  /** Lines under the title. */
  subtitle?: readonly string[];
  /** Lines under the panels (e.g. how many points are missing and why). */
  caption?: readonly string[];
  /** The <desc> element: a plain-text account of the plot for readers and tools. */
  description?: string;
  idPrefix?: string;
  panels: readonly Panel[];
}

/** Okabe and Ito's colour-blind-safe palette (Color Universal Design, 2002). */
export const PALETTE = ['#0072B2', '#D55E00', '#009E73', '#CC79A7', '#E69F00', '#56B4E9', '#000000'] as const;

const FONT = 12;
/** Width of a character as a share of the font size: an estimate for the generic sans-serif. */
const CHAR_WIDTH = 0.6;

/** Escapes text for XML element content and attribute values. */
export function escapeXml(s: string): string {
  return s
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&apos;')
    .replace(/[\u0000-\u0008\u000b\u000c\u000e-\u001f\ufffe\uffff]/g, '');
}

/** A coordinate with two decimals; never "-0.00". */
export function fmt(n: number): string {
  const s = n.toFixed(2);
  return s === '-0.00' ? '0.00' : s;
}

export interface Ticks {
  /** The tick values, ascending. */
  ticks: number[];
  /** The step is mantissa * 10^exponent, mantissa 1, 2 or 5. */
  mantissa: number;
  exponent: number;
  /** The range covered: [lo, hi] widened to ticks when `widen`, else as given. */
  lo: number;
  hi: number;
}

/**
 * Ticks at the multiples of the smallest step 1, 2 or 5 times 10^k (k >= minExponent) that
 * gives at most maxTicks ticks in [lo, hi]. With `widen` the range grows to the outer
 * ticks. A zero-width range is widened by 1 (or 10% of its value) first.
 */
export function niceTicks(lo: number, hi: number, maxTicks = 6, widen = true, minExponent = -300): Ticks {
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) throw new RangeError(`niceTicks: non-finite range [${lo}, ${hi}]`);
  if (lo > hi) [lo, hi] = [hi, lo];
  if (hi - lo <= Math.abs(hi) * 1e-12) {
    const d = lo === 0 ? 1 : Math.abs(lo) * 0.1;
    lo -= d;
    hi += d;
  }
  const n = Math.max(2, maxTicks);
  let k = Math.max(minExponent, Math.floor(Math.log10((hi - lo) / n)) - 1);
  for (;;) {
    for (const m of [1, 2, 5]) {
      const step = m * 10 ** k;
      const i0 = widen ? Math.floor(lo / step + 1e-9) : Math.ceil(lo / step - 1e-9);
      const i1 = widen ? Math.ceil(hi / step - 1e-9) : Math.floor(hi / step + 1e-9);
      if (i1 - i0 + 1 <= n) {
        const ticks: number[] = [];
        for (let i = i0; i <= i1; i++) ticks.push(tickValue(i * m, k));
        return widen ? { ticks, mantissa: m, exponent: k, lo: i0 * step, hi: i1 * step } : { ticks, mantissa: m, exponent: k, lo, hi };
      }
    }
    k++;
  }
}

/** n * 10^k without the binary noise of n * 0.1 ... (0.30000000000000004). */
function tickValue(n: number, k: number): number {
  return k >= 0 ? n * 10 ** k : n / 10 ** -k;
}

/** A tick label, with as many decimals as the step needs; exponential outside 1e-4..1e6. */
export function formatTick(value: number, t: Pick<Ticks, 'exponent'>): string {
  if (value === 0) return '0';
  if (t.exponent >= 6 || t.exponent <= -5) {
    const s = value.toExponential(Math.max(0, Math.floor(Math.log10(Math.abs(value))) - t.exponent));
    return s.replace('e+', 'e');
  }
  return value.toFixed(Math.max(0, -t.exponent));
}

/** Splits text at spaces into lines of at most maxChars (a longer word gets a line of its own). */
export function wrap(s: string, maxChars: number): string[] {
  const lines: string[] = [];
  let cur = '';
  for (const word of s.split(' ')) {
    if (cur !== '' && cur.length + 1 + word.length > maxChars) {
      lines.push(cur);
      cur = word;
    } else {
      cur = cur === '' ? word : `${cur} ${word}`;
    }
  }
  lines.push(cur);
  return lines;
}

function truncate(s: string, maxChars: number): string {
  return s.length <= maxChars ? s : s.slice(0, Math.max(1, maxChars - 1)) + '\u2026';
}

function dashArray(d: Dash | undefined): string {
  return d === 'dashed' ? ' stroke-dasharray="6 4"' : d === 'dotted' ? ' stroke-dasharray="1.5 3"' : '';
}

function textWidth(s: string, size = FONT): number {
  return s.length * size * CHAR_WIDTH;
}

interface Frame {
  left: number;
  top: number;
  width: number;
  height: number;
}

/** A log-panel tick label 10^k as text with a raised exponent. */
function powerOfTen(k: number): string {
  return `10<tspan dy="-5" font-size="${FONT - 3}">${k}</tspan>`;
}

/** The whole plot as an SVG document (module header). */
export function linePlot(spec: LinePlotSpec): string {
  const W = spec.width ?? 720;
  const H = spec.height ?? 480;
  const id = spec.idPrefix ?? 'plot';
  const out: string[] = [];
  out.push('<?xml version="1.0" encoding="UTF-8"?>');
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" font-family="sans-serif" font-size="${FONT}">`,
  );
  if (spec.title !== undefined) out.push(`<title>${escapeXml(spec.title)}</title>`);
  if (spec.description !== undefined) out.push(`<desc>${escapeXml(spec.description)}</desc>`);
  out.push(`<rect x="0" y="0" width="${W}" height="${H}" fill="#ffffff"/>`);

  // vertical layout: title block, panels, caption block
  let y = 12;
  if (spec.title !== undefined) {
    y += 16;
    out.push(`<text x="${fmt(W / 2)}" y="${fmt(y)}" text-anchor="middle" font-size="${FONT + 3}" font-weight="bold">${escapeXml(truncate(spec.title, Math.floor(W / ((FONT + 3) * CHAR_WIDTH))))}</text>`);
  }
  for (const line of spec.subtitle ?? []) {
    y += 16;
    out.push(`<text x="${fmt(W / 2)}" y="${fmt(y)}" text-anchor="middle">${escapeXml(truncate(line, Math.floor(W / (FONT * CHAR_WIDTH))))}</text>`);
  }
  const caption = (spec.caption ?? []).flatMap((line) => wrap(line, Math.floor((W - 72 - 12) / ((FONT - 1) * CHAR_WIDTH))));
  const captionHeight = caption.length > 0 ? caption.length * 15 + 8 : 0;

  const allSeries = spec.panels.flatMap((p) => p.series);
  const labels = spec.panels.flatMap((p) => [...p.series.map((s) => s.label), ...(p.yScale === 'log10' ? [LOG_MARK_LABEL] : [])]);
  const legendWidth = Math.min(Math.max(100, Math.max(0, ...labels.map((l) => textWidth(l))) + 40), W * 0.35);
  const left = 72;
  const plotWidth = Math.max(40, W - left - legendWidth - 12);

  const xs = allSeries.flatMap((s) => s.x.filter((v) => Number.isFinite(v)));
  const xLo = xs.length > 0 ? Math.min(...xs) : 0;
  const xHi = xs.length > 0 ? Math.max(...xs) : 1;
  const xTicks = niceTicks(xLo, xHi, Math.max(3, Math.floor(plotWidth / 70)), false);
  const xMap = (v: number) => left + ((v - xTicks.lo) / (xTicks.hi - xTicks.lo)) * plotWidth;

  // each panel: 26 px for its title above, 18 for tick labels below, 16 more for an x label
  const overhead = spec.panels.reduce((a, p) => a + 26 + 18 + (p.xLabel !== undefined ? 16 : 0) + 8, 0);
  const free = Math.max(40 * spec.panels.length, H - y - 8 - overhead - captionHeight);
  const totalWeight = spec.panels.reduce((a, p) => a + (p.weight ?? 1), 0);
  let colour = 0;
  spec.panels.forEach((panel, i) => {
    y += 26;
    const frame: Frame = { left, top: y, width: plotWidth, height: (free * (panel.weight ?? 1)) / totalWeight };
    const colours = panel.series.map((s) => s.color ?? PALETTE[colour++ % PALETTE.length]!);
    out.push(drawPanel(panel, frame, colours, xTicks, xMap, `${id}-clip-${i}`, legendWidth));
    y += frame.height + 18 + (panel.xLabel !== undefined ? 16 : 0) + 8;
  });

  caption.forEach((line, i) => {
    out.push(`<text x="${fmt(left)}" y="${fmt(H - captionHeight + 12 + i * 15)}" font-size="${FONT - 1}" fill="#444444">${escapeXml(line)}</text>`);
  });
  out.push('</svg>');
  return out.join('\n') + '\n';
}

const LOG_MARK_LABEL = 'exact 0 (at the floor)';

function triangle(x: number, y: number, colour: string): string {
  return `<path d="M${fmt(x - 3)} ${fmt(y - 6)}L${fmt(x + 3)} ${fmt(y - 6)}L${fmt(x)} ${fmt(y)}Z" fill="${escapeXml(colour)}" stroke="none"/>`;
}

function drawPanel(panel: Panel, f: Frame, colours: string[], xTicks: Ticks, xMap: (v: number) => number, clipId: string, legendWidth: number): string {
  const log = panel.yScale === 'log10';
  const finite = panel.series.flatMap((s) => s.y.filter((v): v is number => v !== null && Number.isFinite(v)));
  const hasMinusInf = log && panel.series.some((s) => s.y.some((v) => v === -Infinity));
  let lo = finite.length > 0 ? Math.min(...finite) : 0;
  let hi = finite.length > 0 ? Math.max(...finite) : 1;
  let floor = -Infinity;
  if (log) {
    floor = panel.floor ?? (hasMinusInf ? Math.floor(lo) - 1 : -Infinity);
    if (Number.isFinite(floor)) {
      lo = floor;
      hi = Math.max(hi, floor + 1);
    }
  }
  const nTicks = Math.max(3, Math.min(7, Math.floor(f.height / 28)));
  // log panels: from the floor (or the lowest exponent) to the next integer exponent, ticks at integers
  const yTicks = log ? niceTicks(Math.floor(lo), Math.max(Math.ceil(hi), Math.floor(lo) + 1), nTicks, false, 0) : niceTicks(lo, hi, nTicks);
  const yMap = (v: number) => f.top + (1 - (v - yTicks.lo) / (yTicks.hi - yTicks.lo)) * f.height;
  const bottom = f.top + f.height;
  const o: string[] = ['<g>'];
  o.push(`<defs><clipPath id="${escapeXml(clipId)}"><rect x="${fmt(f.left)}" y="${fmt(f.top)}" width="${fmt(f.width)}" height="${fmt(f.height)}"/></clipPath></defs>`);
  if (panel.title !== undefined) {
    o.push(`<text x="${fmt(f.left)}" y="${fmt(f.top - 6)}" font-weight="bold">${escapeXml(truncate(panel.title, Math.floor(f.width / (FONT * CHAR_WIDTH))))}</text>`);
  }
  // grid and ticks
  for (const t of yTicks.ticks) {
    if (t < yTicks.lo || t > yTicks.hi) continue;
    const py = fmt(yMap(t));
    o.push(`<line x1="${fmt(f.left)}" y1="${py}" x2="${fmt(f.left + f.width)}" y2="${py}" stroke="#e0e0e0" stroke-width="1"/>`);
    const label = log ? powerOfTen(t) : escapeXml(formatTick(t, yTicks));
    o.push(`<text x="${fmt(f.left - 6)}" y="${fmt(yMap(t) + 4)}" text-anchor="end">${label}</text>`);
  }
  for (const t of xTicks.ticks) {
    const px = fmt(xMap(t));
    o.push(`<line x1="${px}" y1="${fmt(f.top)}" x2="${px}" y2="${fmt(bottom)}" stroke="#e0e0e0" stroke-width="1"/>`);
    o.push(`<text x="${px}" y="${fmt(bottom + 15)}" text-anchor="middle">${escapeXml(formatTick(t, xTicks))}</text>`);
  }
  o.push(`<rect x="${fmt(f.left)}" y="${fmt(f.top)}" width="${fmt(f.width)}" height="${fmt(f.height)}" fill="none" stroke="#333333" stroke-width="1"/>`);
  if (panel.xLabel !== undefined) {
    o.push(`<text x="${fmt(f.left + f.width / 2)}" y="${fmt(bottom + 31)}" text-anchor="middle">${escapeXml(panel.xLabel)}</text>`);
  }
  if (panel.yLabel !== undefined) {
    const cy = f.top + f.height / 2;
    o.push(`<text x="16" y="${fmt(cy)}" text-anchor="middle" transform="rotate(-90 16 ${fmt(cy)})">${escapeXml(truncate(panel.yLabel, Math.floor(f.height / (FONT * CHAR_WIDTH))))}</text>`);
  }
  // data
  o.push(`<g clip-path="url(#${escapeXml(clipId)})" fill="none" stroke-linejoin="round" stroke-linecap="round">`);
  let clamped: string | null = null;
  panel.series.forEach((s, si) => {
    const colour = colours[si]!;
    const width = s.width ?? 1.6;
    const pts: ({ x: number; y: number; mark: boolean } | null)[] = s.x.map((xv, k) => {
      const yv = s.y[k] ?? null;
      if (yv === null || Number.isNaN(yv) || !Number.isFinite(xv)) return null;
      if (log && yv < floor) return { x: xMap(xv), y: yMap(floor), mark: true };
      if (!Number.isFinite(yv)) return null;
      return { x: xMap(xv), y: yMap(yv), mark: false };
    });
    let d = '';
    const dots: string[] = [];
    const marks: string[] = [];
    pts.forEach((p, k) => {
      if (p === null) return;
      if (p.mark) {
        clamped ??= colour;
        marks.push(triangle(p.x, p.y, colour));
        return;
      }
      const prev = pts[k - 1];
      const next = pts[k + 1];
      const prevOk = prev !== undefined && prev !== null && !prev.mark;
      const nextOk = next !== undefined && next !== null && !next.mark;
      if (!prevOk && !nextOk) dots.push(`<circle cx="${fmt(p.x)}" cy="${fmt(p.y)}" r="${fmt(Math.max(1.5, width))}" fill="${escapeXml(colour)}" stroke="none"/>`);
      else d += `${prevOk ? 'L' : 'M'}${fmt(p.x)} ${fmt(p.y)}`;
    });
    if (d !== '') o.push(`<path d="${d}" stroke="${escapeXml(colour)}" stroke-width="${fmt(width)}"${dashArray(s.dash)}><title>${escapeXml(s.label)}</title></path>`);
    o.push(...dots, ...marks);
  });
  o.push('</g>');
  // legend, right of the frame
  const lx = f.left + f.width + 14;
  const maxChars = Math.floor((legendWidth - 40) / (FONT * CHAR_WIDTH));
  let ly = f.top + 10;
  panel.series.forEach((s, si) => {
    const colour = escapeXml(colours[si]!);
    o.push(`<line x1="${fmt(lx)}" y1="${fmt(ly)}" x2="${fmt(lx + 24)}" y2="${fmt(ly)}" stroke="${colour}" stroke-width="${fmt(s.width ?? 1.6)}"${dashArray(s.dash)}/>`);
    o.push(`<text x="${fmt(lx + 30)}" y="${fmt(ly + 4)}">${escapeXml(truncate(s.label, maxChars))}</text>`);
    ly += 18;
  });
  if (clamped !== null) {
    o.push(triangle(lx + 12, ly + 4, clamped));
    o.push(`<text x="${fmt(lx + 30)}" y="${fmt(ly + 4)}">${escapeXml(truncate(LOG_MARK_LABEL, maxChars))}</text>`);
  }
  o.push('</g>');
  return o.join('\n');
}
