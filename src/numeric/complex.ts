/**
 * Complex numbers on decimal.js, principal branches throughout.
 *
 * Convention: a Complex is immutable; arithmetic (add, sub, mul, div) rounds to the current
 * precision (precision.ts); transcendental functions are computed on the BigInt kernels of
 * fixed.ts with guard bits and checked for relative accuracy (retrying with more bits where
 * a result is small against its inputs, e.g. sin near a multiple of pi), then rounded.
 * Branch cuts: log, sqrt and pow are cut along the negative real axis, arg in (-pi, pi].
 *
 *   withDigits(40, () => Complex.of(0, 1).exp().toString())   // e^i to 40 digits
 */
import { Decimal } from 'decimal.js';
import { ModvetError } from './errors.js';
import * as fx from './fixed.js';
import { fromFixed, toFixed } from './convert.js';
import { bitsFor, withGuard } from './precision.js';

export type Real = Decimal;
export type RealLike = Decimal | number | string;

const LOG2_10 = 3.321928094887362;
const GUARD_BITS = 24;
const MAX_RETRY_BITS = 40000;

function dec(x: RealLike): Decimal {
  return x instanceof Decimal ? x : new Decimal(x);
}

/** Binary exponent estimate of a nonzero Decimal: |d| ~ 2^result. */
function binExp(d: Decimal): number {
  return Math.round(d.e * LOG2_10);
}

/** Fixed-point bits that leave `need` significant bits in a value of size ~2^-lost. */
function bitsWithLoss(need: number, lost: number): number {
  const W = need + Math.max(0, lost);
  if (W > MAX_RETRY_BITS) {
    throw new ModvetError('precision', 'complex', 'cancellation too severe to resolve');
  }
  return W;
}

/** [sin a, cos a] at W bits with both parts accurate to `need` significant bits. */
function sinCosChecked(a: Decimal, need: number): { s: bigint; c: bigint; W: number } {
  if (a.isZero()) return { s: 0n, c: fx.one(need), W: need };
  let W = bitsWithLoss(need + GUARD_BITS, -binExp(a));
  for (;;) {
    const [s, c] = fx.sincos(toFixed(a, W), W);
    const small = Math.min(fx.bitLength(s), fx.bitLength(c));
    if (small >= need + 4) return { s, c, W };
    W = bitsWithLoss(W, need + 8 - small);
  }
}

/**
 * [cosh b, sinh b] as fixed values at W bits times 2^k, each accurate to `need`
 * significant bits (sinh near b = 0 gets extra bits).
 */
function coshSinhChecked(b: Decimal, need: number): { ch: bigint; sh: bigint; W: number; k: number } {
  if (b.isZero()) return { ch: fx.one(need), sh: 0n, W: need, k: 0 };
  let W = bitsWithLoss(need + GUARD_BITS, -binExp(b));
  for (;;) {
    const B = toFixed(b.abs(), W);
    const [m, k] = fx.expSplit(B, W);
    const inv = 2 * k < W + 4 ? fx.div(fx.one(W), m, W) >> BigInt(2 * k) : 0n;
    const ch = (m + inv) >> 1n;
    let sh = (m - inv) >> 1n;
    if (b.isNegative()) sh = -sh;
    if (fx.bitLength(sh) >= need + 4) return { ch, sh, W, k };
    W = bitsWithLoss(W, need + 8 - fx.bitLength(sh));
  }
}

export class Complex {
  readonly re: Decimal;
  readonly im: Decimal;

  constructor(re: RealLike, im: RealLike = 0) {
    this.re = dec(re);
    this.im = dec(im);
  }

  static of(re: RealLike, im: RealLike = 0): Complex {
    return new Complex(re, im);
  }
  static readonly ZERO = new Complex(0, 0);
  static readonly ONE = new Complex(1, 0);
  static readonly I = new Complex(0, 1);

  isZero(): boolean {
    return this.re.isZero() && this.im.isZero();
  }
  isReal(): boolean {
    return this.im.isZero();
  }
  isFinite(): boolean {
    return this.re.isFinite() && this.im.isFinite();
  }

