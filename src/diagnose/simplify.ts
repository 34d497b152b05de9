/**
 * Tidying a suggested right side (explain.ts builds it from a wrap template, so a fix reads
 * `1/2*(2*E(8, tau))`): products and quotients of powers simplified by nerdamer (1.1.13),
 * read back, put in a readable order and checked exactly before they are used.
 *
 *   simplifiedText(claim.rhs)   // for the right sides on the left:
 *     1/2*(2*E(8, tau))                              -> E(8, tau)
 *     (c*tau + d)^(-2)*((c*tau + d)^6*E(4, tau))     -> (c*tau + d)^4*E(4, tau)
 *     -1*(s*(1 - s)*Ens(s, tau))                     -> (s - 1)*s*Ens(s, tau)
 *     2*sum(n = 1..inf, q^n)                         -> null (nothing shorter)
 *
 * Method. The right side becomes nerdamer text over opaque symbols p0, p1, ...: structure is
 * kept only for number literals (finite decimals as exact fractions), unary minus, + - * /
 * and ^ with an integer exponent (|n| <= MAX_EXPONENT). Every other subtree is one symbol:
 * calls, let calls (they print as written), pi, i, tau and its parts, parameters, group
 * entries, series, operators, limits, and powers with any other exponent; subtrees that
 * print the same (printExpr) are the same symbol, since at the top level of a right side the
 * same text means the same value (bound variables live only inside opaque series). Integer
 * exponents only: for them (ab)^n = a^n b^n and (a^m)^n = a^(mn) hold for complex values
 * wherever both sides are defined, whereas nerdamer applies the same rules to other exponents
 * under real-variable assumptions ((p^2)^(1/2) -> abs(p), (p^2)^s -> p^(2 s)), which is false
 * on principal branches.
 *
 * Two candidates: nerdamer's automatic simplification when it parses the text, and its
 * simplify() (no expand, so a product of sums stays a product). simplify() combines more,
 * (u)^(-2)*(u)^6 -> u^4 for a sum u, but in 1.1.13 it also flips signs: (p0*p1 - p2)/4 ->
 * (1/4)*(p2 - p0*p1). So each candidate is read back by symbolic.ts's reader (no text is
 * executed as code), tidied (`tidy`: sums led by a positive term, a product's sign absorbed
 * into a factor that is a sum, powers of the same base combined, negative powers moved under
 * one '/'), and accepted only when (1) it equals the input as a rational function of the
 * symbols, checked in exact rational arithmetic at CHECK_POINTS random integer points: the
 * symbols are independent variables, so by the Schwartz-Zippel lemma a wrong candidate of
 * total degree D passes a point with probability at most D / 2^30; and (2) it prints shorter
 * than the input. The shortest
 * accepted candidate wins; null when none is accepted or nerdamer throws. As for any rational
 * function, a cancelled factor is a removable singularity: E(4, tau)/E(4, tau) -> 1 also at
 * tau = rho, where the original is 0/0.
 */
import { Decimal } from 'decimal.js';
import nerdamer from 'nerdamer';
import 'nerdamer/Algebra.js';
import type { Expr, Span } from '../lang/ast.js';
import { printExpr, PrintError } from '../lang/print.js';
import { Random } from '../numeric/random.js';
import { fromNerdamer } from '../eval/symbolic.js';

/** Integer exponents up to this size are structure; larger powers are opaque symbols. */
const MAX_EXPONENT = 64;
/** Literals whose exact fraction has more digits than this are opaque (keeps nerdamer exact). */
const MAX_LITERAL_DIGITS = 15;
/** Right sides whose nerdamer text exceeds this are left alone. */
const MAX_TEXT = 20000;
/** Random points of the exact check, and the size of their coordinates. */
const CHECK_POINTS = 2;
const CHECK_BITS = 30;
const CHECK_SEED = 'simplify';

// ---------------------------------------------------------------------------
// Exact rationals, for coefficients and for the check

class Q {
  private constructor(
    readonly n: bigint,
    readonly d: bigint,
  ) {}

  static of(n: bigint, d = 1n): Q {
    if (d === 0n) throw new Refused('division by zero');
    if (d < 0n) {
      n = -n;
      d = -d;
    }
    const g = gcd(n < 0n ? -n : n, d);
    return new Q(n / g, d / g);
  }

