// eta and Delta: mpmath reference values, the closed form eta(i), OEIS A000594, Ramanujan's
// tau multiplicativity, Delta = (E_4^3 - E_6^2)/1728, transformation laws, bad input.
import { describe, expect, it } from 'vitest';
import { Complex } from '../../src/numeric/complex.js';
import { pi } from '../../src/numeric/constants.js';
import { withDigits } from '../../src/numeric/precision.js';
import { Random } from '../../src/numeric/random.js';
import { gamma } from '../../src/special/gamma.js';
import { Mat2 } from '../../src/groups/matrix.js';
import { randomElement, randomInFundamental } from '../../src/groups/sample.js';
import { eisensteinCoefficients, eisensteinE } from '../../src/modular/eisenstein.js';
import { deltaCoefficients, discriminant, eta, etaProductPowerCoefficients, ramanujanTau } from '../../src/modular/eta.js';
import { referenceCases, referenceLibrary, ulpError } from '../helpers/reference.js';
import { errorCode } from '../helpers/errors.js';

function relErr(a: Complex, b: Complex, P: number): number {
  return withDigits(P + 40, () => a.sub(b).abs().div(b.abs()).toNumber());
}

describe(`eta against ${referenceLibrary} (test/reference/values.json, mpmath.eta)`, () => {
  for (const P of [30, 50, 100]) {
    it(`eta at ${P} digits, Im tau from 0.027 to 3.5`, () => {
      for (const c of referenceCases('eta')) {
        const got = withDigits(P, () => eta(c.args[0]!));
        expect(ulpError(got, c.value, P), c.label).toBeLessThanOrEqual(2);
      }
    });
  }
  it('Delta = eta^24 at the reference points, 40 digits (the reference raised to the 24th power at 80 digits)', () => {
    for (const c of referenceCases('eta')) {
      const ref = withDigits(80, () => c.value.powInt(24));
      expect(ulpError(withDigits(40, () => discriminant(c.args[0]!)), ref, 40), c.label).toBeLessThanOrEqual(2);
    }
  });
});

describe('closed form', () => {
  for (const P of [30, 50, 100]) {
    it(`eta(i) = Gamma(1/4) / (2 pi^{3/4}) at ${P} digits (math-reference.md; Gamma from src/special/gamma.ts)`, () => {
      const ref = withDigits(P + 10, () => gamma(Complex.of('0.25')).div(Complex.of(pi().pow(0.75).times(2))));
      expect(ulpError(withDigits(P, () => eta(Complex.I)), ref, P)).toBeLessThanOrEqual(2);
    });
  }
});

describe('far below the default yMin, where the pentagonal sum cancels by ~380 bits', () => {
  it('eta(0.001i) = sqrt(1000) e^{-1000 pi/12} to 20 digits (eta(-1/tau) = sqrt(-i tau) eta(tau) at tau = 1000i, Apostol Thm 3.1)', () => {
    // eta(1000i) = e^{-1000 pi/12} (1 - O(e^{-2000 pi})): the product's correction is far below 10^-20
    const ref = withDigits(40, () => Complex.of(new Complex(1000).sqrt().re.times(pi().times(-1000).div(12).exp())));
    const got = withDigits(20, () => eta(Complex.of('0', '0.001'), { yMin: 0.001 }));
    expect(ulpError(got, ref, 20)).toBeLessThanOrEqual(2);
  });
});

describe('Ramanujan tau(n)', () => {
  it('matches OEIS A000594 for n = 1..20 (from memory; re-derived by an independent integer computation)', () => {
    const a000594 = [
      1, -24, 252, -1472, 4830, -6048, -16744, 84480, -113643, -115920, 534612, -370944, -577738, 401856, 1217160,
      987136, -6905934, 2727432, 10661420, -7109760,
    ];
    expect(deltaCoefficients(20).slice(1)).toEqual(a000594.map(BigInt));
    expect(deltaCoefficients(20)[0]).toBe(0n);
  });
  it('is multiplicative with tau(p^{r+1}) = tau(p) tau(p^r) - p^11 tau(p^{r-1}) (Serre, ch. VII 5, Hecke operators; Apostol, ch. 6)', () => {
    const gcd = (a: number, b: number): number => (b === 0 ? a : gcd(b, a % b));
    for (let m = 2; m <= 30; m++) {
      for (let n = 2; n <= 30; n++) {
        if (gcd(m, n) === 1) expect(ramanujanTau(m * n), `m=${m} n=${n}`).toBe(ramanujanTau(m) * ramanujanTau(n));
      }
    }
    for (const p of [2, 3, 5, 7]) {
      const P11 = BigInt(p) ** 11n;
      let [prev, cur] = [1n, ramanujanTau(p)];
      for (let r = 1; p ** (r + 1) <= 900; r++) {
        const next = ramanujanTau(p) * cur - P11 * prev;
        expect(ramanujanTau(p ** (r + 1)), `p=${p} r=${r}`).toBe(next);
        [prev, cur] = [cur, next];
      }
    }
  });
  it('1728 Delta = E_4^3 - E_6^2 on the first 60 coefficients (Serre, ch. VII 4)', () => {
    const N = 60;
    const e4 = eisensteinCoefficients(4, N).map((r) => r.num);
    const e6 = eisensteinCoefficients(6, N).map((r) => r.num);
    const mul = (a: bigint[], b: bigint[]) => a.map((_, n) => a.slice(0, n + 1).reduce((s, x, i) => s + x * b[n - i]!, 0n));
    const lhs = deltaCoefficients(N).map((t) => 1728n * t);
    const e43 = mul(mul(e4, e4), e4);
    const e62 = mul(e6, e6);
    expect(lhs).toEqual(e43.map((x, n) => x - e62[n]!));
  });
  it('prod (1 - q^n)^-1 gives the partition numbers (OEIS A000041, from memory)', () => {
    const a000041 = [1, 1, 2, 3, 5, 7, 11, 15, 22, 30, 42, 56, 77, 101, 135, 176];
    expect(etaProductPowerCoefficients(-1, 15)).toEqual(a000041.map(BigInt));
  });
});

