// The SVG plotting library: tick choice, tick labels, escaping, gaps, the log panel's
// floor marks, determinism, and well-formed XML by an outside parser (Python's
// xml.dom.minidom, as in test/cli/e2e.test.ts).
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { escapeXml, fmt, formatTick, linePlot, niceTicks, wrap, type LinePlotSpec } from '../../src/report/svg.js';

/** Parses with minidom; returns the element counts asked for, or throws with Python's message. */
function minidom(svg: string, tags: string[]): Record<string, number> {
  const script = [
    'import sys, json, xml.dom.minidom as m',
    'd = m.parseString(sys.stdin.buffer.read())',
    'assert d.documentElement.tagName == "svg"',
    `print(json.dumps({t: len(d.getElementsByTagName(t)) for t in ${JSON.stringify(tags)}}))`,
  ].join('\n');
  const py = spawnSync('python3', ['-c', script], { input: svg, encoding: 'utf8' });
  if (py.status !== 0) throw new Error(py.stderr);
  return JSON.parse(py.stdout) as Record<string, number>;
}

const SPEC: LinePlotSpec = {
  title: 'a <test> & "plot"',
  subtitle: ['f = E(4, tau)^2'],
  caption: ['2 of 5 points not drawn'],
  description: 'values & gaps',
  panels: [
    {
      title: 'values',
      yLabel: 'value',
      series: [
        { label: 'Re f', x: [0, 1, 2, 3, 4], y: [1, 2, null, 4, 5] },
        { label: 'Im f', x: [0, 1, 2, 3, 4], y: [0, null, 0.5, null, 0], dash: 'dashed' },
      ],
    },
    {
      yScale: 'log10',
      xLabel: 'y',
      floor: -30,
      series: [{ label: '|f - g|', x: [0, 1, 2, 3, 4], y: [-20, -Infinity, -19.5, -40, null] }],
    },
  ],
};

describe('niceTicks', () => {
  it('picks steps of 1, 2 or 5 times a power of ten and widens to the outer ticks', () => {
    const t = niceTicks(0.13, 0.87, 6);
    expect([t.mantissa, t.exponent]).toEqual([2, -1]);
    expect(t.ticks).toEqual([0, 0.2, 0.4, 0.6, 0.8, 1]);
    expect([t.lo, t.hi]).toEqual([0, 1]);
    const u = niceTicks(-47, 212, 6);
    expect([u.mantissa, u.exponent]).toEqual([1, 2]);
    expect(u.ticks).toEqual([-100, 0, 100, 200, 300]);
  });
  it('keeps the range and the ticks inside it without widening', () => {
    const t = niceTicks(0.5, 3, 6, false);
    expect([t.lo, t.hi]).toEqual([0.5, 3]);
    expect(t.ticks).toEqual([0.5, 1, 1.5, 2, 2.5, 3]);
  });
  it('gives exact decimal ticks, no binary noise (0.30000000000000004)', () => {
    const t = niceTicks(0.1, 0.7, 8);
    expect(t.ticks).toContain(0.3);
    expect(t.ticks.map((v) => formatTick(v, t))).toEqual(['0.1', '0.2', '0.3', '0.4', '0.5', '0.6', '0.7']);
  });
  it('widens a zero-width range and honours a smallest exponent (integer exponents of log panels)', () => {
    const t = niceTicks(5, 5, 5);
    expect(t.lo).toBeLessThan(5);
    expect(t.hi).toBeGreaterThan(5);
    const l = niceTicks(-22, 3, 6, false, 0);
    expect(l.ticks.every((v) => Number.isInteger(v))).toBe(true);
    expect(l.ticks).toEqual([-20, -15, -10, -5, 0]);
  });
  it('formats large and small steps exponentially, and never prints -0', () => {
    const t = niceTicks(0, 8e6, 5);
    expect(t.ticks.map((v) => formatTick(v, t))).toEqual(['0', '2e6', '4e6', '6e6', '8e6']);
    expect(formatTick(-0, { exponent: -1 })).toBe('0');
    expect(fmt(-0.001)).toBe('0.00');
  });
});

