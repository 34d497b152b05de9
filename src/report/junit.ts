/**
 * JUnit XML (`modvet check --junit FILE`), for CI servers: one testsuite per claim file, one
 * testcase per claim; a claim whose verdict is not the expected one is a <failure>, a file
 * that could not be read or parsed is a testsuite with one <error>.
 */
import { ClaimResult } from '../check/run.js';
import { showComplex, showSample } from './describe.js';

function esc(s: string): string {
  return s
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&apos;')
    // characters XML 1.0 forbids
    .replace(/[\u0000-\u0008\u000b\u000c\u000e-\u001f]/g, '');
}

export function junitReport(results: ClaimResult[], errors: { file: string; message: string }[]): string {
  const files = new Map<string, ClaimResult[]>();
  for (const r of results) {
    const list = files.get(r.claim.file) ?? [];
    list.push(r);
    files.set(r.claim.file, list);
  }
  const out: string[] = ['<?xml version="1.0" encoding="UTF-8"?>'];
  const failures = results.filter((r) => !r.ok).length;
  const total = results.length + errors.length;
  const time = results.reduce((t, r) => t + r.timeMs, 0) / 1000;
  out.push(`<testsuites name="modvet" tests="${total}" failures="${failures}" errors="${errors.length}" time="${time.toFixed(3)}">`);
  for (const [file, rs] of files) {
    const f = rs.filter((r) => !r.ok).length;
    const t = rs.reduce((a, r) => a + r.timeMs, 0) / 1000;
    out.push(`  <testsuite name="${esc(file)}" tests="${rs.length}" failures="${f}" errors="0" time="${t.toFixed(3)}">`);
    for (const r of rs) {
      const head = `    <testcase classname="${esc(file)}" name="${esc(r.claim.name)}" time="${(r.timeMs / 1000).toFixed(3)}"`;
      if (r.ok) {
        out.push(`${head}/>`);
        continue;
      }
      const detail: string[] = [`equation: ${r.claim.text}`, `verdict: ${r.verdict}`];
      if (r.reason !== undefined) detail.push(`reason: ${r.reason}`);
      if (r.worst !== undefined) {
        detail.push(`worst sample: ${showSample(r.worst.sample, r.claim.group?.variable)}`);
        detail.push(`LHS = ${showComplex(r.worst.lhs.value)}`, `RHS = ${showComplex(r.worst.rhs.value)}`);
      }
      out.push(`${head}>`);
      out.push(`      <failure type="${r.verdict}" message="${esc(`expected ${r.claim.expect}, got ${r.verdict}`)}">${esc(detail.join('\n'))}</failure>`);
      out.push('    </testcase>');
    }
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
