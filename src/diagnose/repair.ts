/**
 * Finding a slip inside an expression, for refuted claims that no global pattern of
 * diagnose.ts fits: a bounded search over single edits of either side, each checked
 * numerically; the first edit that makes the claim hold is named and suggested.
 *
 * The edits, tried in this order (cheapest and simplest first), on the nodes written in the
 * claim (never inside a let's body, whose text lives elsewhere):
 * 1. the sign of one term of a side's top-level sum: a + b -> a - b;
 * 2. one term of such a sum (a sum of at least two terms: a factor on a whole side is a
 *    global pattern) times 2 or 1/2, the first term also times -1; a numeric literal among
 *    the term's factors is edited when there is one (2*sqrt(y)*S -> 4*sqrt(y)*S; a literal
 *    that becomes 1 is dropped), else the factor is put in front (2*f*g);
 * 3. the same two edits on the terms of a sum(...) body that is a sum of terms;
 * 4. a sign slip in an exponent or an index: n^e -> n^-e for a power of a series variable
 *    (n^(s - 1/2) -> n^(1/2 - s)), sigma(a, n) -> sigma(-a, n) (sigma(2*s - 1, n) ->
 *    sigma(1 - 2*s, n));
 * 5. the nome: the tau-dependent argument of a modular function or of exp times 2 or 1/2
 *    (theta3(2*tau) -> theta3(tau)), and q -> q^2, q -> exp(pi*i*tau) (= q^(1/2)).
 * Every edit is a text edit of the file (SpanEdit: an offset range of the file text and its
 * replacement, parenthesised only where its spot in the grammar needs it) and the mutated
 * claim it gives, built with mapExpr so that it shares every untouched node.
 *
 * Checking (cost): a candidate is first evaluated at up to QUICK_SAMPLES of the samples the
 * checker already drew, at their first precision P1, and dropped at the first sample where
 * the sides differ beyond 10^-(P/2) (relative to the larger side or cancellation gauge);
 * the shared evaluation memos (fromAst.ts SampleMemos) make every untouched subtree cost one
 * evaluation per sample for the whole search. A candidate that passes is re-parsed from the
 * edited file text (which must give the same tree) and confirmed by checkClaim with the
 * claim's own samples, digits and seed (the same samples, so the memos carry over). At most
 * MAX_CANDIDATES candidates, MAX_EVALUATIONS quick evaluations and MAX_CONFIRMATIONS
 * confirmations per claim; claims with a lattice sum (about a second an evaluation) are not
 * searched.
 *
 *   const r = repairSuggestion(result, { claim, fileText, defaults }, opts)
 *   r?.diagnosis.text   // "the term 2*sqrt(y)*sum(...) needs a factor 2: 4*sqrt(y)*sum(...) holds"
 *   r?.fileText         // the file with the edit applied and `expect refuted` removed
 */
import { Decimal } from 'decimal.js';
import type { BuiltinName, Claim, Expr, Settings, Span } from '../lang/ast.js';
import { dependsOnTau } from '../lang/depends.js';
import { parseSource } from '../lang/parser.js';
import { Level, levelOf, printExpr, PrintError, wrappedInParens } from '../lang/print.js';
import { ModvetError } from '../numeric/errors.js';
import { MAX_DIGITS, withDigits } from '../numeric/precision.js';
import type { CheckableClaim } from '../check/claim.js';
import { SampleMemos, toCheckable } from '../check/fromAst.js';
import { checkClaim, type CheckOptions, type ClaimResult, type SampleReport } from '../check/run.js';
import type { ClaimSource, Suggestion } from './explain.js';
import { mapExpr } from './mutate.js';
import type { Diagnosis, SpanEdit } from './types.js';

/** Candidates tried per claim. */
export const MAX_CANDIDATES = 40;
/** Quick evaluations (both sides at one sample and precision) per claim. */
export const MAX_EVALUATIONS = 80;
/** Candidates confirmed with the full sample set per claim. */
export const MAX_CONFIRMATIONS = 2;
/** Samples a candidate is first evaluated at. */
const QUICK_SAMPLES = 3;
/** Subterms quoted in a diagnosis are abbreviated to about this many characters. */
const QUOTE_LENGTH = 60;

/** Functions of tau whose argument carries the nome (edit 5). */
const NOME_FUNCTIONS: ReadonlySet<BuiltinName> = new Set(['E', 'G', 'E2star', 'eta', 'Delta', 'j', 'theta2', 'theta3', 'theta4', 'exp']);

