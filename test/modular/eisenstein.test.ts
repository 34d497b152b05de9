// E_k, G_k and E_2*: closed forms, OEIS coefficient tables, Ramanujan's identities on exact
// coefficients, the lattice sum, transformation laws at random group elements, bad input.
import { describe, expect, it } from 'vitest';
import { Decimal } from 'decimal.js';
import { Complex } from '../../src/numeric/complex.js';
import { pi } from '../../src/numeric/constants.js';
import { withDigits } from '../../src/numeric/precision.js';
import { Random } from '../../src/numeric/random.js';
import { gamma } from '../../src/special/gamma.js';
import { Mat2 } from '../../src/groups/matrix.js';
import { randomElement, randomInFundamental } from '../../src/groups/sample.js';
import { e2star, eisensteinCoefficients, eisensteinE, eisensteinG } from '../../src/modular/eisenstein.js';
import { ulpError } from '../helpers/reference.js';
import { errorCode } from '../helpers/errors.js';

/** |a - b| / |b| at 40 extra digits. */
function relErr(a: Complex, b: Complex, P: number): number {
  return withDigits(P + 40, () => a.sub(b).abs().div(b.abs()).toNumber());
}
/** rho = e^{2 pi i/3} = -1/2 + i sqrt(3)/2, to d digits. */
function rho(d: number): Complex {
  return withDigits(d, () => Complex.of('-0.5', new Decimal(3).sqrt().div(2)));
}
const quarter = () => gamma(Complex.of('0.25'));
const third = () => gamma(Complex.of(1).div(Complex.of(3)));

describe('closed forms (design/math-reference.md special values; Gamma from src/special/gamma.ts)', () => {
  for (const P of [30, 50, 100]) {
    it(`E_4(i) = 3 Gamma(1/4)^8 / (2 pi)^6, E_2(i) = 3/pi at ${P} digits`, () => {
      const i = Complex.I;
      const e4 = withDigits(P + 10, () => quarter().pow(8).scale(3).div(Complex.of(pi().times(2).pow(6))).round());
      expect(ulpError(withDigits(P, () => eisensteinE(4, i)), e4, P)).toBeLessThanOrEqual(2);
      // E_2*(i) = 0 since E_2* has weight 2 and i is fixed by S (Zagier, quasimodular forms)
      const e2 = withDigits(P + 10, () => Complex.of(new Decimal(3).div(pi())));
      expect(ulpError(withDigits(P, () => eisensteinE(2, i)), e2, P)).toBeLessThanOrEqual(2);
    });
    it(`E_6(rho) = 27 Gamma(1/3)^18 / (2^9 pi^12), E_2(rho) = 2 sqrt 3 / pi at ${P} digits`, () => {
      const r = rho(P + 150);
      const e6 = withDigits(P + 10, () => third().pow(18).scale(27).div(Complex.of(pi().pow(12).times(512))));
      expect(ulpError(withDigits(P, () => eisensteinE(6, r)), e6, P)).toBeLessThanOrEqual(2);
      // E_2*(rho) = 0 as at i (rho is fixed by ST), so E_2(rho) = 3/(pi sqrt(3)/2)
      const e2 = withDigits(P + 10, () => Complex.of(new Decimal(3).sqrt().times(2).div(pi())));
      expect(ulpError(withDigits(P, () => eisensteinE(2, r)), e2, P)).toBeLessThanOrEqual(2);
    });
    it(`exact zeros E_6(i) = E_4(rho) = E_2*(i) = E_2*(rho) = 0, absolutely, at ${P} digits`, () => {
      // E_6(i) = i^6 E_6(i) and E_4(rho) = rho^4 E_4(rho) (Serre, ch. VII 3.2). The largest
      // terms here are below 2, so the guarantee (qseries.ts) is |value| < 2^-256 10^-P 2.
      const bound = 10 ** -(P + 76);
      withDigits(P, () => {
        expect(eisensteinE(6, Complex.I).abs().toNumber()).toBeLessThan(bound);
        expect(eisensteinE(4, rho(P + 150)).abs().toNumber()).toBeLessThan(bound);
        expect(e2star(Complex.I).abs().toNumber()).toBeLessThan(bound);
        expect(e2star(rho(P + 150)).abs().toNumber()).toBeLessThan(bound);
      });
    });
  }
  it('G_4(i) = Gamma(1/4)^8 / (960 pi^2) and G_k = 2 zeta(k) E_k with zeta(4) = pi^4/90, zeta(6) = pi^6/945 (DLMF 25.6.1)', () => {
    const P = 40;
    const g4 = withDigits(P + 10, () => quarter().pow(8).div(Complex.of(pi().pow(2).times(960))));
    expect(ulpError(withDigits(P, () => eisensteinG(4, Complex.I)), g4, P)).toBeLessThanOrEqual(2);
    const tau = Complex.of('0.2', '0.9');
    const e6 = withDigits(P + 10, () => eisensteinE(6, tau));
    const g6 = withDigits(P + 10, () => e6.scale(pi().pow(6).times(2).div(945)));
    expect(ulpError(withDigits(P, () => eisensteinG(6, tau)), g6, P)).toBeLessThanOrEqual(2);
  });
});

