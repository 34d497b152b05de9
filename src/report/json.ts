/**
 * The JSON report (`modvet check --json`), schema "modvet-check/1". Stable: fields are only
 * ever added. Contains no timings, so the same seed and inputs give byte-identical output.
 *
 * {
 *   "schema": "modvet-check/1", "version": "0.1.0",
 *   "settings": { "seed": 1, "digits": 30, "samples": 16, "ymin": 0.02 },
 *   "claims": [ {
 *     "file": "identities/x.vet", "line": 3, "name": "...", "source": "..." | null,
 *     "equation": "LHS = RHS", "expected": "holds", "verdict": "holds", "ok": true,
 *     "digits": 30, "requested_digits": 30, "limited_by": null | "a lattice sum",
 *     "samples": 16, "reason": null | "...",
 *     "worst": null | { "tau": {"re","im"}, "group": null | {"matrix": [[a,b],[c,d]], "word": "S T"},
 *                       "params": { "s": {"re","im"} }, "lhs": {"re","im"}, "rhs": {"re","im"},
 *                       "residual": "1.2e-31", "precisions": [35, 45] },
 *     "diagnosis": null | { "kind": "constant-factor", "text": "LHS = 2 pi * RHS",
 *                           "constant": null | "2 pi", "digits": 28 },
 *     "simplest": null | { "text": "g = S at tau = i", "residual": "0.5" },
 *     "suggestion": null | { "equation": "...", "verdict": "holds", "digits": 30,
 *                            "limited_by": null | "...", "reason": null | "..." } } ],
 *   (diagnosis, simplest and suggestion are set for refuted claims only)
 *   "errors": [ { "file": "...", "message": "..." } ],
 *   "summary": { "claims": n, "holds": n, "refuted": n, "undecided": n, "error": n, "unexpected": n }
 * }
 * Numbers inside "worst" are decimal strings with 20 significant digits.
 */
import type { ExplainedResult } from '../diagnose/explain.js';
import { toWord, wordToString } from '../groups/words.js';
import { complexJson } from './describe.js';

export interface RunSettings {
  seed: number;
  digits: number;
  samples: number;
  yMin: number;
}

function explanationJson(r: ExplainedResult) {
  const x = r.explanation;
  if (x === undefined) return { diagnosis: null, simplest: null, suggestion: null };
  const d = x.diagnosis;
  const s = x.suggestion;
  return {
    diagnosis: { kind: d.kind, text: d.text, constant: d.constant?.text ?? null, digits: d.digits },
    simplest: x.simplest === null ? null : { text: x.simplest.text, residual: x.simplest.residual },
    suggestion:
      s === undefined
        ? null
        : { equation: s.equation, verdict: s.verdict, digits: s.digits, limited_by: s.limitedBy ?? null, reason: s.reason ?? null },
  };
}

/** One claim's entry of the "claims" array. */
export function claimJson(r: ExplainedResult) {
  const w = r.worst;
  return {
    file: r.claim.file,
    line: r.claim.line,
    name: r.claim.name,
    source: r.claim.source ?? null,
    equation: r.claim.text,
    expected: r.claim.expect,
    verdict: r.verdict,
    ok: r.ok,
    digits: r.digits,
    requested_digits: r.requested,
    limited_by: r.limitedBy ?? null,
    samples: r.samples,
    reason: r.reason ?? null,
    worst:
      w === undefined
        ? null
        : {
            tau: complexJson(w.sample.tau),
            group:
              w.sample.gamma === undefined
                ? null
                : {
                    matrix: [
                      [w.sample.gamma.a.toString(), w.sample.gamma.b.toString()],
                      [w.sample.gamma.c.toString(), w.sample.gamma.d.toString()],
                    ],
                    word: wordToString(toWord(w.sample.gamma)),
                  },
            params: Object.fromEntries([...w.sample.params].map(([k, v]) => [k, complexJson(v)])),
            lhs: complexJson(w.lhs.value),
            rhs: complexJson(w.rhs.value),
            residual: w.assessment.residual.isZero() ? '0' : w.assessment.residual.toSD(3).toExponential(),
            precisions: [w.p1, w.p2],
          },
    ...explanationJson(r),
  };
}

/** The counts of the summary from the verdicts. */
export interface Tally {
  verdict: string;
  ok: boolean;
}

/** The whole document from the claims' entries (in order) and their verdicts. */
export function jsonDocument(
  version: string,
  settings: RunSettings,
  claims: unknown[],
  tallies: Tally[],
  errors: { file: string; message: string }[],
): string {
  const count = (v: string) => tallies.filter((r) => r.verdict === v).length;
  const doc = {
    schema: 'modvet-check/1',
    version,
    settings: { seed: settings.seed, digits: settings.digits, samples: settings.samples, ymin: settings.yMin },
    claims,
    errors,
    summary: {
      claims: tallies.length,
      holds: count('holds'),
      refuted: count('refuted'),
      undecided: count('undecided'),
      error: count('error'),
      unexpected: tallies.filter((r) => !r.ok).length,
    },
  };
  return JSON.stringify(doc, null, 2) + '\n';
}

export function jsonReport(
  version: string,
  settings: RunSettings,
  results: ExplainedResult[],
  errors: { file: string; message: string }[],
): string {
  return jsonDocument(version, settings, results.map(claimJson), results, errors);
}
