/**
 * Complex fixed-point kernels: pairs of BigInt fixed values at F fractional bits (see
 * fixed.ts for the convention). Internal to the hot loops of the special functions;
 * `fromComplex` / `toComplex` convert at the decimal.js interface.
 */
import { Complex } from './complex.js';
import { fromFixed, toFixed } from './convert.js';
import * as fx from './fixed.js';

export interface FxC {
  re: bigint;
  im: bigint;
}

export function fromComplex(z: Complex, F: number): FxC {
  return { re: toFixed(z.re, F), im: toFixed(z.im, F) };
}

/** The Complex nearest c / 2^F (times 2^k), rounded to the current precision. */
export function toComplex(c: FxC, F: number, k = 0): Complex {
  return new Complex(fromFixed(c.re, F - k), fromFixed(c.im, F - k));
}

export function cadd(a: FxC, b: FxC): FxC {
  return { re: a.re + b.re, im: a.im + b.im };
}
export function csub(a: FxC, b: FxC): FxC {
  return { re: a.re - b.re, im: a.im - b.im };
}
export function cmul(a: FxC, b: FxC, F: number): FxC {
  const f = BigInt(F);
  return { re: (a.re * b.re - a.im * b.im) >> f, im: (a.re * b.im + a.im * b.re) >> f };
}
export function csqr(a: FxC, F: number): FxC {
  const f = BigInt(F);
  return { re: ((a.re + a.im) * (a.re - a.im)) >> f, im: (2n * a.re * a.im) >> f };
}
/** a times a real fixed value r. */
export function cmulReal(a: FxC, r: bigint, F: number): FxC {
  const f = BigInt(F);
  return { re: (a.re * r) >> f, im: (a.im * r) >> f };
}
export function cdiv(a: FxC, b: FxC, F: number): FxC {
  const den = b.re * b.re + b.im * b.im; // at 2F bits
  const f = BigInt(F);
  return {
    re: ((a.re * b.re + a.im * b.im) << f) / den,
    im: ((a.im * b.re - a.re * b.im) << f) / den,
  };
}
export function cabs2(a: FxC, F: number): bigint {
  return (a.re * a.re + a.im * a.im) >> BigInt(F);
}

/** e^z as [w, k] with e^z = w * 2^k: full relative precision whatever Re z. */
export function cexpSplit(z: FxC, F: number): [FxC, number] {
  const [m, k] = fx.expSplit(z.re, F);
  if (z.im === 0n) return [{ re: m, im: 0n }, k];
  const [s, c] = fx.sincos(z.im, F);
  return [{ re: fx.mul(m, c, F), im: fx.mul(m, s, F) }, k];
}

/** e^z in fixed point (absolute error; tiny results lose relative precision). */
export function cexp(z: FxC, F: number): FxC {
  const [w, k] = cexpSplit(z, F);
  return k >= 0
    ? { re: w.re << BigInt(k), im: w.im << BigInt(k) }
    : { re: w.re >> BigInt(-k), im: w.im >> BigInt(-k) };
}

/** Principal log z (z != 0): log|z| + i arg z, arg in (-pi, pi]. */
export function clog(z: FxC, F: number): FxC {
  const n2 = z.re * z.re + z.im * z.im; // |z|^2 at 2F bits
  // log(n2) is at 2F bits: halve it and drop F of them
  return { re: fx.log(n2, 2 * F) >> BigInt(F + 1), im: fx.atan2(z.im, z.re, F) };
}
