/**
 * Printing a resolved expression (ast.ts) back in the claim language, and rewriting a
 * claim's right side in its file (for suggested fixes, src/diagnose/types.ts Fix).
 *
 * Public API:
 *   printExpr(e, { substitute? }): string       e.g. 'E(4, tau)^2', '-(x^2)' -> '-x^2'
 *   rewriteEquation(fileText, claim, newRhs)    the file with the claim's RHS replaced
 *   applyFix(fix, claim): string                the corrected right side's text
 *   PrintError                                  thrown when a node has no surface form
 *
 * Conventions:
 * - Parentheses are minimal for the grammar of parser.ts: + - < * / < unary minus < ^, with
 *   ^ right-associative and tighter than unary minus (-2^2 = -(2^2); 2^-1 = 1/2). The tree
 *   is kept exactly: a + (b + c) keeps its parentheses, so re-parsing gives the same AST.
 *   For readability a negation that is the right operand of + - * / is parenthesised
 *   (a*(-b), not a*-b), and so is a negation of a negation.
 * - Numbers print as their literal text (NumberLit.text, plus 'i' when imaginary).
 * - A let call prints as written, name(args), never its expansion; a let without
 *   parameters prints as its bare name.
 * - x, y, taubar, q of a tau other than the claim's (only inside a let's expansion) print as
 *   re(t), im(t), conj(t), exp(2*pi*i*t).
 * - Substitution (param name or 'tau' -> text) puts the text in parentheses unless its
 *   top-level operators already bind tightly enough for the spot (E(4, -1/tau) needs none).
 *   Substituting tau where a let body uses the claim's tau directly prints the let's
 *   expansion instead of the call; through a differential operator it is refused
 *   (PrintError): (lap f)(-1/tau) has no surface form.
 * - An operator taken at a let's argument (Operator.at !== null) has no surface form of its
 *   own: it is printed through its let call, and printing the expansion alone throws.
 *
 *   printExpr(eq('s*(s - 1) = 0', ['for s in [1, 2]']).lhs, { substitute: new Map([['s', '1 - s']]) })
 *     // '(1 - s)*(1 - s - 1)'
 */
import type { Claim, Expr, LetCall, TauPart } from './ast.js';
import type { Fix } from '../diagnose/types.js';
import { dependsOnTau } from './depends.js';

export interface PrintOptions {
  /** Param name or 'tau' -> replacement text in the claim language. */
  substitute?: ReadonlyMap<string, string>;
}

export class PrintError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'PrintError';
  }
}

/** Binding strength of a printed form; a slot requires at least some level. */
export enum Level {
  Any = 0,
  Add = 1,
  Mul = 2,
  Neg = 3,
  Pow = 4,
  Atom = 5,
}

interface Printed {
  text: string;
  level: Level;
}

/** The text in parentheses unless it binds at least `min` (and is not a negation when `noNeg`). */
function fit(p: Printed, min: Level, noNeg = false): string {
  return p.level < min || (noNeg && p.level === Level.Neg) ? `(${p.text})` : p.text;
}

/**
 * The binding level of claim-language text, judged from its top-level operators: any + or -
 * (unary included: conservative) is Add, then * /, then ^; text wholly in one pair of
 * parentheses, or without operators, is an atom. The '-' of an exponent (1e-3) is skipped.
 */
function textLevel(text: string): Level {
  const s = text.trim();
  if (wrappedInParens(s)) return Level.Atom;
  let depth = 0;
  let level = Level.Atom;
  for (let k = 0; k < s.length; k++) {
    const c = s[k]!;
    if (c === '(' || c === '[' || c === '{') depth++;
    else if (c === ')' || c === ']' || c === '}') depth--;
    else if (depth > 0) continue;
    else if ((c === '+' || c === '-') && !isExponentSign(s, k)) return Level.Add;
    else if (c === '*' || c === '/') level = Math.min(level, Level.Mul);
    else if (c === '^') level = Math.min(level, Level.Pow);
  }
  return level;
}

/** Whether the sign at k belongs to a number's exponent, as in 2.5e-3. */
function isExponentSign(s: string, k: number): boolean {
  if (k < 2 || (s[k - 1] !== 'e' && s[k - 1] !== 'E')) return false;
  let j = k - 2;
  if (!/[0-9.]/.test(s[j]!)) return false;
  while (j >= 0 && /[0-9.]/.test(s[j]!)) j--;
  // the digits must start a number, not continue a name (x2e-1 is x2e minus 1)
  return j < 0 || !/[A-Za-z0-9_]/.test(s[j]!);
}

/** Whether s is one parenthesised group, e.g. '(a + b)' but not '(a) + (b)'. */
export function wrappedInParens(s: string): boolean {
  if (!s.startsWith('(') || !s.endsWith(')')) return false;
  let depth = 0;
  for (let k = 0; k < s.length; k++) {
    if (s[k] === '(') depth++;
    else if (s[k] === ')') depth--;
    if (depth === 0 && k < s.length - 1) return false;
  }
  return true;
}

