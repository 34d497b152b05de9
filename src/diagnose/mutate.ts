/**
 * Mutants of a claim that holds: the slips the diagnosis must catch, injected on purpose
 * into the right side. Used by the mutation tests (test/diagnose/mutation.test.ts), which
 * require every mutant to be refuted and the injected error to be named.
 *
 * The mutants (the right side R of LHS = R):
 * - scalar factors: 2 R, R/2, pi R, 2 pi R, -R, i R, (1 + 10^-12) R;
 * - a shift: R + 1;
 * - a weight slip: every exponent k of a power of an expression in the group entries c, d
 *   (the automorphy factor (c tau + d)^k) becomes k + 2, one mutant per claim;
 * - a reflection: the parameter s becomes 1 - s (claims with a parameter named s).
 * Mutants are built on the resolved AST, sharing every untouched node with the original,
 * so that evaluation memos (fromAst.ts SampleMemos) evaluate the untouched parts once.
 * The new nodes carry the span of the right side they replace.
 */
import type { Claim, Expr, Span } from '../lang/ast.js';

export interface Mutant {
  /** e.g. 'RHS * 2 pi', 'RHS + 1', 'weight + 2', 's -> 1 - s'. */
  label: string;
  kind: 'factor' | 'shift' | 'weight' | 'reflection';
  /** For factor and shift mutants: the injected constant in the claim language. */
  injected?: string;
  claim: Claim;
}

/** The scalar factors, as claim-language text and as the node builder. */
export const FACTORS: readonly { text: string; label: string }[] = [
  { text: '2', label: '2' },
  { text: '1/2', label: '1/2' },
  { text: 'pi', label: 'pi' },
  { text: '2*pi', label: '2 pi' },
  { text: '-1', label: '-1' },
  { text: 'i', label: 'i' },
  { text: '1 + 10^-12', label: '1 + 10^-12' },
];

const num = (text: string, span: Span, imaginary = false): Expr => ({ kind: 'number', text, imaginary, span });
const bin = (op: '+' | '-' | '*' | '/' | '^', left: Expr, right: Expr, span: Span): Expr => ({ kind: 'binary', op, left, right, span });

function factorNode(label: string, span: Span): Expr {
  switch (label) {
    case '2':
      return num('2', span);
    case '1/2':
      return bin('/', num('1', span), num('2', span), span);
    case 'pi':
      return { kind: 'constant', name: 'pi', span };
    case '2 pi':
      return bin('*', num('2', span), { kind: 'constant', name: 'pi', span }, span);
    case '-1':
      return { kind: 'neg', arg: num('1', span), span };
    case 'i':
      return { kind: 'constant', name: 'i', span };
    case '1 + 10^-12':
      return bin('+', num('1', span), num('1e-12', span), span);
  }
  throw new Error(`unknown factor ${label}`);
}

