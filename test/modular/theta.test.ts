// Theta constants: mpmath reference values (jtheta(n, 0, e^{i pi tau})), Jacobi's identity,
// 2 eta^3 = theta_2 theta_3 theta_4, E_4 = (theta_2^8 + theta_3^8 + theta_4^8)/2, the
// inversion law theta_3(-1/tau) = sqrt(-i tau) theta_3(tau), a closed form, bad input.
import { describe, expect, it } from 'vitest';
import { Complex } from '../../src/numeric/complex.js';
import { pi } from '../../src/numeric/constants.js';
import { withDigits } from '../../src/numeric/precision.js';
import { Random } from '../../src/numeric/random.js';
import { gamma } from '../../src/special/gamma.js';
import { eisensteinE } from '../../src/modular/eisenstein.js';
import { eta } from '../../src/modular/eta.js';
import { theta2, theta3, theta4 } from '../../src/modular/theta.js';
import { referenceCases, referenceLibrary, ulpError } from '../helpers/reference.js';
import { errorCode } from '../helpers/errors.js';

function relErr(a: Complex, b: Complex, P: number): number {
  return withDigits(P + 40, () => a.sub(b).abs().div(b.abs()).toNumber());
}
const thetas: [string, (t: Complex) => Complex][] = [
  ['jtheta2', theta2],
  ['jtheta3', theta3],
  ['jtheta4', theta4],
];

describe(`theta constants against ${referenceLibrary} (test/reference/values.json, jtheta(n, 0, e^{i pi tau}))`, () => {
  for (const [name, f] of thetas) {
    for (const P of [30, 50, 100]) {
      it(`${name} at ${P} digits, Im tau from 0.027 to 3.5`, () => {
        for (const c of referenceCases(name)) {
          expect(ulpError(withDigits(P, () => f(c.args[0]!)), c.value, P), c.label).toBeLessThanOrEqual(2);
        }
      });
    }
  }
});

describe('closed form', () => {
  // classical lemniscatic value, from memory (mpmath: jtheta(3, 0, e^-pi) = 1.08643481121330801457...)
  it('theta_3(i) = pi^{1/4} / Gamma(3/4) (Gamma from src/special/gamma.ts)', () => {
    for (const P of [30, 60]) {
      const ref = withDigits(P + 10, () => Complex.of(pi().pow(0.25)).div(gamma(Complex.of('0.75'))));
      expect(ulpError(withDigits(P, () => theta3(Complex.I)), ref, P)).toBeLessThanOrEqual(2);
    }
  });
});

/** Random tau, half of them with Im tau in [0.03, 0.15]. */
function points(seed: number, n: number): Complex[] {
  const rng = new Random(seed);
  return Array.from({ length: n }, (_, s) =>
    Complex.of(rng.uniform(-1, 1).toPrecision(12), (s % 2 === 0 ? rng.uniform(0.03, 0.15) : rng.uniform(0.3, 2)).toPrecision(12)),
  );
}

describe('far below the default yMin, where the sum cancels by ~1100 bits', () => {
  it('theta_4(0.001i) = sqrt(1000) theta_2(1000i) = 2 sqrt(1000) e^{-250 pi} to 20 digits (DLMF 20.7(viii))', () => {
    // theta_2(1000i) = 2 e^{-250 pi} (1 + O(e^{-2000 pi}))
    const ref = withDigits(40, () => Complex.of(new Complex(1000).sqrt().re.times(2).times(pi().times(-250).exp())));
    const got = withDigits(20, () => theta4(Complex.of('0', '0.001'), { yMin: 0.001 }));
    expect(ulpError(got, ref, 20)).toBeLessThanOrEqual(2);
  });
});