const TAU_PART_FN: Readonly<Record<TauPart['part'], string>> = { x: 're', y: 'im', taubar: 'conj', q: 'exp' };

class Printer {
  private readonly subst: ReadonlyMap<string, string>;
  private readonly substTau: string | undefined;
  /** Memo of "the let body uses the claim's tau other than through its arguments". */
  private readonly freeTauMemo = new WeakMap<LetCall, boolean>();

  constructor(opts: PrintOptions) {
    this.subst = opts.substitute ?? new Map();
    this.substTau = this.subst.get('tau');
  }

  private replaced(text: string): Printed {
    return { text: text.trim(), level: textLevel(text) };
  }

  private args(xs: readonly Expr[]): string {
    return xs.map((a) => this.print(a).text).join(', ');
  }

  print(e: Expr): Printed {
    const atom = (text: string): Printed => ({ text, level: Level.Atom });
    switch (e.kind) {
      case 'number':
        return atom(e.imaginary ? `${e.text}i` : e.text);
      case 'constant':
        return atom(e.name);
      case 'tau':
        return this.substTau !== undefined ? this.replaced(this.substTau) : atom('tau');
      case 'tauPart': {
        if (e.arg.kind === 'tau' && this.substTau === undefined) return atom(e.part);
        const t = this.print(e.arg);
        if (e.part === 'q') return atom(`exp(2*pi*i*${fit(t, Level.Pow, true)})`);
        return atom(`${TAU_PART_FN[e.part]}(${t.text})`);
      }
      case 'param': {
        const by = this.subst.get(e.name);
        return by !== undefined ? this.replaced(by) : atom(e.name);
      }
      case 'groupEntry':
        return atom(e.entry);
      case 'boundVar':
        return atom(e.name);
      case 'moebius':
        return atom(`${e.group}(${this.print(e.arg).text})`);
      case 'neg':
        return { text: `-${fit(this.print(e.arg), Level.Pow)}`, level: Level.Neg };
      case 'binary': {
        const l = this.print(e.left);
        const r = this.print(e.right);
        // base: a primary; exponent: a unary (2^-1), right-associative (a^b^c = a^(b^c))
        if (e.op === '^') return { text: `${fit(l, Level.Atom)}^${fit(r, Level.Neg)}`, level: Level.Pow };
        if (e.op === '*' || e.op === '/') return { text: `${fit(l, Level.Mul)}${e.op}${fit(r, Level.Pow)}`, level: Level.Mul };
        return { text: `${fit(l, Level.Add)} ${e.op} ${fit(r, Level.Mul, true)}`, level: Level.Add };
      }
      case 'call':
        return atom(`${e.fn}(${this.args(e.args)})`);
      case 'letCall':
        if (this.substTau !== undefined && this.usesTauDirectly(e)) return this.print(e.body);
        return atom(e.args.length === 0 ? e.name : `${e.name}(${this.args(e.args)})`);
      case 'operator': {
        if (e.at !== null) throw new PrintError(`${e.op} taken at a let's argument has no surface form: print the let call`);
        if (this.substTau !== undefined && dependsOnTau(e)) {
          throw new PrintError(`substituting tau inside ${e.op}(...) would change the derivative`);
        }
        const w = e.weight === null ? '' : `${this.print(e.weight).text}, `;
        return atom(`${e.op}(${w}${this.print(e.arg).text})`);
      }
      case 'series': {
        const r = e.range;
        const head =
          r.kind === 'divisors'
            ? `${e.variable} | ${this.print(r.of).text}`
            : `${e.variable} = ${this.print(r.from).text}..${r.to === null ? 'inf' : this.print(r.to).text}`;
        return atom(`${e.op}(${head}, ${this.print(e.body).text})`);
      }
      case 'lattice': {
        const [m, n] = e.variables;
        const head = e.pairs === 'punctured' ? `(${m}, ${n}) != (0, 0)` : `gcd(${m}, ${n}) = 1`;
        return atom(`sum(${head}, ${this.print(e.body).text})`);
      }
      case 'limit':
        return atom(`limit(${e.variable} -> ${this.print(e.at).text}, ${this.print(e.body).text})`);
    }
  }