/** Rebuilds e bottom-up with f applied first (f returns a replacement or null). */
export function mapExpr(e: Expr, f: (e: Expr) => Expr | null): Expr {
  const r = f(e);
  if (r !== null) return r;
  const m = (x: Expr) => mapExpr(x, f);
  switch (e.kind) {
    case 'number':
    case 'constant':
    case 'tau':
    case 'param':
    case 'groupEntry':
    case 'boundVar':
      return e;
    case 'tauPart': {
      const arg = m(e.arg);
      return arg === e.arg ? e : { ...e, arg };
    }
    case 'moebius': {
      const arg = m(e.arg);
      return arg === e.arg ? e : { ...e, arg };
    }
    case 'neg': {
      const arg = m(e.arg);
      return arg === e.arg ? e : { ...e, arg };
    }
    case 'binary': {
      const left = m(e.left);
      const right = m(e.right);
      return left === e.left && right === e.right ? e : { ...e, left, right };
    }
    case 'call': {
      const args = e.args.map(m);
      return args.every((a, k) => a === e.args[k]) ? e : { ...e, args };
    }
    case 'letCall': {
      const args = e.args.map(m);
      const body = m(e.body);
      return body === e.body && args.every((a, k) => a === e.args[k]) ? e : { ...e, args, body };
    }
    case 'operator': {
      const arg = m(e.arg);
      const weight = e.weight === null ? null : m(e.weight);
      const at = e.at === null ? null : m(e.at);
      const frozen = e.frozen.map(m);
      const same = arg === e.arg && weight === e.weight && at === e.at && frozen.every((x, k) => x === e.frozen[k]);
      return same ? e : { ...e, arg, weight, at, frozen };
    }
    case 'series': {
      const body = m(e.body);
      const range =
        e.range.kind === 'divisors'
          ? (() => {
              const of = m(e.range.of);
              return of === e.range.of ? e.range : { kind: 'divisors' as const, of };
            })()
          : (() => {
              const from = m(e.range.from);
              const to = e.range.to === null ? null : m(e.range.to);
              return from === e.range.from && to === e.range.to ? e.range : { kind: 'range' as const, from, to };
            })();
      return body === e.body && range === e.range ? e : { ...e, body, range };
    }
    case 'limit': {
      const at = m(e.at);
      const body = m(e.body);
      return at === e.at && body === e.body ? e : { ...e, at, body };
    }
    case 'lattice': {
      const body = m(e.body);
      return body === e.body ? e : { ...e, body };
    }
  }
}

function mentionsGroupEntry(e: Expr): boolean {
  let found = false;
  mapExpr(e, (x) => {
    if (x.kind === 'groupEntry' && (x.entry === 'c' || x.entry === 'd')) found = true;
    return null;
  });
  return found;
}

/** An integer literal exponent (possibly negated), or null. */
function intExponent(e: Expr): number | null {
  if (e.kind === 'number' && !e.imaginary && /^\d+$/.test(e.text)) return Number(e.text);
  if (e.kind === 'neg') {
    const k = intExponent(e.arg);
    return k === null ? null : -k;
  }
  return null;
}

function withRhs(claim: Claim, rhs: Expr, rhsText: string): Claim {
  return { ...claim, rhs, rhsText, text: `${claim.lhsText} = ${rhsText}`, expect: 'refuted' };
}

/** The mutants of a claim (module header). */
export function mutants(claim: Claim): Mutant[] {
  const span = claim.rhs.span;
  const R = claim.rhsText;
  const out: Mutant[] = [];
  for (const f of FACTORS) {
    const rhs = bin('*', factorNode(f.label, span), claim.rhs, span);
    out.push({ label: `RHS * ${f.label}`, kind: 'factor', injected: f.text, claim: withRhs(claim, rhs, `(${f.text})*(${R})`) });
  }
  out.push({ label: 'RHS + 1', kind: 'shift', injected: '1', claim: withRhs(claim, bin('+', claim.rhs, num('1', span), span), `(${R}) + 1`) });

  let changed = false;
  const weighted = mapExpr(claim.rhs, (x) => {
    if (x.kind !== 'binary' || x.op !== '^' || !mentionsGroupEntry(x.left)) return null;
    const k = intExponent(x.right);
    if (k === null) return null;
    changed = true;
    const k2 = k + 2;
    return { ...x, right: k2 < 0 ? { kind: 'neg', arg: num(String(-k2), x.right.span), span: x.right.span } : num(String(k2), x.right.span) };
  });
  if (changed) out.push({ label: 'weight + 2', kind: 'weight', claim: withRhs(claim, weighted, `${R} [automorphy exponent + 2]`) });

  let hasS = false;
  const reflected = mapExpr(claim.rhs, (x) => {
    if (x.kind !== 'param' || x.name !== 's') return null;
    hasS = true;
    return bin('-', num('1', x.span), x, x.span);
  });
  if (hasS) out.push({ label: 's -> 1 - s', kind: 'reflection', claim: withRhs(claim, reflected, `${R} [s -> 1 - s]`) });
  return out;
}
