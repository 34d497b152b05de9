/** The code of the ModvetError that f throws, or undefined when it returns. */
import { ModvetError } from '../../src/numeric/errors.js';

export function errorCode(f: () => unknown): string | undefined {
  try {
    f();
  } catch (e) {
    if (e instanceof ModvetError) return e.code;
    throw e;
  }
  return undefined;
}

/** `code:fn` of the ModvetError that f throws (the function it names too), or undefined. */
export function errorCodeAndFn(f: () => unknown): string | undefined {
  try {
    f();
  } catch (e) {
    if (e instanceof ModvetError) return `${e.code}:${e.fn}`;
    throw e;
  }
  return undefined;
}