  /**
   * Whether a let body reaches the claim's tau other than through the call's arguments (a
   * let without a tau parameter that mentions tau, x, y, ...). An operator taken at an
   * argument (at !== null) differentiates its own variable: only `at`, the weight and the
   * frozen arguments can bring the claim's tau in.
   */
  private usesTauDirectly(call: LetCall): boolean {
    const hit = this.freeTauMemo.get(call);
    if (hit !== undefined) return hit;
    const args = new Set<Expr>(call.args);
    const memo = new WeakMap<Expr, boolean>();
    const walk = (e: Expr): boolean => {
      if (args.has(e)) return false;
      const m = memo.get(e);
      if (m !== undefined) return m;
      let r: boolean;
      switch (e.kind) {
        case 'tau':
          r = true;
          break;
        case 'number':
        case 'constant':
        case 'param':
        case 'groupEntry':
        case 'boundVar':
          r = false;
          break;
        case 'tauPart':
        case 'neg':
        case 'moebius':
          r = walk(e.arg);
          break;
        case 'binary':
          r = walk(e.left) || walk(e.right);
          break;
        case 'call':
          r = e.args.some(walk);
          break;
        case 'letCall':
          r = walk(e.body);
          break;
        case 'operator':
          r = e.at === null ? dependsOnTau(e) : walk(e.at) || (e.weight !== null && walk(e.weight)) || e.frozen.some(walk);
          break;
        case 'series':
          r = walk(e.body) || (e.range.kind === 'divisors' ? walk(e.range.of) : walk(e.range.from) || (e.range.to !== null && walk(e.range.to)));
          break;
        case 'lattice':
          r = walk(e.body);
          break;
        case 'limit':
          r = walk(e.at) || walk(e.body);
          break;
      }
      memo.set(e, r);
      return r;
    };
    const r = walk(call.body);
    this.freeTauMemo.set(call, r);
    return r;
  }
}

/** The binding level of a node's own operator (what printing it needs from its spot). */
export function levelOf(e: Expr): Level {
  if (e.kind === 'neg') return Level.Neg;
  if (e.kind !== 'binary') return Level.Atom;
  return e.op === '^' ? Level.Pow : e.op === '*' || e.op === '/' ? Level.Mul : Level.Add;
}

/** The expression in the claim language (module header); throws PrintError where it has no surface form. */
export function printExpr(e: Expr, opts: PrintOptions = {}): string {
  return new Printer(opts).print(e).text;
}

/** The binding level of an expression as printed (for placing it in a template). */
function exprLevel(e: Expr): Level {
  return new Printer({}).print(e).level;
}

/**
 * The file text with the claim's right side replaced by newRhs. The RHS node's span covers
 * what was written, outer parentheses included, in offsets of the file text (span.ts).
 */
export function rewriteEquation(fileText: string, claim: Claim, newRhs: string): string {
  const { start, end } = claim.rhs.span;
  return fileText.slice(0, start) + newRhs + fileText.slice(end);
}

/** The previous and next non-blank characters around position k of s ('' at either end). */
function neighbours(s: string, k: number, len: number): [string, string, string] {
  let i = k - 1;
  while (i >= 0 && s[i] === ' ') i--;
  let j = k + len;
  while (j < s.length && s[j] === ' ') j++;
  let h = i - 1;
  while (h >= 0 && s[h] === ' ') h--;
  return [i >= 0 ? s[i]! : '', j < s.length ? s[j]! : '', h >= 0 ? s[h]! : ''];
}

/** What a slot '#' of a wrap template requires of the text put there: [level, no bare negation]. */
function slotRequirement(template: string, k: number): [Level, boolean] {
  const [left, right, beforeLeft] = neighbours(template, k, 1);
  let min = Level.Any;
  let noNeg = false;
  if (left === '+' || left === '-') {
    // binary when an operand ends before it
    const binary = /[A-Za-z0-9_.)#]/.test(beforeLeft);
    if (binary) {
      min = Level.Mul;
      noNeg = true;
    } else {
      min = Level.Pow;
    }
  } else if (left === '*' || left === '/') {
    min = Level.Pow;
  } else if (left === '^') {
    min = Level.Neg;
  } else if (!(left === '' || left === '(' || left === ',' || left === '=')) {
    min = Level.Atom;
  }
  let r = Level.Any;
  if (right === '+' || right === '-') r = Level.Add;
  else if (right === '*' || right === '/') r = Level.Mul;
  else if (!(right === '' || right === ')' || right === ',')) r = Level.Atom;
  return [Math.max(min, r) as Level, noNeg];
}

/** The template with every '#' replaced by `p`, parenthesised only where its spot needs it. */
function fillTemplate(template: string, p: Printed): string {
  let out = '';
  for (let k = 0; k < template.length; k++) {
    if (template[k] !== '#') {
      out += template[k];
      continue;
    }
    const [min, noNeg] = slotRequirement(template, k);
    out += fit(p, min, noNeg);
  }
  return out;
}

/**
 * The corrected right side for a fix (types.ts): for `wrap`, the template with '#' replaced
 * by the right side as the user wrote it (claim.rhsText), parenthesised only where its spot
 * in the template needs it; for `substitute`, the printed right side with the substitution
 * applied. Throws PrintError when the substitution has no surface form (through an operator).
 *
 *   applyFix({ kind: 'wrap', template: '2*pi*#' }, claim)   // '2*pi*E(8, tau)'
 */
export function applyFix(fix: Fix, claim: Claim): string {
  if (fix.kind === 'substitute') return printExpr(claim.rhs, { substitute: new Map([[fix.name, fix.by]]) });
  const text = claim.rhsText.trim();
  const level = wrappedInParens(text) ? Level.Atom : exprLevel(claim.rhs);
  return fillTemplate(fix.template, { text, level });
}
