/**
 * SL(2,Z) and its congruence subgroups, as data and as membership tests.
 *
 * Conventions (math-reference.md): Gamma0(N): c = 0 mod N; Gamma1(N): also a = d = 1
 * mod N; Gamma(N): b = c = 0 and a = d = 1 mod N. SL2Z is Gamma0(1).
 */
import { ModvetError } from '../numeric/errors.js';
import { Mat2 } from './matrix.js';

export type Group =
  | { kind: 'SL2Z' }
  | { kind: 'Gamma0'; N: number }
  | { kind: 'Gamma1'; N: number }
  | { kind: 'Gamma'; N: number };

export function groupName(g: Group): string {
  return g.kind === 'SL2Z' ? 'SL2Z' : `${g.kind}(${g.N})`;
}

/** A group from its kind and level; levels must be positive integers. */
export function makeGroup(kind: Group['kind'], N = 1): Group {
  if (kind === 'SL2Z') return { kind };
  if (!Number.isSafeInteger(N) || N < 1) {
    throw new ModvetError('domain', kind, `level N = ${N} must be a positive integer`);
  }
  return { kind, N };
}

function mod(x: bigint, n: bigint): bigint {
  const r = x % n;
  return r < 0n ? r + n : r;
}

/** Whether m lies in the group (determinant one and the congruences). */
export function contains(g: Group, m: Mat2): boolean {
  if (m.det() !== 1n) return false;
  if (g.kind === 'SL2Z') return true;
  const N = BigInt(g.N);
  if (mod(m.c, N) !== 0n) return false;
  if (g.kind === 'Gamma0') return true;
  if (mod(m.a, N) !== mod(1n, N) || mod(m.d, N) !== mod(1n, N)) return false;
  return g.kind === 'Gamma1' || mod(m.b, N) === 0n;
}
