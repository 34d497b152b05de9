/**
 * Properties of resolved expressions the operators need: whether an expression depends on
 * the tau it mentions, whether it is provably holomorphic in it, and how deeply
 * differential operators nest. All walks are memoised (expansions share subtrees).
 *
 * "Depends on tau" and "holomorphic" are judged from the AST alone: a tau-free expression
 * is constant; a holomorphic one is built from tau by holomorphic built-ins and operations
 * (then d/dtau = d/dx, and d/dtaubar, lap, lower give exactly 0). Anything not provably
 * holomorphic (x, y, taubar, abs, re, E2star, Ens, ...) is treated as general.
 *
 *   dependsOnTau(expr('Gamma(2) * pi'))   // false
 *   isHolomorphic(expr('E(4, tau)^2 / eta(tau)'))   // true
 */
import type { BuiltinName, Expr, OperatorName } from './ast.js';

const depMemo = new WeakMap<Expr, boolean>();
const holoMemo = new WeakMap<Expr, boolean>();
const depthMemo = new WeakMap<Expr, number>();

/** Operators whose result is f's multiple, not its derivative (non-zero for constant f). */
const WEIGHTED: ReadonlySet<OperatorName> = new Set(['raise', 'serre']);

export function isWeighted(op: OperatorName): boolean {
  return WEIGHTED.has(op);
}

/** Children of a node (the operand of an operator included). */
function children(e: Expr): Expr[] {
  switch (e.kind) {
    case 'number':
    case 'constant':
    case 'tau':
    case 'param':
    case 'groupEntry':
      return [];
    case 'tauPart':
    case 'neg':
    case 'moebius':
      return [e.arg];
    case 'binary':
      return [e.left, e.right];
    case 'call':
      return e.args;
    case 'letCall':
      return [e.body];
    case 'operator':
      return [...(e.weight === null ? [] : [e.weight]), e.arg, ...(e.at === null ? [] : [e.at]), ...e.frozen];
    case 'boundVar':
      return [];
    case 'limit':
      return [e.at, e.body];
    case 'lattice':
      return [e.body];
    case 'series':
      return [...(e.range.kind === 'divisors' ? [e.range.of] : [e.range.from, ...(e.range.to === null ? [] : [e.range.to])]), e.body];
  }
}

const boundMemo = new WeakMap<Expr, ReadonlySet<number>>();
const NO_KEYS: ReadonlySet<number> = new Set();

/** The keys of the series variables free in e (bound by an enclosing series, not inside e). */
export function freeBoundKeys(e: Expr): ReadonlySet<number> {
  const hit = boundMemo.get(e);
  if (hit !== undefined) return hit;
  let r: ReadonlySet<number>;
  if (e.kind === 'boundVar') {
    r = new Set([e.key]);
  } else {
    const acc = new Set<number>();
    for (const c of children(e)) for (const k of freeBoundKeys(c)) acc.add(k);
    if (e.kind === 'series' || e.kind === 'limit') acc.delete(e.key);
    if (e.kind === 'lattice') for (const k of e.keys) acc.delete(k);
    r = acc.size === 0 ? NO_KEYS : acc;
  }
  boundMemo.set(e, r);
  return r;
}

/** Whether the value changes with the tau of the evaluation environment. */
export function dependsOnTau(e: Expr): boolean {
  const hit = depMemo.get(e);
  if (hit !== undefined) return hit;
  let r: boolean;
  switch (e.kind) {
    case 'tau':
      r = true;
      break;
    case 'operator': {
      // the operand's tau is the variable differentiated; the result lives at `at`
      const nonzero = isWeighted(e.op) || dependsOnTau(e.arg);
      r = nonzero && (e.at === null || dependsOnTau(e.at) || e.frozen.length > 0);
      break;
    }
    case 'letCall':
      r = dependsOnTau(e.body);
      break;
    default:
      r = children(e).some(dependsOnTau);
  }
  depMemo.set(e, r);
  return r;
}

/** Built-ins holomorphic in every argument (where defined). */
const HOLO_BUILTINS: ReadonlySet<BuiltinName> = new Set([
  'exp', 'log', 'sqrt', 'sin', 'cos', 'sinh', 'cosh', 'zeta', 'xi', 'beta', 'eta', 'Delta', 'j', 'theta2', 'theta3', 'theta4',
]);
/** Built-ins holomorphic in their last argument when the others do not depend on tau. */
const HOLO_LAST: ReadonlySet<BuiltinName> = new Set(['E', 'G']);

/** Whether e is provably a holomorphic function of tau (a tau-free expression is). */
export function isHolomorphic(e: Expr): boolean {
  const hit = holoMemo.get(e);
  if (hit !== undefined) return hit;
  let r: boolean;
  if (!dependsOnTau(e)) {
    r = true;
  } else {
    switch (e.kind) {
      case 'tau':
        r = true;
        break;
      case 'tauPart':
        r = e.part === 'q' && isHolomorphic(e.arg);
        break;
      case 'moebius':
      case 'neg':
        r = isHolomorphic(e.arg);
        break;
      case 'binary':
        // a^b = exp(b log a): holomorphic off the cut when a and b are
        r = isHolomorphic(e.left) && isHolomorphic(e.right);
        break;
      case 'call':
        if (HOLO_BUILTINS.has(e.fn)) r = e.args.every(isHolomorphic);
        else if (HOLO_LAST.has(e.fn)) r = e.args.slice(0, -1).every((a) => !dependsOnTau(a)) && isHolomorphic(e.args[e.args.length - 1]!);
        else if (e.fn === 'Gamma') r = e.args.length === 1 && isHolomorphic(e.args[0]!);
        else r = false;
        break;
      case 'letCall':
        r = isHolomorphic(e.body);
        break;
      case 'series':
        // a uniformly convergent series of holomorphic terms; bounds must not move with tau
        r = isHolomorphic(e.body) && children(e).slice(0, -1).every((c) => !dependsOnTau(c));
        break;
      case 'lattice':
        // an absolutely convergent sum of holomorphic terms (lattice.ts refuses the others)
        r = isHolomorphic(e.body);
        break;
      case 'operator': {
        // d/dtau and q d/dq keep holomorphy; serre too (E_2 is holomorphic); raise has k/y
        const keeps = e.op === 'dtau' || e.op === 'qd' || e.op === 'serre' || e.op === 'dtaubar' || e.op === 'lap' || e.op === 'lower';
        r = keeps && e.frozen.length === 0 && isHolomorphic(e.arg) && (e.at === null || isHolomorphic(e.at));
        break;
      }
      default:
        r = false;
    }
  }
  holoMemo.set(e, r);
  return r;
}

/** How deeply differential operators nest in e (0: none). */
export function operatorDepth(e: Expr): number {
  const hit = depthMemo.get(e);
  if (hit !== undefined) return hit;
  let r = 0;
  for (const c of children(e)) r = Math.max(r, operatorDepth(c));
  if (e.kind === 'operator') r += 1;
  depthMemo.set(e, r);
  return r;
}

/**
 * The outermost node where the nesting exceeds `limit`: the operator itself, or the let
 * call through which the claim reaches it (the call site is what the user wrote there).
 */
export function tooDeep(e: Expr, limit: number): Expr | null {
  if (operatorDepth(e) <= limit) return null;
  if (e.kind === 'operator' || e.kind === 'letCall') return e;
  for (const c of children(e)) {
    const r = tooDeep(c, limit);
    if (r !== null) return r;
  }
  return null;
}
