// The lexer: token kinds and texts, spans (line/column), layout flags, number forms
// (including the range operator next to integers) and the lexical error codes.
import { describe, expect, it } from 'vitest';
import { lex } from '../../src/lang/lexer.js';

const texts = (s: string) => lex(s, 'f.vet').tokens.map((t) => t.text);
const codes = (s: string) => lex(s, 'f.vet').diagnostics.map((d) => `${d.code}@${d.span.line}:${d.span.column}`);

describe('tokens', () => {
  it('splits names, numbers, punctuation; comments vanish', () => {
    expect(texts('E(4, tau)^2 # comment\n= x')).toEqual(['E', '(', '4', ',', 'tau', ')', '^', '2', '=', 'x', '']);
  });
  it('two-character operators', () => {
    expect(texts('y >= 1 <= 2 .. 3')).toEqual(['y', '>=', '1', '<=', '2', '..', '3', '']);
  });
  it('numbers: decimals, exponents, imaginary suffix, leading point', () => {
    const toks = lex('2 0.25 1e-3 1E+5 4i 0.5i 1e-3i .5', 'f').tokens.filter((t) => t.kind === 'number');
    expect(toks.map((t) => (t.kind === 'number' ? [t.digits, t.imaginary] : null))).toEqual([
      ['2', false], ['0.25', false], ['1e-3', false], ['1E+5', false], ['4', true], ['0.5', true], ['1e-3', true], ['0.5', false],
    ]);
  });
  it('1..20 is a range, not a decimal', () => {
    expect(texts('1..20')).toEqual(['1', '..', '20', '']);
    expect(texts('-3..-1')).toEqual(['-', '3', '..', '-', '1', '']);
  });
  it('a number followed by a name stays two tokens (2x, 4in, 2euler)', () => {
    expect(texts('2x')).toEqual(['2', 'x', '']);
    expect(texts('4in')).toEqual(['4', 'in', '']);
    expect(texts('2euler')).toEqual(['2', 'euler', '']);
  });
  it('strings with escapes', () => {
    const t = lex('source "a \\"b\\" \\\\ c"', 'f').tokens[1]!;
    expect(t.kind === 'string' && t.value).toBe('a "b" \\ c');
  });
  it('spans: 1-based line and column, offsets, bol flags', () => {
    const { tokens } = lex('claim "x"\n  E(4, tau) = 1\n', 'f.vet');
    const e = tokens[2]!;
    expect(e.text).toBe('E');
    expect(e.span).toMatchObject({ file: 'f.vet', line: 2, column: 3, start: 12, end: 13 });
    expect(tokens.map((t) => t.bol)).toEqual([true, false, true, false, false, false, false, false, false, false, true]);
  });
});

describe('lexical errors', () => {
  it('bad-character, with a hint for | and !', () => {
    expect(codes('x = |tau|')).toEqual(['bad-character@1:5', 'bad-character@1:9']);
    expect(lex('n!', 'f').diagnostics[0]!.hint).toMatch(/Gamma/);
    expect(codes('a $$ b')).toEqual(['bad-character@1:3']);
  });
  it('bad-number: 1e, 1., 1.2.3', () => {
    expect(codes('1e + 2')).toEqual(['bad-number@1:1']);
    expect(codes('x = 1. + 2')).toEqual(['bad-number@1:5']);
    expect(codes('1.2.3')).toEqual(['bad-number@1:1']);
  });
  it('unterminated-string stops at the line end', () => {
    expect(codes('source "abc\nclaim "x"')).toEqual(['unterminated-string@1:8']);
  });
});
