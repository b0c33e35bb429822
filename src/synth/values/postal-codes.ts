import type { Rng } from '../prng.js';

function letters(rng: Rng, allowed: string): string {
  return allowed[rng.int(0, allowed.length - 1)];
}

function digit(rng: Rng, lo = 0): string {
  return String(rng.int(lo, 9));
}

/** US ZIP (5 digits) or ZIP+4 (USPS Publication 28 §23). Leading "0" allowed, "00000" avoided. */
export function drawUsZip(rng: Rng, plusFour: boolean): string {
  const zip = digit(rng) + digit(rng) + digit(rng, 1) + digit(rng) + digit(rng, 1);
  return plusFour ? `${zip}-${digit(rng)}${digit(rng)}${digit(rng)}${digit(rng, 1)}` : zip;
}

/**
 * Canadian postal code "A1A 1A1" (Canada Post addressing guidelines): letters D F I O Q U never appear; W and Z are
 * not used as the first letter (from memory of the published rules).
 */
export function drawCanadianPostalCode(rng: Rng): string {
  const first = 'ABCEGHJKLMNPRSTVXY';
  const other = 'ABCEGHJKLMNPRSTVWXYZ';
  return `${letters(rng, first)}${digit(rng)}${letters(rng, other)} ${digit(rng)}${letters(rng, other)}${digit(rng)}`;
}

/**
 * UK postcode in one of the six published outward forms (A9, A99, AA9, AA99, A9A, AA9A) and inward "9AA", whose
 * letters exclude C I K M O V (Royal Mail / BS 7666 postcode format, from memory).
 */
export function drawUkPostcode(rng: Rng): string {
  const area1 = 'ABCDEFGHIJKLMNOPRSTUWYZ'; // not Q V X in first position
  const area2 = 'ABCDEFGHKLMNOPQRSTUVWXY'; // not I J Z in second position
  const third = 'ABCDEFGHJKPSTUW'; // letter after a single-letter area in A9A
  const fourth = 'ABEHMNPRVWXY'; // letter after AA9 in AA9A
  const inward = 'ABDEFGHJLNPQRSTUWXYZ';
  const form = rng.int(0, 5);
  const outward =
    form === 0
      ? letters(rng, area1) + digit(rng, 1)
      : form === 1
        ? letters(rng, area1) + digit(rng, 1) + digit(rng)
        : form === 2
          ? letters(rng, area1) + letters(rng, area2) + digit(rng, 1)
          : form === 3
            ? letters(rng, area1) + letters(rng, area2) + digit(rng, 1) + digit(rng)
            : form === 4
              ? letters(rng, area1) + digit(rng, 1) + letters(rng, third)
              : letters(rng, area1) + letters(rng, area2) + digit(rng, 1) + letters(rng, fourth);
  return `${outward} ${digit(rng)}${letters(rng, inward)}${letters(rng, inward)}`;
}

export function drawPostalCode(rng: Rng, country: 'US' | 'CA' | 'GB'): string {
  if (country === 'CA') return drawCanadianPostalCode(rng);
  if (country === 'GB') return drawUkPostcode(rng);
  return drawUsZip(rng, rng.chance(0.25));
}
