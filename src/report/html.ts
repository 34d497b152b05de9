/**
 * The HTML report (`modvet check --report FILE`): one self-contained page from plain data
 * (HtmlClaim pieces, rendered per claim in the unit by claimPlot.ts, and the run's
 * settings). Inline CSS and inline SVG only: no scripts, no fonts, no links outside the
 * page; a Content-Security-Policy meta element makes the browser refuse any fetch.
 *
 *   htmlDocument({ version: '0.1.0', settings, claims, problems })
 *
 * Layout: a summary (counts per verdict, the claims not as expected, the run's settings
 * and "Numerical agreement is evidence, not proof."), a table with one row per claim
 * linking to its section (#claim-1, #claim-2, ... in claim order), and per claim a
 * section with the equation, the path plot (or why there is none), the residual plot, the
 * samples, and for refuted claims the diagnosis, the simplest failure and the suggestion.
 * Same inputs, same bytes, except the times (per claim, and their total).
 */
import type { Verdict } from '../check/claim.js';
import { samplesText } from './describe.js';
import { escapeXml } from './svg.js';
import type { RunSettings } from './json.js';

/** One evaluated sample, as shown in a claim's table of samples. */
export interface HtmlSampleRow {
  /** tau, the group element and the parameters. */
  point: string;
  outcome: 'agree' | 'disagree' | 'undecided';
  /** Relative residual, 3 significant digits. */
  residual: string;
  digits: number;
}

/** Everything the page shows of one claim: plain data (it crosses from a worker thread). */
export interface HtmlClaim {
  name: string;
  file: string;
  line: number;
  source?: string;
  equation: string;
  verdict: Verdict;
  expect: Verdict;
  ok: boolean;
  digits: number;
  requested: number;
  limitedBy?: string;
  /** Agreement measured against the terms (both sides vanish at the worst sample). */
  vanishing: boolean;
  samples: number;
  timeMs: number;
  reason?: string;
  worst?: { point: string; lhs: string; rhs: string; residual: string };
  diagnosis?: string;
  simplest?: string;
  suggestion?: { equation: string; verdict: Verdict; digits: number; limitedBy?: string; reason?: string };
  /** Inline <svg> of both sides along the path, or a note saying why there is none. */
  pathSvg?: string;
  pathNote?: string;
  /** Inline <svg> of log10 of the residual per sample, or a note. */
  residualSvg?: string;
  residualNote?: string;
  sampleRows: HtmlSampleRow[];
}

export interface HtmlReport {
  version: string;
  settings: RunSettings;
  claims: readonly HtmlClaim[];
  problems: readonly { file: string; message: string }[];
  /** An extra line for the summary (e.g. the shard). */
  note?: string;
}

const esc = escapeXml;

const VERDICTS: readonly Verdict[] = ['holds', 'refuted', 'undecided', 'error'];

