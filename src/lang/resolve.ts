/**
 * Name resolution: surface items (syntax.ts) -> the public AST (ast.ts), with diagnostics.
 *
 * Scoping rules:
 * - Lets are file-wide and order-independent (a claim may use a let defined below it);
 *   a let that reaches itself through let calls is an error ('recursive-let'). Let names
 *   must not clash with built-ins, constants, tau and its parts, or another let.
 * - A let body sees its parameters, built-ins, constants, other lets, and tau, x, y,
 *   taubar, q. A parameter named tau makes tau, x, y, taubar and q in the body refer to
 *   the argument, so `let F(tau) = y^2 * E(4, tau)` and `F(g(tau))` mean Im(g tau)^2 E_4(g tau).
 *   Claim parameters and the group (a, b, c, d, g) are not visible in a let body: pass them
 *   as arguments.
 * - A claim sees its parameters (for s in ...), and a, b, c, d and g(...) when it has a group
 *   clause `for g in ...`. Bound names must not clash with built-ins, constants, tau and its
 *   parts, lets, or each other.
 * - sum/prod/limit bind their variable (a `boundVar`) in their body only; the bounds (the
 *   point of a limit) are resolved outside it. The variable must not clash with a built-in
 *   name, a let, a claim or let parameter, the group (g, and a, b, c, d under a group clause;
 *   without one, d is free: sum(d | n, ...)) or an enclosing series' variable.
 * - Clause values (box corners, list elements, points, region bounds) must be constant.
 * Expansion: a let call is replaced by its body with the arguments substituted, kept in a
 * `letCall` node; equal calls (same let, same argument nodes) share one expansion, so
 * nested lets do not blow up.
 */
import { makeGroup } from '../groups/subgroups.js';
import { MAX_DIGITS, MIN_DIGITS } from '../numeric/precision.js';
import type {
  Claim,
  Comparison,
  Expr,
  FileAst,
  Operator,
  GroupClause,
  GroupEntryName,
  LetInfo,
  ParamClause,
  Region,
  RegionBound,
  RegionQuantity,
  LatticeSum,
  Limit,
  Series,
  SeriesRange,
  Settings,
  Span,
  TauRef,
} from './ast.js';
import { diagnostic, type Diagnostic, type DiagnosticCode } from './diagnostics.js';
import { dependsOnTau, tooDeep } from './depends.js';
import { BUILTINS, CONSTANTS, MAX_OPERATOR_DEPTH, OPERATORS, PLANNED, SERIES, TAU_PARTS, isBuiltin, isSeriesName, isConstant, isOperator, isTauPart, nearestNames } from './names.js';
import type { ClauseSyntax, ConditionSyntax, Item, SettingSyntax, SyntaxExpr } from './syntax.js';

type LetItem = Extract<Item, { kind: 'let' }>;
type ClaimItem = Extract<Item, { kind: 'claim' }>;

const GROUP_ENTRIES: readonly GroupEntryName[] = ['a', 'b', 'c', 'd'];

/** Names no binding may take. */
function isGlobalName(name: string): boolean {
  return isBuiltin(name) || isOperator(name) || isConstant(name) || isTauPart(name) || name === 'tau' || isSeriesName(name);
}

interface Scope {
  /** Let parameters in force: name -> the argument's expression. */
  letArgs: ReadonlyMap<string, Expr> | null;
  /** The let being resolved (for messages), or null in a claim. */
  inLet: string | null;
  /** Claim parameters. */
  params: ReadonlySet<string>;
  /** The group variable, when the claim has a group clause. */
  group: string | null;
  /** What tau, x, y, taubar, q refer to: the argument of a let's tau parameter, or null for the claim's tau. */
  tau: Expr | null;
  /** Variables of the enclosing sums and products: name -> the series key. */
  bound?: ReadonlyMap<string, number>;
}

export function resolveFile(items: Item[], file: string): { ast: FileAst; diagnostics: Diagnostic[] } {
  return new Resolver(file).run(items);
}

class Resolver {
  private readonly diagnostics: Diagnostic[] = [];
  private readonly lets = new Map<string, LetItem>();
  /** Lets whose definition has an error: uses of them fail silently (reported once, at the let). */
  private readonly brokenLets = new Set<string>();
  private readonly expansionCache = new Map<string, Expr>();
  private readonly nodeIds = new WeakMap<Expr, number>();
  private nextId = 0;
  private nextSeriesKey = 0;
  /** Set when a use of a broken let was met while resolving the current claim. */
  private usedBroken = false;
  /** While let bodies are checked one by one, let calls are validated but not expanded. */
  private checking = false;

  constructor(private readonly file: string) {}

  private report(code: DiagnosticCode, message: string, span: Span, hint?: string): null {
    this.diagnostics.push(diagnostic(code, message, span, hint));
    return null;
  }

