/**
 * The surface syntax tree: what the parser builds before names are resolved (internal to
 * src/lang; the public tree is ast.ts). Names are still strings here; clause values are
 * unresolved expressions.
 */
import type { Comparison, Expectation } from './ast.js';
import type { Span } from './span.js';

export type SyntaxExpr =
  | { kind: 'num'; digits: string; imaginary: boolean; span: Span }
  | { kind: 'name'; name: string; span: Span }
  | { kind: 'call'; name: string; nameSpan: Span; args: SyntaxExpr[]; span: Span }
  | { kind: 'neg'; arg: SyntaxExpr; span: Span }
  | { kind: 'binary'; op: '+' | '-' | '*' | '/' | '^'; left: SyntaxExpr; right: SyntaxExpr; span: Span }
  | { kind: 'limit'; variable: Named; at: SyntaxExpr; body: SyntaxExpr; nameSpan: Span; span: Span }
  | { kind: 'lattice'; pairs: 'punctured' | 'coprime'; variables: readonly [Named, Named]; body: SyntaxExpr; nameSpan: Span; span: Span }
  | {
      kind: 'series';
      op: 'sum' | 'prod';
      variable: Named;
      /** to null: inf */
      range: { kind: 'range'; from: SyntaxExpr; to: SyntaxExpr | null; toSpan: Span } | { kind: 'divisors'; of: SyntaxExpr };
      body: SyntaxExpr;
      nameSpan: Span;
      span: Span;
    };

export type SettingName = 'digits' | 'samples' | 'seed' | 'ymin';

export interface SettingSyntax {
  name: SettingName;
  /** The literal as written. */
  text: string;
  span: Span;
  /** The whole `name value` pair. */
  fullSpan: Span;
}

export interface Named {
  name: string;
  span: Span;
}

export type DomainSyntax =
  | { kind: 'group'; group: 'SL2Z' | 'Gamma0' | 'Gamma1' | 'Gamma'; level: number; span: Span }
  | { kind: 'interval'; lo: SyntaxExpr; hi: SyntaxExpr; span: Span }
  | { kind: 'box'; corner1: SyntaxExpr; corner2: SyntaxExpr; span: Span }
  | { kind: 'list'; values: SyntaxExpr[]; span: Span }
  | { kind: 'intRange'; lo: number; hi: number; span: Span };

/** One comparison chain of a region clause: operands[k] ops[k] operands[k+1]. */
export interface ConditionSyntax {
  operands: SyntaxExpr[];
  ops: Comparison[];
  span: Span;
}

export type ClauseSyntax =
  | { kind: 'for'; variable: Named; domain: DomainSyntax; span: Span }
  | { kind: 'at'; variable: Named; points: SyntaxExpr[]; span: Span }
  | { kind: 'region'; conditions: ConditionSyntax[]; span: Span }
  | { kind: 'settings'; settings: SettingSyntax[]; span: Span }
  | { kind: 'expect'; value: Expectation; span: Span }
  | { kind: 'source'; value: string; span: Span };

export interface EquationSyntax {
  lhs: SyntaxExpr;
  rhs: SyntaxExpr;
  span: Span;
  text: string;
  lhsText: string;
  rhsText: string;
}

export type Item =
  | { kind: 'use'; settings: SettingSyntax[]; span: Span }
  | { kind: 'let'; name: Named; params: Named[]; body: SyntaxExpr; text: string; span: Span }
  | {
      kind: 'claim';
      name: string;
      span: Span;
      clauses: ClauseSyntax[];
      equation: EquationSyntax | null;
      /** A syntax error was reported inside the claim: resolve it for more errors, never return it. */
      broken: boolean;
    };
