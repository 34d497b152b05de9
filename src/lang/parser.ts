/**
 * The parser: tokens -> surface items (syntax.ts), then resolution (resolve.ts) to the
 * public AST (ast.ts). Hand-written recursive descent.
 *
 * Public API:
 *   parseSource(text, file): { ast: FileAst; diagnostics: Diagnostic[] }
 * Diagnostics are collected, sorted by position; the claims that parsed and resolved
 * cleanly are in ast.claims even when others failed.
 *
 * Grammar (layout: an item starts at column 1; everything indented below it belongs to it;
 * a logical line is a line plus the lines its open brackets run over):
 *   file      = { use | let | claim }
 *   use       = 'use' setting { ',' setting }
 *   setting   = ('digits' | 'samples' | 'seed') INT | 'ymin' NUMBER
 *   let       = 'let' NAME [ '(' [ NAME { ',' NAME } ] ')' ] '=' expr        (may continue on indented lines)
 *   claim     = 'claim' STRING NEWLINE { clause NEWLINE } equation
 *   clause    = 'for' NAME 'in' domain
 *             | 'at' 'tau' 'in' '{' expr { ',' expr } '}'
 *             | 'region' cond { ('and' | ',') cond }
 *             | setting { ',' setting }
 *             | 'expect' ('holds' | 'refuted')
 *             | 'source' STRING
 *   domain    = 'SL2Z' | ('Gamma0' | 'Gamma1' | 'Gamma') '(' INT ')'
 *             | '[' expr ',' expr ']' | 'box' '(' expr ',' expr ')'
 *             | '{' expr { ',' expr } '}' | ['-'] INT '..' ['-'] INT
 *   cond      = expr cmp expr [ cmp expr ]          cmp = '<' | '<=' | '>' | '>='
 *   equation  = expr '=' expr                        (over one or more indented lines)
 *   expr      = term { ('+' | '-') term }
 *   term      = unary { ('*' | '/') unary }
 *   unary     = ('-' | '+') unary | power
 *   power     = primary [ '^' unary ]                 (right-associative; -2^2 = -4, 2^-1 = 1/2)
 *   primary   = NUMBER | NAME | NAME '(' [ expr { ',' expr } ] ')' | '(' expr ')'
 * Recovery: a syntax error ends its logical line (a clause) or its item (an equation, a let);
 * brackets are matched per item first, so an unclosed one is reported at its opener.
 * Expressions nested deeper than MAX_DEPTH are 'too-complex' (the later stages recurse).
 */
import type { FileAst, Comparison, Expectation } from './ast.js';
import { diagnostic, type Diagnostic } from './diagnostics.js';
import { GROUP_NAMES, KEYWORDS, MAX_SERIES_TERMS, nearestNames } from './names.js';
import { lex, type Punct, type Token } from './lexer.js';
import { resolveFile } from './resolve.js';
import { joinSpans, type Span } from './span.js';
import type { ClauseSyntax, ConditionSyntax, DomainSyntax, EquationSyntax, Item, Named, SettingName, SettingSyntax, SyntaxExpr } from './syntax.js';

export function parseSource(text: string, file: string): { ast: FileAst; diagnostics: Diagnostic[] } {
  const lexed = lex(text, file);
  const parsed = parseItems(lexed.tokens, text);
  const resolved = resolveFile(parsed.items, file);
  const diagnostics = [...lexed.diagnostics, ...parsed.diagnostics, ...resolved.diagnostics];
  // stable: equal positions keep their order of discovery
  diagnostics.sort((a, b) => a.span.start - b.span.start);
  return { ast: resolved.ast, diagnostics };
}

// ---------------------------------------------------------------------------
// Items and lines

const CLAUSE_WORDS = new Set(['for', 'at', 'region', 'digits', 'samples', 'seed', 'ymin', 'expect', 'source']);
const SETTING_WORDS = new Set<string>(['digits', 'samples', 'seed', 'ymin']);
const OPENERS: Record<string, string> = { '(': ')', '[': ']', '{': '}' };
const CLOSERS = new Set([')', ']', '}']);

/** A syntax error: ends the current line or item; caught where recovery happens. */
class Fail {
  constructor(readonly diag: Diagnostic) {}
}

function fail(code: Diagnostic['code'], message: string, span: Span, hint?: string): never {
  throw new Fail(diagnostic(code, message, span, hint));
}

function isPunct(t: Token, p: Punct): boolean {
  return t.kind === 'punct' && t.text === p;
}
function isWord(t: Token, w: string): boolean {
  return t.kind === 'ident' && t.text === w;
}

