/** Strip what OCR and form conventions add around a label: item markers, required-marks, trailing colons, stray rules. */
export function cleanLabel(text: string): string {
  return text
    .replace(/\s+/g, ' ')
    // Item markers before a label: "(a)", "b)", "4(c)", "12.", "3)".
    .replace(/^\s*(\d*\(?[a-z]\)|\d+[.)])\s+/i, '')
    .replace(/^[\s|_.:;,\-–—*(]+/, '')
    .replace(/[\s|_.:;,\-–—*]+$/, '')
    .replace(/\s*\*\s*$/, '')
    .trim();
}

/**
 * A field name from a label: lower case ASCII letters, digits and _, starting with a letter (the schema's rule),
 * at most 40 characters cut at a word boundary. Accents are folded (é -> e) by Unicode decomposition.
 */
export function slugName(label: string): string {
  const words = label
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[\u2018\u2019`]/g, "'")
    .replace(/'s\b/g, '')
    .split(/[^a-z0-9]+/)
    .filter((w) => w.length > 0);
  let out = '';
  for (const w of words) {
    const next = out ? `${out}_${w}` : w;
    if (next.length > 40) break;
    out = next;
  }
  if (!out) return '';
  return /^[a-z]/.test(out) ? out : `field_${out}`.slice(0, 40);
}

/** `base`, or `base_2`, `base_3`, ... when taken; the name is added to `used`. */
export function uniqueName(base: string, used: Set<string>): string {
  if (!used.has(base)) {
    used.add(base);
    return base;
  }
  for (let i = 2; ; i++) {
    const n = `${base}_${i}`.slice(0, 48);
    if (!used.has(n)) {
      used.add(n);
      return n;
    }
  }
}