describe('escaping and wrapping', () => {
  it('escapes the five XML specials and drops characters XML 1.0 forbids', () => {
    expect(escapeXml(`a<b>&"c"'\u0001`)).toBe('a&lt;b&gt;&amp;&quot;c&quot;&apos;');
  });
  it('wraps at spaces within the width', () => {
    expect(wrap('one two three four', 9)).toEqual(['one two', 'three', 'four']);
  });
});

describe('linePlot', () => {
  const svg = linePlot(SPEC);
  it('is well-formed XML with the parts asked for (minidom)', () => {
    const n = minidom(svg, ['svg', 'title', 'desc', 'path', 'circle', 'clipPath', 'script', 'image', 'a']);
    expect(n.svg).toBe(1);
    expect(n.desc).toBe(1);
    expect(n.clipPath).toBe(2);
    expect(n.script).toBe(0);
    expect(n.image).toBe(0);
    expect(n.a).toBe(0);
  });
  it('is self-contained: no links, scripts, external fonts or event handlers', () => {
    expect(svg).not.toMatch(/xlink|href|<script|@import|url\((?!#)|\son[a-z]+=/i);
    // the only URL is the SVG namespace
    expect(svg.match(/https?:\/\/[^"]*/g)).toEqual(['http://www.w3.org/2000/svg']);
  });
  it('escapes titles and labels', () => {
    expect(svg).toContain('<title>a &lt;test&gt; &amp; &quot;plot&quot;</title>');
    expect(svg).toContain('<desc>values &amp; gaps</desc>');
  });
  it('breaks lines at gaps and draws a point between two gaps as a dot', () => {
    const re = /<path d="([^"]*)" stroke="[^"]*" stroke-width="[^"]*"[^>]*><title>Re f<\/title>/.exec(svg);
    expect(re).not.toBeNull();
    // 1, 2 | gap | 4, 5: two pieces, each starting with M
    expect(re![1]!.match(/M/g)).toHaveLength(2);
    expect(re![1]!.match(/L/g)).toHaveLength(2);
    // Im f: 0 | gap | 0.5 | gap | 0: three isolated points, no line
    expect(svg).not.toContain('<title>Im f</title>');
    // and the log panel's two values between marks (next test): five dots
    expect(svg.match(/<circle /g)).toHaveLength(5);
  });
  it('draws exact zeros and exponents below the floor at the floor with a mark, and explains it', () => {
    // -20 and -19.5 lie between marks (-Infinity, -40): dots, never joined through a mark
    expect(svg).not.toContain('<title>|f - g|</title>');
    expect(svg).toContain('exact 0 (at the floor)');
    expect(svg.match(/Z" fill=/g)).toHaveLength(3); // two marks and the legend's
    expect(svg).toContain('10<tspan dy="-5" font-size="9">-30</tspan>');
  });
  it('is deterministic and uses two-decimal coordinates', () => {
    expect(linePlot(SPEC)).toBe(svg);
    const coords = [...svg.matchAll(/ (?:x|y|x1|y1|x2|y2|cx|cy)="([^"]*)"/g)].map((m) => m[1]!);
    expect(coords.length).toBeGreaterThan(20);
    for (const c of coords) expect(c).toMatch(/^-?\d+(\.\d\d)?$/);
  });
  it('takes an id prefix, so that several plots can share a page', () => {
    const a = linePlot({ ...SPEC, idPrefix: 'claim-3' });
    expect(a).toContain('id="claim-3-clip-0"');
    expect(a).toContain('clip-path="url(#claim-3-clip-1)"');
    expect(a).not.toContain('id="plot-clip');
  });
  it('draws an empty panel (every point a gap) without failing', () => {
    const e = linePlot({ panels: [{ series: [{ label: 'f', x: [0, 1], y: [null, null] }] }] });
    expect(minidom(e, ['path']).path).toBe(0);
  });
});
