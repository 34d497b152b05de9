/**
 * The lexer: text -> tokens with spans, plus lexical diagnostics.
 *
 * Conventions: line breaks are not tokens; instead each token records whether it is the
 * first on its line (`bol`) and its column, which is all the layout the parser needs (an
 * item starts at column 1; clauses and continuation lines are indented). Comments run from
 * '#' to the end of the line. Numbers: digits, an optional fraction '.digits' (a '.' followed
 * by another '.' is a range, as in 1..20), an optional exponent e[+-]digits, and an
 * optional imaginary suffix 'i' not followed by a name character (4i, 0.5i, 1e-3i).
 * Strings: "..." on one line with the escapes \" and \\.
 *
 *   lex('E(4, tau)^2', 'f.vet').tokens.map((t) => t.text)   // ['E', '(', '4', ',', 'tau', ')', '^', '2', '']
 */
import { diagnostic, type Diagnostic } from './diagnostics.js';
import { LineTable, type Span } from './span.js';

export type Punct = '(' | ')' | '[' | ']' | '{' | '}' | ',' | '=' | '+' | '-' | '*' | '/' | '^' | '<' | '<=' | '>' | '>=' | '..' | '|' | '!=';

export type Token =
  | { kind: 'number'; text: string; digits: string; imaginary: boolean; span: Span; bol: boolean }
  | { kind: 'ident'; text: string; span: Span; bol: boolean }
  | { kind: 'string'; text: string; value: string; span: Span; bol: boolean }
  | { kind: 'punct'; text: Punct; span: Span; bol: boolean }
  | { kind: 'eof'; text: ''; span: Span; bol: boolean };

export interface LexResult {
  tokens: Token[];
  diagnostics: Diagnostic[];
  lines: LineTable;
}

/** '|' is a token only in `sum(d | n, ...)` / `prod(d | n, ...)`; elsewhere a bad character (hint: abs). */
function afterSeriesVariable(tokens: readonly Token[]): boolean {
  const n = tokens.length;
  const [f, open, v] = [tokens[n - 3], tokens[n - 2], tokens[n - 1]];
  return f?.kind === 'ident' && (f.text === 'sum' || f.text === 'prod') && open?.kind === 'punct' && open.text === '(' && v?.kind === 'ident';
}

const PUNCT2: readonly Punct[] = ['<=', '>=', '..', '!='];
const PUNCT1 = new Set<string>(['(', ')', '[', ']', '{', '}', ',', '=', '+', '-', '*', '/', '^', '<', '>']);

const isDigit = (c: string | undefined): boolean => c !== undefined && c >= '0' && c <= '9';
const isNameStart = (c: string | undefined): boolean => c !== undefined && /[A-Za-z_]/.test(c);
const isNameChar = (c: string | undefined): boolean => c !== undefined && /[A-Za-z0-9_]/.test(c);

export function lex(text: string, file: string): LexResult {
  const lines = new LineTable(text);
  const tokens: Token[] = [];
  const diagnostics: Diagnostic[] = [];
  let pos = 0;
  let bol = true;
  const span = (s: number, e: number): Span => lines.span(file, s, e);

  while (pos < text.length) {
    const c = text[pos]!;
    if (c === '\n') {
      bol = true;
      pos++;
      continue;
    }
    if (c === ' ' || c === '\t' || c === '\r') {
      pos++;
      continue;
    }
    if (c === '#') {
      while (pos < text.length && text[pos] !== '\n') pos++;
      continue;
    }
    const start = pos;
    if (isDigit(c) || (c === '.' && isDigit(text[pos + 1]))) {
      pos = lexNumber(text, pos, (msg, s, e) => diagnostics.push(diagnostic('bad-number', msg, span(s, e))));
      let digits = text.slice(start, pos);
      let imaginary = false;
      if (text[pos] === 'i' && !isNameChar(text[pos + 1])) {
        imaginary = true;
        pos++;
      }
      if (digits.startsWith('.')) digits = '0' + digits;
      tokens.push({ kind: 'number', text: text.slice(start, pos), digits, imaginary, span: span(start, pos), bol });
    } else if (isNameStart(c)) {
      while (isNameChar(text[pos])) pos++;
      tokens.push({ kind: 'ident', text: text.slice(start, pos), span: span(start, pos), bol });
    } else if (c === '"') {
      pos++;
      let value = '';
      let closed = false;
      while (pos < text.length && text[pos] !== '\n') {
        const ch = text[pos]!;
        if (ch === '"') {
          closed = true;
          pos++;
          break;
        }
        if (ch === '\\' && (text[pos + 1] === '"' || text[pos + 1] === '\\')) {
          value += text[pos + 1];
          pos += 2;
          continue;
        }
        value += ch;
        pos++;
      }
      if (!closed) {
        diagnostics.push(diagnostic('unterminated-string', 'string is not closed on this line', span(start, pos), 'close it with "'));
      }
      tokens.push({ kind: 'string', text: text.slice(start, pos), value, span: span(start, pos), bol });
    } else {
      const two = text.slice(pos, pos + 2) as Punct;
      if (PUNCT2.includes(two)) {
        pos += 2;
        tokens.push({ kind: 'punct', text: two, span: span(start, pos), bol });
      } else if (PUNCT1.has(c) || (c === '|' && afterSeriesVariable(tokens))) {
        pos++;
        tokens.push({ kind: 'punct', text: c as Punct, span: span(start, pos), bol });
      } else {
        // one diagnostic for a run of stray characters
        while (pos < text.length && !/[\sA-Za-z0-9_#"()[\]{},=+\-*/^<>.|]/.test(text[pos]!)) pos++;
        if (pos === start) pos++;
        const hint = c === '|' ? 'write abs(...) for a modulus' : c === '!' ? 'write Gamma(n + 1) for a factorial' : undefined;
        diagnostics.push(diagnostic('bad-character', `unexpected character '${text.slice(start, pos)}'`, span(start, pos), hint));
        continue; // the stray text is dropped; bol stays as it was
      }
    }
    bol = false;
  }
  tokens.push({ kind: 'eof', text: '', span: span(text.length, text.length), bol: true });
  return { tokens, diagnostics, lines };
}

/** Scans a numeric literal from `pos`; returns the end. Reports and skips malformed tails. */
function lexNumber(text: string, pos: number, report: (msg: string, s: number, e: number) => void): number {
  const start = pos;
  while (isDigit(text[pos])) pos++;
  if (text[pos] === '.' && text[pos + 1] !== '.') {
    pos++;
    if (!isDigit(text[pos])) {
      report(`malformed number '${text.slice(start, pos)}': digits must follow the point`, start, pos);
      return pos;
    }
    while (isDigit(text[pos])) pos++;
  }
  if (/^[eE][+-]?\d/.test(text.slice(pos, pos + 3))) {
    pos++;
    if (text[pos] === '+' || text[pos] === '-') pos++;
    while (isDigit(text[pos])) pos++;
  } else if ((text[pos] === 'e' || text[pos] === 'E') && !isNameChar(text[pos + 1])) {
    // '1e' or '1e+' with no digits; '2euler' is left to the parser (a number, then a name)
    pos++;
    if (text[pos] === '+' || text[pos] === '-') pos++;
    report(`malformed number '${text.slice(start, pos)}': the exponent needs digits`, start, pos);
    return pos;
  }
  if (text[pos] === '.' && isDigit(text[pos + 1])) {
    // 1.2.3
    while (isDigit(text[pos]) || (text[pos] === '.' && text[pos + 1] !== '.')) pos++;
    report(`malformed number '${text.slice(start, pos)}'`, start, pos);
  }
  return pos;
}
