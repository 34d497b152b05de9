/**
 * Exact integer 2x2 matrices and their action on the upper half plane.
 *
 * Convention: gamma = (a b; c d) acts by gamma tau = (a tau + b)/(c tau + d); the automorphy
 * factor is c tau + d, and Im(gamma tau) = Im(tau) / |c tau + d|^2 for det gamma = 1.
 * Entries are BigInt, so products never overflow. S = (0 -1; 1 0): tau -> -1/tau,
 * T = (1 1; 0 1): tau -> tau + 1.
 *
 *   new Mat2(1n, 1n, 0n, 1n).act(Complex.I)   // 1 + i
 */
import { Complex } from '../numeric/complex.js';
import { ModvetError } from '../numeric/errors.js';

export class Mat2 {
  constructor(
    readonly a: bigint,
    readonly b: bigint,
    readonly c: bigint,
    readonly d: bigint,
  ) {}

  static readonly I = new Mat2(1n, 0n, 0n, 1n);
  static readonly S = new Mat2(0n, -1n, 1n, 0n);
  static readonly T = new Mat2(1n, 1n, 0n, 1n);

  /** T^n = (1 n; 0 1). */
  static translation(n: bigint): Mat2 {
    return new Mat2(1n, n, 0n, 1n);
  }

  det(): bigint {
    return this.a * this.d - this.b * this.c;
  }

  mul(m: Mat2): Mat2 {
    return new Mat2(
      this.a * m.a + this.b * m.c,
      this.a * m.b + this.b * m.d,
      this.c * m.a + this.d * m.c,
      this.c * m.b + this.d * m.d,
    );
  }

  /** The inverse of a determinant-one matrix. */
  inv(): Mat2 {
    if (this.det() !== 1n) throw new ModvetError('domain', 'matrix', `det ${this} is not 1`);
    return new Mat2(this.d, -this.b, -this.c, this.a);
  }

  neg(): Mat2 {
    return new Mat2(-this.a, -this.b, -this.c, -this.d);
  }

  pow(n: number): Mat2 {
    if (n < 0) return this.inv().pow(-n);
    let acc: Mat2 = Mat2.I;
    let base: Mat2 = this;
    for (let k = n; k > 0; k >>= 1) {
      if (k & 1) acc = acc.mul(base);
      base = base.mul(base);
    }
    return acc;
  }

  equals(m: Mat2): boolean {
    return this.a === m.a && this.b === m.b && this.c === m.c && this.d === m.d;
  }

  /** Equal in PSL(2,Z), i.e. up to sign. */
  equalsProjectively(m: Mat2): boolean {
    return this.equals(m) || this.equals(m.neg());
  }

  /** The automorphy factor c tau + d. */
  automorphy(tau: Complex): Complex {
    return tau.scale(this.c.toString()).add(Complex.of(this.d.toString()));
  }

  /** The Moebius action (a tau + b)/(c tau + d). */
  act(tau: Complex): Complex {
    const num = tau.scale(this.a.toString()).add(Complex.of(this.b.toString()));
    return num.div(this.automorphy(tau));
  }

  /** The largest absolute entry, a measure of size. */
  height(): bigint {
    const abs = (x: bigint) => (x < 0n ? -x : x);
    let h = abs(this.a);
    for (const x of [this.b, this.c, this.d]) if (abs(x) > h) h = abs(x);
    return h;
  }

  toString(): string {
    return `(${this.a} ${this.b}; ${this.c} ${this.d})`;
  }
}
