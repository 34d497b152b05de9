/**
 * Exact derivatives of elementary operands of the differential operators
 * (derivative.ts), by nerdamer (1.1.x, its Calculus module).
 *
 * Conventions: tau = x + i y with x, y real; taubar = x - i y; q = exp(2 pi i tau). The
 * derivatives are d_x, d_y, d_x^2, d_y^2 of the operand as a function of (x, y), and the
 * combinations d_x^2 + d_y^2 and (1/2)(d_x -+ i d_y) the operators use.
 *
 * Elementary operand: built from tau, x, y, taubar, q (of tau), neg, + - * / ^, exp, log,
 * sqrt, sin, cos, sinh, cosh and let calls (their bodies), over sub-expressions held
 * constant: tau-free ones (numbers, pi, i, euler, rho, parameters, free series variables,
 * Gamma(s), ...) and the operator's frozen let arguments. Not: abs, re, im, conj, arg,
 * special or modular functions of tau, nested operators, group actions.
 *
 * Method. The operand becomes nerdamer text in x, y (and nerdamer's i, in x + i y and
 * x - i y only); every constant sub-expression except a small integer is an opaque symbol
 * p0, p1, ... In 1.1.13 nerdamer approximates pi by a float fraction, turns
 * exp(2 pi i (x + i y)) into -1, drops log(i) from d/dy (2i)^y and simplifies square roots
 * wrongly (d_x^2 (sqrt(y) cosh x) = cosh(x) sqrt(y^(1/4))); so pi, constants with i and 1/2
 * never reach it as such, and sqrt(a) is passed as a^(1/2) with 1/2 opaque (the principal
 * branch either way, as in evaluate.ts). nerdamer prints exp(a) as e^a, sqrt as sqrt and i
 * as i; its printed result is read back by the small parser below into AST nodes (ast.ts,
 * the operand's span on every new node; opaque symbols become their original nodes, so the
 * evaluator seeds frozen arguments as usual). The result is refused (null: the caller
 * differences numerically) when nerdamer throws or prints anything outside that grammar: a
 * decimal (it left exact arithmetic), abs (it writes sqrt(a^2) as abs(a), true for real a
 * only), pi, or any other function or name. Because nerdamer also simplifies under
 * real-variable assumptions ((x^2)^s -> x^(2s)), derivative.ts checks every symbolic value
 * numerically.
 *
 * Safety: nothing from a claim is executed as code. The text given to nerdamer is built
 * here from the AST (integers, x, y, i, p<n>, operators and the six function names); no
 * claim text, no JavaScript eval or Function.
 *
 *   symbolicPartial(node, 'yy')   // the AST of d_y^2 of node.arg, or null
 *   symbolicPartial(node, 'lap')  // d_x^2 + d_y^2, simplified as one expression
 */
import { Decimal } from 'decimal.js';
import nerdamer from 'nerdamer';
import 'nerdamer/Calculus.js';
import type { BinaryOp, BuiltinName, Expr, Operator, Span } from '../lang/ast.js';
import { dependsOnTau } from '../lang/depends.js';

/**
 * d_x, d_y, d_x^2, d_y^2; 'lap': d_x^2 + d_y^2 (without the factor y^2); 'tau', 'taubar':
 * (1/2)(d_x -+ i d_y). The combinations are simplified by nerdamer as one expression.
 */
export type SymbolicDerivative = 'x' | 'y' | 'xx' | 'yy' | 'lap' | 'tau' | 'taubar';

/** Elementary functions passed to nerdamer under their own names (sqrt goes as a power). */
const FUNCTIONS: ReadonlySet<string> = new Set(['exp', 'log', 'sin', 'cos', 'sinh', 'cosh']);
/** Integers up to this size go to nerdamer as digits (it keeps them exact); others are opaque. */
const MAX_INLINE = new Decimal('1e15');
/** Operands whose nerdamer text exceeds this are differenced numerically (DAG expansion). */
const MAX_TEXT = 20000;

// ---------------------------------------------------------------------------
// The nerdamer adapter: the only place its loosely typed API is touched.

/** nerdamer's derivative (or combination of derivatives) of `text`, printed; null if it throws. */
function nerdamerDerivative(text: string, which: SymbolicDerivative): string | null {
  // Expression methods, not nerdamer(text): that one also files every result in a global list
  const diff = (v: 'x' | 'y', n: 1 | 2): nerdamer.Expression => nerdamer.diff(text, v, n);
  try {
    let r: nerdamer.Expression;
    switch (which) {
      case 'x':
      case 'y':
        r = diff(which, 1);
        break;
      case 'xx':
      case 'yy':
        r = diff(which === 'xx' ? 'x' : 'y', 2);
        break;
      case 'lap':
        r = diff('x', 2).add(diff('y', 2));
        break;
      case 'tau':
      case 'taubar': {
        const iy = diff('y', 1).multiply('i');
        r = (which === 'tau' ? diff('x', 1).subtract(iy) : diff('x', 1).add(iy)).divide(2);
        break;
      }
    }
    const out: unknown = r.toString();
    return typeof out === 'string' ? out : null;
  } catch {
    return null;
  }
}