function describe(t: Token): string {
  switch (t.kind) {
    case 'eof':
      return 'end of line';
    case 'number':
      return `number ${t.text}`;
    case 'string':
      return 'a string';
    default:
      return `'${t.text}'`;
  }
}

/** Matches brackets over an item; the first imbalance, or null. */
function checkBrackets(toks: Token[]): Diagnostic | null {
  const stack: Token[] = [];
  for (const t of toks) {
    if (t.kind !== 'punct') continue;
    if (OPENERS[t.text] !== undefined) {
      stack.push(t);
    } else if (CLOSERS.has(t.text)) {
      const open = stack.pop();
      if (open === undefined) return diagnostic('unbalanced-paren', `'${t.text}' has no matching opener`, t.span);
      if (OPENERS[open.text] !== t.text) {
        return diagnostic(
          'unbalanced-paren',
          `'${open.text}' is not closed`,
          open.span,
          `expected '${OPENERS[open.text]}' before the '${t.text}' at ${t.span.line}:${t.span.column}`,
        );
      }
    }
  }
  const open = stack.pop();
  if (open === undefined) return null;
  return diagnostic('unbalanced-paren', `'${open.text}' is never closed`, open.span, `add '${OPENERS[open.text]}'`);
}

/** Splits an item into logical lines: a new one at each line start outside brackets. */
function logicalLines(toks: Token[]): Token[][] {
  const out: Token[][] = [];
  let depth = 0;
  for (const t of toks) {
    if (t.bol && depth === 0) out.push([]);
    out[out.length - 1]!.push(t);
    if (t.kind === 'punct') {
      if (OPENERS[t.text] !== undefined) depth++;
      else if (CLOSERS.has(t.text)) depth--;
    }
  }
  return out;
}

