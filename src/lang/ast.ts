/**
 * The resolved AST of a claim file: what parseSource returns and the evaluator reads.
 *
 * Public API (stable; src/check, src/report and src/cli build on it):
 *   parseSource(text, file): { ast: FileAst; diagnostics: Diagnostic[] }     (parser.ts)
 *   renderDiagnostic(d, text): string                                       (diagnostics.ts)
 *   knownNames(): NameInfo[]                                                (names.ts)
 *   evaluate(expr, env), evaluateConstant(expr), evaluateConstantWithError(expr),
 *   evaluateRegion(region), inRegion(bounds, tau), EvalError                (../eval/evaluate.ts)
 *
 * Conventions:
 * - Every node has `kind` and `span` (span.ts). Names are resolved: an Expr never holds an
 *   unknown identifier, and let macros are already expanded (a `letCall` node keeps the
 *   call for reports and error traces; its `body` is the expansion, which the evaluator
 *   reads). Expansions share argument subtrees (a DAG, not always a tree): walk with a
 *   memo when the size matters.
 * - `x`, `y`, `taubar`, `q` are parts of the tau in scope: in a claim the sampled tau; in a
 *   let with a parameter named `tau`, that parameter. So `tauPart.arg` is the tau they
 *   belong to (usually a `tau` node).
 * - Numbers keep their literal text; decimal.js parses it exactly at evaluation time.
 * - Clause values (box corners, list elements, fixed points, region bounds) are constant
 *   expressions: no tau, parameters or group. Evaluate them with evaluateConstant.
 *
 * - Differential operators (lap, dtau, dtaubar, qd, raise, lower, serre) are `operator`
 *   nodes: the operand is a function of the tau it mentions (a `tau` node, never a let's
 *   argument), and `at` says where the result is taken (null: the tau of the evaluation
 *   environment); the let's other arguments that depend on tau are held fixed (`frozen`). They nest at most MAX_OPERATOR_DEPTH deep (names.ts).
 *
 * - Sums and products (sum, prod) are `series` nodes: over an integer range from..to (to
 *   null: infinity) or over the positive divisors of an integer. The bound variable is a
 *   `boundVar` node; `key` identifies the series that binds it (names may repeat in
 *   separate series). Bounds are resolved in the enclosing scope; the body sees the
 *   variable. A series uses tau when its body or bounds do.
 *
 * - limit(s -> a, f) is a `limit` node (removable singularities; src/eval/limit.ts); its s
 *   is a `boundVar` like a series variable. A limit uses tau when f or a does.
 *
 * Extension point (the pattern the constructs above followed): add a node kind here, its name and
 * argument shape to names.ts (it is listed there in PLANNED and diagnosed 'not-implemented'
 * until then), its resolution rule in resolve.ts, and a case in evaluate.ts, which can
 * re-enter `evaluate` with another tau or extra parameter values (EvalEnv is plain data).
 */
import type { Group } from '../groups/subgroups.js';
import type { Span } from './span.js';

export type { Span } from './span.js';

// ---------------------------------------------------------------------------
// Expressions

export type ConstantName = 'i' | 'pi' | 'euler' | 'rho';
export type TauPartName = 'x' | 'y' | 'taubar' | 'q';
export type GroupEntryName = 'a' | 'b' | 'c' | 'd';
export type BinaryOp = '+' | '-' | '*' | '/' | '^';
/** Differential operators; summaries and the sign convention in names.ts. */
export type OperatorName = 'lap' | 'dtau' | 'dtaubar' | 'qd' | 'raise' | 'lower' | 'serre';

/** Built-in functions; arities and summaries in names.ts. */
export type BuiltinName =
  // elementary, principal branches
  | 'exp' | 'log' | 'sqrt' | 'abs' | 're' | 'im' | 'conj' | 'arg' | 'sin' | 'cos' | 'sinh' | 'cosh'
  // number theory and special functions
  | 'sigma' | 'bernoulli' | 'zeta' | 'xi' | 'Gamma' | 'beta' | 'K'
  // modular
  | 'E' | 'G' | 'E2star' | 'eta' | 'Delta' | 'j' | 'theta2' | 'theta3' | 'theta4' | 'Ens' | 'Estar' | 'EnsSplit' | 'EstarSplit';