describe('identities between built-ins at random tau', () => {
  const P = 40;
  it("Jacobi: theta_3^4 = theta_2^4 + theta_4^4 (DLMF 20.7.5)", () => {
    for (const tau of points(51, 12)) {
      const [t2, t3, t4] = withDigits(P, () => [theta2(tau), theta3(tau), theta4(tau)]);
      const [lhs, rhs] = withDigits(P + 10, () => [t3.powInt(4), t2.powInt(4).add(t4.powInt(4))]);
      // the right side adds two terms that may be much larger than their sum
      const scale = withDigits(P + 10, () => t2.powInt(4).abs().plus(t4.powInt(4).abs()));
      const err = withDigits(P + 10, () => lhs.sub(rhs).abs().div(scale).toNumber());
      expect(err, `seed=51 tau=${tau} P=${P}`).toBeLessThan(10 ** (2 - P));
    }
  });
  it("2 eta^3 = theta_2 theta_3 theta_4 (DLMF 20.4.6: theta_1'(0) = theta_2 theta_3 theta_4, with theta_1'(0) = 2 eta^3; math-reference.md)", () => {
    for (const tau of points(52, 12)) {
      const lhs = withDigits(P + 10, () => withDigits(P, () => eta(tau)).powInt(3).scale(2));
      const rhs = withDigits(P + 10, () => withDigits(P, () => theta2(tau).mul(theta3(tau)).mul(theta4(tau))));
      expect(relErr(lhs, rhs, P), `seed=52 tau=${tau} P=${P}`).toBeLessThan(10 ** (2 - P));
    }
  });
  it('E_4 = (theta_2^8 + theta_3^8 + theta_4^8)/2 (Zagier, on theta series; math-reference.md)', () => {
    for (const tau of points(53, 12)) {
      const [t2, t3, t4] = withDigits(P, () => [theta2(tau), theta3(tau), theta4(tau)]);
      const rhs = withDigits(P + 10, () => t2.powInt(8).add(t3.powInt(8)).add(t4.powInt(8)).scale(0.5));
      const scale = withDigits(P + 10, () => t2.powInt(8).abs().plus(t3.powInt(8).abs()).plus(t4.powInt(8).abs()));
      const err = withDigits(P + 10, () => withDigits(P, () => eisensteinE(4, tau)).sub(rhs).abs().div(scale).toNumber());
      expect(err, `seed=53 tau=${tau} P=${P}`).toBeLessThan(10 ** (2 - P));
    }
  });
});

describe('transformation laws (built-ins evaluated independently at tau and the image)', () => {
  const P = 40;
  it('theta_3(-1/tau) = sqrt(-i tau) theta_3(tau), theta_4(-1/tau) = sqrt(-i tau) theta_2(tau) (DLMF 20.7(viii) at z = 0)', () => {
    // tau with |tau| about 1 and Im tau small, so that -1/tau is also near the real axis
    const rng = new Random(54);
    for (let s = 0; s < 10; s++) {
      const ang = rng.uniform(0.04, Math.PI - 0.04);
      const rad = rng.uniform(0.6, 1.6);
      const tau = Complex.of((rad * Math.cos(ang)).toPrecision(12), (rad * Math.sin(ang)).toPrecision(12));
      const [st, root] = withDigits(P + 12, () => [Complex.ONE.neg().div(tau), tau.mul(Complex.of(0, -1)).sqrt()]);
      const label = `seed=54 s=${s} tau=${tau} -1/tau=${st} P=${P}`;
      const r3 = withDigits(P + 10, () => root.mul(withDigits(P, () => theta3(tau))));
      expect(relErr(withDigits(P, () => theta3(st)), r3, P), label).toBeLessThan(10 ** (2 - P));
      const r4 = withDigits(P + 10, () => root.mul(withDigits(P, () => theta2(tau))));
      expect(relErr(withDigits(P, () => theta4(st)), r4, P), label).toBeLessThan(10 ** (2 - P));
    }
  });
  it('theta_3(tau + 1) = theta_4(tau) and theta_2(tau + 1) = e^{pi i/4} theta_2(tau) (DLMF 20.7(vii))', () => {
    for (const tau of points(55, 8)) {
      const [t1, w] = withDigits(P + 12, () => [tau.add(Complex.ONE), Complex.of(0, pi().div(4)).exp()]);
      expect(relErr(withDigits(P, () => theta3(t1)), withDigits(P, () => theta4(tau)), P), `tau=${tau}`).toBeLessThan(10 ** (2 - P));
      const r = withDigits(P + 10, () => w.mul(withDigits(P, () => theta2(tau))));
      expect(relErr(withDigits(P, () => theta2(t1)), r, P), `tau=${tau}`).toBeLessThan(10 ** (2 - P));
    }
  });
});

describe('bad input (error codes)', () => {
  it("Im tau <= 0: 'domain'; below yMin: 'ymin'", () => {
    for (const [, f] of thetas) {
      expect(errorCode(() => f(Complex.of('0.2', '-0.3')))).toBe('domain');
      expect(errorCode(() => f(Complex.of('0.2', '0')))).toBe('domain');
      expect(errorCode(() => f(Complex.of('0.2', '0.01')))).toBe('ymin');
      expect(withDigits(20, () => f(Complex.of('0.2', '0.01'), { yMin: 0.005 })).isFinite()).toBe(true);
    }
  });
});