describe('G_k as the lattice sum sum\'_{(m,n)} (m tau + n)^-k (Serre, ch. VII 2.3)', () => {
  it('G_24 at tau = 0.1 + 1.1i from |m|, |n| <= 30 (omitted part below 1e-29)', () => {
    const P = 25;
    const tau = Complex.of('0.1', '1.1');
    const direct = withDigits(P + 8, () => {
      let s = Complex.ZERO;
      for (let m = -30; m <= 30; m++) {
        for (let n = -30; n <= 30; n++) {
          if (m === 0 && n === 0) continue;
          s = s.add(tau.scale(m).add(Complex.of(n)).powInt(-24));
        }
      }
      return s;
    });
    expect(relErr(withDigits(P, () => eisensteinG(24, tau)), direct, P)).toBeLessThan(1e-22);
  });
});

describe('q-expansion coefficients', () => {
  const ints = (k: number, N: number) =>
    eisensteinCoefficients(k, N).map((r) => {
      expect(r.den).toBe(1n);
      return r.num;
    });
  it('E_4 matches OEIS A004009 and E_6 matches OEIS A013973 (first 12 terms, from memory; = 240 sigma_3, -504 sigma_5)', () => {
    const a004009 = [1, 240, 2160, 6720, 17520, 30240, 60480, 82560, 140400, 181680, 272160, 319680];
    const a013973 = [1, -504, -16632, -122976, -532728, -1575504, -4058208, -8471232, -17047800, -29883672, -51991632, -81170208];
    expect(ints(4, 11)).toEqual(a004009.map(BigInt));
    expect(ints(6, 11)).toEqual(a013973.map(BigInt));
  });
  it('E_12 = 1 + (65520/691) sum sigma_11(n) q^n (B_12 = -691/2730, DLMF Table 24.2.1)', () => {
    const c = eisensteinCoefficients(12, 2);
    expect(c[1]).toEqual({ num: 65520n, den: 691n });
    expect(c[2]).toEqual({ num: 65520n * 2049n, den: 691n });
  });
  const mulSeries = (a: bigint[], b: bigint[]) => a.map((_, n) => a.slice(0, n + 1).reduce((s, x, i) => s + x * b[n - i]!, 0n));
  it('E_8 = E_4^2 and E_10 = E_4 E_6 (dim M_8 = dim M_10 = 1, Serre ch. VII 3.2), 40 coefficients', () => {
    const N = 39;
    expect(ints(8, N)).toEqual(mulSeries(ints(4, N), ints(4, N)));
    expect(ints(10, N)).toEqual(mulSeries(ints(4, N), ints(6, N)));
  });
  it("Ramanujan's identities with D = q d/dq: 12 D E_2 = E_2^2 - E_4, 3 D E_4 = E_2 E_4 - E_6, 2 D E_6 = E_2 E_6 - E_4^2 (Zagier; math-reference.md)", () => {
    const N = 40;
    const [e2, e4, e6] = [ints(2, N), ints(4, N), ints(6, N)];
    const D = (a: bigint[], c: bigint) => a.map((x, n) => c * BigInt(n) * x);
    const sub = (a: bigint[], b: bigint[]) => a.map((x, n) => x - b[n]!);
    expect(D(e2, 12n)).toEqual(sub(mulSeries(e2, e2), e4));
    expect(D(e4, 3n)).toEqual(sub(mulSeries(e2, e4), e6));
    expect(D(e6, 2n)).toEqual(sub(mulSeries(e2, e6), mulSeries(e4, e4)));
  });
});