export interface NumberLit {
  kind: 'number';
  /** The literal without the imaginary suffix, e.g. '1e-3', '0.5'. */
  text: string;
  /** `4i`, `0.5i`: the value is text * i. */
  imaginary: boolean;
  span: Span;
}
export interface ConstantRef {
  kind: 'constant';
  name: ConstantName;
  span: Span;
}
/** The sampled (or fixed) point tau of the claim. */
export interface TauRef {
  kind: 'tau';
  span: Span;
}
/** x = Re t, y = Im t, taubar = conj t, q = exp(2 pi i t), t = arg. */
export interface TauPart {
  kind: 'tauPart';
  part: TauPartName;
  arg: Expr;
  span: Span;
}
/** A claim parameter (for s in ..., for k in {...}); its value comes from EvalEnv.params. */
export interface ParamRef {
  kind: 'param';
  name: string;
  span: Span;
}
/** An entry of the claim's group element. */
export interface GroupEntry {
  kind: 'groupEntry';
  entry: GroupEntryName;
  span: Span;
}
/** g(arg): the Moebius action (a arg + b)/(c arg + d) of the claim's group element `group`. */
export interface Moebius {
  kind: 'moebius';
  group: string;
  arg: Expr;
  span: Span;
}
export interface Neg {
  kind: 'neg';
  arg: Expr;
  span: Span;
}
export interface Binary {
  kind: 'binary';
  op: BinaryOp;
  left: Expr;
  right: Expr;
  span: Span;
}
export interface Call {
  kind: 'call';
  fn: BuiltinName;
  args: Expr[];
  /** The span of the function name alone. */
  nameSpan: Span;
  span: Span;
}
/** A use of a let macro: `body` is its expansion with the arguments substituted. */
export interface LetCall {
  kind: 'letCall';
  name: string;
  args: Expr[];
  body: Expr;
  span: Span;
}

/**
 * op(f) or op(k, f) (raise, serre). `arg` is the operand, a function of the `tau` nodes in
 * it; the result is taken at `at` (null: the environment's tau; inside a let with a tau
 * parameter, that argument). `weight` (raise, serre) does not depend on tau.
 */
export interface Operator {
  kind: 'operator';
  op: OperatorName;
  weight: Expr | null;
  arg: Expr;
  at: Expr | null;
  /**
   * Inside a let with a tau parameter: the let's other arguments that depend on tau. They
   * are held at their values in the environment while the operand's tau moves (the
   * evaluator seeds them), so `let F(tau, w) = dtau(w*tau)` called as F(tau, y) gives y.
   */
  frozen: Expr[];
  /** The span of the operator name alone. */
  nameSpan: Span;
  span: Span;
}

/** The variable of a sum or product; its value comes from the enclosing series. */
export interface BoundVar {
  kind: 'boundVar';
  name: string;
  /** The `key` of the series that binds it. */
  key: number;
  span: Span;
}

export type SeriesOp = 'sum' | 'prod';
/** from..to (to null: inf), or the positive divisors of `of`. */
export type SeriesRange = { kind: 'range'; from: Expr; to: Expr | null } | { kind: 'divisors'; of: Expr };

/** sum(n = a..b, body), sum(n = a..inf, body), sum(d | n, body); prod likewise. */
export interface Series {
  kind: 'series';
  op: SeriesOp;
  variable: string;
  /** Unique per series node: the BoundVar nodes of its variable carry it. */
  key: number;
  range: SeriesRange;
  body: Expr;
  nameSpan: Span;
  span: Span;
}