export interface Repair {
  diagnosis: Diagnosis;
  suggestion: Suggestion;
  /** The file with the edit applied and the claim's `expect refuted` clause removed. */
  fileText: string;
}

export interface RepairBudget {
  maxCandidates?: number;
  maxEvaluations?: number;
}

/** One single edit: the text edit, the claim it gives, and its description. */
export interface Candidate {
  /** e.g. 'sign', 'factor 2', 'exponent sign', 'argument 1/2', 'q -> q^2'. */
  label: string;
  edit: SpanEdit;
  claim: Claim;
  /** The sentence for the report, given that the edit makes the claim hold. */
  text: string;
}

// ---------------------------------------------------------------------------
// Text: where an edit goes and how it is parenthesised (the grammar of parser.ts, as in
// print.ts: + - < * / < unary minus < ^, ^ right-associative and tighter than unary minus)

/** What a spot requires of the text put there: a binding level, and no bare negation. */
interface Spot {
  min: Level;
  noNeg: boolean;
}
const ANY: Spot = { min: Level.Any, noNeg: false };
const needs = (min: Level, noNeg = false): Spot => ({ min, noNeg });

function fit(text: string, level: Level, spot: Spot): string {
  return level < spot.min || (spot.noNeg && level === Level.Neg) ? `(${text})` : text;
}


/** The file text with [start, end) replaced by `text`. */
export function replaceSpan(fileText: string, start: number, end: number, text: string): string {
  return fileText.slice(0, start) + text + fileText.slice(end);
}