  run(items: Item[]): { ast: FileAst; diagnostics: Diagnostic[] } {
    const defaults = this.defaults(items);
    const letInfos = this.collectLets(items);
    this.checkLets();
    const claims: Claim[] = [];
    const names = new Map<string, Span>();
    for (const it of items) {
      if (it.kind !== 'claim') continue;
      const prev = names.get(it.name);
      if (prev !== undefined && it.name !== '') {
        this.report('duplicate-name', `a claim named "${it.name}" already exists (line ${prev.line})`, it.span, 'give each claim its own name');
      } else {
        names.set(it.name, it.span);
      }
      const c = this.guardDepth(it);
      if (c !== null && prev === undefined) claims.push(c);
    }
    return { ast: { file: this.file, defaults, lets: letInfos, claims }, diagnostics: this.diagnostics };
  }

  /** Resolves a claim; lets nested in lets can still exhaust the stack: that is reported, not thrown. */
  private guardDepth(it: ClaimItem): Claim | null {
    try {
      return this.claim(it);
    } catch (e) {
      if (!isStackOverflow(e)) throw e;
      return this.report('too-complex', `claim "${it.name}" expands to an expression too deeply nested`, it.span, 'lets call lets too deeply here');
    }
  }

  // -------------------------------------------------------------------------
  // Settings

  private defaults(items: Item[]): Settings {
    const out: Settings = {};
    const seen = new Map<string, Span>();
    for (const it of items) if (it.kind === 'use') this.applySettings(it.settings, out, seen);
    return out;
  }

  /** Validates and stores settings (bad ones are reported and left unset). */
  private applySettings(list: SettingSyntax[], out: Settings, seen: Map<string, Span>): void {
    for (const s of list) {
      const prev = seen.get(s.name);
      if (prev !== undefined) {
        this.report('duplicate-clause', `${s.name} is set twice (first at line ${prev.line})`, s.fullSpan);
        continue;
      }
      seen.set(s.name, s.fullSpan);
      const v = Number(s.text);
      const isInt = /^\d+$/.test(s.text) && Number.isSafeInteger(v);
      switch (s.name) {
        case 'digits':
          if (isInt && v >= MIN_DIGITS && v <= MAX_DIGITS) out.digits = v;
          else this.report('bad-setting', `digits must be an integer from ${MIN_DIGITS} to ${MAX_DIGITS}, not ${s.text}`, s.span);
          break;
        case 'samples':
          if (isInt && v >= 1 && v <= 1e6) out.samples = v;
          else this.report('bad-setting', `samples must be an integer from 1 to 1000000, not ${s.text}`, s.span);
          break;
        case 'seed':
          if (isInt) out.seed = v;
          else this.report('bad-setting', `seed must be a non-negative integer, not ${s.text}`, s.span);
          break;
        case 'ymin':
          if (Number.isFinite(v) && v > 0) out.yMin = v;
          else this.report('bad-setting', `ymin must be a positive number, not ${s.text}`, s.span);
          break;
      }
    }
  }

  // -------------------------------------------------------------------------
  // Lets

  private collectLets(items: Item[]): LetInfo[] {
    const infos: LetInfo[] = [];
    for (const it of items) {
      if (it.kind !== 'let') continue;
      const n = it.name.name;
      if (isGlobalName(n)) {
        this.report('duplicate-name', `'${n}' is a built-in name and cannot be redefined`, it.name.span, 'choose another name');
        continue;
      }
      if (PLANNED[n] !== undefined) {
        this.report('duplicate-name', `'${n}' is reserved for a planned operator (${PLANNED[n]})`, it.name.span, 'choose another name');
        continue;
      }
      const prev = this.lets.get(n);
      if (prev !== undefined) {
        this.report('duplicate-name', `let ${n} is defined twice (first at line ${prev.name.span.line})`, it.name.span);
        continue;
      }
      this.lets.set(n, it);
      infos.push({ name: n, params: it.params.map((p) => p.name), text: it.text, span: it.span });
    }
    for (const it of this.lets.values()) {
      const seen = new Set<string>();
      for (const p of it.params) {
        if (seen.has(p.name)) {
          this.report('duplicate-name', `parameter ${p.name} appears twice in let ${it.name.name}`, p.span);
          this.brokenLets.add(it.name.name);
        } else if (isBuiltin(p.name) || isOperator(p.name) || isConstant(p.name) || this.lets.has(p.name)) {
          this.report('duplicate-name', `parameter ${p.name} of let ${it.name.name} clashes with ${this.lets.has(p.name) ? 'a let' : 'a built-in'} of that name`, p.span, 'rename the parameter');
          this.brokenLets.add(it.name.name);
        }
        seen.add(p.name);
      }
    }
    return infos;
  }

