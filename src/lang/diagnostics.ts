/**
 * Diagnostics of the claim language: a closed set of codes, collected rather than thrown,
 * rendered with position, source line, carets and hint.
 *
 * Convention: every diagnostic is an error (a file with any diagnostic must not be
 * checked as a whole; the claims that did parse are still returned). Messages start in
 * lower case and name the thing at fault; the `hint` says what to do instead. Tests assert
 * on `code` and on the span, never on message wording.
 *
 *   renderDiagnostic(d, text)
 *   // claims.vet:4:3: unknown name 'Delat'
 *   //   Delat(g(tau)) = (c*tau + d)^12 * Delta(tau)
 *   //   ^^^^^
 *   //   hint: did you mean 'Delta'?
 */
import { LineTable, type Span } from './span.js';

export type DiagnosticCode =
  // lexical
  | 'bad-character' // a character that starts no token
  | 'bad-number' // a malformed numeric literal (1e, 1.5.2)
  | 'unterminated-string'
  // syntax
  | 'unexpected-token' // generic: the parser expected something else here
  | 'unbalanced-paren' // an opener never closed (span: the opener), or a closer with no opener
  | 'bad-top-level' // a line at column 1 that is not use/let/claim, or indented text outside a claim
  | 'bad-clause' // a malformed clause or an unknown clause keyword
  | 'misplaced-clause' // a clause after the claim's equation
  | 'duplicate-clause' // the same clause or setting twice in one claim (or in the use lines)
  | 'bad-setting' // digits/samples/seed/ymin out of range or of the wrong type; unknown setting
  | 'bad-region' // a region condition outside the supported forms
  | 'bad-range' // an empty or too long list/range, non-integer range bounds, bad group level
  | 'missing-equation' // a claim with no equation
  | 'missing-equals' // an equation without '='
  | 'extra-equals' // a = b = c
  | 'reserved-word' // a keyword used as a name
  | 'too-complex' // an expression nested deeper than the parser allows (MAX_DEPTH)
  // names
  | 'unknown-name' // with the nearest known names as a hint
  | 'arity' // wrong number of arguments (message names the expected count)
  | 'not-callable' // a value applied to arguments: pi(2), s(1)
  | 'not-a-value' // a function used without arguments: exp + 1
  | 'group-outside' // a, b, c, d or g(...) where no group clause binds them
  | 'not-constant' // a clause value that depends on tau, parameters or the group
  | 'duplicate-name' // a name defined twice, or clashing with a built-in or another binding
  | 'recursive-let' // a let that uses itself, directly or through other lets
  | 'operator-depth' // differential operators nested deeper than MAX_OPERATOR_DEPTH
  | 'not-implemented'; // a planned construct (sum, prod, limit) not available yet

export interface Diagnostic {
  code: DiagnosticCode;
  message: string;
  span: Span;
  hint?: string;
}

export function diagnostic(code: DiagnosticCode, message: string, span: Span, hint?: string): Diagnostic {
  return hint === undefined ? { code, message, span } : { code, message, span, hint };
}

/**
 * `file:line:col: message`, the source line, carets under the span (to the end of its
 * first line when it runs over several), and `hint: ...` when there is one. Lines end
 * with '\n'. `text` is the whole source the span refers to.
 */
export function renderDiagnostic(d: Diagnostic, text: string): string {
  return renderAt(d.span, d.message, text, d.hint);
}

/** The same layout for any message at a span (the checker uses it for runtime errors). */
export function renderAt(span: Span, message: string, text: string, hint?: string, table?: LineTable): string {
  const t = table ?? new LineTable(text);
  const { line, column } = t.position(span.start);
  const src = t.lineText(line);
  const from = column - 1;
  // carets stop at the end of the first line of a multi-line span
  const to = Math.min(span.end - t.starts[line - 1]!, src.length);
  // keep tabs in the padding so the carets line up under tabbed source
  const pad = src.slice(0, from).replace(/[^\t]/g, ' ');
  const carets = '^'.repeat(Math.max(1, to - from));
  let out = `${span.file}:${line}:${column}: ${message}\n  ${src}\n  ${pad}${carets}\n`;
  if (hint !== undefined) out += `  hint: ${hint}\n`;
  return out;
}
