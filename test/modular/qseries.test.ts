// The shared q-series machinery: the raw summers against sums at twice the precision on
// decimal.js (common practice: an independent slow evaluation), within their stated error
// bounds; the tail rule; the checked-evaluation loop; e^{2 pi i tau r}.
import { describe, expect, it } from 'vitest';
import { Decimal } from 'decimal.js';
import { Complex } from '../../src/numeric/complex.js';
import { pi } from '../../src/numeric/constants.js';
import { fromComplex, toComplex } from '../../src/numeric/fixedComplex.js';
import { withDigits } from '../../src/numeric/precision.js';
import { sigmaSieve } from '../../src/special/divisors.js';
import {
  cancellationCap,
  checkedEvaluation,
  checkTau,
  denseTermCount,
  expTwoPiITau,
  pentagonalErrorBound,
  pentagonalSum,
  scaled,
  scaledToComplex,
  sdiv,
  spow,
  sumQSeries,
} from '../../src/modular/qseries.js';

const q = (x: string, y: string, D: number) =>
  withDigits(D, () => new Complex(x, y).scale(pi().times(2)).mulI().exp());

describe('sumQSeries (baby steps, giant steps)', () => {
  for (const [p, x, y] of [
    [1, '0.31', '0.02'],
    [3, '-0.44', '0.05'],
    [11, '0.123', '0.3'],
    [23, '0.1', '1.1'],
    [13, '-0.4995', '1.13'],
  ] as const) {
    it(`sum sigma_${p}(n) q^n at tau = ${x} + ${y}i is within its bound Phi 2^-F`, () => {
      const F = 160;
      const D = 120;
      const yf = Number(y);
      const log2r = -2 * Math.PI * yf * Math.LOG2E;
      const r = 2 ** log2r;
      const N = denseTermCount(0, p, log2r, -F, 'test');
      const a = sigmaSieve(p, N);
      const m = Math.max(1, Math.min(Math.ceil(Math.sqrt(N + 1)), Math.floor(64 / -log2r)));
      const g = Math.ceil(m * -log2r) + 4;
      const qz = q(x, y, D);
      const bits = Math.max(...a.map((c) => c.toString(2).length));
      const got = withDigits(D, () => toComplex(sumQSeries(a, N, fromComplex(qz, F + g), F, g, m, bits), F));
      const exact = withDigits(D, () => {
        let s = Complex.ZERO;
        for (let n = N; n >= 1; n--) s = s.add(Complex.of(a[n]!.toString())).mul(qz);
        return s;
      });
      let phi = 4 / -Math.expm1(m * log2r * Math.LN2);
      for (let n = 1; n <= N; n++) phi += 8 * (n + 1) * Number(a[n]!) * r ** n;
      const err = withDigits(D, () => got.sub(exact).abs().toNumber());
      expect(err).toBeLessThanOrEqual(phi * 2 ** -F);
    });
  }
});

describe('pentagonalSum', () => {
  it('equals prod_{n>=1} (1 - q^n) (DLMF 27.14(ii)) within pentagonalErrorBound', () => {
    for (const [x, y] of [
      ['0.2', '0.02'],
      ['-0.37', '0.1'],
      ['0.05', '1'],
    ]) {
      const F = 150;
      const D = 100;
      const log2r = -2 * Math.PI * Number(y) * Math.LOG2E;
      const G = Math.ceil((F + 4) / -log2r);
      const qz = q(x, y, D);
      const got = withDigits(D, () => toComplex(pentagonalSum(fromComplex(qz, F), F, G), F));
      const prod = withDigits(D, () => {
        let s = Complex.ONE;
        let qn = Complex.ONE;
        for (let n = 1; n <= G + 40; n++) {
          qn = qn.mul(qz);
          s = s.mul(Complex.ONE.sub(qn));
        }
        return s;
      });
      const err = withDigits(D, () => got.sub(prod).abs().toNumber());
      expect(err, `tau=${x}+${y}i`).toBeLessThanOrEqual((pentagonalErrorBound(log2r, G, 1) + 2) * 2 ** -F);
    }
  });
});

describe('denseTermCount', () => {
  it('leaves a tail below the target (checked by summing the bound further)', () => {
    for (const [p, y, target] of [
      [3, 0.02, -200],
      [11, 0.05, -120],
      [1, 1.5, -300],
    ]) {
      const log2r = -2 * Math.PI * y * Math.LOG2E;
      const N = denseTermCount(Math.log2(240), p, log2r, target, 'test');
      let tail = 0;
      for (let n = N + 1; n < N + 20000; n++) tail += 240 * n ** p * (1 + Math.log(n)) * 2 ** (n * log2r - target);
      expect(tail, `p=${p} y=${y}`).toBeLessThanOrEqual(1);
    }
  });
});

describe('checkedEvaluation', () => {
  const value = scaled({ re: 1n, im: 0n }, 10);
  it('accepts a first pass with little cancellation', () => {
    const extras: number[] = [];
    checkedEvaluation(100, (extra) => {
      extras.push(extra);
      return { value, lostBits: 3 };
    });
    expect(extras).toEqual([8]);
  });
  it('re-sums with the measured loss, and stops at the cap for an exact zero', () => {
    const extras: number[] = [];
    checkedEvaluation(100, (extra) => {
      extras.push(extra);
      return { value, lostBits: extra < 40 ? 30 : 20 };
    });
    expect(extras).toEqual([8, 38]);
    const zeros: number[] = [];
    checkedEvaluation(100, (extra) => {
      zeros.push(extra);
      return { value, lostBits: Infinity };
    });
    expect(zeros).toEqual([8, cancellationCap(100)]);
    expect(cancellationCap(100)).toBe(256);
    expect(cancellationCap(1000)).toBe(1000);
  });
});

describe('e^{2 pi i tau r} and scaled arithmetic', () => {
  it('expTwoPiITau keeps relative accuracy for large Re tau and large Im tau', () => {
    for (const [x, y, num, den] of [
      ['123456.789', '0.5', 1, 1],
      ['0.25', '40', 1, 24],
      ['-3.3', '0.02', 1, 8],
    ] as const) {
      const D = 60;
      const got = withDigits(D, () => scaledToComplex(expTwoPiITau(checkTau(new Complex(x, y), 'test'), num, den, 230)));
      const ref = withDigits(D + 20, () => new Complex(x, y).scale(pi().times(2 * num).div(den)).mulI().exp());
      const rel = withDigits(D + 20, () => got.sub(ref).abs().div(ref.abs()).toNumber());
      expect(rel, `tau=${x}+${y}i r=${num}/${den}`).toBeLessThan(1e-58);
    }
  });
  it('spow and sdiv keep relative accuracy across scales', () => {
    withDigits(50, () => {
      const z = new Complex('0.0003', '-0.0007');
      const s = scaled(fromComplex(z, 200), 200);
      const p = scaledToComplex(sdiv(spow(s, 24), s));
      const ref = withDigits(80, () => z.powInt(23));
      const rel = withDigits(80, () => p.sub(ref).abs().div(ref.abs()).toNumber());
      expect(rel).toBeLessThan(1e-49);
      expect(new Decimal(p.abs()).lt(1e-70)).toBe(true);
    });
  });
});