  /** Resolves every let body once (for its diagnostics) and rejects recursion. */
  private checkLets(): void {
    const deps = new Map<string, Set<string>>();
    for (const [name, it] of this.lets) {
      const d = new Set<string>();
      collectCalls(it.body, (n) => {
        if (this.lets.has(n)) d.add(n);
      });
      deps.set(name, d);
    }
    // recursion: a depth-first search; each cycle reported once, at its first let in file order
    const state = new Map<string, 'active' | 'done'>();
    const path: string[] = [];
    const reported = new Set<string>();
    const visit = (n: string): void => {
      state.set(n, 'active');
      path.push(n);
      for (const m of deps.get(n) ?? []) {
        if (state.get(m) === 'active') {
          const cycle = path.slice(path.indexOf(m));
          const key = [...cycle].sort().join(',');
          for (const c of cycle) this.brokenLets.add(c);
          if (!reported.has(key)) {
            reported.add(key);
            const it = this.lets.get(m)!;
            const chain = [...cycle, m].join(' -> ');
            this.report('recursive-let', cycle.length === 1 ? `let ${m} uses itself` : `lets call each other in a cycle: ${chain}`, it.name.span, 'a let is a macro: it cannot be recursive');
          }
        } else if (state.get(m) === undefined) {
          visit(m);
        }
      }
      path.pop();
      state.set(n, 'done');
    };
    for (const n of this.lets.keys()) if (state.get(n) === undefined) visit(n);
    // bodies, with placeholder arguments: reports unknown names etc. once per let
    this.checking = true;
    for (const [name, it] of this.lets) {
      if (this.brokenLets.has(name)) continue;
      const before = this.diagnostics.length;
      const args = new Map<string, Expr>(it.params.map((p) => [p.name, { kind: 'param', name: p.name, span: p.span } as Expr]));
      const scope: Scope = { letArgs: args, inLet: name, params: new Set(), group: null, tau: args.get('tau') ?? null };
      this.expr(it.body, scope);
      if (this.diagnostics.length > before) this.brokenLets.add(name);
    }
    this.checking = false;
    // a let that calls a broken let is broken too (no further diagnostic)
    let changed = true;
    while (changed) {
      changed = false;
      for (const [name, d] of deps) {
        if (!this.brokenLets.has(name) && [...d].some((m) => this.brokenLets.has(m))) {
          this.brokenLets.add(name);
          changed = true;
        }
      }
    }
  }

  private expand(name: string, args: Expr[], span: Span): Expr {
    // checking: the callee's body is checked on its own; a placeholder stands for it
    if (this.checking) return { kind: 'letCall', name, args, body: { kind: 'number', text: '0', imaginary: false, span }, span };
    const it = this.lets.get(name)!;
    const key = `${name}(${args.map((a) => this.id(a)).join(',')})`;
    const hit = this.expansionCache.get(key);
    const body =
      hit ??
      (() => {
        const map = new Map<string, Expr>(it.params.map((p, k) => [p.name, args[k]!]));
        const scope: Scope = { letArgs: map, inLet: name, params: new Set(), group: null, tau: map.get('tau') ?? null };
        // the body resolved cleanly in checkLets, so this reports nothing
        const r = this.expr(it.body, scope);
        this.expansionCache.set(key, r!);
        return r!;
      })();
    return { kind: 'letCall', name, args, body, span };
  }

  private id(e: Expr): number {
    let k = this.nodeIds.get(e);
    if (k === undefined) {
      k = this.nextId++;
      this.nodeIds.set(e, k);
    }
    return k;
  }

  // -------------------------------------------------------------------------
  // Expressions

  /** The resolved expression, or null after reporting (siblings are still resolved). */
  private expr(s: SyntaxExpr, scope: Scope): Expr | null {
    switch (s.kind) {
      case 'num':
        return { kind: 'number', text: s.digits, imaginary: s.imaginary, span: s.span };
      case 'neg': {
        const arg = this.expr(s.arg, scope);
        return arg === null ? null : { kind: 'neg', arg, span: s.span };
      }
      case 'binary': {
        const left = this.expr(s.left, scope);
        const right = this.expr(s.right, scope);
        return left === null || right === null ? null : { kind: 'binary', op: s.op, left, right, span: s.span };
      }
      case 'name':
        return this.name(s.name, s.span, scope);
      case 'call':
        return this.call(s, scope);
      case 'series':
        return this.series(s, scope);
      case 'limit':
        return this.limit(s, scope);
      case 'lattice':
        return this.lattice(s, scope);
    }
  }

  /** The name a series or limit variable clashes with, or null (rules at series()). */
  private boundClash(v: string, scope: Scope): string | null {
    return isGlobalName(v)
      ? 'a built-in name'
      : PLANNED[v] !== undefined
        ? 'a planned operator'
        : this.lets.has(v)
          ? 'a let'
          : scope.params.has(v)
            ? 'a parameter of the claim'
            : scope.letArgs?.has(v) === true
              ? `a parameter of let ${scope.inLet ?? ''}`
              : scope.bound?.has(v) === true
                ? 'the variable of an enclosing sum, product or limit'
                : scope.group !== null && (v === scope.group || (GROUP_ENTRIES as readonly string[]).includes(v))
                  ? 'the group element or its entries a, b, c, d'
                  : null;
  }