  add(w: Complex): Complex {
    return new Complex(this.re.plus(w.re), this.im.plus(w.im));
  }
  sub(w: Complex): Complex {
    return new Complex(this.re.minus(w.re), this.im.minus(w.im));
  }
  mul(w: Complex): Complex {
    if (w.im.isZero()) return new Complex(this.re.times(w.re), this.im.times(w.re));
    if (this.im.isZero()) return new Complex(this.re.times(w.re), this.re.times(w.im));
    return new Complex(
      this.re.times(w.re).minus(this.im.times(w.im)),
      this.re.times(w.im).plus(this.im.times(w.re)),
    );
  }
  scale(r: RealLike): Complex {
    const d = dec(r);
    return new Complex(this.re.times(d), this.im.times(d));
  }
  div(w: Complex): Complex {
    if (w.isZero()) throw new ModvetError('pole', 'division', 'division by zero');
    if (w.im.isZero()) return new Complex(this.re.div(w.re), this.im.div(w.re));
    // Smith's algorithm avoids overflow and keeps the rounding error small
    if (w.re.abs().gte(w.im.abs())) {
      const r = w.im.div(w.re);
      const den = w.re.plus(w.im.times(r));
      return new Complex(this.re.plus(this.im.times(r)).div(den), this.im.minus(this.re.times(r)).div(den));
    }
    const r = w.re.div(w.im);
    const den = w.re.times(r).plus(w.im);
    return new Complex(this.re.times(r).plus(this.im).div(den), this.im.times(r).minus(this.re).div(den));
  }
  inv(): Complex {
    return Complex.ONE.div(this);
  }
  neg(): Complex {
    return new Complex(this.re.neg(), this.im.neg());
  }
  conj(): Complex {
    return new Complex(this.re, this.im.neg());
  }
  /** Multiply by i. */
  mulI(): Complex {
    return new Complex(this.im.neg(), this.re);
  }
  abs(): Decimal {
    if (this.im.isZero()) return this.re.abs();
    if (this.re.isZero()) return this.im.abs();
    return Decimal.hypot(this.re, this.im);
  }
  /**
   * |z| to about 15 digits, rounded up: for error scales, which need a few digits only
   * (decimal.js's hypot at 50 digits costs about as much as the arithmetic it measures).
   * Falls back to abs() outside the double range.
   */
  absBound(): Decimal {
    if (this.im.isZero()) return this.re.abs();
    if (this.re.isZero()) return this.im.abs();
    const e = Math.max(this.re.e, this.im.e);
    if (e > 300 || e < -300) return this.abs();
    const h = Math.hypot(this.re.toNumber(), this.im.toNumber());
    return new Decimal(h * (1 + 4e-16));
  }
  /** |z|^2, exact up to one rounding. */
  abs2(): Decimal {
    return this.re.times(this.re).plus(this.im.times(this.im));
  }
  /** Round both parts to the current precision (after work done with guard digits). */
  round(): Complex {
    const P = Decimal.precision;
    return new Complex(this.re.toSD(P), this.im.toSD(P));
  }

  arg(): Decimal {
    if (this.isZero()) throw new ModvetError('domain', 'arg', 'arg(0) is undefined');
    const P = Decimal.precision;
    const s = binExp(this.re.isZero() ? this.im : this.im.isZero() ? this.re : Decimal.max(this.re.abs(), this.im.abs()));
    const W = bitsFor(P) + GUARD_BITS;
    // scale by 2^-s so the larger part is near 1; the angle is unchanged
    const X = toFixed(this.re, W - s);
    const Y = toFixed(this.im, W - s);
    // |arg| can be tiny (im << re): then it needs extra bits to be relatively accurate
    let Wa = W;
    if (!this.im.isZero() && this.re.isPositive()) Wa = bitsWithLoss(W, binExp(this.re) - binExp(this.im));
    const A = Wa === W ? fx.atan2(Y, X, W) : fx.atan2(toFixed(this.im, Wa - s), toFixed(this.re, Wa - s), Wa);
    return fromFixed(A, Wa);
  }

  exp(): Complex {
    const P = Decimal.precision;
    const need = bitsFor(P) + 8;
    const W = need + GUARD_BITS;
    const [m, k] = fx.expSplit(toFixed(this.re, W), W);
    if (this.im.isZero()) return new Complex(fromFixed(m, W - k), 0);
    const { s, c, W: Wt } = sinCosChecked(this.im, need);
    return new Complex(fromFixed(m * c, W + Wt - k), fromFixed(m * s, W + Wt - k));
  }

