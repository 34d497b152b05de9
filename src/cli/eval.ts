/**
 * `modvet eval "<expression>" --at "tau=0.1+1.2i" --at "s=2.5" [--digits N] [--json]`:
 * one value, correctly rounded to N significant digits.
 *
 * The expression and the --at values are read by the claim language's own parser (as a
 * one-claim source: the values become fixed points and one-value lists), so the names and
 * the error messages are those of .vet files. Rounding: the value is computed at N + 10
 * and N + 25 digits; both are rounded to N significant digits of |value| (a part smaller
 * than the last digit becomes 0); when the two roundings differ, the precision is raised
 * until they agree, and printed only then.
 */
import { Decimal } from 'decimal.js';
import { Complex } from '../numeric/complex.js';
import { ModvetError } from '../numeric/errors.js';
import { MAX_DIGITS, withDigits } from '../numeric/precision.js';
import { parseSource } from '../lang/parser.js';
import { renderDiagnostic, type Diagnostic } from '../lang/diagnostics.js';
import type { Expr } from '../lang/ast.js';
import { evaluate, evaluateConstant, type EvalResult } from '../eval/evaluate.js';
import { asModvetError } from '../check/fromAst.js';
import { digitsOption, UsageError } from './options.js';
import type { Streams } from './program.js';

export interface EvalFlags {
  at?: string[];
  digits?: string;
  json?: boolean;
  ymin?: string;
}

const NAME = /^[A-Za-z][A-Za-z0-9_]*$/;

function usesTau(e: Expr): boolean {
  switch (e.kind) {
    case 'tau':
      return true;
    case 'tauPart':
      return usesTau(e.arg);
    case 'neg':
      return usesTau(e.arg);
    case 'binary':
      return usesTau(e.left) || usesTau(e.right);
    case 'call':
      return e.args.some(usesTau);
    case 'letCall':
      return usesTau(e.body);
    case 'series':
      return (
        usesTau(e.body) ||
        (e.range.kind === 'range' ? usesTau(e.range.from) || (e.range.to !== null && usesTau(e.range.to)) : usesTau(e.range.of))
      );
    case 'limit':
      return usesTau(e.at) || usesTau(e.body);
    case 'lattice':
      return usesTau(e.body);
    case 'moebius':
    case 'operator':
      // operators act on tau; the moebius action needs the claim's group element
      return true;
    default:
      return false;
  }
}

/** Rounds z to N significant digits of |z|; parts below the last digit become 0. */
export function roundComplex(z: Complex, N: number): Complex {
  if (z.isZero()) return Complex.ZERO;
  return withDigits(Math.min(MAX_DIGITS, N + 20), () => {
    const e = z.abs().e; // floor(log10 |z|)
    const places = N - 1 - e;
    const r = (d: Decimal) => (places >= 0 ? d.toDecimalPlaces(places) : d.toNearest(new Decimal(10).pow(-places)));
    return new Complex(r(z.re), r(z.im));
  });
}

export function formatComplex(z: Complex): string {
  const im = z.im;
  return `${z.re.toString()} ${im.isNegative() ? '-' : '+'} ${im.abs().toString()} i`;
}

