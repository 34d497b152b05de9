// The seeded source: reproducible, in range, and roughly uniform (common practice checks).
import { describe, expect, it } from 'vitest';
import { Random } from '../../src/numeric/random.js';

describe('Random', () => {
  it('gives the same stream for the same seed and a different one for another seed', () => {
    const a = new Random(7);
    const b = new Random(7);
    const c = new Random(8);
    const xs = Array.from({ length: 20 }, () => a.nextUint32());
    expect(Array.from({ length: 20 }, () => b.nextUint32())).toEqual(xs);
    expect(Array.from({ length: 20 }, () => c.nextUint32())).not.toEqual(xs);
  });
  it('keeps uniform() and int() in range with about the right mean', () => {
    const r = new Random('range');
    let sum = 0;
    const counts = new Array<number>(7).fill(0);
    for (let i = 0; i < 20000; i++) {
      const u = r.uniform(2, 3);
      expect(u >= 2 && u < 3).toBe(true);
      sum += u;
      const k = r.int(-3, 3);
      counts[k + 3]!++;
    }
    expect(Math.abs(sum / 20000 - 2.5)).toBeLessThan(0.01); // sd of the mean ~ 0.002
    for (const c of counts) expect(Math.abs(c - 20000 / 7)).toBeLessThan(250); // ~ 5 sd
  });
});
