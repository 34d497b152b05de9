/**
 * Source positions.
 *
 * Convention: offsets are UTF-16 code-unit indices into the file's text (what JavaScript
 * strings index), `end` exclusive; `line` and `column` are 1-based and describe `start`.
 * A column counts code units from the line start, so a tab counts as one column (the
 * renderer copies tabs when it draws carets, which keeps them aligned).
 *
 *   const t = new LineTable('ab\ncd');  t.position(4)   // { line: 2, column: 2 }
 */

export interface Span {
  file: string;
  /** Offset of the first character. */
  start: number;
  /** Offset one past the last character (start === end for an empty span, e.g. at end of file). */
  end: number;
  line: number;
  column: number;
}

/** Line starts of a text, for offset -> line/column and for extracting a line. */
export class LineTable {
  /** starts[k] is the offset of line k + 1. */
  readonly starts: number[];

  constructor(readonly text: string) {
    const starts = [0];
    for (let k = 0; k < text.length; k++) if (text.charCodeAt(k) === 10) starts.push(k + 1);
    this.starts = starts;
  }

  /** 1-based line and column of an offset (offsets past the end clamp to the end). */
  position(offset: number): { line: number; column: number } {
    const o = Math.max(0, Math.min(offset, this.text.length));
    // binary search for the last line start <= o
    let lo = 0;
    let hi = this.starts.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (this.starts[mid]! <= o) lo = mid;
      else hi = mid - 1;
    }
    return { line: lo + 1, column: o - this.starts[lo]! + 1 };
  }

  /** The text of a 1-based line, without its line break (and without a trailing '\r'). */
  lineText(line: number): string {
    const s = this.starts[line - 1];
    if (s === undefined) return '';
    const next = this.starts[line];
    let e = next === undefined ? this.text.length : next - 1;
    if (e > s && this.text.charCodeAt(e - 1) === 13) e--;
    return this.text.slice(s, e);
  }

  span(file: string, start: number, end: number): Span {
    const { line, column } = this.position(start);
    return { file, start, end, line, column };
  }
}

/** The smallest span covering both (same file assumed). */
export function joinSpans(a: Span, b: Span): Span {
  const first = a.start <= b.start ? a : b;
  return { file: a.file, start: first.start, end: Math.max(a.end, b.end), line: first.line, column: first.column };
}
