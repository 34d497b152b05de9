/**
 * The names the claim language knows: built-in functions with their arities, constants,
 * the parts of tau, keywords, the differential operators, and the constructs planned next.
 *
 * Convention: names are case-sensitive and keep the trade's notation (E, G, Gamma, Delta,
 * j). This table is the one place the resolver learns a function's argument count; the
 * evaluator (src/eval/builtins.ts) implements exactly the names of BuiltinName.
 *
 *   knownNames().filter((n) => n.kind === 'function').map((n) => n.signature)
 */
import type { BuiltinName, ConstantName, OperatorName, TauPartName } from './ast.js';

export interface BuiltinSpec {
  /** Accepted argument counts (Gamma takes 1 or 2). */
  arities: readonly number[];
  signature: string;
  summary: string;
}

const f = (arities: number[], signature: string, summary: string): BuiltinSpec => ({ arities, signature, summary });

export const BUILTINS: Readonly<Record<BuiltinName, BuiltinSpec>> = {
  exp: f([1], 'exp(z)', 'exponential'),
  log: f([1], 'log(z)', 'principal logarithm, cut along (-inf, 0]'),
  sqrt: f([1], 'sqrt(z)', 'principal square root, cut along (-inf, 0)'),
  abs: f([1], 'abs(z)', 'modulus |z|'),
  re: f([1], 're(z)', 'real part'),
  im: f([1], 'im(z)', 'imaginary part'),
  conj: f([1], 'conj(z)', 'complex conjugate'),
  arg: f([1], 'arg(z)', 'argument in (-pi, pi]'),
  sin: f([1], 'sin(z)', 'sine'),
  cos: f([1], 'cos(z)', 'cosine'),
  sinh: f([1], 'sinh(z)', 'hyperbolic sine'),
  cosh: f([1], 'cosh(z)', 'hyperbolic cosine'),
  sigma: f([2], 'sigma(k, n)', 'divisor sum sum_{d|n} d^k; n a positive integer, k complex (exact for integer k >= 0)'),
  bernoulli: f([1], 'bernoulli(n)', 'Bernoulli number B_n (B_1 = -1/2), n a non-negative integer'),
  zeta: f([1], 'zeta(s)', 'Riemann zeta'),
  xi: f([1], 'xi(s)', 'completed zeta pi^(-s/2) Gamma(s/2) zeta(s)'),
  Gamma: f([1, 2], 'Gamma(s), Gamma(a, x)', 'Gamma function; with two arguments the upper incomplete Gamma, x > 0 real'),
  beta: f([1], 'beta(s)', 'Dirichlet beta sum_{n>=0} (-1)^n (2n+1)^-s'),
  K: f([2], 'K(nu, x)', 'modified Bessel function K_nu(x), x > 0 real'),
  E: f([2], 'E(k, tau)', 'holomorphic Eisenstein series 1 - (2k/B_k) sum sigma_{k-1}(n) q^n, k even >= 2'),
  G: f([2], 'G(k, tau)', 'lattice Eisenstein series sum\' (m tau + n)^-k = 2 zeta(k) E_k, k even >= 4'),
  E2star: f([1], 'E2star(tau)', 'E_2(tau) - 3/(pi y), modular of weight 2'),
  eta: f([1], 'eta(tau)', 'Dedekind eta q^(1/24) prod (1 - q^n)'),
  Delta: f([1], 'Delta(tau)', 'discriminant eta^24'),
  j: f([1], 'j(tau)', 'Klein invariant, j(i) = 1728'),
  theta2: f([1], 'theta2(tau)', 'theta constant sum e^(pi i tau (n+1/2)^2)'),
  theta3: f([1], 'theta3(tau)', 'theta constant sum e^(pi i tau n^2)'),
  theta4: f([1], 'theta4(tau)', 'theta constant sum (-1)^n e^(pi i tau n^2)'),
  Ens: f([2], 'Ens(s, tau)', 'non-holomorphic Eisenstein series, coset sum of Im(gamma tau)^s'),
  Estar: f([2], 'Estar(s, tau)', 'completed xi(2s) Ens(s, tau), Estar(s) = Estar(1 - s)'),
  EnsSplit: f([2], 'EnsSplit(s, tau)', 'Ens(s, tau) by the Epstein theta splitting, which shares no code with the Fourier method of Ens (slower)'),
  EstarSplit: f([2], 'EstarSplit(s, tau)', 'Estar(s, tau) by the Epstein theta splitting (independent of Estar\'s Fourier method; slower)'),
};