  add(o: Q): Q {
    return Q.of(this.n * o.d + o.n * this.d, this.d * o.d);
  }
  sub(o: Q): Q {
    return Q.of(this.n * o.d - o.n * this.d, this.d * o.d);
  }
  mul(o: Q): Q {
    return Q.of(this.n * o.n, this.d * o.d);
  }
  div(o: Q): Q {
    return Q.of(this.n * o.d, this.d * o.n);
  }
  neg(): Q {
    return new Q(-this.n, this.d);
  }
  pow(k: number): Q {
    const m = BigInt(Math.abs(k));
    const p = new Q(this.n ** m, this.d ** m);
    return k < 0 ? Q.of(p.d, p.n) : p;
  }
  equals(o: Q): boolean {
    return this.n === o.n && this.d === o.d;
  }
}

function gcd(a: bigint, b: bigint): bigint {
  while (b !== 0n) [a, b] = [b, a % b];
  return a === 0n ? 1n : a;
}

class Refused extends Error {}

// ---------------------------------------------------------------------------
// What is structure and what is an opaque symbol

/** The exact value of a real number literal, or null (imaginary, huge, or too many digits). */
function literalValue(e: Expr): Q | null {
  if (e.kind !== 'number' || e.imaginary) return null;
  const d = new Decimal(e.text);
  if (!d.isFinite() || Math.abs(d.e) > MAX_LITERAL_DIGITS) return null;
  // toFixed() without digits is exact, in plain notation
  const [whole, frac = ''] = d.abs().toFixed().split('.') as [string, string?];
  if (whole.length + frac.length > MAX_LITERAL_DIGITS + 1) return null;
  const n = BigInt(whole + frac);
  return Q.of(d.isNegative() ? -n : n, 10n ** BigInt(frac.length));
}

/** The integer exponent of a power (n or -n with n an integer literal), or null. */
function integerExponent(e: Expr): number | null {
  const lit = e.kind === 'neg' ? e.arg : e;
  const q = literalValue(lit);
  if (q === null || q.d !== 1n || q.n < 0n || q.n > BigInt(MAX_EXPONENT)) return null;
  const n = Number(q.n);
  return e.kind === 'neg' ? -n : n;
}

/** The opaque symbols' keys: their printed text (module header). */
class Symbols {
  readonly nodes: Expr[] = [];
  private readonly ids = new Map<string, number>();
  private readonly keys = new WeakMap<Expr, string>();

  key(e: Expr): string {
    let k = this.keys.get(e);
    if (k === undefined) {
      k = printExpr(e);
      this.keys.set(e, k);
    }
    return k;
  }

  /** The symbol's index, registering it when `add`; null for an unknown one. */
  id(e: Expr, add: boolean): number | null {
    const k = this.key(e);
    const id = this.ids.get(k);
    if (id !== undefined || !add) return id ?? null;
    this.nodes.push(e);
    this.ids.set(k, this.nodes.length - 1);
    return this.nodes.length - 1;
  }
}

/** Whether e is structure (module header); everything else is an opaque symbol. */
function isStructure(e: Expr): boolean {
  if (e.kind === 'number') return literalValue(e) !== null;
  if (e.kind === 'neg') return true;
  if (e.kind !== 'binary') return false;
  return e.op !== '^' || integerExponent(e.right) !== null;
}

function toNerdamer(e: Expr, symbols: Symbols): string {
  if (!isStructure(e)) return `p${symbols.id(e, true)!}`;
  switch (e.kind) {
    case 'number': {
      const q = literalValue(e)!;
      return q.d === 1n ? q.n.toString() : `(${q.n}/${q.d})`;
    }
    case 'neg':
      return `(-${toNerdamer(e.arg, symbols)})`;
    case 'binary':
      if (e.op === '^') return `(${toNerdamer(e.left, symbols)}^(${integerExponent(e.right)!}))`;
      return `(${toNerdamer(e.left, symbols)}${e.op}${toNerdamer(e.right, symbols)})`;
    default:
      throw new Refused(e.kind);
  }
}

// ---------------------------------------------------------------------------
// The nerdamer adapter: the only place its loosely typed API is touched here.

interface Printable {
  toString(): string;
}
/** What this module uses of nerdamer's core (untyped in its index.d.ts). */
interface Core {
  PARSER: { parse(text: string): Printable };
}
type SimplifyFn = (text: string) => Printable;

/** nerdamer's parse (automatic simplification) and simplify() of `text`, printed; failures dropped. */
function nerdamerForms(text: string): string[] {
  // the core parser, not nerdamer(text): that one also files every result in a global list
  const core = nerdamer.getCore() as Core;
  const simplify = (nerdamer as unknown as { simplify?: SimplifyFn }).simplify;
  const out: string[] = [];
  for (const run of [() => core.PARSER.parse(text), () => simplify!(text)]) {
    try {
      const s: unknown = run().toString();
      if (typeof s === 'string' && !out.includes(s)) out.push(s);
    } catch {
      // nerdamer threw (or simplify is missing): no candidate from this one
    }
  }
  return out;
}