  /** limit(s -> a, f): a in the enclosing scope, f with s bound (same clash rules as a series). */
  private limit(s: Extract<SyntaxExpr, { kind: 'limit' }>, scope: Scope): Expr | null {
    const v = s.variable.name;
    const at = this.expr(s.at, scope);
    const clash = this.boundClash(v, scope);
    const key = this.nextSeriesKey++;
    const bound = new Map(scope.bound ?? []);
    bound.set(v, key);
    const body = this.expr(s.body, { ...scope, bound });
    if (clash !== null) return this.report('duplicate-name', `the limit variable ${v} clashes with ${clash}`, s.variable.span, 'choose another name');
    if (at === null || body === null) return null;
    const node: Limit = { kind: 'limit', variable: v, key, at, body, nameSpan: s.nameSpan, span: s.span };
    return node;
  }

  /**
   * sum/prod: the bounds in the enclosing scope, the body with the variable bound. The
   * variable must not clash with a built-in, a let, a parameter (of the claim or the let),
   * the group (g, and a, b, c, d under a group clause) or an enclosing series' variable.
   */
  private series(s: Extract<SyntaxExpr, { kind: 'series' }>, scope: Scope): Expr | null {
    const v = s.variable.name;
    let range: SeriesRange | null = null;
    if (s.range.kind === 'range') {
      const from = this.expr(s.range.from, scope);
      const to = s.range.to === null ? null : this.expr(s.range.to, scope);
      if (from !== null && (s.range.to === null || to !== null)) range = { kind: 'range', from, to };
    } else {
      const of = this.expr(s.range.of, scope);
      if (of !== null) range = { kind: 'divisors', of };
    }
    const clash = this.boundClash(v, scope);
    const key = this.nextSeriesKey++;
    const bound = new Map(scope.bound ?? []);
    bound.set(v, key);
    const body = this.expr(s.body, { ...scope, bound });
    if (clash !== null) return this.report('duplicate-name', `the ${s.op} variable ${v} clashes with ${clash}`, s.variable.span, 'choose another name');
    if (range === null || body === null) return null;
    const node: Series = { kind: 'series', op: s.op, variable: v, key, range, body, nameSpan: s.nameSpan, span: s.span };
    return node;
  }

  /** A lattice sum: the body with both variables bound (the clash rules of series()). */
  private lattice(s: Extract<SyntaxExpr, { kind: 'lattice' }>, scope: Scope): Expr | null {
    const [v1, v2] = s.variables;
    const clash1 = this.boundClash(v1.name, scope);
    const clash2 = this.boundClash(v2.name, scope);
    const keys = [this.nextSeriesKey++, this.nextSeriesKey++] as const;
    const bound = new Map(scope.bound ?? []);
    bound.set(v1.name, keys[0]);
    bound.set(v2.name, keys[1]);
    const body = this.expr(s.body, { ...scope, bound });
    if (clash1 !== null) return this.report('duplicate-name', `the lattice variable ${v1.name} clashes with ${clash1}`, v1.span, 'choose another name');
    if (clash2 !== null) return this.report('duplicate-name', `the lattice variable ${v2.name} clashes with ${clash2}`, v2.span, 'choose another name');
    if (body === null) return null;
    const node: LatticeSum = { kind: 'lattice', pairs: s.pairs, variables: [v1.name, v2.name], keys, body, nameSpan: s.nameSpan, span: s.span };
    return node;
  }

  private tauNode(scope: Scope, span: Span): Expr {
    if (scope.tau !== null) return scope.tau;
    const t: TauRef = { kind: 'tau', span };
    return t;
  }