// ---------------------------------------------------------------------------
// AST -> nerdamer text

interface Conversion {
  text: string;
  /** The node each opaque symbol p<n> stands for. */
  symbols: Expr[];
}

class Unsupported extends Error {}

class ToText {
  readonly symbols: Expr[] = [];
  private readonly ids = new Map<Expr, number>();
  private readonly memo = new Map<Expr, string>();
  private piNode: Expr | null = null;
  private halfNode: Expr | null = null;
  private size = 0;

  constructor(
    private readonly frozen: ReadonlySet<Expr>,
    private readonly span: Span,
  ) {}

  private symbol(e: Expr): string {
    let id = this.ids.get(e);
    if (id === undefined) {
      id = this.symbols.length;
      this.symbols.push(e);
      this.ids.set(e, id);
    }
    return `p${id}`;
  }

  /** nerdamer's own i, for x + i y: it multiplies those correctly (not inside constants). */
  private i(): string {
    return 'i';
  }

  private pi(): string {
    this.piNode ??= { kind: 'constant', name: 'pi', span: this.span };
    return this.symbol(this.piNode);
  }

  private half(): string {
    this.halfNode ??= { kind: 'number', text: '0.5', imaginary: false, span: this.span };
    return this.symbol(this.halfNode);
  }

  run(e: Expr): string {
    const hit = this.memo.get(e);
    if (hit !== undefined) return hit;
    const t = this.node(e);
    this.size += t.length;
    if (this.size > MAX_TEXT) throw new Unsupported('too large');
    this.memo.set(e, t);
    return t;
  }

  private node(e: Expr): string {
    if (this.frozen.has(e)) return this.symbol(e);
    if (!dependsOnTau(e)) {
      if (e.kind === 'number' && !e.imaginary) {
        const d = new Decimal(e.text);
        if (d.isInteger() && d.abs().lt(MAX_INLINE)) return d.isNegative() ? `(${d.toFixed()})` : d.toFixed();
      }
      return this.symbol(e);
    }
    switch (e.kind) {
      case 'tau':
        return `(x+${this.i()}*y)`;
      case 'tauPart': {
        if (e.part === 'q') return `exp(2*${this.pi()}*${this.i()}*${this.run(e.arg)})`;
        // x, y, taubar of a tau other than the operand's own would need Re/Im of an expression
        if (e.arg.kind !== 'tau') throw new Unsupported('part of a moved tau');
        return e.part === 'x' ? 'x' : e.part === 'y' ? 'y' : `(x-${this.i()}*y)`;
      }
      case 'neg':
        return `(-${this.run(e.arg)})`;
      case 'binary':
        return `(${this.run(e.left)}${e.op}${this.run(e.right)})`;
      case 'call': {
        if (e.args.length !== 1) throw new Unsupported(e.fn);
        const a = this.run(e.args[0]!);
        // principal sqrt a = a^(1/2) = exp(log(a)/2): the same branch in evaluate.ts
        if (e.fn === 'sqrt') return `(${a}^${this.half()})`;
        if (!FUNCTIONS.has(e.fn)) throw new Unsupported(e.fn);
        return `${e.fn}(${a})`;
      }
      case 'letCall':
        return this.run(e.body);
      default:
        throw new Unsupported(e.kind);
    }
  }
}

/** The operand as nerdamer text, or null when it is not elementary (module header). */
function toNerdamer(node: Operator): Conversion | null {
  const w = new ToText(new Set(node.frozen), node.arg.span);
  try {
    return { text: w.run(node.arg), symbols: w.symbols };
  } catch (e) {
    // RangeError: nested too deeply for the stack; the differences walk it as evaluate does
    if (e instanceof Unsupported || e instanceof RangeError) return null;
    throw e;
  }
}

// ---------------------------------------------------------------------------
// nerdamer text -> AST: integers, x, y, i, p<n>, e^a, the functions, + - * / ^ and parentheses

type Token = { t: 'num' | 'name'; v: string } | { t: 'op'; v: string };

function tokenize(s: string): Token[] | null {
  const out: Token[] = [];
  let k = 0;
  while (k < s.length) {
    const c = s[k]!;
    if (c === ' ') {
      k++;
    } else if (/[0-9]/.test(c)) {
      let j = k;
      while (j < s.length && /[0-9]/.test(s[j]!)) j++;
      // a decimal point means nerdamer left exact arithmetic
      if (s[j] === '.') return null;
      out.push({ t: 'num', v: s.slice(k, j) });
      k = j;
    } else if (/[a-z]/i.test(c)) {
      let j = k;
      while (j < s.length && /[a-z0-9_]/i.test(s[j]!)) j++;
      out.push({ t: 'name', v: s.slice(k, j) });
      k = j;
    } else if ('+-*/^()'.includes(c)) {
      out.push({ t: 'op', v: c });
      k++;
    } else {
      return null;
    }
  }
  return out;
}

class FromText {
  private k = 0;
  private readonly tau: Expr;

