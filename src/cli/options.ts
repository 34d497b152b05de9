/**
 * Validation of command-line option values: a bad value is a usage error (exit 2) with a
 * message that names the option, the value and what is allowed.
 */
import { MAX_DIGITS, MIN_DIGITS } from '../numeric/precision.js';

export class UsageError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'UsageError';
  }
}

export function intOption(name: string, raw: string, lo: number, hi: number): number {
  const v = Number(raw);
  if (!/^[+-]?\d+$/.test(raw.trim()) || !Number.isSafeInteger(v) || v < lo || v > hi) {
    throw new UsageError(`${name} ${raw}: expected a whole number from ${lo} to ${hi}`);
  }
  return v;
}

export function digitsOption(raw: string): number {
  return intOption('--digits', raw, MIN_DIGITS, MAX_DIGITS);
}

export function yMinOption(raw: string): number {
  const v = Number(raw);
  if (raw.trim() === '' || !Number.isFinite(v) || v <= 0 || v > 1) {
    throw new UsageError(`--ymin ${raw}: expected a number in (0, 1]`);
  }
  return v;
}

/** A name pattern: case-insensitive, `*` matches any run of characters, otherwise a substring. */
export function namePattern(raw: string): (name: string) => boolean {
  const parts = raw.toLowerCase().split('*').map((p) => p.replace(/[.*+?^${}()|[\]\\]/g, '\\$&'));
  const re = new RegExp(raw.includes('*') ? `^${parts.join('.*')}$` : parts.join(''));
  return (name) => re.test(name.toLowerCase());
}

/** --shard k/n: the k-th of n parts, 1 <= k <= n <= 1000. */
export function shardOption(raw: string): { k: number; n: number } {
  const m = /^\s*(\d+)\s*\/\s*(\d+)\s*$/.exec(raw);
  const k = m === null ? NaN : Number(m[1]);
  const n = m === null ? NaN : Number(m[2]);
  if (m === null || !(n >= 1 && n <= 1000) || !(k >= 1 && k <= n)) {
    throw new UsageError(`--shard ${raw}: expected k/n with 1 <= k <= n <= 1000, e.g. --shard 2/4`);
  }
  return { k, n };
}