// ---------------------------------------------------------------------------
// Tidying a read-back candidate. Every rewrite is an identity for integer exponents; the
// exact check runs on the tidied form anyway.

const num = (q: bigint, span: Span): Expr => ({ kind: 'number', text: q.toString(), imaginary: false, span });
const bin = (op: '+' | '-' | '*' | '/' | '^', left: Expr, right: Expr, span: Span): Expr => ({ kind: 'binary', op, left, right, span });
const neg = (arg: Expr, span: Span): Expr => ({ kind: 'neg', arg, span });

const isSum = (e: Expr): boolean => e.kind === 'binary' && (e.op === '+' || e.op === '-');

/** A tidied product: `abs` times -1 when `negative`. */
interface Signed {
  negative: boolean;
  abs: Expr;
}

function tidy(e: Expr): Expr {
  const s = isSum(e) || (e.kind === 'neg' && isSum(e.arg)) ? tidySum(e) : tidyProduct(e);
  return s.negative ? neg(s.abs, e.span) : s.abs;
}

/** The terms of a sum with their signs, in order (through +, - and unary minus). */
function sumTerms(e: Expr, negative: boolean, out: { negative: boolean; e: Expr }[]): void {
  if (e.kind === 'binary' && (e.op === '+' || e.op === '-')) {
    sumTerms(e.left, negative, out);
    sumTerms(e.right, e.op === '-' ? !negative : negative, out);
  } else if (e.kind === 'neg' && isSum(e.arg)) {
    sumTerms(e.arg, !negative, out);
  } else {
    out.push({ negative, e });
  }
}

/** a + b - c with a positive term first when there is one: -s + 1 -> 1 - s. */
function tidySum(e: Expr): Signed {
  const raw: { negative: boolean; e: Expr }[] = [];
  sumTerms(e, false, raw);
  const terms = raw.map((t) => {
    const p = tidyProduct(t.e);
    return { negative: p.negative !== t.negative, abs: p.abs };
  });
  const first = terms.findIndex((t) => !t.negative);
  if (first > 0) terms.unshift(...terms.splice(first, 1));
  let out = terms[0]!.negative ? neg(terms[0]!.abs, e.span) : terms[0]!.abs;
  for (const t of terms.slice(1)) out = bin(t.negative ? '-' : '+', out, t.abs, e.span);
  return { negative: false, abs: out };
}

interface Factor {
  base: Expr;
  exponent: number;
}

/** Flattens a product: literal factors into `coef`, the rest with their integer exponents. */
function productFactors(e: Expr, exponent: number, acc: { coef: Q; factors: Factor[] }): void {
  const lit = literalValue(e);
  if (lit !== null) {
    acc.coef = acc.coef.mul(lit.pow(exponent));
  } else if (e.kind === 'neg') {
    if (exponent % 2 !== 0) acc.coef = acc.coef.neg();
    productFactors(e.arg, exponent, acc);
  } else if (e.kind === 'binary' && (e.op === '*' || e.op === '/')) {
    productFactors(e.left, exponent, acc);
    productFactors(e.right, e.op === '/' ? -exponent : exponent, acc);
  } else if (e.kind === 'binary' && e.op === '^' && integerExponent(e.right) !== null) {
    productFactors(e.left, exponent * integerExponent(e.right)!, acc);
  } else if (exponent !== 0) {
    const base = isSum(e) ? tidySum(e).abs : e;
    // u^m u^n = u^(m+n) for integers m, n: the parse candidate leaves such pairs
    const key = printExpr(base);
    const same = acc.factors.find((f) => printExpr(f.base) === key);
    if (same !== undefined) same.exponent += exponent;
    else acc.factors.push({ base, exponent });
  }
}

/**
 * coefficient * factors as N/D: N the factors with positive exponents (the numerator of the
 * coefficient first), D the denominator of the coefficient and the rest. A negative sign goes
 * into the first factor that is a sum to an odd power (-(1 - s)*s -> (s - 1)*s), otherwise it
 * is returned as `negative`.
 */
