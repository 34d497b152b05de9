/**
 * JUnit XML (`modvet check --junit FILE`), for CI servers: one testsuite per claim file, one
 * testcase per claim; a claim whose verdict is not the expected one is a <failure>, a file
 * that could not be read or parsed is a testsuite with one <error>.
 */
import type { ExplainedResult } from '../diagnose/explain.js';
import { showComplex, showSample } from './describe.js';
import { escapeXml } from './svg.js';

const esc = escapeXml;

/** One claim's <testcase> element (indented for its testsuite), for junitDocument. */
export interface JunitCase {
  file: string;
  ok: boolean;
  timeMs: number;
  xml: string;
}

export function junitCase(r: ExplainedResult): JunitCase {
  const file = r.claim.file;
  const head = `    <testcase classname="${esc(file)}" name="${esc(r.claim.name)}" time="${(r.timeMs / 1000).toFixed(3)}"`;
  if (r.ok) return { file, ok: true, timeMs: r.timeMs, xml: `${head}/>` };
  const detail: string[] = [`equation: ${r.claim.text}`, `verdict: ${r.verdict}`];
  if (r.reason !== undefined) detail.push(`reason: ${r.reason}`);
  if (r.worst !== undefined) {
    detail.push(`worst sample: ${showSample(r.worst.sample, r.claim.group?.variable)}`);
    detail.push(`LHS = ${showComplex(r.worst.lhs.value)}`, `RHS = ${showComplex(r.worst.rhs.value)}`);
  }
  if (r.explanation !== undefined) {
    detail.push(`diagnosis: ${r.explanation.diagnosis.text}`);
    if (r.explanation.suggestion !== undefined) detail.push(`suggested: ${r.explanation.suggestion.equation} (${r.explanation.suggestion.verdict})`);
  }
  const failure = `      <failure type="${r.verdict}" message="${esc(`expected ${r.claim.expect}, got ${r.verdict}`)}">${esc(detail.join('\n'))}</failure>`;
  return { file, ok: false, timeMs: r.timeMs, xml: [`${head}>`, failure, '    </testcase>'].join('\n') };
}

/** The whole document: one testsuite per claim file, in the order the cases come. */
export function junitDocument(cases: JunitCase[], errors: { file: string; message: string }[]): string {
  const files = new Map<string, JunitCase[]>();
  for (const c of cases) {
    const list = files.get(c.file) ?? [];
    list.push(c);
    files.set(c.file, list);
  }
  const out: string[] = ['<?xml version="1.0" encoding="UTF-8"?>'];
  const failures = cases.filter((c) => !c.ok).length;
  const total = cases.length + errors.length;
  const time = cases.reduce((t, c) => t + c.timeMs, 0) / 1000;
  out.push(`<testsuites name="modvet" tests="${total}" failures="${failures}" errors="${errors.length}" time="${time.toFixed(3)}">`);
  for (const [file, cs] of files) {
    const f = cs.filter((c) => !c.ok).length;
    const t = cs.reduce((a, c) => a + c.timeMs, 0) / 1000;
    out.push(`  <testsuite name="${esc(file)}" tests="${cs.length}" failures="${f}" errors="0" time="${t.toFixed(3)}">`);
    for (const c of cs) out.push(c.xml);
    out.push('  </testsuite>');
  }
  for (const e of errors) {
    out.push(`  <testsuite name="${esc(e.file)}" tests="1" failures="0" errors="1" time="0">`);
    out.push(`    <testcase classname="${esc(e.file)}" name="read and parse"><error message="${esc(e.message)}"/></testcase>`);
    out.push('  </testsuite>');
  }
  out.push('</testsuites>');
  return out.join('\n') + '\n';
}

export function junitReport(results: ExplainedResult[], errors: { file: string; message: string }[]): string {
  return junitDocument(results.map(junitCase), errors);
}