  private name(name: string, span: Span, scope: Scope): Expr | null {
    const key = scope.bound?.get(name);
    if (key !== undefined) return { kind: 'boundVar', name, key, span };
    if (name === 'inf') return this.report('bad-range', 'inf may only end the range of a sum or product', span, 'sum(n = 1..inf, f)');
    if (name === 'limit') return this.report('not-a-value', 'limit is a construct, not a value', span, 'limit(s -> a, f)');
    if (name === 'sum' || name === 'prod') return this.report('not-a-value', `${name} is a ${name === 'sum' ? 'sum' : 'product'}`, span, SERIES[name].split(':')[0]);
    const letArg = scope.letArgs?.get(name);
    if (letArg !== undefined) return letArg;
    if (scope.params.has(name)) return { kind: 'param', name, span };
    if (name === 'tau') return this.tauNode(scope, span);
    if (isTauPart(name)) return { kind: 'tauPart', part: name, arg: this.tauNode(scope, span), span };
    if (isConstant(name)) return { kind: 'constant', name, span };
    if ((GROUP_ENTRIES as readonly string[]).includes(name)) {
      if (scope.group !== null) return { kind: 'groupEntry', entry: name as GroupEntryName, span };
      return this.groupOutside(name, span, scope);
    }
    if (isBuiltin(name)) {
      const spec = BUILTINS[name];
      return this.report('not-a-value', `${name} is a function`, span, `call it: ${spec.signature}`);
    }
    if (isOperator(name)) {
      return this.report('not-a-value', `${name} is an operator`, span, `apply it: ${OPERATORS[name].signature}`);
    }
    if (this.lets.has(name)) {
      if (this.brokenLets.has(name)) return this.brokenUse();
      const it = this.lets.get(name)!;
      if (it.params.length > 0) {
        return this.report('arity', `${name} expects ${plural(it.params.length, 'argument')}`, span, `call it: ${name}(${it.params.map((p) => p.name).join(', ')})`);
      }
      return this.expand(name, [], span);
    }
    if (name === scope.group) {
      return this.report('not-a-value', `${name} is the group element: apply it to a point, e.g. ${name}(tau)`, span);
    }
    return this.unknown(name, span, scope, null);
  }

  private brokenUse(): null {
    this.usedBroken = true;
    return null;
  }

  private groupOutside(name: string, span: Span, scope: Scope): null {
    const hint = scope.inLet !== null ? `pass it to let ${scope.inLet} as a parameter` : 'add a group clause, e.g. for g in SL2Z';
    return this.report('group-outside', `${name} is bound only by a group clause`, span, hint);
  }

  private unknown(name: string, span: Span, scope: Scope, called: number | null): null {
    if (PLANNED[name] !== undefined) {
      return this.report('not-implemented', `${name} (${PLANNED[name]}) is planned but not available yet`, span);
    }
    const candidates: string[] = [...Object.keys(BUILTINS), ...Object.keys(OPERATORS), ...Object.keys(CONSTANTS), ...Object.keys(TAU_PARTS), 'tau', ...this.lets.keys(), ...scope.params];
    if (scope.letArgs !== null) candidates.push(...scope.letArgs.keys());
    if (scope.bound !== undefined) candidates.push(...scope.bound.keys());
    if (scope.group !== null) candidates.push(scope.group, ...GROUP_ENTRIES);
    const near = nearestNames(name, candidates);
    const meant = near.length > 0 ? `did you mean ${near.map((n) => `'${n}'`).join(', ')}?` : undefined;
    let hint = meant;
    // a short name applied to one point, in a claim without a group: probably a group element
    if (called === 1 && scope.group === null && scope.inLet === null && name.length <= 2) {
      hint = `if ${name} is a group element, add a clause: for ${name} in SL2Z${meant === undefined ? '' : `; or ${meant}`}`;
    }
    if (scope.inLet !== null && near.length === 0 && called === null) hint = `claim parameters are not visible in a let: pass ${name} as a parameter of ${scope.inLet}`;
    return this.report('unknown-name', `unknown name '${name}'`, span, hint);
  }

  private call(s: Extract<SyntaxExpr, { kind: 'call' }>, scope: Scope): Expr | null {
    const name = s.name;
    if (scope.letArgs?.has(name) || scope.params.has(name) || isConstant(name) || isTauPart(name) || name === 'tau') {
      s.args.forEach((a) => this.expr(a, scope));
      return this.report('not-callable', `${name} is a value, not a function`, s.nameSpan, "write '*' for a product");
    }
    if (isOperator(name)) return this.operator(s, name, scope);
    const args: (Expr | null)[] = s.args.map((a) => this.expr(a, scope));
    const ok = (xs: (Expr | null)[]): xs is Expr[] => xs.every((x) => x !== null);
    if (name === scope.group) {
      if (s.args.length !== 1) return this.report('arity', `the group element ${name} acts on one point, not ${s.args.length}`, s.span, `${name}(tau)`);
      return ok(args) ? { kind: 'moebius', group: name, arg: args[0]!, span: s.span } : null;
    }
    if (isBuiltin(name)) {
      const spec = BUILTINS[name];
      if (!spec.arities.includes(s.args.length)) {
        const expected = spec.arities.map((n) => String(n)).join(' or ');
        return this.report('arity', `${name} expects ${expected} argument${spec.arities.length === 1 && spec.arities[0] === 1 ? '' : 's'}, got ${s.args.length}`, s.span, spec.signature);
      }
      return ok(args) ? { kind: 'call', fn: name, args, nameSpan: s.nameSpan, span: s.span } : null;
    }
    if (this.lets.has(name)) {
      const it = this.lets.get(name)!;
      if (it.params.length !== s.args.length) {
        const sig = `${name}(${it.params.map((p) => p.name).join(', ')})`;
        return this.report('arity', `${name} expects ${plural(it.params.length, 'argument')}, got ${s.args.length}`, s.span, sig);
      }
      if (this.brokenLets.has(name)) return this.brokenUse();
      return ok(args) ? this.expand(name, args, s.span) : null;
    }
    if ((GROUP_ENTRIES as readonly string[]).includes(name)) return this.report('not-callable', `${name} is a matrix entry, not a function`, s.nameSpan);
    return this.unknown(name, s.nameSpan, scope, s.args.length);
  }

