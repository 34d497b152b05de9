// Groups: matrix algebra, membership, words in S and T, sampling and reduction to F.
// Relations from Serre, "A Course in Arithmetic", ch. VII, section 1 (S^2 = (ST)^3 = -1 in
// SL(2,Z)) and the definitions of the congruence subgroups in math-reference.md.
import { describe, expect, it } from 'vitest';
import { Decimal } from 'decimal.js';
import { Complex } from '../../src/numeric/complex.js';
import { Random } from '../../src/numeric/random.js';
import { withDigits } from '../../src/numeric/precision.js';
import { Mat2 } from '../../src/groups/matrix.js';
import { contains, Group, makeGroup } from '../../src/groups/subgroups.js';
import { toWord, wordToMatrix, wordToString } from '../../src/groups/words.js';
import { randomElement, randomInFundamental } from '../../src/groups/sample.js';
import { reduceToFundamental } from '../../src/groups/fundamental.js';
import { ModvetError } from '../../src/numeric/errors.js';

const minusI = Mat2.I.neg();

describe('matrices', () => {
  it('satisfy S^2 = (ST)^3 = -I (Serre VII.1)', () => {
    expect(Mat2.S.mul(Mat2.S).equals(minusI)).toBe(true);
    expect(Mat2.S.mul(Mat2.T).pow(3).equals(minusI)).toBe(true);
  });
  it('act as a group action with Im(g tau) = Im(tau)/|c tau + d|^2 (common practice)', () => {
    withDigits(40, () => {
      const tau = Complex.of('0.31', '0.77');
      const g = new Mat2(2n, 1n, 7n, 4n);
      const h = new Mat2(1n, -3n, 1n, -2n);
      const lhs = g.mul(h).act(tau);
      const rhs = g.act(h.act(tau));
      expect(lhs.sub(rhs).abs().lt('1e-38')).toBe(true);
      const im = tau.im.div(g.automorphy(tau).abs2());
      expect(g.act(tau).im.minus(im).abs().lt('1e-38')).toBe(true);
    });
  });
});

describe('congruence subgroups', () => {
  it('test membership by the congruences', () => {
    const m = new Mat2(1n, 2n, 6n, 13n); // det 1, c = 0 mod 6, a = d = 1 mod 6? d = 13 = 1 mod 6
    expect(contains(makeGroup('Gamma0', 6), m)).toBe(true);
    expect(contains(makeGroup('Gamma1', 6), m)).toBe(true);
    expect(contains(makeGroup('Gamma', 6), m)).toBe(false); // b = 2 != 0 mod 6
    expect(contains(makeGroup('Gamma', 2), m)).toBe(true);
    expect(contains(makeGroup('Gamma0', 4), m)).toBe(false);
    expect(contains(makeGroup('SL2Z'), new Mat2(2n, 0n, 0n, 1n))).toBe(false);
  });
  it('reject a non-positive level with a typed error', () => {
    expect(() => makeGroup('Gamma0', 0)).toThrow(ModvetError);
  });
});

describe('words in S and T', () => {
  it('round-trip random matrices and print the generators', () => {
    const rng = new Random(11);
    const tau = Complex.of('0.1', '1.1');
    for (let i = 0; i < 200; i++) {
      const g = randomElement(makeGroup('SL2Z'), rng, tau, { yMin: 0.005 });
      const w = toWord(g);
      expect(wordToMatrix(w).equals(g), `${g} -> ${wordToString(w)}`).toBe(true);
    }
    expect(wordToString(toWord(Mat2.S))).toBe('S');
    expect(wordToString(toWord(Mat2.T.pow(3)))).toBe('T^3');
    expect(wordToString(toWord(Mat2.I))).toBe('I');
    expect(wordToMatrix(toWord(minusI)).equals(minusI)).toBe(true);
  });
});

describe('sampling', () => {
  const groups: Group[] = [
    makeGroup('SL2Z'),
    makeGroup('Gamma0', 4),
    makeGroup('Gamma0', 11),
    makeGroup('Gamma1', 5),
    makeGroup('Gamma', 3),
  ];
  it('is reproducible from the seed', () => {
    const draw = (seed: number) => {
      const rng = new Random(seed);
      return Array.from({ length: 10 }, () => {
        const tau = randomInFundamental(rng);
        return `${tau} ${randomElement(makeGroup('Gamma0', 3), rng, tau, { yMin: 0.02 })}`;
      });
    };
    expect(draw(5)).toEqual(draw(5));
    expect(draw(5)).not.toEqual(draw(6));
  });
  it('gives group members with Im(g tau) >= yMin that reach close to the real axis', () => {
    withDigits(30, () => {
      const rng = new Random('sampling');
      for (const G of groups) {
        let lowest = Infinity;
        for (let i = 0; i < 60; i++) {
          const tau = randomInFundamental(rng);
          const g = randomElement(G, rng, tau, { yMin: 0.02 });
          expect(contains(G, g), `${JSON.stringify(G)} ${g}`).toBe(true);
          const y = g.act(tau).im;
          expect(y.gte(new Decimal(0.02)), `${g} at ${tau}`).toBe(true);
          lowest = Math.min(lowest, y.toNumber());
        }
        // for SL2Z and small levels most draws have c != 0, so some land below Im = 0.1
        if (G.kind === 'SL2Z' || (G.kind === 'Gamma0' && G.N === 4)) expect(lowest).toBeLessThan(0.1);
      }
    });
  });
  it('keeps sampled points inside F', () => {
    const rng = new Random(3);
    for (let i = 0; i < 100; i++) {
      const t = randomInFundamental(rng);
      expect(t.re.abs().lte(0.5) && t.abs2().gte(1)).toBe(true);
    }
  });
});

describe('reduction to the fundamental domain', () => {
  it('lands in F with the matrix it reports', () => {
    withDigits(40, () => {
      const rng = new Random(9);
      for (let i = 0; i < 50; i++) {
        const tau = Complex.of(rng.uniform(-3, 3).toPrecision(12), rng.uniform(0.001, 0.5).toPrecision(12));
        const { tau: z, gamma } = reduceToFundamental(tau);
        expect(z.re.abs().lte('0.5000000001') && z.abs2().gte('0.9999999999'), `${tau} -> ${z}`).toBe(true);
        expect(gamma.det()).toBe(1n);
        expect(gamma.act(tau).sub(z).abs().lt('1e-30')).toBe(true);
      }
    });
  });
});