function tidyProduct(e: Expr): Signed {
  const acc = { coef: Q.of(1n), factors: [] as Factor[] };
  productFactors(e, 1, acc);
  const span = e.span;
  if (acc.coef.n === 0n) return { negative: false, abs: num(0n, span) };
  let negative = acc.coef.n < 0n;
  if (negative) {
    const f = acc.factors.find((x) => x.exponent > 0 && x.exponent % 2 !== 0 && isSum(x.base));
    if (f !== undefined) {
      f.base = tidySum(neg(f.base, span)).abs;
      negative = false;
    }
  }
  acc.factors = acc.factors.filter((f) => f.exponent !== 0);
  const power = (f: Factor, k: number): Expr => (k === 1 ? f.base : bin('^', f.base, num(BigInt(k), span), span));
  const top: Expr[] = acc.factors.filter((f) => f.exponent > 0).map((f) => power(f, f.exponent));
  const bottom: Expr[] = acc.factors.filter((f) => f.exponent < 0).map((f) => power(f, -f.exponent));
  const n = acc.coef.n < 0n ? -acc.coef.n : acc.coef.n;
  if (n !== 1n || top.length === 0) top.unshift(num(n, span));
  if (acc.coef.d !== 1n) bottom.unshift(num(acc.coef.d, span));
  const times = (xs: Expr[]): Expr => xs.reduce((a, b) => bin('*', a, b, span));
  const abs = bottom.length === 0 ? times(top) : bin('/', times(top), times(bottom), span);
  return { negative, abs };
}

// ---------------------------------------------------------------------------
// The exact check

/** The value of e with the symbols at `point`; throws Refused on an unknown symbol or 1/0. */
function exactValue(e: Expr, symbols: Symbols, point: readonly Q[]): Q {
  if (!isStructure(e)) {
    const id = symbols.id(e, false);
    if (id === null) throw new Refused('a symbol that is not in the input');
    return point[id]!;
  }
  switch (e.kind) {
    case 'number':
      return literalValue(e)!;
    case 'neg':
      return exactValue(e.arg, symbols, point).neg();
    case 'binary': {
      const a = exactValue(e.left, symbols, point);
      if (e.op === '^') return a.pow(integerExponent(e.right)!);
      const b = exactValue(e.right, symbols, point);
      return e.op === '+' ? a.add(b) : e.op === '-' ? a.sub(b) : e.op === '*' ? a.mul(b) : a.div(b);
    }
    default:
      throw new Refused(e.kind);
  }
}

/** Whether candidate = input as rational functions of the symbols (module header). */
function sameFunction(input: Expr, candidate: Expr, symbols: Symbols): boolean {
  const r = new Random(CHECK_SEED);
  const max = 2 ** CHECK_BITS;
  try {
    for (let k = 0; k < CHECK_POINTS; k++) {
      const point = symbols.nodes.map(() => Q.of(BigInt(r.int(1, max)) * (r.int(0, 1) === 0 ? 1n : -1n)));
      if (!exactValue(input, symbols, point).equals(exactValue(candidate, symbols, point))) return false;
    }
    return true;
  } catch (e) {
    // a pole at a random point, or a symbol nerdamer made up: not shown equal
    if (e instanceof Refused) return false;
    throw e;
  }
}

// ---------------------------------------------------------------------------

/**
 * The right side with its products and quotients of powers simplified (module header), or
 * null when nothing prints shorter or nerdamer fails. The result shares the input's opaque
 * subtrees; new nodes carry the input's span.
 */
export function simplifyRhs(rhs: Expr): Expr | null {
  const best = simplifyWithText(rhs);
  return best === null ? null : best.expr;
}

/** printExpr of simplifyRhs(rhs), or null. */
export function simplifiedText(rhs: Expr): string | null {
  const best = simplifyWithText(rhs);
  return best === null ? null : best.text;
}

function simplifyWithText(rhs: Expr): { expr: Expr; text: string } | null {
  const symbols = new Symbols();
  let text: string;
  let before: string;
  try {
    before = printExpr(rhs);
    text = toNerdamer(rhs, symbols);
  } catch (e) {
    if (e instanceof PrintError || e instanceof Refused || e instanceof RangeError) return null;
    throw e;
  }
  // an opaque right side (a call, a series, an operator) has nothing to simplify
  if (text.length > MAX_TEXT || !isStructure(rhs)) return null;
  let best: { expr: Expr; text: string } | null = null;
  for (const out of nerdamerForms(text)) {
    const read = fromNerdamer(out, symbols.nodes, rhs.span);
    if (read === null) continue;
    let cand: Expr;
    let printed: string;
    try {
      cand = tidy(read);
      printed = printExpr(cand);
    } catch (e) {
      if (e instanceof PrintError || e instanceof Refused || e instanceof RangeError) continue;
      throw e;
    }
    if (printed.length >= (best?.text ?? before).length) continue;
    let same: boolean;
    try {
      same = sameFunction(rhs, cand, symbols);
    } catch (e) {
      // nested too deeply for the stack
      if (e instanceof RangeError) continue;
      throw e;
    }
    if (!same) continue;
    best = { expr: cand, text: printed };
  }
  return best;
}
