// The name table: every built-in listed with its arity, the help listing, the edit
// distance (textbook values) and the nearest-name hints.
import { describe, expect, it } from 'vitest';
import { BUILTINS, KEYWORDS, OPERATORS, PLANNED, editDistance, knownNames, nearestNames } from '../../src/lang/names.js';

describe('knownNames', () => {
  it('lists constants, tau and its parts, the group entries and every built-in with its arities', () => {
    const names = knownNames();
    const byName = new Map(names.map((n) => [n.name, n]));
    for (const c of ['i', 'pi', 'euler', 'rho']) expect(byName.get(c)?.kind).toBe('constant');
    for (const v of ['tau', 'x', 'y', 'taubar', 'q']) expect(byName.get(v)?.kind).toBe('variable');
    for (const e of ['a', 'b', 'c', 'd']) expect(byName.get(e)?.kind).toBe('group entry');
    expect(byName.get('Gamma')?.arities).toEqual([1, 2]);
    expect(byName.get('E')?.arities).toEqual([2]);
    expect(names.filter((n) => n.kind === 'function')).toHaveLength(Object.keys(BUILTINS).length + Object.keys(OPERATORS).length);
    for (const n of names) expect(n.summary.length).toBeGreaterThan(0);
  });
  it('no built-in is a keyword or a planned operator', () => {
    for (const n of Object.keys(BUILTINS)) {
      expect(KEYWORDS.has(n)).toBe(false);
      expect(PLANNED[n]).toBeUndefined();
    }
  });
});

describe('edit distance (optimal string alignment)', () => {
  it('textbook values', () => {
    expect(editDistance('kitten', 'sitting')).toBe(3);
    expect(editDistance('', 'abc')).toBe(3);
    expect(editDistance('flaw', 'lawn')).toBe(2);
    expect(editDistance('Delat', 'Delta')).toBe(1); // one transposition
    expect(editDistance('same', 'same')).toBe(0);
  });
  it('nearest names: closest first, case-only differences first of all, far names dropped', () => {
    expect(nearestNames('Delat', ['Delta', 'eta', 'zeta'])).toEqual(['Delta']);
    expect(nearestNames('PI', ['pi', 'i', 'Gamma'])[0]).toBe('pi');
    expect(nearestNames('theta', ['theta2', 'theta3', 'theta4', 'beta', 'zeta'])).toEqual(['theta2', 'theta3', 'theta4']);
    expect(nearestNames('quux', ['E', 'eta', 'sigma'])).toEqual([]);
  });
});