const CSS = `
:root { color-scheme: light; }
* { box-sizing: border-box; }
body { font-family: sans-serif; font-size: 15px; line-height: 1.45; color: #1a1a1a; background: #fafafa; margin: 0; }
main { max-width: 1100px; margin: 0 auto; padding: 16px 24px 48px; }
h1 { font-size: 1.6em; margin: 0.4em 0 0.2em; }
h2 { font-size: 1.25em; margin: 1.6em 0 0.5em; border-bottom: 1px solid #ccc; padding-bottom: 0.2em; }
h3 { font-size: 1.1em; margin: 0 0 0.4em; }
code, .eq, td.num, .mono { font-family: monospace; font-size: 0.95em; }
a { color: #0b5cad; }
.evidence { font-weight: bold; }
.counts { display: flex; flex-wrap: wrap; gap: 8px; margin: 10px 0; padding: 0; list-style: none; }
.counts li { border: 1px solid #ccc; border-radius: 4px; padding: 4px 10px; background: #fff; }
.counts b { font-size: 1.15em; }
dl.settings { display: grid; grid-template-columns: max-content auto; gap: 2px 14px; margin: 8px 0; }
dl.settings dt { color: #555; }
dl.settings dd { margin: 0; font-family: monospace; }
table { border-collapse: collapse; background: #fff; }
table.claims { width: 100%; font-size: 0.9em; }
th, td { border: 1px solid #ddd; padding: 3px 7px; text-align: left; vertical-align: top; }
th { background: #eee; position: sticky; top: 0; }
td.num { text-align: right; white-space: nowrap; }
td.where { white-space: nowrap; font-family: monospace; font-size: 0.9em; }
tr.unexpected td:first-child { box-shadow: inset 4px 0 0 #c0392b; }
.v { display: inline-block; min-width: 5.6em; padding: 0 6px; border-radius: 3px; font-weight: bold; font-size: 0.9em; text-align: center; }
.v-holds { background: #d9f2e3; color: #11612f; }
.v-refuted { background: #dbeaf7; color: #0d4a7a; }
.v-undecided { background: #fbefd0; color: #7a5300; }
.v-error { background: #f8dcd8; color: #8c1d12; }
.tag { display: inline-block; margin-left: 4px; padding: 0 5px; border-radius: 3px; background: #c0392b; color: #fff; font-size: 0.8em; font-weight: bold; }
section.claim { background: #fff; border: 1px solid #ddd; border-radius: 6px; padding: 12px 16px; margin: 18px 0; }
section.claim.unexpected { border-left: 5px solid #c0392b; }
.eq { display: block; background: #f4f4f4; border: 1px solid #e4e4e4; padding: 6px 10px; white-space: pre-wrap; overflow-wrap: anywhere; margin: 6px 0; }
.meta { color: #444; margin: 2px 0; }
.note { color: #555; font-style: italic; margin: 6px 0; }
.explain { background: #f3f8fc; border: 1px solid #cfe1f0; border-radius: 4px; padding: 6px 10px; margin: 8px 0; }
.explain p { margin: 3px 0; }
figure { margin: 10px 0; }
figure svg { max-width: 100%; height: auto; display: block; border: 1px solid #eee; }
details { margin: 6px 0; }
table.samples { font-size: 0.85em; }
.back { font-size: 0.85em; }
`;

function verdictBadge(v: Verdict): string {
  return `<span class="v v-${v}">${v}</span>`;
}

function seconds(ms: number): string {
  return `${(ms / 1000).toFixed(2)} s`;
}

function anchor(k: number): string {
  return `claim-${k + 1}`;
}

function unexpectedTag(c: HtmlClaim): string {
  return c.ok ? '' : `<span class="tag" title="expected ${esc(c.expect)}">expected ${esc(c.expect)}</span>`;
}

function digitsCell(c: HtmlClaim): string {
  if (c.verdict !== 'holds') return '';
  return `${c.digits}${c.digits < c.requested ? ` of ${c.requested}` : ''}`;
}