  /**
   * op(f) or op(k, f). The operand is a function of tau: in a let with a tau parameter the
   * operand's tau is the variable (not the argument), and the result is taken at the
   * argument (`at`). The weight is resolved in the outer scope and must not depend on tau.
   */
  private operator(s: Extract<SyntaxExpr, { kind: 'call' }>, op: Operator['op'], scope: Scope): Expr | null {
    const spec = OPERATORS[op];
    const want = spec.weighted ? 2 : 1;
    if (s.args.length !== want) {
      s.args.forEach((a) => this.expr(a, scope));
      return this.report('arity', `${op} expects ${plural(want, 'argument')}, got ${s.args.length}`, s.span, spec.signature);
    }
    let weight: Expr | null = null;
    let weightOk = true;
    if (spec.weighted) {
      weight = this.expr(s.args[0]!, scope);
      if (weight !== null && dependsOnTau(weight)) {
        this.report('not-constant', `the weight of ${op} cannot depend on tau`, s.args[0]!.span, `${spec.signature}: k is a number or a parameter`);
        weightOk = false;
      }
    }
    let inner = scope;
    const frozen: Expr[] = [];
    if (scope.tau !== null && scope.letArgs !== null) {
      const letArgs = new Map(scope.letArgs);
      letArgs.delete('tau');
      inner = { ...scope, letArgs, tau: null };
      // the other arguments belong to the caller's tau: held fixed while the operand's tau moves
      for (const a of letArgs.values()) if (dependsOnTau(a)) frozen.push(a);
    }
    const arg = this.expr(s.args[want - 1]!, inner);
    if (arg === null || !weightOk || (spec.weighted && weight === null)) return null;
    const node: Operator = { kind: 'operator', op, weight, arg, at: scope.tau, frozen, nameSpan: s.nameSpan, span: s.span };
    return node;
  }

  /** Reports operators nested deeper than MAX_OPERATOR_DEPTH (at the outermost such node). */
  private checkDepth(e: Expr | null): Expr | null {
    if (e === null) return null;
    const bad = tooDeep(e, MAX_OPERATOR_DEPTH);
    if (bad === null) return e;
    const where = bad.kind === 'letCall' ? ` (through let ${bad.name})` : '';
    return this.report('operator-depth', `differential operators nest more than ${MAX_OPERATOR_DEPTH} deep here${where}`, bad.span, `at most ${MAX_OPERATOR_DEPTH} nested operators: each level multiplies the evaluations by about 13`);
  }

  // -------------------------------------------------------------------------
  // Claims

  private claim(it: ClaimItem): Claim | null {
    const before = this.diagnostics.length;
    this.usedBroken = false;
    const seen = new Map<string, Span>();
    const dup = (what: string, span: Span): boolean => {
      const prev = seen.get(what);
      if (prev !== undefined) {
        this.report('duplicate-clause', `a second ${what} clause (first at line ${prev.line})`, span);
        return true;
      }
      seen.set(what, span);
      return false;
    };
    // bindings first, so clause values and the equation see them
    let group: GroupClause | undefined;
    const params = new Set<string>();
    const bound = new Map<string, Span>();
    const bind = (name: string, span: Span, isGroup: boolean): void => {
      const clash = isGlobalName(name)
        ? 'a built-in name'
        : this.lets.has(name)
          ? 'a let'
          : bound.has(name)
            ? `the variable bound at line ${bound.get(name)!.line}`
            : isGroup && (GROUP_ENTRIES as readonly string[]).includes(name)
              ? 'a matrix entry a, b, c, d'
              : PLANNED[name] !== undefined
                ? 'a planned operator'
                : null;
      if (clash !== null) this.report('duplicate-name', `${name} clashes with ${clash}`, span, 'choose another name');
      else bound.set(name, span);
    };
    for (const cl of it.clauses) {
      if (cl.kind !== 'for') continue;
      if (cl.domain.kind === 'group') {
        if (dup('group', cl.span)) continue;
        // bound even after a clash, so the equation does not report the name again
        bind(cl.variable.name, cl.variable.span, true);
        const d = cl.domain;
        group = { kind: 'group', variable: cl.variable.name, group: d.group === 'SL2Z' ? makeGroup('SL2Z') : makeGroup(d.group, d.level), span: cl.span };
      } else {
        bind(cl.variable.name, cl.variable.span, false);
        params.add(cl.variable.name);
      }
    }
    if (group !== undefined) {
      for (const e of GROUP_ENTRIES) {
        if (params.has(e)) this.report('duplicate-name', `${e} clashes with the matrix entry ${e} of ${group.variable}`, bound.get(e) ?? group.span, 'choose another name');
      }
    }
    const scope: Scope = { letArgs: null, inLet: null, params, group: group?.variable ?? null, tau: null };

    const out: Omit<Claim, 'lhs' | 'rhs' | 'text' | 'lhsText' | 'rhsText' | 'equationSpan'> = {
      name: it.name,
      span: it.span,
      expect: 'holds',
      params: [],
    };
    if (group !== undefined) out.group = group;
    const settings: Settings = {};
    const settingSeen = new Map<string, Span>();
    for (const cl of it.clauses) this.clause(cl, scope, out, settings, settingSeen, dup);
    Object.assign(out, settings);

    let lhs: Expr | null = null;
    let rhs: Expr | null = null;
    if (it.equation !== null) {
      lhs = this.checkDepth(this.expr(it.equation.lhs, scope));
      rhs = this.checkDepth(this.expr(it.equation.rhs, scope));
    }
    if (it.broken || this.usedBroken || this.diagnostics.length > before || lhs === null || rhs === null || it.equation === null) return null;
    const eq = it.equation;
    return { ...out, lhs, rhs, text: eq.text, lhsText: eq.lhsText, rhsText: eq.rhsText, equationSpan: eq.span };
  }

