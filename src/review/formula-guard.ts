/**
 * Spreadsheet formula-injection guard for CSV cells, reversible on the way back in.
 *
 * A cell whose first character a spreadsheet reads as the start of a formula gets a leading apostrophe.
 * Trigger characters: = + - @ tab CR (OWASP "CSV Injection" community page), NUL (OWASP ASVS 5.0 requirement 1.2.10),
 * and the full-width forms of = + - @ that some spreadsheets normalize to the ASCII ones (the same list csv-stringify's
 * `escape_formulas` option guards, noted there as found by testing).
 */
export const FORMULA_TRIGGERS: readonly string[] = ['=', '+', '-', '@', '\t', '\r', '\0', '\uFF1D', '\uFF0B', '\uFF0D', '\uFF20'];

const APOSTROPHE = "'";

function escapesNext(ch: string | undefined): boolean {
  return ch !== undefined && (ch === APOSTROPHE || FORMULA_TRIGGERS.includes(ch));
}

/**
 * Prefix an apostrophe when the cell starts with a trigger, and also when it starts with an apostrophe that
 * `unguardCell` would otherwise strip, so that unguardCell(guardCell(s)) === s for every string.
 */
export function guardCell(s: string): string {
  const first = s.charAt(0);
  if (FORMULA_TRIGGERS.includes(first)) return APOSTROPHE + s;
  if (first === APOSTROPHE && escapesNext(s.charAt(1) || undefined)) return APOSTROPHE + s;
  return s;
}

/** Reverse guardCell: drop one leading apostrophe that precedes a trigger or another apostrophe. */
export function unguardCell(s: string): string {
  if (s.charAt(0) === APOSTROPHE && escapesNext(s.charAt(1) || undefined)) return s.slice(1);
  return s;
}
