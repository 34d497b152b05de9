/**
 * Real fixed-point kernels on native BigInt: the fast floor under every special function.
 *
 * Convention: a real x is held as the bigint X = x * 2^F (truncated), F the number of
 * fractional bits, passed explicitly to every kernel. Errors are absolute (a few units
 * of 2^-F per operation); callers choose F from the magnitudes they expect and add guard
 * bits. These kernels are internal: decimal.js is the number type at every public
 * interface (see convert.ts), and the elementary functions of complex.ts are built here
 * because decimal.js's own exp/ln/sin/cos are 20-100x slower than needed.
 *
 *   const F = 200; const e = exp(one(F), F);   // e * 2^200, error < 2^-195
 */
import { ModvetError } from './errors.js';

/** 2^F, the fixed-point one. */
export function one(F: number): bigint {
  return 1n << BigInt(F);
}

/** a * b in fixed point. */
export function mul(a: bigint, b: bigint, F: number): bigint {
  return (a * b) >> BigInt(F);
}

/** a / b in fixed point (b != 0). */
export function div(a: bigint, b: bigint, F: number): bigint {
  return (a << BigInt(F)) / b;
}

/** Move a value from F1 to F2 fractional bits. */
export function rescale(a: bigint, F1: number, F2: number): bigint {
  return F2 >= F1 ? a << BigInt(F2 - F1) : a >> BigInt(F1 - F2);
}

/** Integer division rounded to nearest. */
export function roundDiv(a: bigint, b: bigint): bigint {
  if (b < 0n) return roundDiv(-a, -b);
  return a >= 0n ? (2n * a + b) / (2n * b) : -((2n * -a + b) / (2n * b));
}

/** Exact number of bits of |a| (0 for 0). */
export function bitLength(a: bigint): number {
  if (a < 0n) a = -a;
  if (a === 0n) return 0;
  const h = a.toString(16);
  return (h.length - 1) * 4 + (32 - Math.clz32(parseInt(h[0]!, 16)));
}

/** m * 2^e without intermediate overflow or underflow of the power. */
function ldexp(m: number, e: number): number {
  while (e > 1000) {
    m *= 2 ** 1000;
    e -= 1000;
  }
  while (e < -1000) {
    m *= 2 ** -1000;
    e += 1000;
  }
  return m * 2 ** e;
}

/** The double nearest (to about 2^-60 relative) to the fixed value a / 2^F. */
export function toFloat(a: bigint, F: number): number {
  const L = bitLength(a);
  const s = L - 64;
  return s > 0 ? ldexp(Number(a >> BigInt(s)), s - F) : ldexp(Number(a), -F);
}

/** A double as a fixed value (exact for |x| * 2^F integral; used for seeds and guesses). */
export function fromFloat(x: number, F: number): bigint {
  if (!Number.isFinite(x)) throw new ModvetError('overflow', 'fixed', `cannot convert ${x}`);
  if (x === 0) return 0n;
  const e = Math.floor(Math.log2(Math.abs(x)));
  const m = BigInt(Math.round(ldexp(x, 52 - e)));
  return rescale(m, 52 - e, F);
}

// ---------------------------------------------------------------------------
// Constants, computed once at the highest precision asked for and shifted down.

interface Cached {
  F: number;
  v: bigint;
}
/** A constant computed once at the highest precision asked for, then shifted down. */
export function cachedConstant(compute: (F: number) => bigint): (F: number) => bigint {
  let c: Cached = { F: -1, v: 0n };
  return (F: number) => {
    if (F > c.F) {
      const W = Math.max(F, 2 * c.F, 256) + 32;
      c = { F: W, v: compute(W + 32) >> 32n };
    }
    return c.v >> BigInt(c.F - F);
  };
}

/** sum_{n>=0} (-1)^n / ((2n+1) k^(2n+1)) = atan(1/k), or atanh(1/k) when alternate = false. */
function arctanInverse(k: bigint, F: number, alternate: boolean): bigint {
  const k2 = k * k;
  let p = one(F) / k;
  let sum = p;
  let sign = -1n;
  for (let n = 3n; p !== 0n; n += 2n) {
    p /= k2;
    sum += (alternate ? sign : 1n) * (p / n);
    sign = -sign;
  }
  return sum;
}

