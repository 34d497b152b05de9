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
