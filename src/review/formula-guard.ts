/**
 * Spreadsheet formula-injection guard for CSV cells, reversible on the way back in.
 *
 * A cell a spreadsheet could read as the start of a formula gets a leading apostrophe.
 * Trigger characters: = + - @ tab CR (OWASP "CSV Injection" community page), NUL (OWASP ASVS 5.0 requirement 1.2.10),
 * and the full-width forms of = + - @ that some spreadsheets normalize to the ASCII ones (the same list csv-stringify's
 * `escape_formulas` option guards, noted there as found by testing). LF joins CR, as a line break before a formula
 * runs it just the same.
 *
 * Spreadsheets trim blanks and skip invisible characters before looking for a formula, so a trigger counts after
 * any run of leading whitespace (spaces, line breaks, no-break spaces) and zero-width or byte-order-mark characters
 * (OWASP's guidance: the check must not be bypassable by leading whitespace; which characters are invisible is the
 * Unicode "default ignorable" set's common members, U+200B-U+200D, U+2060, U+FEFF).
 */
export const FORMULA_TRIGGERS: readonly string[] = ['=', '+', '-', '@', '\t', '\r', '\n', '\0', '\uFF1D', '\uFF0B', '\uFF0D', '\uFF20'];

const LEADING_BLANKS = /^[\s\u00A0\u1680\u2000-\u200D\u2028\u2029\u202F\u205F\u2060\u3000\uFEFF]*/u;

const APOSTROPHE = "'";

/** Whether a spreadsheet could read the cell as a formula: a trigger first, or after leading blanks. */
export function looksLikeFormula(s: string): boolean {
  if (s.length > 0 && FORMULA_TRIGGERS.includes(s.charAt(0))) return true;
  const rest = s.slice(LEADING_BLANKS.exec(s)?.[0].length ?? 0);
  return rest.length > 0 && FORMULA_TRIGGERS.includes(rest.charAt(0));
}

/** What follows an apostrophe that unguardCell would strip. */
function escapesRest(rest: string): boolean {
  return rest.startsWith(APOSTROPHE) || looksLikeFormula(rest);
}

/**
 * Prefix an apostrophe when the cell looks like a formula, and also when it starts with an apostrophe that
 * `unguardCell` would otherwise strip, so that unguardCell(guardCell(s)) === s for every string.
 */
export function guardCell(s: string): string {
  if (looksLikeFormula(s)) return APOSTROPHE + s;
  if (s.startsWith(APOSTROPHE) && escapesRest(s.slice(1))) return APOSTROPHE + s;
  return s;
}

/** Reverse guardCell: drop one leading apostrophe that precedes a formula-like rest or another apostrophe. */
export function unguardCell(s: string): string {
  if (s.startsWith(APOSTROPHE) && escapesRest(s.slice(1))) return s.slice(1);
  return s;
}