/** pi by Machin's formula pi = 16 atan(1/5) - 4 atan(1/239). */
export const pi = cachedConstant(
  (F) => 16n * arctanInverse(5n, F, true) - 4n * arctanInverse(239n, F, true),
);

/** log 2 = 18 atanh(1/26) - 2 atanh(1/4801) + 8 atanh(1/8749) (a Machin-like formula). */
export const ln2 = cachedConstant(
  (F) =>
    18n * arctanInverse(26n, F, false) -
    2n * arctanInverse(4801n, F, false) +
    8n * arctanInverse(8749n, F, false),
);

/**
 * Euler's constant by the Brent-McMillan algorithm B1 (Brent & McMillan, Math. Comp. 34
 * (1980) 305-312): gamma = U/V with error O(e^{-4n}).
 */
export const euler = cachedConstant((F) => {
  const W = F + 32;
  const n = BigInt(Math.ceil((F * Math.LN2) / 4) + 2);
  const n2 = n * n;
  let A = -log(BigInt(n) << BigInt(W), W);
  let B = one(W);
  let U = A;
  let V = B;
  for (let k = 1n; B !== 0n || A !== 0n; k++) {
    B = (B * n2) / (k * k);
    A = ((A * n2) / k + B) / k;
    U += A;
    V += B;
  }
  return div(U, V, W) >> 32n;
});

// ---------------------------------------------------------------------------
// exp, log, sin/cos, atan2, sqrt

/**
 * e^a as [m, k] with e^a = (m / 2^F) * 2^k and m / 2^F in [0.7, 1.42]: keeps full relative
 * precision for any size of a. Method: a = k log 2 + r, then e^r from the Taylor series of
 * e^{r/2^s} - 1 and s doublings u -> u (u + 2), which loses no relative precision near 1.
 */
export function expSplit(a: bigint, F: number): [bigint, number] {
  const af = toFloat(a, F);
  if (Math.abs(af) > 2 ** 50) throw new ModvetError('overflow', 'exp', `argument ${af} too large`);
  const k = Math.round(af / Math.LN2);
  const s = Math.ceil(Math.sqrt(F) / 1.4);
  const G = s + 12 + bitLength(BigInt(k));
  const W = F + G;
  const r = (a << BigInt(G)) - BigInt(k) * ln2(W);
  const x = r >> BigInt(s);
  let term = x;
  let u = x;
  for (let n = 2n; term !== 0n; n++) {
    term = mul(term, x, W) / n;
    u += term;
  }
  const two = 2n << BigInt(W);
  for (let j = 0; j < s; j++) u = mul(u, u + two, W);
  return [(u + one(W)) >> BigInt(G), k];
}

/** e^a in fixed point; tiny results lose relative (not absolute) precision. */
export function exp(a: bigint, F: number): bigint {
  const [m, k] = expSplit(a, F);
  return k >= 0 ? m << BigInt(k) : m >> BigInt(-k);
}

/**
 * [sin b, cos b]. Reduction b = q pi/2 + r with q exact (BigInt), then the Taylor series of
 * sin and cos - 1 at r / 2^s and s doublings S -> 2 S (C + 1), C -> -2 S^2 (C = cos - 1).
 */
export function sincos(b: bigint, F: number): [bigint, bigint] {
  const bf = toFloat(b, F);
  const qbits = Math.max(0, Math.ceil(Math.log2(Math.abs(bf) + 1)));
  const s = Math.ceil(Math.sqrt(F) / 2);
  const G = s + 14 + qbits;
  const W = F + G;
  const hp = pi(W) >> 1n;
  const bW = b << BigInt(G);
  const q = roundDiv(bW, hp);
  const x = (bW - q * hp) >> BigInt(s);
  // t_n = x^n / n!: sin = t1 - t3 + ..., cos - 1 = -t2 + t4 - ...
  let S = x;
  let C = 0n;
  let t = x;
  for (let n = 2n; t !== 0n; n += 2n) {
    t = mul(t, x, W) / n;
    C += (n & 2n) === 0n ? t : -t;
    t = mul(t, x, W) / (n + 1n);
    S += (n & 2n) === 0n ? t : -t;
  }
  const o = one(W);
  for (let j = 0; j < s; j++) {
    const S2 = 2n * mul(S, C + o, W);
    C = -2n * mul(S, S, W);
    S = S2;
  }
  const sn = S >> BigInt(G);
  const cs = (C + o) >> BigInt(G);
  return rotateQuadrant(sn, cs, Number(((q % 4n) + 4n) % 4n));
}

