import { configError } from '../errors.js';

/** A whole-number option (threads, workers, attempts...), at least `min`: a usage error (exit 2) naming the option otherwise. */
export function wholeNumber(flag: string, text: string, min = 1): number {
  const n = Number(text);
  if (!Number.isInteger(n) || n < min) throw configError(undefined, `${flag}: expected a whole number >= ${min} but received "${text}"`);
  return n;
}

/** The same for an option that may be absent. */
export function optionalWholeNumber(flag: string, text: string | undefined, min = 1): number | undefined {
  return text === undefined ? undefined : wholeNumber(flag, text, min);
}
