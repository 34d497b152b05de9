/**
 * Writing an element of SL(2,Z) as a word in the generators S and T (for reports).
 *
 * Method: the Euclidean algorithm on the bottom row. While c != 0, with q the nearest
 * integer to a/c, gamma = T^q S gamma' where gamma' = S^-1 T^-q gamma has a smaller |c|.
 * At c = 0, gamma' = +-T^m. So gamma = sign * T^q1 S T^q2 S ... T^m, using S^2 = -I.
 */
import { ModvetError } from '../numeric/errors.js';
import { Mat2 } from './matrix.js';

export interface Letter {
  gen: 'S' | 'T';
  pow: number;
}
export interface Word {
  /** -1 when the matrix is minus the product of the letters. */
  sign: 1 | -1;
  letters: Letter[];
}

function nearestQuotient(a: bigint, c: bigint): bigint {
  // round(a / c) with exact integers
  const q = a / c;
  const r = a - q * c;
  const abs = (x: bigint) => (x < 0n ? -x : x);
  if (2n * abs(r) > abs(c)) return q + ((r < 0n) === (c < 0n) ? 1n : -1n);
  return q;
}

export function toWord(m: Mat2): Word {
  if (m.det() !== 1n) throw new ModvetError('domain', 'word', `${m} is not in SL(2,Z)`);
  const letters: Letter[] = [];
  const push = (gen: 'S' | 'T', pow: number) => {
    if (pow !== 0) letters.push({ gen, pow });
  };
  const Sinv = Mat2.S.inv();
  let g = m;
  while (g.c !== 0n) {
    const q = nearestQuotient(g.a, g.c);
    push('T', Number(q));
    push('S', 1);
    g = Sinv.mul(Mat2.translation(-q)).mul(g);
  }
  // g = +-(1 m; 0 1)
  const sign: 1 | -1 = g.a === 1n ? 1 : -1;
  push('T', Number(sign === 1 ? g.b : -g.b));
  return { sign, letters };
}

export function wordToMatrix(w: Word): Mat2 {
  let g = Mat2.I;
  for (const l of w.letters) g = g.mul((l.gen === 'S' ? Mat2.S : Mat2.T).pow(l.pow));
  return w.sign === 1 ? g : g.neg();
}

/** "T^2 S T^-1 S", "I" for the identity, a leading "-" for minus the product. */
export function wordToString(w: Word): string {
  const body = w.letters.map((l) => (l.pow === 1 ? l.gen : `${l.gen}^${l.pow}`)).join(' ');
  const core = body === '' ? 'I' : body;
  return w.sign === 1 ? core : `-${core}`;
}