/** [sin, cos] of r + q pi/2 from [sin r, cos r] (q taken mod 4). */
export function rotateQuadrant(sn: bigint, cs: bigint, q: number): [bigint, bigint] {
  switch (((q % 4) + 4) % 4) {
    case 0:
      return [sn, cs];
    case 1:
      return [cs, -sn];
    case 2:
      return [-sn, -cs];
    default:
      return [-cs, sn];
  }
}

/**
 * Natural logarithm of a > 0. Method: a = a' 2^e with a' in [1, 2); y0 = log a' in double
 * precision; then log a' = y0 + log1p(eps), eps = a' e^{-y0} - 1 ~ 2^-50, from
 * log1p(eps) = 2 atanh(eps / (2 + eps)), which needs about F/100 terms.
 */
export function log(a: bigint, F: number): bigint {
  if (a <= 0n) throw new ModvetError('domain', 'log', 'argument must be positive');
  const e = bitLength(a) - 1 - F;
  const W = F + 20 + bitLength(BigInt(Math.abs(e)));
  const aW = rescale(a, F + e, W); // a' = a / 2^e at W bits
  const Y0 = fromFloat(Math.log(toFloat(aW, W)), W);
  const o = one(W);
  const eps = mul(aW, exp(-Y0, W), W) - o;
  const u = div(eps, 2n * o + eps, W);
  const u2 = mul(u, u, W);
  let term = u;
  let sum = u;
  // floor shifts leave a negative term at -1, never 0: stop once it is a unit
  for (let n = 3n; term > 1n || term < -1n; n += 2n) {
    term = mul(term, u2, W);
    sum += term / n;
  }
  return (Y0 + 2n * sum + BigInt(e) * ln2(W)) >> BigInt(W - F);
}

/** The angle of (x, y) in (-pi, pi]; error is absolute. Throws at the origin. */
export function atan2(y: bigint, x: bigint, F: number): bigint {
  if (x === 0n && y === 0n) throw new ModvetError('domain', 'arg', 'arg(0) is undefined');
  const W = F + 20;
  const L = Math.max(bitLength(x), bitLength(y));
  // scale both so the larger is in [1, 2) at W bits: the angle does not change
  const xs = rescale(x, L - 1, W);
  const ys = rescale(y, L - 1, W);
  const th0 = Math.atan2(toFloat(ys, W), toFloat(xs, W));
  const TH0 = fromFloat(th0, W);
  const [sn, cs] = sincos(TH0, W);
  // rotate by -th0: the point lands near the positive real axis
  const xr = mul(xs, cs, W) + mul(ys, sn, W);
  const yr = mul(ys, cs, W) - mul(xs, sn, W);
  const u = div(yr, xr, W);
  const u2 = mul(u, u, W);
  let term = u;
  let sum = u;
  for (let n = 3n; term > 1n || term < -1n; n += 2n) {
    term = -mul(term, u2, W);
    sum += term / n;
  }
  return (TH0 + sum) >> 20n;
}

/** floor(sqrt(n)) for n >= 0, by Newton's iteration from a double-precision start. */
export function isqrt(n: bigint): bigint {
  if (n < 0n) throw new ModvetError('domain', 'sqrt', 'negative argument');
  if (n < 2n ** 52n) return BigInt(Math.floor(Math.sqrt(Number(n))));
  const L = bitLength(n);
  const sh = (L - 100) & ~1;
  const guess = BigInt(Math.floor(Math.sqrt(Number(n >> BigInt(sh))))) << BigInt(sh / 2);
  let x = guess + (guess >> 40n) + 1n; // start above the root: Newton then decreases monotonically
  for (;;) {
    const y = (x + n / x) >> 1n;
    if (y >= x) break;
    x = y;
  }
  while (x * x > n) x -= 1n;
  while ((x + 1n) * (x + 1n) <= n) x += 1n;
  return x;
}

/** sqrt(a) for a >= 0 in fixed point. */
export function sqrt(a: bigint, F: number): bigint {
  return isqrt(a << BigInt(F));
}