  log(): Complex {
    if (this.isZero()) throw new ModvetError('pole', 'log', 'log(0) is undefined');
    const P = Decimal.precision;
    const need = bitsFor(P) + 8;
    const big = this.re.isZero() ? this.im.abs() : this.im.isZero() ? this.re.abs() : Decimal.max(this.re.abs(), this.im.abs());
    const s = binExp(big);
    let W = need + GUARD_BITS;
    for (;;) {
      const X = toFixed(this.re, W - s);
      const Y = toFixed(this.im, W - s);
      const n2 = (X * X + Y * Y) >> BigInt(W);
      const L = (fx.log(n2, W) >> 1n) + BigInt(s) * fx.ln2(W);
      // log|z| near 0 (|z| near 1) cancels: retry with the bits it lost
      if (L === 0n || fx.bitLength(L) >= need + 4 || this.im.isZero() && this.re.eq(1)) {
        const re = L === 0n && this.re.eq(1) && this.im.isZero() ? new Decimal(0) : fromFixed(L, W);
        const im = this.im.isZero() && this.re.isPositive() ? new Decimal(0) : this.arg();
        return new Complex(re, im);
      }
      W = bitsWithLoss(W, need + 8 - fx.bitLength(L));
    }
  }

  sqrt(): Complex {
    if (this.isZero()) return Complex.ZERO;
    // t = sqrt((|z| + |Re z|)/2) has no cancellation; the other part is Im z/(2t)
    return withGuard(6, () => {
      const r = this.abs();
      if (!this.re.isNegative()) {
        const t = r.plus(this.re).div(2).sqrt();
        return new Complex(t, this.im.div(t.times(2)));
      }
      const t = r.minus(this.re).div(2).sqrt();
      const im = this.im.isNegative() ? t.neg() : t;
      return new Complex(this.im.abs().div(t.times(2)), im);
    }).round();
  }

  /** Principal power z^w = exp(w log z); integer w uses repeated squaring. */
  pow(w: Complex | RealLike): Complex {
    const e = w instanceof Complex ? w : new Complex(w);
    if (e.im.isZero() && e.re.isInteger() && e.re.abs().lt(2 ** 31)) return this.powInt(e.re.toNumber());
    if (this.isZero()) {
      if (e.re.isPositive() && !e.re.isZero()) return Complex.ZERO;
      throw new ModvetError('pole', 'pow', `0^(${e}) is undefined`);
    }
    // exp amplifies the absolute error of w log z into a relative one: carry
    // log10 |w log z| guard digits (|log z| <= |log |z|| + pi)
    const logAbs = Math.abs(this.abs().e) * Math.LN10 + Math.PI + 1;
    const size = Math.log10(Math.max(1, e.abs().toNumber() * logAbs));
    const r = withGuard(6 + Math.ceil(size), () => e.mul(this.log()));
    return r.exp();
  }

  powInt(n: number): Complex {
    if (n === 0) return Complex.ONE;
    if (n < 0) return this.powInt(-n).inv();
    // repeated squaring rounds about 2 log2 n times
    return withGuard(2 + Math.ceil(Math.log10(n + 1) * 2), () => {
      let base: Complex = this;
      let acc: Complex = Complex.ONE;
      for (let k = n; k > 0; k >>= 1) {
        if (k & 1) acc = acc.mul(base);
        if (k > 1) base = base.mul(base);
      }
      return acc;
    }).round();
  }

  sin(): Complex {
    // sin(a + ib) = sin a cosh b + i cos a sinh b
    return this.trig(false);
  }
  cos(): Complex {
    // cos(a + ib) = cos a cosh b - i sin a sinh b
    return this.trig(true);
  }
  sinh(): Complex {
    // sinh z = -i sin(iz)
    return this.mulI().sin().mulI().neg();
  }
  cosh(): Complex {
    // cosh z = cos(iz)
    return this.mulI().cos();
  }

  private trig(isCos: boolean): Complex {
    const P = Decimal.precision;
    const need = bitsFor(P) + 8;
    const { s, c, W: Wa } = sinCosChecked(this.re, need);
    if (this.im.isZero()) return new Complex(fromFixed(isCos ? c : s, Wa), 0);
    const { ch, sh, W: Wb, k } = coshSinhChecked(this.im, need);
    const F = Wa + Wb - k;
    return isCos
      ? new Complex(fromFixed(c * ch, F), fromFixed(-s * sh, F))
      : new Complex(fromFixed(s * ch, F), fromFixed(c * sh, F));
  }

  equals(w: Complex): boolean {
    return this.re.eq(w.re) && this.im.eq(w.im);
  }

  toString(sd?: number): string {
    const f = (d: Decimal) => (sd === undefined ? d.toString() : d.toSD(sd).toString());
    if (this.im.isZero()) return f(this.re);
    const sign = this.im.isNegative() ? '-' : '+';
    return `${f(this.re)} ${sign} ${f(this.im.abs())}i`;
  }
}
