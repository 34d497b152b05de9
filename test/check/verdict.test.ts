// The per-sample decision (src/check/verdict.ts) and the sampler, on hand-made values.
// The rules tested are the project's own policy (README, "What a check does"), so the
// expected outcomes are worked out by hand from it (common practice: tolerance 10^-(P-2)).
import { describe, expect, it } from 'vitest';
import { Decimal } from 'decimal.js';
import { Complex } from '../../src/numeric/complex.js';
import { withDigits } from '../../src/numeric/precision.js';
import { aggregate, assessSample } from '../../src/check/verdict.js';
import { drawSamples } from '../../src/check/sampler.js';
import type { CheckableClaim } from '../../src/check/claim.js';
import { makeGroup } from '../../src/groups/subgroups.js';

const side = (re: string, scale = '0') => ({ value: Complex.of(re), scale: new Decimal(scale) });
const pair = (l: string, r: string, ls = '0', rs = '0') => ({ lhs: side(l, ls), rhs: side(r, rs) });

const limited = (re: string, rel: string) => ({ value: Complex.of(re), scale: new Decimal(0), limit: { rel: new Decimal(rel), by: 'a lattice sum' } });

describe('assessSample with a truncation limit (a lattice sum)', () => {
  const at = (l: string, r: string, rel: string) => ({ lhs: limited(l, rel), rhs: side(r) });
  it('agrees within the reached accuracy and reports no more digits than it', () => {
    withDigits(60, () => {
      const a = assessSample(at('1.0000000000000000001', '1', '1e-15'), at('1.0000000000000000001', '1', '1e-15'), 30);
      expect(a.outcome).toBe('agree');
      expect(a.digits).toBe(15);
      expect(a.limitedBy).toBe('a lattice sum');
    });
  });
  it('is undecided when the residual is above the accuracy but not far above it', () => {
    withDigits(60, () => {
      const a = assessSample(at('1.00000000000001', '1', '1e-15'), at('1.00000000000001', '1', '1e-15'), 30);
      expect(a.outcome).toBe('undecided');
      expect(a.reason).toMatch(/lattice sum/);
    });
  });
  it('disagrees when the residual is far beyond the reached accuracy', () => {
    withDigits(60, () => {
      const a = assessSample(at('1.0000001', '1', '1e-15'), at('1.0000001', '1', '1e-15'), 30);
      expect(a.outcome).toBe('disagree');
    });
  });
  it('a limit below the tolerance changes nothing', () => {
    withDigits(60, () => {
      const a = assessSample(at('1.5', '1.5', '1e-40'), at('1.5', '1.5', '1e-40'), 30);
      expect(a.digits).toBe(30);
      expect(a.limitedBy).toBeUndefined();
    });
  });
});

describe('assessSample', () => {
  it('agrees when the residual and the precision difference are below 10^-(P-2)', () => {
    withDigits(60, () => {
      const a = assessSample(pair('1.5', '1.5000000000000000000000000000000001'), pair('1.5', '1.50000000000000000000000000000000001'), 30);
      expect(a.outcome).toBe('agree');
      expect(a.digits).toBe(30);
    });
  });
  it('disagrees when the residual is real: far above the error and the same at both precisions', () => {
    withDigits(60, () => {
      const a = assessSample(pair('2', '1'), pair('2', '1'), 30);
      expect(a.outcome).toBe('disagree');
      expect(a.residual.toNumber()).toBe(0.5);
    });
  });
  it('is undecided when the two precisions disagree (precision lost)', () => {
    withDigits(60, () => {
      const a = assessSample(pair('1.000001', '1'), pair('1.0000000001', '1'), 30);
      expect(a.outcome).toBe('undecided');
      expect(a.reason).toMatch(/precision/);
    });
  });
  it('measures vanishing sides against the terms that formed them', () => {
    withDigits(60, () => {
      // |LHS| = 1e-40 while its terms were of size 1: zero to 30 digits of the terms
      const a = assessSample(pair('1e-40', '0', '1'), pair('1e-45', '0', '1'), 30);
      expect(a.vanishing).toBe(true);
      expect(a.outcome).toBe('agree');
      // without the gauge the same numbers would be a 100% residual
      const b = assessSample(pair('1e-40', '0'), pair('1e-45', '0'), 30);
      expect(b.outcome).not.toBe('agree');
    });
  });
  it('aggregates: one disagreement refutes, all agreements hold, otherwise undecided', () => {
    expect(aggregate(['agree', 'disagree', 'undecided'])).toBe('refuted');
    expect(aggregate(['agree', 'agree'])).toBe('holds');
    expect(aggregate(['agree', 'undecided'])).toBe('undecided');
    expect(aggregate([])).toBe('undecided');
  });
});

describe('drawSamples', () => {
  const claim: CheckableClaim = {
    file: 'x.vet',
    line: 1,
    name: 'c',
    text: 'a = b',
    expect: 'holds',
    group: { variable: 'g', group: makeGroup('Gamma0', 3) },
    params: [
      { kind: 'interval', name: 's', lo: 1, hi: 2 },
      { kind: 'values', name: 'k', values: [Complex.of(4), Complex.of(6)] },
    ],
    evaluate: () => {
      throw new Error('not used');
    },
  };
  it('is deterministic in the seed, repeats the set per listed value, and splits F / images', () => {
    const opts = { seed: 3, samples: 8, yMin: 0.02 };
    const a = drawSamples(claim, opts);
    const b = drawSamples(claim, opts);
    expect(a.map((s) => `${s.tau} ${s.gamma} ${s.params.get('s')}`)).toEqual(b.map((s) => `${s.tau} ${s.gamma} ${s.params.get('s')}`));
    expect(a.length).toBe(16);
    expect(a.filter((s) => s.params.get('k')!.re.eq(4)).length).toBe(8);
    expect(a.filter((s) => s.origin === 'F').length).toBe(8);
    for (const s of a) {
      const v = s.params.get('s')!.re.toNumber();
      expect(v >= 1 && v < 2).toBe(true);
      expect(s.gamma!.c % 3n).toBe(0n);
      expect(s.gamma!.act(s.tau).im.gte(0.02)).toBe(true);
    }
    const c = drawSamples(claim, { ...opts, seed: 4 });
    expect(c[0]!.tau.equals(a[0]!.tau)).toBe(false);
  });
});