/** The text without the claim's `expect refuted` line (it sits between the header and the equation). */
function withoutExpectRefuted(text: string, claim: Claim): string {
  if (claim.expect !== 'refuted') return text;
  const lines = text.split('\n');
  for (let k = claim.span.line; k < claim.equationSpan.line - 1 && k < lines.length; k++) {
    if (/^\s*expect\s+refuted\s*(#.*)?$/.test(lines[k]!)) {
      lines.splice(k, 1);
      break;
    }
  }
  return lines.join('\n');
}

/**
 * The file text with the edit applied and the claim's `expect refuted` clause removed (the
 * edit lies inside the equation, after the clause lines, so their line numbers hold). To
 * apply several claims' edits, apply them bottom-up.
 */
export function applyEdit(fileText: string, claim: Claim, edit: SpanEdit): string {
  return withoutExpectRefuted(replaceSpan(fileText, edit.start, edit.end, edit.text), claim);
}

/** Text for a report: whitespace folded, long parenthesised groups shown as (...), then cut. */
export function abbreviate(text: string, max = QUOTE_LENGTH): string {
  let s = text.replace(/\s+/g, ' ').trim();
  while (s.length > max) {
    // the longest group opened at depth 0
    let best: [number, number] | null = null;
    let depth = 0;
    let open = -1;
    for (let k = 0; k < s.length; k++) {
      if (s[k] === '(') {
        if (depth === 0) open = k;
        depth++;
      } else if (s[k] === ')') {
        depth--;
        if (depth === 0 && open >= 0 && k - open - 1 > 3 && (best === null || k - open > best[1] - best[0])) best = [open, k];
      }
    }
    if (best === null) return `${s.slice(0, max - 3)}...`;
    s = `${s.slice(0, best[0] + 1)}...${s.slice(best[1])}`;
  }
  return s;
}

// ---------------------------------------------------------------------------
// Candidates

const num = (text: string, span: Span): Expr => ({ kind: 'number', text, imaginary: false, span });
const bin = (op: '+' | '-' | '*' | '/' | '^', left: Expr, right: Expr, span: Span): Expr => ({ kind: 'binary', op, left, right, span });

/** A replacement of one node: the new node and its text at the node's spot. */
interface Replacement {
  target: Expr;
  by: Expr;
  /** Offsets of the text replaced (the target's span unless a smaller edit says the same). */
  start: number;
  end: number;
  text: string;
}

const FACTORS: readonly { text: string; value: Decimal }[] = [
  { text: '2', value: new Decimal(2) },
  { text: '1/2', value: new Decimal(0.5) },
  { text: '-1', value: new Decimal(-1) },
];

/** The nodes of one side as written, with their parents and spots. */
class Side {
  private readonly parents = new Map<Expr, Expr | null>();
  private readonly spots = new Map<Expr, Spot>();
  /** The claim-level nodes in source order (preorder). */
  readonly nodes: Expr[] = [];

  constructor(
    readonly which: 'lhs' | 'rhs',
    readonly root: Expr,
    private readonly fileText: string,
  ) {
    this.walk(root, null, ANY);
  }

  private walk(e: Expr, parent: Expr | null, spot: Spot): void {
    this.parents.set(e, parent);
    this.spots.set(e, spot);
    this.nodes.push(e);
    for (const [c, s] of children(e)) this.walk(c, e, s);
  }

  parent(e: Expr): Expr | null {
    return this.parents.get(e) ?? null;
  }
  spot(e: Expr): Spot {
    return this.spots.get(e) ?? ANY;
  }
  src(e: Expr): string {
    return this.fileText.slice(e.span.start, e.span.end);
  }
  /** The binding level of the node's source text (outer parentheses are inside the span). */
  level(e: Expr): Level {
    return wrappedInParens(this.src(e).trim()) ? Level.Atom : levelOf(e);
  }
  /** The node's source text at a spot. */
  at(e: Expr, spot: Spot): string {
    return fit(this.src(e), this.level(e), spot);
  }
  /** The node's text after a replacement inside it. */
  after(e: Expr, r: Replacement): string {
    return this.fileText.slice(e.span.start, r.start) + r.text + this.fileText.slice(r.end, e.span.end);
  }
  /** A replacement of `target` by `by`, whose text `text` binds at `level`. */
  replace(target: Expr, by: Expr, text: string, level: Level): Replacement {
    return { target, by, start: target.span.start, end: target.span.end, text: fit(text, level, this.spot(target)) };
  }
}

/** The children written in the claim, with the spots their text sits in. */
function children(e: Expr): [Expr, Spot][] {
  switch (e.kind) {
    case 'binary':
      if (e.op === '^') return [[e.left, needs(Level.Atom)], [e.right, needs(Level.Neg)]];
      if (e.op === '*' || e.op === '/') return [[e.left, needs(Level.Mul)], [e.right, needs(Level.Pow)]];
      return [[e.left, needs(Level.Add)], [e.right, needs(Level.Mul, true)]];
    case 'neg':
      return [[e.arg, needs(Level.Pow)]];
    case 'call':
      return e.args.map((a) => [a, ANY]);
    case 'moebius':
      return [[e.arg, ANY]];
    case 'series': {
      const r = e.range;
      const bounds = r.kind === 'divisors' ? [r.of] : [r.from, ...(r.to === null ? [] : [r.to])];
      return [...bounds.map((b): [Expr, Spot] => [b, ANY]), [e.body, ANY]];
    }
    case 'limit':
      return [[e.at, ANY], [e.body, ANY]];
    case 'operator':
      if (e.at !== null) return [];
      return [...(e.weight === null ? [] : [[e.weight, ANY] as [Expr, Spot]]), [e.arg, ANY]];
    // a let call's text is its call, its body lives elsewhere; q is written as q
    default:
      return [];
  }
}

/** The terms of a sum a +- b +- c, each with the + or - node that adds it (null for the first). */
function termsOf(e: Expr): { term: Expr; joint: Extract<Expr, { kind: 'binary' }> | null }[] {
  const out: { term: Expr; joint: Extract<Expr, { kind: 'binary' }> | null }[] = [];
  let cur = e;
  while (cur.kind === 'binary' && (cur.op === '+' || cur.op === '-')) {
    out.unshift({ term: cur.right, joint: cur });
    cur = cur.left;
  }
  out.unshift({ term: cur, joint: null });
  return out;
}

/** The factors of a product, left to right, with whether each divides. */
function factorsOf(e: Expr, inverted = false, out: { node: Expr; inverted: boolean }[] = []): { node: Expr; inverted: boolean }[] {
  if (e.kind === 'binary' && (e.op === '*' || e.op === '/')) {
    factorsOf(e.left, inverted, out);
    factorsOf(e.right, e.op === '/' ? !inverted : inverted, out);
  } else {
    out.push({ node: e, inverted });
  }
  return out;
}

/** The first real numeric literal among the factors, or null. */
function literalFactor(e: Expr): { node: Extract<Expr, { kind: 'number' }>; inverted: boolean } | null {
  for (const f of factorsOf(e)) {
    if (f.node.kind === 'number' && !f.node.imaginary && !new Decimal(f.node.text).isZero()) return { node: f.node, inverted: f.inverted };
  }
  return null;
}

/**
 * `e` (a term, or a function's argument) times k, editing its first numeric literal when it
 * has one; otherwise the factor goes in front of the leftmost factor ('front', for terms) or
 * around the whole ('whole', for arguments: 2*tau, tau/2).
 */
function scaled(side: Side, e: Expr, k: { text: string; value: Decimal }, form: 'front' | 'whole'): Replacement {
  const lit = literalFactor(e);
  if (lit !== null) {
    const L = lit.node;
    const v = lit.inverted ? new Decimal(L.text).div(k.value) : new Decimal(L.text).times(k.value);
    const P = side.parent(L);
    if (v.eq(1) && P !== null && P.kind === 'binary' && (P.op === '*' || (P.op === '/' && P.right === L))) {
      // a factor 1 is dropped: 2*tau -> tau
      const other = P.left === L ? P.right : P.left;
      return side.replace(P, other, side.src(other), side.level(other));
    }
    const text = v.abs().toString();
    return v.isNeg() ? side.replace(L, { kind: 'neg', arg: num(text, L.span), span: L.span }, `-${text}`, Level.Neg) : side.replace(L, num(text, L.span), text, Level.Atom);
  }
  let f = e;
  if (form === 'front') while (f.kind === 'binary' && (f.op === '*' || f.op === '/')) f = f.left;
  const s = f.span;
  if (k.text === '-1') {
    if (f.kind === 'neg') return side.replace(f, f.arg, side.src(f.arg), side.level(f.arg));
    return side.replace(f, { kind: 'neg', arg: f, span: s }, `-${side.at(f, needs(Level.Pow))}`, Level.Neg);
  }
  if (k.text === '2') return side.replace(f, bin('*', num('2', s), f, s), `2*${side.at(f, needs(Level.Pow))}`, Level.Mul);
  if (form === 'whole') return side.replace(f, bin('/', f, num('2', s), s), `${side.at(f, needs(Level.Mul))}/2`, Level.Mul);
  return side.replace(f, bin('*', bin('/', num('1', s), num('2', s), s), f, s), `1/2*${side.at(f, needs(Level.Pow))}`, Level.Mul);
}

/** -e, written as simply as the tree allows: a - b -> b - a, -a -> a. */
function negated(side: Side, e: Expr): Replacement {
  if (e.kind === 'binary' && e.op === '-') {
    const text = `${side.at(e.right, needs(Level.Add))} - ${side.at(e.left, needs(Level.Mul, true))}`;
    return side.replace(e, bin('-', e.right, e.left, e.span), text, Level.Add);
  }
  if (e.kind === 'neg') return side.replace(e, e.arg, side.src(e.arg), side.level(e.arg));
  return side.replace(e, { kind: 'neg', arg: e, span: e.span }, `-${side.at(e, needs(Level.Pow))}`, Level.Neg);
}

/** The sign of the term added by `joint` flipped: only the operator's character changes. */
function flipped(fileText: string, joint: Extract<Expr, { kind: 'binary' }>): Replacement | null {
  const from = joint.left.span.end;
  const k = fileText.slice(from, joint.right.span.start).search(/[+-]/);
  if (k < 0) return null;
  const op = joint.op === '+' ? '-' : '+';
  return { target: joint, by: { ...joint, op }, start: from + k, end: from + k + 1, text: op };
}

/**
 * The single edits of a claim (module header), in the order they are tried, without
 * duplicates; not capped.
 */
export function editCandidates(claim: Claim, fileText: string): Candidate[] {
  const sides = [new Side('lhs', claim.lhs, fileText), new Side('rhs', claim.rhs, fileText)];
  const out: Candidate[] = [];
  const seen = new Set<string>();
  const add = (side: Side, label: string, r: Replacement | null, describe: (r: Replacement) => string): void => {
    if (r === null) return;
    const key = `${r.start}:${r.end}:${r.text}`;
    if (seen.has(key)) return;
    seen.add(key);
    const root = mapExpr(side.root, (e) => (e === r.target ? r.by : null));
    const sideText = side.after(side.root, r).replace(/\s+/g, ' ').trim();
    const lhsText = side.which === 'lhs' ? sideText : claim.lhsText.trim();
    const rhsText = side.which === 'rhs' ? sideText : claim.rhsText.trim();
    const mutated: Claim = { ...claim, [side.which]: root, lhsText, rhsText, text: `${lhsText} = ${rhsText}`, expect: 'holds' };
    out.push({ label, edit: { side: side.which, start: r.start, end: r.end, text: r.text }, claim: mutated, text: describe(r) });
  };
  const q = (s: Side, e: Expr) => abbreviate(s.src(e));
  const qa = (s: Side, e: Expr, r: Replacement) => abbreviate(s.after(e, r));

  const sums = (s: Side): Expr[] => [s.root, ...s.nodes.filter((e) => e.kind === 'series' && termsOf(e.body).length >= 2).map((e) => (e as Extract<Expr, { kind: 'series' }>).body)];
  const signs = (s: Side, sum: Expr) => {
    for (const { term, joint } of termsOf(sum)) {
      if (joint === null) continue;
      add(s, 'sign', flipped(fileText, joint), (r) => `the term ${q(s, term)} has the wrong sign: ${qa(s, sum, r)} holds`);
    }
  };
  const factors = (s: Side, sum: Expr) => {
    const terms = termsOf(sum);
    if (terms.length < 2) return;
    for (const { term, joint } of terms) {
      for (const k of FACTORS) {
        if (k.text === '-1' && joint !== null) continue; // the sign flip says it
        add(s, `factor ${k.text}`, scaled(s, term, k, 'front'), (r) => `the term ${q(s, term)} needs a factor ${k.text}: ${qa(s, term, r)} holds`);
      }
    }
  };
  // 1, 2: the top-level sums; 3: sum bodies
  for (const s of sides) signs(s, s.root);
  for (const s of sides) factors(s, s.root);
  for (const s of sides) {
    for (const body of sums(s).slice(1)) {
      signs(s, body);
      factors(s, body);
    }
  }
  // 4: signs of exponents of series variables and of sigma's index
  for (const s of sides) {
    for (const e of s.nodes) {
      if (e.kind === 'binary' && e.op === '^' && e.left.kind === 'boundVar') {
        add(s, 'exponent sign', negated(s, e.right), (r) => `the exponent of ${e.left.kind === 'boundVar' ? e.left.name : 'the power'} in ${q(s, e)} has the wrong sign: ${qa(s, e, r)} holds`);
      } else if (e.kind === 'call' && e.fn === 'sigma' && e.args.length === 2) {
        add(s, 'index sign', negated(s, e.args[0]!), (r) => `the index of ${q(s, e)} has the wrong sign: ${qa(s, e, r)} holds`);
      }
    }
  }
  // 5: the nome
  for (const s of sides) {
    for (const e of s.nodes) {
      if (e.kind === 'call' && NOME_FUNCTIONS.has(e.fn)) {
        for (const a of e.args) {
          if (!dependsOnTau(a)) continue;
          for (const k of FACTORS.slice(0, 2)) {
            add(s, `argument ${k.text}`, scaled(s, a, k, 'whole'), (r) => `the argument of ${q(s, e)} needs a factor ${k.text}: ${qa(s, e, r)} holds`);
          }
        }
      } else if (e.kind === 'tauPart' && e.part === 'q' && e.arg.kind === 'tau') {
        const sp = e.span;
        const q2 = bin('^', e, num('2', sp), sp);
        add(s, 'q -> q^2', s.replace(e, q2, 'q^2', Level.Pow), () => `q should be q^2 (the nome of 2 tau)`);
        const pi: Expr = { kind: 'constant', name: 'pi', span: sp };
        const i: Expr = { kind: 'constant', name: 'i', span: sp };
        const half: Expr = { kind: 'call', fn: 'exp', args: [bin('*', bin('*', pi, i, sp), e.arg, sp)], nameSpan: sp, span: sp };
        add(s, 'q -> q^(1/2)', s.replace(e, half, 'exp(pi*i*tau)', Level.Atom), () => `q should be exp(pi*i*tau) = q^(1/2) (the nome of the theta constants)`);
      }
    }
  }
  return out;
}

// ---------------------------------------------------------------------------
// Checking

/** Whether evaluating the claim is costly (a lattice sum, about a second an evaluation). */
function costly(claim: Claim): boolean {
  let heavy = false;
  for (const side of [claim.lhs, claim.rhs]) {
    mapExpr(side, (e) => {
      if (e.kind === 'lattice') heavy = true;
      return null;
    });
  }
  return heavy;
}

/** Up to QUICK_SAMPLES reports, spread over the list (the first and last differ in listed parameters). */
function quickReports(reports: SampleReport[]): SampleReport[] {
  const n = reports.length;
  const picks = [0, n - 1, Math.floor(n / 2)].filter((k, j, a) => k >= 0 && a.indexOf(k) === j);
  return picks.slice(0, QUICK_SAMPLES).map((k) => reports[k]!);
}

/** Whether both sides agree to about P/2 digits at the report's sample and P1 (module header). */
function agreesRoughly(checkable: CheckableClaim, r: SampleReport, P: number, yMin: number): boolean {
  let v: ReturnType<CheckableClaim['evaluate']>;
  try {
    v = withDigits(Math.min(r.p1, MAX_DIGITS), () => checkable.evaluate(r.sample, yMin));
  } catch (e) {
    if (e instanceof ModvetError) return false;
    throw e;
  }
  const gauge = Decimal.max(v.lhs.value.abs(), v.rhs.value.abs(), v.lhs.scale, v.rhs.scale);
  if (gauge.isZero()) return true;
  return v.lhs.value.sub(v.rhs.value).abs().div(gauge).lte(new Decimal(10).pow(-Math.floor(P / 2)));
}

/** Whether the two claims have the same trees as printed (PrintError: cannot tell). */
function sameTrees(a: Claim, b: Claim): boolean | null {
  try {
    return printExpr(a.lhs) === printExpr(b.lhs) && printExpr(a.rhs) === printExpr(b.rhs);
  } catch (e) {
    if (e instanceof PrintError) return null;
    throw e;
  }
}

/** The claim at the same header line of the edited file, or null when it did not parse. */
function reparsed(fileText: string, claim: Claim): { claim: Claim; defaults: Settings } | null {
  const { ast, diagnostics } = parseSource(fileText, claim.span.file);
  const again = ast.claims.find((c) => c.span.line === claim.span.line);
  if (again === undefined || diagnostics.some((d) => d.span.line >= claim.span.line && d.span.line <= again.equationSpan.line)) return null;
  return { claim: again, defaults: ast.defaults };
}

/**
 * The first single edit that makes a refuted claim hold (module header), with the
 * diagnosis ('term-slip'), the checked suggestion and the edited file text; null when the
 * claim is not refuted, is costly to evaluate, or no edit within the budget holds.
 */
export function repairSuggestion(result: ClaimResult, src: ClaimSource, opts: CheckOptions, budget: RepairBudget = {}): Repair | null {
  if (result.verdict !== 'refuted' || result.reports.length === 0 || costly(src.claim)) return null;
  const maxEvaluations = budget.maxEvaluations ?? MAX_EVALUATIONS;
  const candidates = editCandidates(src.claim, src.fileText).slice(0, budget.maxCandidates ?? MAX_CANDIDATES);
  const P = result.requested;
  const yMin = result.claim.yMin ?? opts.yMin;
  const quick = quickReports(result.reports);
  const memos = new SampleMemos();
  let evaluations = 0;
  let confirmations = 0;
  for (const c of candidates) {
    if (evaluations >= maxEvaluations || confirmations >= MAX_CONFIRMATIONS) break;
    let checkable: CheckableClaim;
    try {
      checkable = toCheckable(c.claim, src.defaults, memos);
    } catch (e) {
      if (e instanceof ModvetError) continue;
      throw e;
    }
    // the run's samples: the claim's own seed (or the file's, set by the caller)
    if (result.claim.seed !== undefined) checkable.seed = result.claim.seed;
    let rough = true;
    for (const r of quick) {
      evaluations++;
      if (!agreesRoughly(checkable, r, P, yMin)) {
        rough = false;
        break;
      }
    }
    if (!rough) continue;
    const fileText = applyEdit(src.fileText, src.claim, c.edit);
    const again = reparsed(fileText, src.claim);
    if (again === null) continue;
    const same = sameTrees(again.claim, c.claim);
    if (same === false) continue;
    if (same === null) {
      // the edited text is what the user gets: check it as parsed
      checkable = toCheckable({ ...again.claim, expect: 'holds' }, src.defaults);
      if (result.claim.seed !== undefined) checkable.seed = result.claim.seed;
    }
    confirmations++;
    const r = checkClaim(checkable, opts);
    if (r.verdict !== 'holds') continue;
    const suggestion: Suggestion = {
      rhs: again.claim.rhsText.trim(),
      equation: again.claim.text,
      verdict: r.verdict,
      digits: r.digits,
      ...(r.limitedBy !== undefined ? { limitedBy: r.limitedBy } : {}),
    };
    return { diagnosis: { kind: 'term-slip', text: c.text, edit: c.edit, digits: r.digits }, suggestion, fileText };
  }
  return null;
}