export function runEval(expression: string, flags: EvalFlags, io: Streams): number {
  const N = flags.digits !== undefined ? digitsOption(flags.digits) : 30;
  const lines = ['claim "eval"'];
  let tauLine: string | null = null;
  const names = new Set<string>();
  for (const a of flags.at ?? []) {
    const eq = a.indexOf('=');
    const name = eq < 0 ? '' : a.slice(0, eq).trim();
    const value = eq < 0 ? '' : a.slice(eq + 1).trim();
    if (!NAME.test(name) || value === '') throw new UsageError(`--at ${a}: expected name=value, e.g. --at "tau=0.1+1.2i"`);
    if (names.has(name)) throw new UsageError(`--at ${a}: ${name} is given twice`);
    names.add(name);
    if (name === 'tau') tauLine = `  at tau in {${value}}`;
    else lines.push(`  for ${name} in {${value}}`);
  }
  if (tauLine !== null) lines.push(tauLine);
  const prefix = lines.join('\n') + '\n  ';
  const text = `${prefix}${expression.replace(/\n/g, ' ')} = 0\n`;
  const { ast, diagnostics } = parseSource(text, '<eval>');
  if (diagnostics.length > 0) {
    for (const d of diagnostics) io.err(renderForUser(d, text, prefix.length, expression) + '\n');
    return 2;
  }
  const claim = ast.claims[0];
  if (claim === undefined) throw new UsageError('nothing to evaluate');
  if (usesTau(claim.lhs) && claim.at === undefined) {
    throw new UsageError('the expression uses tau: give a point, e.g. --at "tau=0.1+1.2i"');
  }
  const yMin = flags.ymin !== undefined ? Number(flags.ymin) : undefined;
  const at = (P: number): EvalResult =>
    withDigits(P, () => {
      const params = new Map<string, Complex>();
      for (const p of claim.params) if (p.kind === 'list') params.set(p.name, evaluateConstant(p.values[0]!));
      const tau = claim.at !== undefined ? evaluateConstant(claim.at.points[0]!) : Complex.I;
      try {
        return evaluate(claim.lhs, { tau, params, ...(yMin !== undefined ? { yMin } : {}) });
      } catch (e) {
        throw asModvetError(e);
      }
    });
  // a value below its own error bound (10^-P scale, evaluate.ts) is zero as far as P digits tell
  const isNoise = (r: { value: Complex; scale: Decimal }, P: number) =>
    r.value.abs().lte(r.scale.times(new Decimal(10).pow(2 - P)));
  for (let extra = 10; extra <= 4 * N + 80; extra *= 2) {
    const p1 = Math.min(MAX_DIGITS, N + extra);
    const p2 = Math.min(MAX_DIGITS, N + extra + 15);
    const r1 = at(p1);
    const r2 = at(p2);
    if (isNoise(r1, p1) && isNoise(r2, p2)) {
      io.err(`note: the value is zero to within its error at ${p1} and ${p2} digits (|value| <= ${r2.value.abs().toSD(3).toString()}); printed as 0\n`);
      io.out(flags.json ? JSON.stringify({ re: '0', im: '0' }) + '\n' : '0 + 0 i\n');
      return 0;
    }
    const limit = r2.limit ?? r1.limit;
    if (limit !== undefined && limit.rel.gt(new Decimal(10).pow(-N - 1))) return printLimited(r2.value, limit, N, flags, io);
    const a = roundComplex(r1.value, N);
    const b = roundComplex(r2.value, N);
    if (a.equals(b)) {
      io.err(`note: evaluated at ${p1} and ${p2} digits; both round to the value below\n`);
      io.out(flags.json ? JSON.stringify({ re: a.re.toString(), im: a.im.toString() }) + '\n' : formatComplex(a) + '\n');
      return 0;
    }
    if (p1 >= MAX_DIGITS) break;
  }
  throw new ModvetError('precision', 'eval', `the value could not be rounded to ${N} digits: evaluations at different precisions keep disagreeing`);
}

/**
 * A value whose accuracy a truncated construct limited (a lattice sum: relative error at
 * most limit.rel): printed to the most digits D at which every point within the error
 * rounds alike, so each printed digit is right.
 */
function printLimited(v: Complex, limit: { rel: Decimal; by: string }, N: number, flags: EvalFlags, io: Streams): number {
  const err = limit.rel.times(v.abs());
  const corners = [Complex.of(err), Complex.of(err.neg()), Complex.of(0, err), Complex.of(0, err.neg())].map((d) => v.add(d));
  for (let D = Math.min(N, Math.floor(-Math.log10(limit.rel.toNumber()))); D >= 1; D--) {
    const a = roundComplex(v, D);
    if (!corners.every((c) => roundComplex(c, D).equals(a))) continue;
    io.err(`note: limited by ${limit.by} to a relative accuracy of ${limit.rel.toSD(2).toString()}: printed to ${D} digits (${N} requested)\n`);
    io.out(flags.json ? JSON.stringify({ re: a.re.toString(), im: a.im.toString() }) + '\n' : formatComplex(a) + '\n');
    return 0;
  }
  throw new ModvetError('precision', 'eval', `${limit.by} reached a relative accuracy of only ${limit.rel.toSD(2).toString()}: no digit can be printed`);
}

/** Diagnostics inside the expression are shown against the expression as the user typed it. */
function renderForUser(d: Diagnostic, text: string, offset: number, expression: string): string {
  if (d.span.start >= offset && d.span.start <= offset + expression.length) {
    const start = d.span.start - offset;
    const end = Math.min(expression.length, Math.max(start, d.span.end - offset));
    const span = { file: '<expression>', start, end, line: 1, column: start + 1 };
    return renderDiagnostic({ ...d, span }, expression);
  }
  return renderDiagnostic(d, text);
}