/** The source between two offsets with comments dropped and line breaks folded to one space. */
function foldText(text: string, start: number, end: number): string {
  return text
    .slice(start, end)
    .split('\n')
    .map((l) => l.replace(/#.*$/, '').trim())
    .filter((l) => l.length > 0)
    .join(' ');
}

function parseItems(all: Token[], text: string): { items: Item[]; diagnostics: Diagnostic[] } {
  const items: Item[] = [];
  const diagnostics: Diagnostic[] = [];
  const toks = all.filter((t) => t.kind !== 'eof');
  const eofTok = all[all.length - 1]!;
  // item boundaries: tokens that start a line at column 1
  const starts: number[] = [];
  toks.forEach((t, k) => {
    if (t.bol && t.span.column === 1) starts.push(k);
  });
  if (toks.length > 0 && (starts.length === 0 || starts[0]! > 0)) {
    const first = toks[0]!;
    diagnostics.push(diagnostic('bad-top-level', 'indented text outside a claim', first.span, 'items (use, let, claim) start at column 1'));
  }
  for (let n = 0; n < starts.length; n++) {
    const itemToks = toks.slice(starts[n]!, starts[n + 1] ?? toks.length);
    const next = toks[starts[n + 1] ?? -1] ?? eofTok;
    const bad = checkBrackets(itemToks);
    const head = itemToks[0]!;
    if (bad !== null) {
      diagnostics.push(bad);
      continue;
    }
    const p = new ItemParser(itemToks, next, text, diagnostics);
    if (isWord(head, 'claim')) items.push(p.claim());
    else if (isWord(head, 'let')) p.recover(() => items.push(p.let()));
    else if (isWord(head, 'use')) p.recover(() => items.push(p.use()));
    else {
      diagnostics.push(
        diagnostic('bad-top-level', `expected use, let or claim at the start of a line, found ${describe(head)}`, head.span, 'indent the clauses and the equation of a claim'),
      );
    }
  }
  return { items, diagnostics };
}

// ---------------------------------------------------------------------------
// Cursor over a token list

class Cursor {
  private i = 0;
  private nesting = 0;
  constructor(
    private readonly toks: Token[],
    /** Stands for the end of the list: an empty token where the next item begins. */
    private readonly endTok: Token,
  ) {}

  /** Counts recursive descents (parentheses, exponents), failing beyond MAX_DEPTH. */
  enter(): void {
    if (++this.nesting > MAX_DEPTH) fail('too-complex', `the expression is nested more than ${MAX_DEPTH} levels deep`, this.peek().span, 'split it with let definitions');
  }
  leave(): void {
    this.nesting--;
  }
  peek(k = 0): Token {
    return this.toks[this.i + k] ?? this.endTok;
  }
  next(): Token {
    const t = this.peek();
    if (this.i < this.toks.length) this.i++;
    return t;
  }
  atEnd(): boolean {
    return this.i >= this.toks.length;
  }
  /** The last consumed token. */
  last(): Token {
    return this.toks[this.i - 1] ?? this.endTok;
  }
  expectPunct(p: Punct, what: string): Token {
    const t = this.peek();
    if (!isPunct(t, p)) fail('unexpected-token', `expected '${p}' ${what}, found ${describe(t)}`, t.span);
    return this.next();
  }
  expectEnd(what: string): void {
    if (this.atEnd()) return;
    const t = this.peek();
    const juxtaposed = t.kind === 'number' || t.kind === 'ident' || isPunct(t, '(');
    fail('unexpected-token', `unexpected ${describe(t)} ${what}`, t.span, juxtaposed ? "write '*' for a product" : undefined);
  }
}

/** An empty token just after `t` (for "end of line" errors). */
function endAfter(t: Token): Token {
  const s = t.span;
  return { kind: 'eof', text: '', span: { ...s, start: s.end, end: s.end, column: s.column + (s.end - s.start) }, bol: false };
}

// ---------------------------------------------------------------------------
// Expressions

/**
 * Deepest expression tree accepted: the resolver and the evaluator recurse over trees, so a
 * bound keeps them far from the JavaScript stack limit (written expressions stay far below it).
 */
export const MAX_DEPTH = 500;

// tree depth of each node built, so a long chain 1 + 1 + ... is caught without recursion
const depths = new WeakMap<SyntaxExpr, number>();

function built<T extends SyntaxExpr>(node: T, ...children: SyntaxExpr[]): T {
  let d = 1;
  for (const ch of children) d = Math.max(d, (depths.get(ch) ?? 1) + 1);
  if (d > MAX_DEPTH) fail('too-complex', `the expression is nested more than ${MAX_DEPTH} levels deep`, node.span, 'split it with let definitions');
  depths.set(node, d);
  return node;
}

function parseExpr(c: Cursor): SyntaxExpr {
  c.enter();
  let left = parseTerm(c);
  for (;;) {
    const t = c.peek();
    if (!(isPunct(t, '+') || isPunct(t, '-'))) break;
    c.next();
    const right = parseTerm(c);
    left = built({ kind: 'binary', op: t.text as '+' | '-', left, right, span: joinSpans(left.span, right.span) }, left, right);
  }
  c.leave();
  return left;
}

function parseTerm(c: Cursor): SyntaxExpr {
  let left = parseUnary(c);
  for (;;) {
    const t = c.peek();
    if (!(isPunct(t, '*') || isPunct(t, '/'))) return left;
    c.next();
    const right = parseUnary(c);
    left = built({ kind: 'binary', op: t.text as '*' | '/', left, right, span: joinSpans(left.span, right.span) }, left, right);
  }
}

function parseUnary(c: Cursor): SyntaxExpr {
  // signs iteratively: a long run of them must not exhaust the stack before the depth check
  const signs: Token[] = [];
  while (isPunct(c.peek(), '-') || isPunct(c.peek(), '+')) signs.push(c.next());
  let e = parsePower(c);
  for (let k = signs.length - 1; k >= 0; k--) {
    const t = signs[k]!;
    if (t.text === '-') e = built({ kind: 'neg', arg: e, span: joinSpans(t.span, e.span) }, e);
  }
  return e;
}

function parsePower(c: Cursor): SyntaxExpr {
  const base = parsePrimary(c);
  if (!isPunct(c.peek(), '^')) return base;
  c.next();
  // the exponent is a unary: 2^-1, and 2^3^2 = 2^(3^2)
  c.enter();
  const exp = parseUnary(c);
  c.leave();
  return built({ kind: 'binary', op: '^', left: base, right: exp, span: joinSpans(base.span, exp.span) }, base, exp);
}

function parsePrimary(c: Cursor): SyntaxExpr {
  const t = c.next();
  if (t.kind === 'number') return { kind: 'num', digits: t.digits, imaginary: t.imaginary, span: t.span };
  if (t.kind === 'ident') {
    if (KEYWORDS.has(t.text)) fail('reserved-word', `'${t.text}' is a keyword, not a value`, t.span);
    if (!isPunct(c.peek(), '(')) return { kind: 'name', name: t.text, span: t.span };
    if (t.text === 'sum' || t.text === 'prod') return parseSeries(c, t);
    if (t.text === 'limit') return parseLimit(c, t);
    c.next();
    const args: SyntaxExpr[] = [];
    if (!isPunct(c.peek(), ')')) {
      args.push(parseExpr(c));
      while (isPunct(c.peek(), ',')) {
        c.next();
        args.push(parseExpr(c));
      }
    }
    const close = c.expectPunct(')', `to close the arguments of ${t.text}`);
    return built({ kind: 'call', name: t.text, nameSpan: t.span, args, span: joinSpans(t.span, close.span) }, ...args);
  }
  if (isPunct(t, '(')) {
    const inner = parseExpr(c);
    const close = c.expectPunct(')', 'to close the parenthesis');
    // the parenthesised span, so errors on a group point at all of it
    const wide = { ...inner, span: joinSpans(t.span, close.span) } as SyntaxExpr;
    depths.set(wide, depths.get(inner) ?? 1);
    return wide;
  }
  if (isPunct(t, '=')) fail('unexpected-token', "unexpected '=' where a value was expected", t.span, "an equation has exactly one '=' between two sides");
  fail('unexpected-token', `expected a value, found ${describe(t)}`, t.span);
}

/**
 * series = ('sum' | 'prod') '(' NAME '=' expr '..' (expr | 'inf') ',' expr ')'
 *        | ('sum' | 'prod') '(' NAME '|' expr ',' expr ')'
 * Literal integer bounds are checked here ('bad-range'); computed ones at evaluation.
 */
function parseSeries(c: Cursor, t: Token): SyntaxExpr {
  const op = t.text as 'sum' | 'prod';
  const usage = `${op}(n = 1..inf, expr), ${op}(n = a..b, expr) or ${op}(d | n, expr)`;
  c.next(); // '('
  if (isPunct(c.peek(), '(') || (c.peek().kind === 'ident' && c.peek().text === 'gcd' && isPunct(c.peek(1), '('))) return parseLattice(c, t);
  const v = c.next();
  if (v.kind !== 'ident') fail('unexpected-token', `expected the ${op}mation variable after ${op}(, found ${describe(v)}`, v.span, usage);
  if (KEYWORDS.has(v.text)) fail('reserved-word', `'${v.text}' is a keyword, not a variable`, v.span);
  const variable = { name: v.text, span: v.span };
  let range: Extract<SyntaxExpr, { kind: 'series' }>['range'];
  const sep = c.peek();
  if (isPunct(sep, '=')) {
    c.next();
    const from = parseExpr(c);
    c.expectPunct('..', `in the range of ${op} (${usage})`);
    const tt = c.peek();
    let to: SyntaxExpr | null = null;
    if (tt.kind === 'ident' && tt.text === 'inf' && isPunct(c.peek(1), ',')) c.next();
    else to = parseExpr(c);
    range = { kind: 'range', from, to, toSpan: joinSpans(tt.span, c.last().span) };
    checkLiteralRange(from, to, range.toSpan);
  } else if (isPunct(sep, '|')) {
    c.next();
    range = { kind: 'divisors', of: parseExpr(c) };
  } else {
    fail('unexpected-token', `expected '=' or '|' after the variable of ${op}, found ${describe(sep)}`, sep.span, usage);
  }
  c.expectPunct(',', `after the range of ${op}`);
  const body = parseExpr(c);
  const close = c.expectPunct(')', `to close ${op}`);
  const kids = range.kind === 'range' ? [range.from, ...(range.to === null ? [] : [range.to])] : [range.of];
  return built({ kind: 'series', op, variable, range, body, nameSpan: t.span, span: joinSpans(t.span, close.span) }, body, ...kids);
}

const LATTICE_USAGE = 'sum((m, n) != (0, 0), f) or sum(gcd(c, d) = 1, f)';

/** The pair (NAME, NAME) of a lattice sum; the opening '(' is next. */
function parsePair(c: Cursor): [Named, Named] {
  c.expectPunct('(', `to open the pair of variables (${LATTICE_USAGE})`);
  const names: Named[] = [];
  for (let k = 0; k < 2; k++) {
    if (k === 1) c.expectPunct(',', `between the two variables (${LATTICE_USAGE})`);
    const v = c.next();
    if (v.kind !== 'ident') fail('unexpected-token', `expected a variable name, found ${describe(v)}`, v.span, LATTICE_USAGE);
    if (KEYWORDS.has(v.text)) fail('reserved-word', `'${v.text}' is a keyword, not a variable`, v.span);
    names.push({ name: v.text, span: v.span });
  }
  c.expectPunct(')', `to close the pair of variables (${LATTICE_USAGE})`);
  return [names[0]!, names[1]!];
}

/** A literal integer token with the given value, else a 'bad-range' diagnostic. */
function expectLiteral(c: Cursor, value: number, what: string): void {
  const t = c.next();
  if (t.kind !== 'number' || t.imaginary || Number(t.digits) !== value) fail('bad-range', `${what} must be ${value}, found ${describe(t)}`, t.span, LATTICE_USAGE);
}

/**
 * lattice = 'sum' '(' '(' NAME ',' NAME ')' '!=' '(' 0 ',' 0 ')' ',' expr ')'
 *         | 'sum' '(' 'gcd' '(' NAME ',' NAME ')' '=' 1 ',' expr ')'
 * The opening '(' of the sum has been read.
 */
function parseLattice(c: Cursor, t: Token): SyntaxExpr {
  let pairs: 'punctured' | 'coprime';
  let variables: [Named, Named];
  if (isPunct(c.peek(), '(')) {
    pairs = 'punctured';
    variables = parsePair(c);
    c.expectPunct('!=', `after the pair: the lattice sum skips the origin (${LATTICE_USAGE})`);
    c.expectPunct('(', `to open (0, 0) (${LATTICE_USAGE})`);
    expectLiteral(c, 0, 'the excluded point');
    c.expectPunct(',', `in (0, 0) (${LATTICE_USAGE})`);
    expectLiteral(c, 0, 'the excluded point');
    c.expectPunct(')', `to close (0, 0) (${LATTICE_USAGE})`);
  } else {
    pairs = 'coprime';
    c.next(); // gcd
    variables = parsePair(c);
    c.expectPunct('=', `after gcd(c, d) (${LATTICE_USAGE})`);
    expectLiteral(c, 1, 'the gcd of a coprime pair');
  }
  if (variables[0].name === variables[1].name) fail('duplicate-name', `the two variables of the lattice sum are both ${variables[0].name}`, variables[1].span, 'choose two names');
  if (t.text !== 'sum') fail('bad-range', `${t.text} over a lattice is not supported`, t.span, `only sums run over lattices: ${LATTICE_USAGE}`);
  c.expectPunct(',', 'after the pairs of the lattice sum');
  const body = parseExpr(c);
  const close = c.expectPunct(')', 'to close sum');
  return built({ kind: 'lattice', pairs, variables, body, nameSpan: t.span, span: joinSpans(t.span, close.span) }, body);
}

/** limit = 'limit' '(' NAME '->' expr ',' expr ')'   ('->' is '-' then '>') */
function parseLimit(c: Cursor, t: Token): SyntaxExpr {
  const usage = 'limit(s -> a, f)';
  c.next(); // '('
  const v = c.next();
  if (v.kind !== 'ident') fail('unexpected-token', `expected the variable after limit(, found ${describe(v)}`, v.span, usage);
  if (KEYWORDS.has(v.text)) fail('reserved-word', `'${v.text}' is a keyword, not a variable`, v.span);
  if (!isPunct(c.peek(), '-') || !isPunct(c.peek(1), '>')) fail('unexpected-token', `expected '->' after the variable of limit, found ${describe(c.peek())}`, c.peek().span, usage);
  c.next();
  c.next();
  const at = parseExpr(c);
  c.expectPunct(',', 'after the point of limit');
  const body = parseExpr(c);
  const close = c.expectPunct(')', 'to close limit');
  return built({ kind: 'limit', variable: { name: v.text, span: v.span }, at, body, nameSpan: t.span, span: joinSpans(t.span, close.span) }, body, at);
}

/** A literal integer (possibly negated) as a number, or null when the bound is computed. */
function literalInt(s: SyntaxExpr): number | null | 'non-integer' {
  if (s.kind === 'neg') {
    const r = literalInt(s.arg);
    return typeof r === 'number' ? -r : r;
  }
  if (s.kind !== 'num') return null;
  if (s.imaginary) return 'non-integer';
  const v = Number(s.digits);
  return Number.isInteger(v) ? v : 'non-integer';
}

function checkLiteralRange(from: SyntaxExpr, to: SyntaxExpr | null, toSpan: Span): void {
  const a = literalInt(from);
  if (a === 'non-integer') fail('bad-range', 'the start of the range must be an integer', from.span);
  const b = to === null ? null : literalInt(to);
  if (b === 'non-integer') fail('bad-range', 'the end of the range must be an integer or inf', toSpan);
  if (typeof a === 'number' && typeof b === 'number') {
    if (b < a) fail('bad-range', `the range ${a}..${b} is empty`, toSpan, 'the end must be at least the start (a range computed at evaluation may be empty: sum 0, prod 1)');
    if (b - a + 1 > MAX_SERIES_TERMS) fail('bad-range', `the range ${a}..${b} has more than ${MAX_SERIES_TERMS} terms`, toSpan, 'use inf for a convergent series');
  }
}

/** expr { ',' expr } up to (not including) the closer. */
function parseList(c: Cursor, closer: Punct): SyntaxExpr[] {
  const out = [parseExpr(c)];
  while (isPunct(c.peek(), ',')) {
    c.next();
    out.push(parseExpr(c));
  }
  if (!isPunct(c.peek(), closer)) c.expectPunct(closer, 'to close the list');
  return out;
}

// ---------------------------------------------------------------------------
// Items

class ItemParser {
  constructor(
    private readonly toks: Token[],
    /** The first token after the item (the next item's head, or end of file). */
    private readonly nextTok: Token,
    private readonly text: string,
    private readonly diagnostics: Diagnostic[],
  ) {}

  /** Runs f, turning a syntax failure into a diagnostic; returns whether it succeeded. */
  recover(f: () => void): boolean {
    try {
      f();
      return true;
    } catch (e) {
      if (e instanceof Fail) {
        this.diagnostics.push(e.diag);
        return false;
      }
      throw e;
    }
  }

  private cursor(toks: Token[]): Cursor {
    const lastTok = toks[toks.length - 1];
    return new Cursor(toks, lastTok === undefined ? this.nextTok : endAfter(lastTok));
  }

  use(): Item {
    const c = this.cursor(this.toks);
    const head = c.next();
    const settings = this.settings(c, true);
    c.expectEnd('after the settings');
    return { kind: 'use', settings, span: joinSpans(head.span, c.last().span) };
  }

  let(): Item {
    const c = this.cursor(this.toks);
    const head = c.next();
    const name = this.name(c, 'after let');
    const params: Named[] = [];
    if (isPunct(c.peek(), '(')) {
      c.next();
      if (!isPunct(c.peek(), ')')) {
        params.push(this.name(c, 'as a parameter'));
        while (isPunct(c.peek(), ',')) {
          c.next();
          params.push(this.name(c, 'as a parameter'));
        }
      }
      c.expectPunct(')', 'after the parameters');
    }
    c.expectPunct('=', `after let ${name.name}${params.length > 0 ? '(...)' : ''}`);
    const body = parseExpr(c);
    c.expectEnd(`in the definition of ${name.name}`);
    const text = foldText(this.text, body.span.start, body.span.end);
    return { kind: 'let', name, params, body, text, span: joinSpans(head.span, body.span) };
  }

  claim(): Item {
    const lines = logicalLines(this.toks);
    const headLine = lines[0]!;
    const head = headLine[0]!;
    let name = '';
    let broken = false;
    const headerOk = this.recover(() => {
      const c = this.cursor(headLine);
      c.next();
      const t = c.next();
      if (t.kind !== 'string') fail('unexpected-token', `expected the claim's name in quotes after claim, found ${describe(t)}`, t.span, 'claim "E4 squared is E8"');
      name = t.value;
      c.expectEnd("after the claim's name");
    });
    if (!headerOk) broken = true;
    const span = joinSpans(head.span, headLine[headLine.length - 1]!.span);
    const clauses: ClauseSyntax[] = [];
    let eqLines: Token[] = [];
    let eqDone = false;
    for (const line of lines.slice(1)) {
      const first = line[0]!;
      if (first.kind === 'ident' && CLAUSE_WORDS.has(first.text)) {
        if (eqLines.length > 0) {
          eqDone = true;
          this.diagnostics.push(diagnostic('misplaced-clause', `the clause '${first.text}' comes after the equation`, first.span, 'put clauses between the claim line and the equation'));
          broken = true;
          continue;
        }
        if (!this.recover(() => clauses.push(this.clause(line)))) broken = true;
      } else if (eqLines.length === 0 && this.looksLikeClause(line)) {
        const near = nearestNames(first.text, CLAUSE_WORDS);
        this.diagnostics.push(diagnostic('bad-clause', `unknown clause '${first.text}'`, first.span, `did you mean '${near[0]}'?`));
        broken = true;
      } else if (eqDone) {
        // text after a misplaced clause: already reported there
        broken = true;
      } else {
        eqLines = eqLines.concat(line);
      }
    }
    let equation: EquationSyntax | null = null;
    if (eqLines.length === 0) {
      this.diagnostics.push(diagnostic('missing-equation', `claim "${name}" has no equation`, span, 'add an indented line LHS = RHS'));
      broken = true;
    } else if (!this.recover(() => (equation = this.equation(eqLines)))) {
      broken = true;
    }
    return { kind: 'claim', name, span, clauses, equation, broken };
  }

  /** A misspelt clause keyword: `sampels 20`, `exepct refuted` (a name, then no operator). */
  private looksLikeClause(line: Token[]): boolean {
    const [first, second] = line;
    if (first === undefined || first.kind !== 'ident' || second === undefined || second.kind === 'punct') return false;
    return !line.some((t) => isPunct(t, '=')) && nearestNames(first.text, CLAUSE_WORDS).length > 0;
  }

  private equation(toks: Token[]): EquationSyntax {
    const c = this.cursor(toks);
    const lhs = parseExpr(c);
    // the left side ended at the end of the text or of a line: no '=' came
    if (c.atEnd() || (c.peek().bol && !isPunct(c.peek(), '='))) {
      fail('missing-equals', "the equation has no '='", lhs.span, 'write LHS = RHS');
    }
    if (!isPunct(c.peek(), '=')) c.expectEnd('in the equation');
    c.next();
    const rhs = parseExpr(c);
    if (isPunct(c.peek(), '=')) fail('extra-equals', "a second '=' in the equation", c.peek().span, 'a claim states one equation LHS = RHS');
    c.expectEnd('in the equation');
    const span = joinSpans(lhs.span, rhs.span);
    return {
      lhs,
      rhs,
      span,
      text: foldText(this.text, span.start, span.end),
      lhsText: foldText(this.text, lhs.span.start, lhs.span.end),
      rhsText: foldText(this.text, rhs.span.start, rhs.span.end),
    };
  }

  private name(c: Cursor, what: string): Named {
    const t = c.next();
    if (t.kind !== 'ident') fail('unexpected-token', `expected a name ${what}, found ${describe(t)}`, t.span);
    if (KEYWORDS.has(t.text)) fail('reserved-word', `'${t.text}' is a keyword and cannot be a name`, t.span);
    return { name: t.text, span: t.span };
  }

  private settings(c: Cursor, fileWide: boolean): SettingSyntax[] {
    const out: SettingSyntax[] = [];
    for (;;) {
      const t = c.next();
      if (t.kind !== 'ident' || !SETTING_WORDS.has(t.text)) {
        fail('bad-setting', `expected a setting (digits, samples, seed, ymin), found ${describe(t)}`, t.span, fileWide ? 'use digits 40, samples 12' : undefined);
      }
      const v = c.next();
      if (v.kind !== 'number' || v.imaginary) fail('bad-setting', `${t.text} needs a number, found ${describe(v)}`, v.span);
      out.push({ name: t.text as SettingName, text: v.digits, span: v.span, fullSpan: joinSpans(t.span, v.span) });
      if (!isPunct(c.peek(), ',')) return out;
      c.next();
    }
  }

  private clause(line: Token[]): ClauseSyntax {
    const c = this.cursor(line);
    const kw = line[0]!;
    let clause: ClauseSyntax;
    switch (kw.text) {
      case 'for': {
        c.next();
        const variable = this.name(c, 'after for');
        if (!isWord(c.peek(), 'in')) fail('bad-clause', `expected 'in' after for ${variable.name}, found ${describe(c.peek())}`, c.peek().span);
        c.next();
        const domain = this.domain(c);
        clause = { kind: 'for', variable, domain, span: joinSpans(kw.span, domain.span) };
        break;
      }
      case 'at': {
        c.next();
        const variable = this.name(c, 'after at');
        if (variable.name !== 'tau') fail('bad-clause', `'at' fixes tau; found ${variable.name}`, variable.span, `for fixed parameter values write: for ${variable.name} in {...}`);
        if (!isWord(c.peek(), 'in')) fail('bad-clause', `expected 'in' after at tau, found ${describe(c.peek())}`, c.peek().span);
        c.next();
        const open = c.peek();
        if (!isPunct(open, '{')) fail('bad-clause', `expected a list of points {p1, p2, ...}, found ${describe(open)}`, open.span, 'at tau in {i, rho, 0.3 + 1.2i}');
        c.next();
        const points = parseList(c, '}');
        const close = c.next();
        clause = { kind: 'at', variable, points, span: joinSpans(kw.span, close.span) };
        break;
      }
      case 'region': {
        c.next();
        const conditions: ConditionSyntax[] = [this.condition(c)];
        while (isWord(c.peek(), 'and') || isPunct(c.peek(), ',')) {
          c.next();
          conditions.push(this.condition(c));
        }
        clause = { kind: 'region', conditions, span: joinSpans(kw.span, c.last().span) };
        break;
      }
      case 'expect': {
        c.next();
        const v = c.next();
        if (!(isWord(v, 'holds') || isWord(v, 'refuted'))) fail('bad-clause', `expect needs holds or refuted, found ${describe(v)}`, v.span);
        clause = { kind: 'expect', value: v.text as Expectation, span: joinSpans(kw.span, v.span) };
        break;
      }
      case 'source': {
        c.next();
        const v = c.next();
        if (v.kind !== 'string') fail('bad-clause', `source needs a quoted text, found ${describe(v)}`, v.span, 'source "Serre, A Course in Arithmetic, VII.4"');
        clause = { kind: 'source', value: v.value, span: joinSpans(kw.span, v.span) };
        break;
      }
      default: {
        const settings = this.settings(c, false);
        clause = { kind: 'settings', settings, span: joinSpans(kw.span, c.last().span) };
      }
    }
    c.expectEnd(`after the ${kw.text} clause`);
    return clause;
  }

  private domain(c: Cursor): DomainSyntax {
    const t = c.peek();
    const group = GROUP_NAMES.find((g) => isWord(t, g));
    if (group !== undefined) {
      c.next();
      if (t.text === 'SL2Z') return { kind: 'group', group: 'SL2Z', level: 1, span: t.span };
      if (!isPunct(c.peek(), '(')) fail('bad-clause', `${t.text} needs a level, e.g. ${t.text}(4)`, t.span);
      c.next();
      const n = c.next();
      if (n.kind !== 'number' || n.imaginary || !/^\d+$/.test(n.digits)) fail('bad-range', `the level of ${t.text} must be a positive integer, found ${describe(n)}`, n.span);
      const level = Number(n.digits);
      if (level < 1 || level > 1e6) fail('bad-range', `the level of ${t.text} must be between 1 and 1000000`, n.span);
      const close = c.expectPunct(')', `after the level of ${t.text}`);
      return { kind: 'group', group, level, span: joinSpans(t.span, close.span) };
    }
    if (isPunct(t, '[')) {
      c.next();
      const lo = parseExpr(c);
      c.expectPunct(',', 'between the ends of the interval');
      const hi = parseExpr(c);
      const close = c.expectPunct(']', 'to close the interval');
      return { kind: 'interval', lo, hi, span: joinSpans(t.span, close.span) };
    }
    if (isWord(t, 'box') && isPunct(c.peek(1), '(')) {
      c.next();
      c.next();
      const corner1 = parseExpr(c);
      c.expectPunct(',', 'between the corners of the box');
      const corner2 = parseExpr(c);
      const close = c.expectPunct(')', 'to close the box');
      return { kind: 'box', corner1, corner2, span: joinSpans(t.span, close.span) };
    }
    if (isPunct(t, '{')) {
      c.next();
      const values = parseList(c, '}');
      const close = c.next();
      if (values.length > 10000) fail('bad-range', 'a list may hold at most 10000 values', t.span);
      return { kind: 'list', values, span: joinSpans(t.span, close.span) };
    }
    if (t.kind === 'number' || isPunct(t, '-')) return this.intRange(c);
    fail('bad-clause', `expected a group, an interval, a box, a list or a range after 'in', found ${describe(t)}`, t.span, 'SL2Z, Gamma0(N), Gamma1(N), Gamma(N), [lo, hi], box(z1, z2), {v1, v2}, lo..hi');
  }

  private intRange(c: Cursor): DomainSyntax {
    const first = c.peek();
    const lo = this.integer(c);
    if (!isPunct(c.peek(), '..')) fail('bad-clause', `expected '..' in the range, found ${describe(c.peek())}`, c.peek().span, 'for n in 1..20 (or a list {1, 2, 3})');
    c.next();
    const hi = this.integer(c);
    const span = joinSpans(first.span, c.last().span);
    if (hi < lo) fail('bad-range', `the range ${lo}..${hi} is empty`, span);
    if (hi - lo >= 100000) fail('bad-range', `the range ${lo}..${hi} has more than 100000 values`, span);
    return { kind: 'intRange', lo, hi, span };
  }

  private integer(c: Cursor): number {
    const neg = isPunct(c.peek(), '-');
    if (neg) c.next();
    const t = c.next();
    if (t.kind !== 'number' || t.imaginary || !/^\d+$/.test(t.digits) || !Number.isSafeInteger(Number(t.digits))) {
      fail('bad-range', `range bounds must be integers, found ${describe(t)}`, t.span);
    }
    const v = Number(t.digits);
    return neg ? -v : v;
  }

  private condition(c: Cursor): ConditionSyntax {
    const operands = [parseExpr(c)];
    const ops: Comparison[] = [];
    while (ops.length < 2) {
      const t = c.peek();
      if (!(isPunct(t, '<') || isPunct(t, '<=') || isPunct(t, '>') || isPunct(t, '>='))) break;
      c.next();
      ops.push(t.text as Comparison);
      operands.push(parseExpr(c));
    }
    const span = joinSpans(operands[0]!.span, operands[operands.length - 1]!.span);
    if (ops.length === 0) fail('bad-region', 'a region condition needs a comparison', span, 'e.g. region y >= 0.5 and abs(x) <= 1/2');
    return { operands, ops, span };
  }
}
