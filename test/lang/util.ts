// Shared helpers of the language and evaluator tests: parse a snippet, list diagnostics as
// code@line:column, print expressions as s-expressions (structure, not wording).
import { expect } from 'vitest';
import type { Claim, Expr, FileAst } from '../../src/lang/ast.js';
import type { Diagnostic } from '../../src/lang/diagnostics.js';
import { parseSource } from '../../src/lang/parser.js';

export function parse(src: string): { ast: FileAst; diagnostics: Diagnostic[] } {
  return parseSource(src, 't.vet');
}

/** Diagnostics as 'code@line:column', in order. */
export function diags(src: string): string[] {
  return parse(src).diagnostics.map((d) => `${d.code}@${d.span.line}:${d.span.column}`);
}

/** The only claim of a snippet that must parse cleanly. */
export function onlyClaim(src: string): Claim {
  const { ast, diagnostics } = parse(src);
  expect(diagnostics.map((d) => `${d.code}@${d.span.line}:${d.span.column} ${d.message}`)).toEqual([]);
  expect(ast.claims).toHaveLength(1);
  return ast.claims[0]!;
}

/** A claim around one equation. */
export function eq(equation: string, clauses: string[] = []): Claim {
  return onlyClaim(['claim "t"', ...clauses.map((c) => `  ${c}`), `  ${equation}`].join('\n') + '\n');
}

/** The left side of `expr = 0`. */
export function expr(e: string, clauses: string[] = []): Expr {
  return eq(`${e} = 0`, clauses).lhs;
}

/** Structure as an s-expression; let calls print as (let name body). */
export function sexpr(e: Expr): string {
  switch (e.kind) {
    case 'number':
      return e.imaginary ? `${e.text}i` : e.text;
    case 'constant':
      return e.name;
    case 'tau':
      return 'tau';
    case 'tauPart':
      return `(${e.part} ${sexpr(e.arg)})`;
    case 'param':
      return `$${e.name}`;
    case 'groupEntry':
      return `@${e.entry}`;
    case 'moebius':
      return `(act ${e.group} ${sexpr(e.arg)})`;
    case 'neg':
      return `(neg ${sexpr(e.arg)})`;
    case 'binary':
      return `(${e.op} ${sexpr(e.left)} ${sexpr(e.right)})`;
    case 'call':
      return `(${e.fn}${e.args.map((a) => ' ' + sexpr(a)).join('')})`;
    case 'letCall':
      return `(let ${e.name} ${sexpr(e.body)})`;
    case 'operator':
      return `(${e.op}${e.weight === null ? '' : ' ' + sexpr(e.weight)} ${sexpr(e.arg)}${e.at === null ? '' : ' @' + sexpr(e.at)})`;
    case 'boundVar':
      return `%${e.name}`;
    case 'limit':
      return `(limit ${e.variable} ${sexpr(e.at)} ${sexpr(e.body)})`;
    case 'lattice':
      return `(${e.pairs} ${e.variables.join(' ')} ${sexpr(e.body)})`;
    case 'series': {
      const r = e.range.kind === 'divisors' ? `| ${sexpr(e.range.of)}` : `${sexpr(e.range.from)}..${e.range.to === null ? 'inf' : sexpr(e.range.to)}`;
      return `(${e.op} ${e.variable} ${r} ${sexpr(e.body)})`;
    }
  }
}