  constructor(
    private readonly tokens: Token[],
    private readonly symbols: Expr[],
    private readonly span: Span,
  ) {
    this.tau = { kind: 'tau', span };
  }

  parse(): Expr {
    const e = this.sum();
    if (this.k !== this.tokens.length) throw new Unsupported('trailing input');
    return e;
  }

  private peek(v: string): boolean {
    const t = this.tokens[this.k];
    return t !== undefined && t.t === 'op' && t.v === v;
  }

  private expect(v: string): void {
    if (!this.peek(v)) throw new Unsupported(`expected ${v}`);
    this.k++;
  }

  private bin(op: BinaryOp, left: Expr, right: Expr): Expr {
    return { kind: 'binary', op, left, right, span: this.span };
  }

  private sum(): Expr {
    let e = this.product();
    while (this.peek('+') || this.peek('-')) {
      const op = this.tokens[this.k++]!.v as '+' | '-';
      e = this.bin(op, e, this.product());
    }
    return e;
  }

  private product(): Expr {
    let e = this.unary();
    while (this.peek('*') || this.peek('/')) {
      const op = this.tokens[this.k++]!.v as '*' | '/';
      e = this.bin(op, e, this.unary());
    }
    return e;
  }

  /** -a^b is -(a^b), as in nerdamer's output. */
  private unary(): Expr {
    if (this.peek('-')) {
      this.k++;
      return { kind: 'neg', arg: this.unary(), span: this.span };
    }
    if (this.peek('+')) {
      this.k++;
      return this.unary();
    }
    return this.power();
  }

  /** a^b^c = a^(b^c); the exponent may carry a sign. */
  private power(): Expr {
    const t = this.tokens[this.k];
    // e^a is exp(a): nerdamer prints exp that way
    if (t !== undefined && t.t === 'name' && t.v === 'e' && this.tokens[this.k + 1]?.v === '^') {
      this.k += 2;
      return this.call('exp', this.unary());
    }
    const base = this.atom();
    if (!this.peek('^')) return base;
    this.k++;
    return this.bin('^', base, this.unary());
  }

  private call(fn: BuiltinName, arg: Expr): Expr {
    return { kind: 'call', fn, args: [arg], nameSpan: this.span, span: this.span };
  }

  private atom(): Expr {
    const t = this.tokens[this.k++];
    if (t === undefined) throw new Unsupported('end of input');
    if (t.t === 'num') return { kind: 'number', text: t.v, imaginary: false, span: this.span };
    if (t.t === 'op') {
      if (t.v !== '(') throw new Unsupported(t.v);
      const e = this.sum();
      this.expect(')');
      return e;
    }
    const name = t.v;
    if (name === 'x' || name === 'y') return { kind: 'tauPart', part: name, arg: this.tau, span: this.span };
    const m = /^p([0-9]+)$/.exec(name);
    if (m !== null) {
      const s = this.symbols[Number(m[1])];
      if (s === undefined) throw new Unsupported(name);
      return s;
    }
    if (name === 'e') return this.call('exp', { kind: 'number', text: '1', imaginary: false, span: this.span });
    if (name === 'i') return { kind: 'constant', name: 'i', span: this.span };
    // abs, nerdamer's own pi, or any other function: refuse (module header)
    if (name !== 'sqrt' && !FUNCTIONS.has(name)) throw new Unsupported(name);
    this.expect('(');
    const a = this.sum();
    this.expect(')');
    return this.call(name as BuiltinName, a);
  }
}

export function fromNerdamer(text: string, symbols: Expr[], span: Span): Expr | null {
  const tokens = tokenize(text);
  if (tokens === null || tokens.length === 0) return null;
  try {
    return new FromText(tokens, symbols, span).parse();
  } catch (e) {
    if (e instanceof Unsupported) return null;
    throw e;
  }
}

// ---------------------------------------------------------------------------

interface Entry {
  conv: Conversion | null;
  partials: Map<SymbolicDerivative, Expr | null>;
}

// keyed by the operator node: its frozen arguments are part of what "constant" means
const cache = new WeakMap<Operator, Entry>();

/** Whether the operand of `node` is elementary (module header). */
export function isElementary(node: Operator): boolean {
  return entry(node).conv !== null;
}

function entry(node: Operator): Entry {
  let en = cache.get(node);
  if (en === undefined) {
    en = { conv: toNerdamer(node), partials: new Map() };
    cache.set(node, en);
  }
  return en;
}

/**
 * The AST of a derivative of node.arg in x, y (tau nodes of its own; constants are
 * the operand's nodes), or null: not elementary, or nerdamer failed or printed something
 * outside the grammar above. Cached on the node.
 */
export function symbolicPartial(node: Operator, which: SymbolicDerivative): Expr | null {
  const en = entry(node);
  if (en.conv === null) return null;
  if (en.partials.has(which)) return en.partials.get(which)!;
  const out = nerdamerDerivative(en.conv.text, which);
  const r = out === null ? null : fromNerdamer(out, en.conv.symbols, node.arg.span);
  en.partials.set(which, r);
  return r;
}
