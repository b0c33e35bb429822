import type { Rng } from '../prng.js';
import { AREA_CODES, EMAIL_DOMAINS } from './word-lists.js';

/** A fictional US number: a real area code, exchange 555, line 0100..0199 (reserved for fiction by NANPA). */
export function drawPhone(rng: Rng): { e164: string; text: string } {
  const npa = rng.pick(AREA_CODES);
  const line = String(rng.int(100, 199)).padStart(4, '0');
  const style = rng.int(0, 3);
  const text =
    style === 0 ? `(${npa}) 555-${line}` : style === 1 ? `${npa}-555-${line}` : style === 2 ? `${npa}.555.${line}` : `${npa} 555 ${line}`;
  return { e164: `+1${npa}555${line}`, text };
}

export function drawEmail(rng: Rng, given: string, family: string): string {
  const g = given.toLowerCase();
  const f = family.toLowerCase().replace(/[^a-z]/g, '');
  const local = rng.pick([`${g}.${f}`, `${g[0]}${f}`, `${g}${rng.int(1, 99)}`, `${f}.${g[0]}`]);
  return `${local}@${rng.pick(EMAIL_DOMAINS)}`;
}
