/**
 * A seeded pseudo-random source: the only randomness modvet uses, so that a run is
 * reproducible from its seed on every machine.
 *
 * Method: xoshiro128** (Blackman & Vigna, "Scrambled linear pseudorandom number
 * generators", ACM TOMS 2021) on 32-bit integer arithmetic (Math.imul, >>> 0), seeded by
 * splitmix32 from the seed, so the stream depends on nothing but the seed.
 *
 *   const r = new Random(42); r.uniform(0.5, 2); r.int(-3, 3);
 */
export class Random {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;

  constructor(seed: number | string) {
    let h = typeof seed === 'number' ? seed >>> 0 : hashString(seed);
    const next = (): number => {
      // splitmix32
      h = (h + 0x9e3779b9) >>> 0;
      let z = h;
      z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
      z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
      return (z ^ (z >>> 16)) >>> 0;
    };
    this.s0 = next();
    this.s1 = next();
    this.s2 = next();
    this.s3 = next();
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0) this.s0 = 1;
  }

  /** A uniform 32-bit unsigned integer. */
  nextUint32(): number {
    const result = Math.imul(rotl(Math.imul(this.s1, 5) >>> 0, 7), 9) >>> 0;
    const t = (this.s1 << 9) >>> 0;
    this.s2 = (this.s2 ^ this.s0) >>> 0;
    this.s3 = (this.s3 ^ this.s1) >>> 0;
    this.s1 = (this.s1 ^ this.s2) >>> 0;
    this.s0 = (this.s0 ^ this.s3) >>> 0;
    this.s2 = (this.s2 ^ t) >>> 0;
    this.s3 = rotl(this.s3, 11);
    return result;
  }

  /** A uniform double in [0, 1) with 53 random bits. */
  next(): number {
    const hi = this.nextUint32() >>> 5; // 27 bits
    const lo = this.nextUint32() >>> 6; // 26 bits
    return (hi * 67108864 + lo) / 9007199254740992;
  }

  /** A uniform double in [lo, hi). */
  uniform(lo: number, hi: number): number {
    return lo + (hi - lo) * this.next();
  }

  /** A uniform integer in [lo, hi] (inclusive), without modulo bias. */
  int(lo: number, hi: number): number {
    const span = hi - lo + 1;
    if (!Number.isSafeInteger(span) || span <= 0 || span > 2 ** 32) {
      throw new RangeError(`Random.int: bad range [${lo}, ${hi}]`);
    }
    const limit = Math.floor(2 ** 32 / span) * span;
    for (;;) {
      const u = this.nextUint32();
      if (u < limit) return lo + (u % span);
    }
  }

  /** An independent stream derived from this one and a label (e.g. one per claim). */
  fork(label: string): Random {
    return new Random((this.nextUint32() ^ hashString(label)) >>> 0);
  }
}

function rotl(x: number, k: number): number {
  return ((x << k) | (x >>> (32 - k))) >>> 0;
}

/** FNV-1a, 32 bits: a stable hash from a string seed or label. */
function hashString(s: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < s.length; i++) {
    h ^= s.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h >>> 0;
}