describe('transformation laws at random group elements (built-ins evaluated independently at tau and gamma tau)', () => {
  interface Sample {
    tau: Complex;
    g: Mat2;
    gt: Complex;
    j: Complex; // c tau + d
    label: string;
  }
  /** Points of the fundamental domain and group elements with Im(gamma tau) >= 0.025, mostly below 0.1. */
  function samples(seed: number, P: number, count: number): Sample[] {
    const rng = new Random(seed);
    const out: Sample[] = [];
    for (let s = 0; s < count; s++) {
      const tau = randomInFundamental(rng, 1.6);
      const g = randomElement({ kind: 'SL2Z' }, rng, tau, { yMin: 0.025 });
      // gamma tau to 12 extra digits: the built-ins take their argument as exact
      const [gt, j] = withDigits(P + 12, () => [g.act(tau), g.automorphy(tau)] as const);
      out.push({ tau, g, gt, j, label: `seed=${seed} P=${P} tau=${tau} gamma=${g} gamma tau=${gt}` });
    }
    return out;
  }
  it('samples reach below Im = 0.1', () => {
    expect(samples(11, 30, 12).filter((s) => s.gt.im.lt(0.1)).length).toBeGreaterThan(5);
  });
  for (const [seed, P] of [
    [11, 30],
    [12, 45],
  ] as const) {
    it(`E_k(gamma tau) = (c tau + d)^k E_k(tau), k = 4..14 (Serre VII 2.1), seed ${seed}, ${P} digits`, () => {
      for (const s of samples(seed, P, 10)) {
        for (const k of [4, 6, 8, 10, 12, 14]) {
          const lhs = withDigits(P, () => eisensteinE(k, s.gt));
          const rhs = withDigits(P + 10, () => s.j.powInt(k).mul(withDigits(P, () => eisensteinE(k, s.tau))));
          expect(relErr(lhs, rhs, P), `k=${k} ${s.label}`).toBeLessThan(10 ** (2 - P));
        }
      }
    });
    it(`E_2(gamma tau) = (c tau + d)^2 E_2(tau) + (6c/(pi i))(c tau + d) and E_2* has weight 2 (Zagier), seed ${seed}, ${P} digits`, () => {
      for (const s of samples(seed + 100, P, 10)) {
        const lhs = withDigits(P, () => eisensteinE(2, s.gt));
        const rhs = withDigits(P + 10, () => {
          const e2 = withDigits(P, () => eisensteinE(2, s.tau));
          const c = Complex.of(s.g.c.toString());
          const anomaly = c.scale(6).div(Complex.of(0, pi())).mul(s.j);
          return s.j.powInt(2).mul(e2).add(anomaly);
        });
        expect(relErr(lhs, rhs, P), s.label).toBeLessThan(10 ** (2 - P));
        const lhsStar = withDigits(P, () => e2star(s.gt));
        const rhsStar = withDigits(P + 10, () => s.j.powInt(2).mul(withDigits(P, () => e2star(s.tau))));
        expect(relErr(lhsStar, rhsStar, P), s.label).toBeLessThan(10 ** (2 - P));
      }
    });
  }
});

describe('accuracy near the real axis: consistent between precisions', () => {
  it('E_4, E_6, E_12 at Im tau in [0.02, 0.05] at 40 digits agree with 70 digits to 2 ulp', () => {
    const rng = new Random(5);
    for (let s = 0; s < 6; s++) {
      const tau = Complex.of(rng.uniform(-1, 1).toPrecision(12), rng.uniform(0.02, 0.05).toPrecision(12));
      for (const k of [4, 6, 12]) {
        const hi = withDigits(70, () => eisensteinE(k, tau));
        expect(ulpError(withDigits(40, () => eisensteinE(k, tau)), hi, 40), `k=${k} tau=${tau}`).toBeLessThanOrEqual(2);
      }
    }
  });
});

describe('bad input (error codes)', () => {
  const i = Complex.I;
  it("odd k, k < 2, non-integer k: 'domain'", () => {
    expect(errorCode(() => eisensteinE(3, i))).toBe('domain');
    expect(errorCode(() => eisensteinE(0, i))).toBe('domain');
    expect(errorCode(() => eisensteinE(2.5, i))).toBe('domain');
    expect(errorCode(() => eisensteinG(2, i))).toBe('domain');
    expect(errorCode(() => eisensteinCoefficients(5, 3))).toBe('domain');
  });
  it("Im tau <= 0: 'domain'; below yMin: 'ymin'; a smaller yMin admits the point", () => {
    expect(errorCode(() => eisensteinE(4, Complex.of('0.3', '-0.5')))).toBe('domain');
    expect(errorCode(() => eisensteinE(4, Complex.of('0.3', '0')))).toBe('domain');
    expect(errorCode(() => eisensteinE(4, Complex.of('0.3', '0.01')))).toBe('ymin');
    expect(errorCode(() => e2star(Complex.of('0.3', '0.01')))).toBe('ymin');
    expect(errorCode(() => eisensteinE(4, i, { yMin: 0 }))).toBe('domain');
    const v = withDigits(20, () => eisensteinE(4, Complex.of('0.3', '0.01'), { yMin: 0.005 }));
    expect(v.isFinite()).toBe(true);
  });
  it("a series beyond the term budget: 'convergence'", () => {
    expect(errorCode(() => withDigits(30, () => eisensteinE(4, Complex.of('0', '1e-5'), { yMin: 1e-6 })))).toBe('convergence');
  });
});