function summary(r: HtmlReport): string[] {
  const o: string[] = [];
  const n = r.claims.length;
  const count = (v: Verdict) => r.claims.filter((c) => c.verdict === v).length;
  const bad = r.claims.filter((c) => !c.ok);
  const total = r.claims.reduce((t, c) => t + c.timeMs, 0);
  o.push('<section id="summary">', '<h2>Summary</h2>');
  o.push(`<p><b>${n}</b> claim${n === 1 ? '' : 's'} checked; ${bad.length === 0 && r.problems.length === 0 ? 'all as expected' : `<b>${bad.length}</b> not as expected`}.</p>`);
  o.push('<ul class="counts">');
  for (const v of VERDICTS) o.push(`<li>${verdictBadge(v)} <b>${count(v)}</b></li>`);
  o.push(`<li>not as expected <b>${bad.length}</b></li>`);
  o.push('</ul>');
  if (bad.length > 0) {
    o.push('<p>Not as expected:</p>', '<ul>');
    r.claims.forEach((c, k) => {
      if (!c.ok) o.push(`<li><a href="#${anchor(k)}">${esc(c.name)}</a>: ${esc(c.verdict)}, expected ${esc(c.expect)}</li>`);
    });
    o.push('</ul>');
  }
  if (r.problems.length > 0) {
    o.push('<p>Files that could not be read or parsed (their parsed claims were checked):</p>', '<ul>');
    for (const p of r.problems) o.push(`<li><code>${esc(p.file)}</code>: ${esc(p.message)}</li>`);
    o.push('</ul>');
  }
  o.push('<dl class="settings">');
  const row = (k: string, v: string) => o.push(`<dt>${esc(k)}</dt><dd>${esc(v)}</dd>`);
  row('seed', String(r.settings.seed));
  row('digits', String(r.settings.digits));
  row('samples', String(r.settings.samples));
  row('y_min', String(r.settings.yMin));
  row('modvet', r.version);
  row('time', `${seconds(total)} (sum over the claims)`);
  o.push('</dl>');
  o.push('<p class="meta">Digits, samples and y_min are the run\'s; a file\'s <code>use</code> line or a claim\'s own clauses override them (the table shows what each claim used). The same seed reproduces this run.</p>');
  if (r.note !== undefined) o.push(`<p class="meta">${esc(r.note)}</p>`);
  o.push('<p class="evidence">Numerical agreement is evidence, not proof.</p>');
  o.push('</section>');
  return o;
}

function claimTable(claims: readonly HtmlClaim[]): string[] {
  const o: string[] = ['<section id="claims">', '<h2>Claims</h2>'];
  o.push('<table class="claims">', '<thead><tr><th>verdict</th><th>digits</th><th>limited by</th><th>samples</th><th>time</th><th>file:line</th><th>name</th><th>source</th></tr></thead>', '<tbody>');
  claims.forEach((c, k) => {
    o.push(
      `<tr id="row-${k + 1}"${c.ok ? '' : ' class="unexpected"'}>` +
        `<td>${verdictBadge(c.verdict)}${unexpectedTag(c)}</td>` +
        `<td class="num">${digitsCell(c)}</td>` +
        `<td>${c.limitedBy !== undefined ? `limited by ${esc(c.limitedBy)}` : ''}</td>` +
        `<td class="num">${c.samples}</td>` +
        `<td class="num">${seconds(c.timeMs)}</td>` +
        `<td class="where">${esc(`${c.file}:${c.line}`)}</td>` +
        `<td><a href="#${anchor(k)}">${esc(c.name)}</a></td>` +
        `<td>${c.source !== undefined ? esc(c.source) : ''}</td>` +
        '</tr>',
    );
  });
  o.push('</tbody>', '</table>', '</section>');
  return o;
}

function outcomeLine(c: HtmlClaim): string {
  if (c.verdict === 'holds') {
    const against = c.vanishing ? ' of the terms (both sides vanish)' : '';
    const limited = c.limitedBy !== undefined ? `, limited by ${esc(c.limitedBy)}` : '';
    return `Agrees to ${c.digits} digits${against}${limited} at the worst of ${samplesText(c.samples)} (${c.requested} requested), ${seconds(c.timeMs)}.`;
  }
  if (c.verdict === 'refuted') {
    return `Fails: relative residual ${esc(c.worst?.residual ?? '?')} at the worst of ${samplesText(c.samples)}, ${seconds(c.timeMs)}.`;
  }
  return `${esc(c.verdict === 'error' ? 'Error' : 'Undecided')}: ${esc(c.reason ?? 'no reason recorded')} (${samplesText(c.samples)}, ${seconds(c.timeMs)}).`;
}