describe('identities at random tau (seeded)', () => {
  it('Delta = (E_4^3 - E_6^2)/1728 at random tau, including Im tau in [0.03, 0.3] (Serre, ch. VII 4)', () => {
    const rng = new Random(2024);
    const P = 40;
    for (let s = 0; s < 12; s++) {
      const y = s < 6 ? rng.uniform(0.03, 0.3) : rng.uniform(0.5, 2);
      const tau = Complex.of(rng.uniform(-0.5, 0.5).toPrecision(12), y.toPrecision(12));
      // the difference cancels: E_4 and E_6 are taken with 30 extra digits
      const rhs = withDigits(P + 30, () => {
        const e4 = eisensteinE(4, tau);
        const e6 = eisensteinE(6, tau);
        return e4.powInt(3).sub(e6.powInt(2)).div(Complex.of(1728));
      });
      expect(relErr(withDigits(P, () => discriminant(tau)), rhs, P), `seed=2024 s=${s} tau=${tau}`).toBeLessThan(10 ** (1 - P));
    }
  });
});

describe('transformation laws (built-ins evaluated independently at tau and gamma tau)', () => {
  const P = 40;
  it('eta(tau + 1) = e^{pi i/12} eta(tau) and eta(-1/tau) = sqrt(-i tau) eta(tau) (Apostol, Thm 3.1)', () => {
    const rng = new Random(31);
    for (let s = 0; s < 8; s++) {
      const tau = Complex.of(rng.uniform(-1, 1).toPrecision(12), rng.uniform(0.2, 3).toPrecision(12));
      const e = withDigits(P, () => eta(tau));
      const [t1, st, w, root] = withDigits(P + 12, () => [
        tau.add(Complex.ONE),
        Complex.ONE.neg().div(tau),
        Complex.of(0, pi().div(12)).exp(),
        tau.mul(Complex.of(0, -1)).sqrt(),
      ]);
      const label = `seed=31 s=${s} tau=${tau} P=${P}`;
      expect(relErr(withDigits(P, () => eta(t1)), withDigits(P + 10, () => w.mul(e)), P), label).toBeLessThan(10 ** (1 - P));
      expect(relErr(withDigits(P, () => eta(st)), withDigits(P + 10, () => root.mul(e)), P), label).toBeLessThan(10 ** (1 - P));
    }
  });
  it('general gamma: eta(gamma tau) / (sqrt(c tau + d) eta(tau)) is a 24th root of unity; Delta has weight 12 (Apostol, Thm 3.4)', () => {
    const rng = new Random(32);
    let low = 0;
    for (let s = 0; s < 14; s++) {
      const tau = randomInFundamental(rng, 1.6);
      const g: Mat2 = randomElement({ kind: 'SL2Z' }, rng, tau, { yMin: 0.025 });
      const [gt, j] = withDigits(P + 12, () => [g.act(tau), g.automorphy(tau)] as const);
      if (gt.im.lt(0.1)) low++;
      const label = `seed=32 s=${s} tau=${tau} gamma=${g} gamma tau=${gt} P=${P}`;
      const ratio = withDigits(P + 10, () => withDigits(P, () => eta(gt)).div(j.sqrt().mul(withDigits(P, () => eta(tau)))));
      withDigits(P + 10, () => {
        expect(Math.abs(ratio.abs().toNumber() - 1), label).toBeLessThan(10 ** (2 - P));
        expect(ratio.powInt(24).sub(Complex.ONE).abs().toNumber(), label).toBeLessThan(10 ** (3 - P));
      });
      const d = withDigits(P, () => discriminant(gt));
      const rhs = withDigits(P + 10, () => j.powInt(12).mul(withDigits(P, () => discriminant(tau))));
      expect(relErr(d, rhs, P), label).toBeLessThan(10 ** (2 - P));
    }
    expect(low).toBeGreaterThan(5);
  });
});

describe('bad input (error codes)', () => {
  it("Im tau <= 0: 'domain'; below yMin: 'ymin'", () => {
    expect(errorCode(() => eta(Complex.of('0.1', '-1')))).toBe('domain');
    expect(errorCode(() => eta(Complex.of('0.1', '0')))).toBe('domain');
    expect(errorCode(() => eta(Complex.of('0.1', '0.019')))).toBe('ymin');
    expect(errorCode(() => discriminant(Complex.of('0.1', '0.019')))).toBe('ymin');
    expect(errorCode(() => ramanujanTau(0))).toBe('domain');
    expect(withDigits(20, () => eta(Complex.of('0.1', '0.019'), { yMin: 0.01 })).isFinite()).toBe(true);
  });
});