  private clause(
    cl: ClauseSyntax,
    scope: Scope,
    out: Omit<Claim, 'lhs' | 'rhs' | 'text' | 'lhsText' | 'rhsText' | 'equationSpan'>,
    settings: Settings,
    settingSeen: Map<string, Span>,
    dup: (what: string, span: Span) => boolean,
  ): void {
    switch (cl.kind) {
      case 'for': {
        const d = cl.domain;
        const name = cl.variable.name;
        let p: ParamClause | null = null;
        switch (d.kind) {
          case 'group':
            return;
          case 'interval': {
            const lo = this.constant(d.lo, scope);
            const hi = this.constant(d.hi, scope);
            if (lo !== null && hi !== null) p = { kind: 'interval', name, lo, hi, span: cl.span };
            break;
          }
          case 'box': {
            const corner1 = this.constant(d.corner1, scope);
            const corner2 = this.constant(d.corner2, scope);
            if (corner1 !== null && corner2 !== null) p = { kind: 'box', name, corner1, corner2, span: cl.span };
            break;
          }
          case 'list': {
            const values = d.values.map((v) => this.constant(v, scope));
            if (values.every((v): v is Expr => v !== null)) p = { kind: 'list', name, values, span: cl.span };
            break;
          }
          case 'intRange':
            p = { kind: 'intRange', name, lo: d.lo, hi: d.hi, span: cl.span };
            break;
        }
        if (p !== null) out.params.push(p);
        return;
      }
      case 'at': {
        if (dup('at', cl.span)) return;
        const points = cl.points.map((v) => this.constant(v, scope));
        if (points.every((v): v is Expr => v !== null)) out.at = { points, span: cl.span };
        return;
      }
      case 'region': {
        if (dup('region', cl.span)) return;
        const r = this.region(cl.conditions, scope, cl.span);
        if (r !== null) out.region = r;
        return;
      }
      case 'settings':
        this.applySettings(cl.settings, settings, settingSeen);
        return;
      case 'expect':
        if (!dup('expect', cl.span)) out.expect = cl.value;
        return;
      case 'source':
        if (!dup('source', cl.span)) out.source = cl.value;
        return;
    }
  }

  /** A clause value: resolved, then checked to depend on nothing sampled. */
  private constant(s: SyntaxExpr, scope: Scope): Expr | null {
    const e = this.expr(s, scope);
    if (e === null) return null;
    const bad = firstNonConstant(e);
    if (bad === null) return e;
    const inside = bad.span.start >= s.span.start && bad.span.end <= s.span.end;
    const what = bad.kind === 'param' ? `the parameter ${bad.name}` : bad.kind === 'groupEntry' || bad.kind === 'moebius' ? 'the group element' : 'tau';
    return this.report('not-constant', `a clause value cannot depend on ${what}`, inside ? bad.span : s.span, 'clause values are fixed numbers such as 1/2, 2 + 3i, sqrt(3)/2');
  }

