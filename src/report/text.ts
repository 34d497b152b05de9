/**
 * The terminal report: one block per claim, then a summary line with the counts per
 * verdict and the seed that reproduces the run. Colour is decided by the caller.
 */
import { Chalk, ChalkInstance } from 'chalk';
import type { ExplainedResult } from '../diagnose/explain.js';
import { Verdict } from '../check/claim.js';
import { samplesText, showComplex, showSample } from './describe.js';

export interface TextOptions {
  color: boolean;
  quiet: boolean;
}

function painter(color: boolean): ChalkInstance {
  return new Chalk({ level: color ? 1 : 0 });
}

function paintVerdict(c: ChalkInstance, v: Verdict, ok: boolean): string {
  const word = v.padEnd(9);
  if (!ok) return c.red.bold(word);
  return v === 'holds' ? c.green(word) : v === 'refuted' ? c.cyan(word) : c.yellow(word);
}

export function claimLines(r: ExplainedResult, opts: TextOptions): string[] {
  const c = painter(opts.color);
  const where = `${r.claim.file}:${r.claim.line}`;
  const head = `${paintVerdict(c, r.verdict, r.ok)} ${r.claim.name}  ${c.dim(where)}`;
  const secs = (r.timeMs / 1000).toFixed(2);
  const lines = [head];
  const expected = r.ok ? '' : `  (expected ${r.claim.expect})`;
  if (r.verdict === 'holds') {
    // where both sides vanish, agreement is measured against the terms that formed them
    const against = r.worst?.assessment.vanishing === true ? ' of the terms (both sides vanish)' : '';
    const limited = r.limitedBy !== undefined ? `, limited by ${r.limitedBy}` : '';
    lines.push(`          agrees to ${r.digits} digits${against}${limited} at the worst of ${samplesText(r.samples)}, ${secs} s${expected}`);
  } else if (r.verdict === 'refuted') {
    const res = r.worst?.assessment.residual.toSD(3).toString() ?? '?';
    lines.push(`          fails: relative residual ${res} at the worst of ${samplesText(r.samples)}, ${secs} s${expected}`);
  } else {
    lines.push(`          ${r.reason ?? 'no reason recorded'} (${samplesText(r.samples)}, ${secs} s)${expected}`);
  }
  const showWorst = r.worst !== undefined && (r.verdict === 'refuted' || (!r.ok && !opts.quiet));
  if (showWorst && r.worst !== undefined) {
    const w = r.worst;
    lines.push(`          worst sample: ${showSample(w.sample, r.claim.group?.variable)}`);
    lines.push(`            LHS = ${showComplex(w.lhs.value)}`);
    lines.push(`            RHS = ${showComplex(w.rhs.value)}`);
  }
  const x = r.explanation;
  if (x !== undefined) {
    lines.push(`          diagnosis: ${x.diagnosis.text}`);
    if (x.simplest !== null) lines.push(`          simplest failure: ${x.simplest.text} (relative residual ${x.simplest.residual})`);
    const s = x.suggestion;
    if (s !== undefined) {
      const how =
        s.verdict === 'holds'
          ? c.green(`holds to ${s.digits} digits${s.limitedBy !== undefined ? `, limited by ${s.limitedBy}` : ''}`)
          : c.yellow(`${s.verdict}${s.reason !== undefined ? `: ${s.reason}` : ''}`);
      lines.push(`          suggested: ${s.equation}   ${how}`);
    }
  }
  return lines;
}

export function summaryLine(results: readonly { verdict: Verdict; ok: boolean }[], seed: number, parseFailures: number, color: boolean): string {
  const c = painter(color);
  const count = (v: Verdict) => results.filter((r) => r.verdict === v).length;
  const bad = results.filter((r) => !r.ok).length;
  const verdicts = `${count('holds')} hold, ${count('refuted')} refuted, ${count('undecided')} undecided, ${count('error')} error`;
  const status =
    bad === 0 && parseFailures === 0
      ? c.green('all as expected')
      : c.red(`${bad} not as expected${parseFailures > 0 ? `, ${parseFailures} file(s) could not be read or parsed` : ''}`);
  return `${results.length} ${results.length === 1 ? "claim" : "claims"}: ${verdicts}; ${status}. Seed ${seed} reproduces this run. Numerical agreement is evidence, not proof.`;
}