export function isBuiltin(name: string): name is BuiltinName {
  return Object.prototype.hasOwnProperty.call(BUILTINS, name);
}

export const CONSTANTS: Readonly<Record<ConstantName, string>> = {
  i: 'imaginary unit',
  pi: 'pi',
  euler: 'Euler-Mascheroni constant gamma = 0.5772...',
  rho: 'e^(2 pi i/3) = (-1 + i sqrt 3)/2',
};
export function isConstant(name: string): name is ConstantName {
  return Object.prototype.hasOwnProperty.call(CONSTANTS, name);
}

export const TAU_PARTS: Readonly<Record<TauPartName, string>> = {
  x: 'Re tau',
  y: 'Im tau',
  taubar: 'conj tau',
  q: 'exp(2 pi i tau)',
};
export function isTauPart(name: string): name is TauPartName {
  return Object.prototype.hasOwnProperty.call(TAU_PARTS, name);
}

/** Words of the file and clause syntax; never names. */
export const KEYWORDS: ReadonlySet<string> = new Set([
  'use', 'let', 'claim', 'for', 'in', 'at', 'region', 'and', 'digits', 'samples', 'seed', 'ymin', 'expect', 'source',
]);

/** Group names after `for g in` (SL2Z alone, the others with a level). */
export const GROUP_NAMES: readonly ('SL2Z' | 'Gamma0' | 'Gamma1' | 'Gamma')[] = ['SL2Z', 'Gamma0', 'Gamma1', 'Gamma'];

/**
 * Differential operators: they act on an expression (a function of the tau in scope), not
 * on a value; the evaluator differentiates numerically (src/eval/derivative.ts). With
 * weight: the first argument is the weight k (it must not depend on tau), the last the operand.
 * Sign convention of the Laplacian: lap(y^s) = s(s-1) y^s (eigenvalue s(s-1), not s(1-s)).
 */
export interface OperatorSpec {
  /** Whether the operator takes a weight k before the operand. */
  weighted: boolean;
  signature: string;
  summary: string;
}

const op = (weighted: boolean, signature: string, summary: string): OperatorSpec => ({ weighted, signature, summary });

export const OPERATORS: Readonly<Record<OperatorName, OperatorSpec>> = {
  lap: op(false, 'lap(f)', 'hyperbolic Laplacian y^2 (d_x^2 + d_y^2) f; sign: lap(y^s) = s(s-1) y^s (eigenvalue s(s-1))'),
  dtau: op(false, 'dtau(f)', 'd/dtau f = (1/2)(d_x - i d_y) f'),
  dtaubar: op(false, 'dtaubar(f)', 'd/dtaubar f = (1/2)(d_x + i d_y) f (0 for holomorphic f)'),
  qd: op(false, 'qd(f)', 'q d/dq f = (1/(2 pi i)) d/dtau f'),
  raise: op(true, 'raise(k, f)', 'Maass raising R_k f = 2i dtau(f) + (k/y) f'),
  lower: op(false, 'lower(f)', 'Maass lowering L f = -2i y^2 dtaubar(f)'),
  serre: op(true, 'serre(k, f)', 'Serre derivative qd(f) - (k/12) E_2 f'),
};

export function isOperator(name: string): name is OperatorName {
  return Object.prototype.hasOwnProperty.call(OPERATORS, name);
}

/** Operator nesting allowed in one expression: the cost grows like 13^depth evaluations. */
export const MAX_OPERATOR_DEPTH = 4;

/** Constructs of a next stage: reserved, diagnosed 'not-implemented' (none now: sum, prod, limit are implemented). */
export const PLANNED: Readonly<Record<string, string>> = {};

/**
 * Sums and products (src/eval/series.ts): sum(n = a..b, f), sum(n = a..inf, f),
 * sum(d | n, f), and prod likewise. The names sum, prod and inf are reserved.
 */