/**
 * sum((m, n) != (0, 0), body): over the punctured lattice Z^2 minus the origin;
 * sum(gcd(c, d) = 1, body): over the coprime pairs, both signs ((c, d) and (-c, -d) both
 * count). Evaluated in src/eval/lattice.ts (square shells, extrapolated).
 */
export interface LatticeSum {
  kind: 'lattice';
  pairs: 'punctured' | 'coprime';
  variables: readonly [string, string];
  /** The BoundVar nodes of the two variables carry these (shared numbering with Series). */
  keys: readonly [number, number];
  body: Expr;
  nameSpan: Span;
  span: Span;
}

/** limit(s -> at, body): the limit of body as the bound variable s tends to `at` along the real direction. */
export interface Limit {
  kind: 'limit';
  variable: string;
  /** The BoundVar nodes of s carry it (shared numbering with Series). */
  key: number;
  at: Expr;
  body: Expr;
  nameSpan: Span;
  span: Span;
}

export type Expr =
  | Limit
  | Series
  | LatticeSum
  | BoundVar
  | Operator
  | NumberLit
  | ConstantRef
  | TauRef
  | TauPart
  | ParamRef
  | GroupEntry
  | Moebius
  | Neg
  | Binary
  | Call
  | LetCall;

// ---------------------------------------------------------------------------
// Clauses

/** for g in SL2Z / Gamma0(N) / Gamma1(N) / Gamma(N): binds g (any name) and a, b, c, d. */
export interface GroupClause {
  kind: 'group';
  variable: string;
  group: Group;
  span: Span;
}

/**
 * Parameter clauses, in source order. 'interval' and 'box' draw a random value per sample;
 * 'list' and 'intRange' are checked value by value (the checker takes the product of all
 * such clauses). Values are constant expressions except the integer range bounds.
 */
export type ParamClause =
  | { kind: 'interval'; name: string; lo: Expr; hi: Expr; span: Span }
  | { kind: 'box'; name: string; corner1: Expr; corner2: Expr; span: Span }
  | { kind: 'list'; name: string; values: Expr[]; span: Span }
  | { kind: 'intRange'; name: string; lo: number; hi: number; span: Span };

/** at tau in {...}: fixed points used instead of random ones. */
export interface FixedPoints {
  points: Expr[];
  span: Span;
}

/** What a region bound restricts: x, y, |x|, |tau|. */
export type RegionQuantity = 'x' | 'y' | 'absx' | 'abstau';
export type Comparison = '<' | '<=' | '>' | '>=';

/** quantity op bound, e.g. y >= 1/2 (a chain lo <= x <= hi becomes two bounds). */
export interface RegionBound {
  quantity: RegionQuantity;
  op: Comparison;
  bound: Expr;
  span: Span;
}
/** The conjunction of its bounds. */
export interface Region {
  bounds: RegionBound[];
  span: Span;
}

/** File-wide defaults (`use` lines) or per-claim settings; absent fields are not set. */
export interface Settings {
  digits?: number;
  samples?: number;
  seed?: number;
  yMin?: number;
}

export type Expectation = 'holds' | 'refuted';

export interface Claim {
  name: string;
  /** The header line `claim "name"`. */
  span: Span;
  source?: string;
  expect: Expectation;
  group?: GroupClause;
  params: ParamClause[];
  at?: FixedPoints;
  region?: Region;
  digits?: number;
  samples?: number;
  seed?: number;
  yMin?: number;
  lhs: Expr;
  rhs: Expr;
  /** The equation as written, comments dropped and line breaks folded to one space. */
  text: string;
  lhsText: string;
  rhsText: string;
  equationSpan: Span;
}

export interface LetInfo {
  name: string;
  params: string[];
  /** The body as written (comments dropped, line breaks folded). */
  text: string;
  span: Span;
}

export interface FileAst {
  file: string;
  defaults: Settings;
  lets: LetInfo[];
  /** The claims that parsed and resolved without error, in file order. */
  claims: Claim[];
}