  private region(conds: ConditionSyntax[], scope: Scope, span: Span): Region | null {
    const bounds: RegionBound[] = [];
    let ok = true;
    for (const c of conds) {
      const qIdx = c.operands.map(quantityOf);
      const at = qIdx.findIndex((q) => q !== null);
      const count = qIdx.filter((q) => q !== null).length;
      const forms = 'forms: y >= 1/2, x < 0, abs(x) <= 1/2, abs(tau) >= 1, 0.5 <= y <= 2 (joined with and)';
      if (count !== 1 || (c.operands.length === 3 && at !== 1)) {
        this.report('bad-region', count === 0 ? 'a region condition must bound x, y, abs(x) or abs(tau)' : 'a region condition bounds one quantity against constants', c.span, forms);
        ok = false;
        continue;
      }
      if (c.ops.length === 2 && direction(c.ops[0]!) !== direction(c.ops[1]!)) {
        this.report('bad-region', 'a chained condition must run one way (lo <= y <= hi)', c.span, forms);
        ok = false;
        continue;
      }
      const quantity = qIdx[at]!;
      for (let k = 0; k < c.ops.length; k++) {
        // operands k and k+1; the quantity is one of them
        const other = at === k ? k + 1 : at === k + 1 ? k : -1;
        if (other < 0) continue;
        const bound = this.constant(c.operands[other]!, scope);
        if (bound === null) {
          ok = false;
          continue;
        }
        const op = at === k ? c.ops[k]! : flip(c.ops[k]!);
        bounds.push({ quantity, op, bound, span: c.span });
      }
    }
    return ok ? { bounds, span } : null;
  }
}

// ---------------------------------------------------------------------------

/** The engine's stack overflow (a RangeError; BigInt size errors are RangeErrors too). */
export function isStackOverflow(e: unknown): boolean {
  return e instanceof RangeError && /call stack/i.test(e.message);
}

function plural(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? '' : 's'}`;
}

/** Calls every name applied or mentioned in a syntax tree (for let dependencies). */
function collectCalls(s: SyntaxExpr, f: (name: string) => void): void {
  switch (s.kind) {
    case 'num':
      return;
    case 'name':
      f(s.name);
      return;
    case 'call':
      f(s.name);
      for (const a of s.args) collectCalls(a, f);
      return;
    case 'neg':
      collectCalls(s.arg, f);
      return;
    case 'binary':
      collectCalls(s.left, f);
      collectCalls(s.right, f);
      return;
    case 'limit':
      collectCalls(s.at, f);
      collectCalls(s.body, f);
      return;
    case 'lattice':
      collectCalls(s.body, f);
      return;
    case 'series':
      collectCalls(s.body, f);
      if (s.range.kind === 'divisors') collectCalls(s.range.of, f);
      else {
        collectCalls(s.range.from, f);
        if (s.range.to !== null) collectCalls(s.range.to, f);
      }
  }
}

/** The first node that depends on tau, a parameter or the group, or null (DAG walk). */
function firstNonConstant(root: Expr): Expr | null {
  const seen = new Set<Expr>();
  const walk = (e: Expr): Expr | null => {
    if (seen.has(e)) return null;
    seen.add(e);
    switch (e.kind) {
      case 'number':
      case 'constant':
        return null;
      case 'tau':
      case 'param':
      case 'groupEntry':
      case 'moebius':
        return e;
      case 'tauPart':
        return walk(e.arg) === null ? null : e;
      case 'neg':
        return walk(e.arg);
      case 'binary':
        return walk(e.left) ?? walk(e.right);
      case 'call':
        for (const a of e.args) {
          const r = walk(a);
          if (r !== null) return r;
        }
        return null;
      case 'letCall': {
        const r = walk(e.body);
        // point at the call, not into the let's definition
        return r === null ? null : e;
      }
      case 'operator':
        // taken at the environment's tau, or at a let's argument
        return e.at === null || e.frozen.length > 0 ? e : walk(e.at) === null ? null : e;
      case 'boundVar':
        return null;
      case 'limit':
        return walk(e.at) ?? walk(e.body);
      case 'lattice':
        return walk(e.body);
      case 'series': {
        const parts = e.range.kind === 'divisors' ? [e.range.of, e.body] : [e.range.from, ...(e.range.to === null ? [] : [e.range.to]), e.body];
        for (const p of parts) {
          const r = walk(p);
          if (r !== null) return r;
        }
        return null;
      }
    }
  };
  return walk(root);
}

/** Which region quantity a syntax operand is, if any. */
function quantityOf(s: SyntaxExpr): RegionQuantity | null {
  if (s.kind === 'name' && (s.name === 'x' || s.name === 'y')) return s.name;
  if (s.kind === 'call' && s.args.length === 1) {
    const a = s.args[0]!;
    if (s.name === 'abs' && a.kind === 'name' && a.name === 'x') return 'absx';
    if (s.name === 'abs' && a.kind === 'name' && a.name === 'tau') return 'abstau';
    if (s.name === 're' && a.kind === 'name' && a.name === 'tau') return 'x';
    if (s.name === 'im' && a.kind === 'name' && a.name === 'tau') return 'y';
  }
  return null;
}

function direction(op: Comparison): 'up' | 'down' {
  return op === '<' || op === '<=' ? 'up' : 'down';
}

function flip(op: Comparison): Comparison {
  return op === '<' ? '>' : op === '<=' ? '>=' : op === '>' ? '<' : '<=';
}