function claimSection(c: HtmlClaim, k: number): string[] {
  const o: string[] = [`<section class="claim${c.ok ? '' : ' unexpected'}" id="${anchor(k)}">`];
  o.push(`<h3>${verdictBadge(c.verdict)}${unexpectedTag(c)} ${esc(c.name)}</h3>`);
  o.push(`<p class="meta"><code>${esc(`${c.file}:${c.line}`)}</code>${c.source !== undefined ? ` &middot; source: ${esc(c.source)}` : ''} &middot; expected ${esc(c.expect)}</p>`);
  o.push(`<code class="eq">${esc(c.equation)}</code>`);
  o.push(`<p>${outcomeLine(c)}</p>`);
  if (c.worst !== undefined && c.verdict !== 'holds') {
    o.push(`<p class="meta">Worst sample: <span class="mono">${esc(c.worst.point)}</span><br>LHS = <span class="mono">${esc(c.worst.lhs)}</span><br>RHS = <span class="mono">${esc(c.worst.rhs)}</span></p>`);
  }
  if (c.diagnosis !== undefined) {
    o.push('<div class="explain">');
    o.push(`<p><b>Diagnosis:</b> ${esc(c.diagnosis)}</p>`);
    if (c.simplest !== undefined) o.push(`<p><b>Simplest failure:</b> ${esc(c.simplest)}</p>`);
    const s = c.suggestion;
    if (s !== undefined) {
      const how =
        s.verdict === 'holds'
          ? `holds to ${s.digits} digits${s.limitedBy !== undefined ? `, limited by ${esc(s.limitedBy)}` : ''}`
          : `${esc(s.verdict)}${s.reason !== undefined ? `: ${esc(s.reason)}` : ''}`;
      o.push(`<p><b>Suggested:</b> <code>${esc(s.equation)}</code> &mdash; checked: ${verdictBadge(s.verdict)} ${how}</p>`);
    } else {
      o.push('<p><b>Suggested:</b> no checked fix.</p>');
    }
    o.push('</div>');
  }
  if (c.pathSvg !== undefined) o.push(`<figure>${c.pathSvg}</figure>`);
  if (c.pathNote !== undefined) o.push(`<p class="note">${esc(c.pathNote)}</p>`);
  if (c.residualSvg !== undefined) o.push(`<figure>${c.residualSvg}</figure>`);
  if (c.residualNote !== undefined) o.push(`<p class="note">${esc(c.residualNote)}</p>`);
  if (c.sampleRows.length > 0) {
    o.push(`<details><summary>${c.sampleRows.length === 1 ? 'The evaluated sample' : `The ${c.sampleRows.length} evaluated samples`}</summary>`);
    o.push('<table class="samples"><thead><tr><th>#</th><th>point</th><th>outcome</th><th>relative residual</th><th>digits</th></tr></thead><tbody>');
    c.sampleRows.forEach((s, i) => {
      o.push(`<tr><td class="num">${i + 1}</td><td class="mono">${esc(s.point)}</td><td>${esc(s.outcome)}</td><td class="num">${esc(s.residual)}</td><td class="num">${s.digits}</td></tr>`);
    });
    o.push('</tbody></table></details>');
  }
  o.push('<p class="back"><a href="#claims">back to the table</a></p>');
  o.push('</section>');
  return o;
}

/** The whole page (module header). */
export function htmlDocument(r: HtmlReport): string {
  const o: string[] = [
    '<!DOCTYPE html>',
    '<html lang="en">',
    '<head>',
    '<meta charset="utf-8">',
    // no fetch of any kind: the page is complete as it is
    `<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:">`,
    '<meta name="viewport" content="width=device-width, initial-scale=1">',
    '<link rel="icon" href="data:,">',
    `<title>modvet check report: ${r.claims.length} claims</title>`,
    `<style>${CSS}</style>`,
    '</head>',
    '<body>',
    '<main>',
    '<h1>modvet check report</h1>',
    `<p class="meta">Numerical verification of identities between modular forms, modvet ${esc(r.version)}.</p>`,
    ...summary(r),
    ...claimTable(r.claims),
    '<h2>Claim by claim</h2>',
  ];
  r.claims.forEach((c, k) => o.push(...claimSection(c, k)));
  o.push('</main>', '</body>', '</html>');
  return o.join('\n') + '\n';
}