export const SERIES: Readonly<Record<'sum' | 'prod', string>> = {
  sum: 'sum(n = a..b, f), sum(n = a..inf, f), sum(d | n, f): sum over integers a..b, to infinity, or the positive divisors d of n (empty range: 0)',
  prod: 'prod(n = a..b, f), prod(n = a..inf, f), prod(d | n, f): product likewise (empty range: 1)',
};
export function isSeriesName(name: string): boolean {
  return name === 'sum' || name === 'prod' || name === 'inf' || name === 'limit';
}
/** limit(s -> a, f): the limit of f as s -> a (a removable singularity), src/eval/limit.ts. */
export const LIMIT_SIGNATURE = 'limit(s -> a, f)';
/** Most terms of a finite range (a literal range beyond it is 'bad-range'; a computed one fails at evaluation). */
export const MAX_SERIES_TERMS = 100000;
/** Terms an infinite sum or product may take before it fails with 'convergence'. */
export const INFINITE_SERIES_BUDGET = 20000;

export interface NameInfo {
  name: string;
  kind: 'function' | 'constant' | 'variable' | 'group entry';
  /** Accepted argument counts; [] for non-functions. */
  arities: readonly number[];
  signature: string;
  summary: string;
}

/** Every name an expression may use (besides lets and parameters), for help texts. */
export function knownNames(): NameInfo[] {
  const out: NameInfo[] = [];
  for (const [name, c] of Object.entries(CONSTANTS)) out.push({ name, kind: 'constant', arities: [], signature: name, summary: c });
  out.push({ name: 'tau', kind: 'variable', arities: [], signature: 'tau', summary: 'the point of the upper half plane' });
  for (const [name, s] of Object.entries(TAU_PARTS)) out.push({ name, kind: 'variable', arities: [], signature: name, summary: s });
  for (const e of ['a', 'b', 'c', 'd']) {
    out.push({ name: e, kind: 'group entry', arities: [], signature: e, summary: `entry ${e} of the group element (a b; c d), under a group clause` });
  }
  for (const [name, s] of Object.entries(BUILTINS) as [BuiltinName, BuiltinSpec][]) {
    out.push({ name, kind: 'function', arities: s.arities, signature: s.signature, summary: s.summary });
  }
  for (const [name, s] of Object.entries(OPERATORS) as [OperatorName, OperatorSpec][]) {
    out.push({ name, kind: 'function', arities: [s.weighted ? 2 : 1], signature: s.signature, summary: s.summary });
  }
  return out;
}

/** Optimal string alignment distance (Levenshtein with adjacent transpositions). */
export function editDistance(a: string, b: string): number {
  const m = a.length;
  const n = b.length;
  const d: number[][] = Array.from({ length: m + 1 }, (_, r) => Array.from({ length: n + 1 }, (_, c) => (r === 0 ? c : c === 0 ? r : 0)));
  for (let r = 1; r <= m; r++) {
    for (let c = 1; c <= n; c++) {
      const cost = a[r - 1] === b[c - 1] ? 0 : 1;
      let v = Math.min(d[r - 1]![c]! + 1, d[r]![c - 1]! + 1, d[r - 1]![c - 1]! + cost);
      if (r > 1 && c > 1 && a[r - 1] === b[c - 2] && a[r - 2] === b[c - 1]) v = Math.min(v, d[r - 2]![c - 2]! + 1);
      d[r]![c] = v;
    }
  }
  return d[m]![n]!;
}

/**
 * Up to `max` candidates nearest to `name`, closest first: a case-only difference counts
 * as distance 0.5; candidates farther than about a third of the name's length are dropped.
 */
export function nearestNames(name: string, candidates: Iterable<string>, max = 3): string[] {
  const limit = Math.max(1, Math.floor(name.length / 3)) + (name.length >= 6 ? 1 : 0);
  const scored: { c: string; s: number }[] = [];
  for (const c of new Set(candidates)) {
    if (c === name) continue;
    const s = c.toLowerCase() === name.toLowerCase() ? 0.5 : editDistance(name, c);
    if (s <= limit) scored.push({ c, s });
  }
  scored.sort((p, q) => p.s - q.s || p.c.localeCompare(q.c));
  return scored.slice(0, max).map((x) => x.c);
}
