import { format as formatDate, isValid, parse } from 'date-fns';
import { z } from 'zod';
import type { FieldType, Interpretation } from './types.js';
import type { ReasonCode } from './reasons.js';
import { type DateToken, dateFormatProblem, datePattern, tokenizeDateFormat } from './date-format.js';
import { repairDigits, repairPenalty } from './digit-repair.js';
import { emptyInterpretation, invalidInterpretation } from './interpretation.js';
import { ocrText } from './ocr-text.js';

const options = z
  .object({
    formats: z
      .array(
        z.string().superRefine((f, ctx) => {
          const problem = dateFormatProblem(f);
          if (problem) ctx.addIssue({ code: 'custom', message: `date format "${f}" ${problem}` });
        }),
      )
      .min(1)
      .default(['YYYY-MM-DD'])
      .describe('Accepted input formats, tried in order, e.g. "MM/DD/YYYY", "DD.MM.YYYY", "D MMM YYYY" (default ["YYYY-MM-DD"])'),
    notFuture: z.boolean().default(false).describe('Reject dates after today (default false)'),
    minYear: z.number().int().optional().describe('Reject dates before 1 January of this year'),
    pivotYear: z
      .number()
      .int()
      .optional()
      .describe('First year of the 100-year window two-digit years fall in (default 1950: 00-49 → 20xx, 50-99 → 19xx)'),
  })
  .strict();

export type DateOptions = z.infer<typeof options>;

/**
 * Two-digit years land in the window [pivot, pivot + 99]. The default 1950 is the rule RFC 5322 §4.3 gives for
 * obsolete two-digit years (00-49 → 2000-2049, 50-99 → 1950-1999).
 */
export const DEFAULT_PIVOT_YEAR = 1950;

export function expandTwoDigitYear(yy: number, pivotYear = DEFAULT_PIVOT_YEAR): number {
  const century = Math.floor(pivotYear / 100) * 100;
  const year = century + yy;
  return year < pivotYear ? year + 100 : year;
}

interface Candidate {
  iso: string;
  year: number;
  repairs: number;
}

/** One declared format against the text: null when the text does not have that shape. */
function readWithFormat(text: string, fmt: string, o: DateOptions, reference: Date): Candidate | 'impossible' | null {
  const parts = tokenizeDateFormat(fmt);
  const m = datePattern(parts).exec(text);
  if (!m) return null;
  let repairs = 0;
  let year = 0;
  let month = '';
  let monthToken: DateToken = 'M';
  let day = '';
  let g = 1;
  for (const p of parts) {
    if (!('token' in p)) continue;
    const raw = m[g++];
    if (p.token === 'MMM' || p.token === 'MMMM') {
      month = raw;
      monthToken = p.token;
      continue;
    }
    const r = repairDigits(raw);
    repairs += r.repairs;
    if (p.token === 'YYYY') year = Number(r.text);
    else if (p.token === 'YY') year = expandTwoDigitYear(Number(r.text), o.pivotYear);
    else if (p.token === 'MM' || p.token === 'M') month = r.text;
    else day = r.text;
  }
  // date-fns checks the real calendar (month lengths, Gregorian leap years) instead of our own arithmetic.
  const monthFormats = monthToken === 'M' ? ['M'] : ['MMMM', 'MMM'];
  const monthSpellings = monthToken === 'M' ? [month] : [month, month.slice(0, 3)];
  for (const mf of monthFormats)
    for (const ms of monthSpellings) {
      const d = parse(`${String(year).padStart(4, '0')}-${ms}-${day}`, `yyyy-${mf}-d`, reference);
      if (isValid(d)) return { iso: formatDate(d, 'yyyy-MM-dd'), year, repairs };
    }
  return 'impossible';
}

function interpretText(text: string, o: DateOptions, today: Date): Interpretation {
  const cleaned = text.replace(/[\u2010-\u2015\u2212]/g, '-').trim();
  if (cleaned === '') return emptyInterpretation();
  const found: Candidate[] = [];
  let impossible = false;
  for (const fmt of o.formats) {
    const c = readWithFormat(cleaned, fmt, o, today);
    if (c === 'impossible') impossible = true;
    else if (c) found.push(c);
  }
  if (found.length === 0) return invalidInterpretation(impossible ? ['invalid_date'] : ['format_mismatch']);

  const fewest = Math.min(...found.map((c) => c.repairs));
  const best = found.filter((c) => c.repairs === fewest);
  const chosen = best[0];
  const reasons: ReasonCode[] = [];
  if (chosen.repairs > 0) reasons.push('repaired_digits');
  const confidence = repairPenalty(chosen.repairs);
  // "03/04/2024" under both MM/DD/YYYY and DD/MM/YYYY: two real dates, no way to tell them apart from the text.
  if (new Set(best.map((c) => c.iso)).size > 1)
    return { value: null, outcome: 'ambiguous', confidence, reasons: [...reasons, 'ambiguous_date_format'] };

  const rangeReasons: ReasonCode[] = [];
  if (o.notFuture && chosen.iso > formatDate(today, 'yyyy-MM-dd')) rangeReasons.push('future_date');
  if (o.minYear !== undefined && chosen.year < o.minYear) rangeReasons.push('before_min_year');
  // Out of range is still a real calendar date: keep it so the reviewer sees what was read.
  if (rangeReasons.length) return { value: chosen.iso, outcome: 'invalid', confidence, reasons: [...reasons, ...rangeReasons] };
  return { value: chosen.iso, outcome: 'valid', confidence, reasons };
}

/** Characters a date in these formats can contain: digits, the formats' separators, and letters for month names. */
function allowedCharacters(o: DateOptions): string | undefined {
  if (o.formats.some((f) => /MMM/.test(f))) return undefined;
  const separators = new Set(o.formats.flatMap((f) => f.replace(/[YMD]/g, '').split('')));
  return '0123456789' + [...separators].join('');
}

export const dateField: FieldType<DateOptions> = {
  name: 'date',
  description: 'A calendar date, stored as ISO 8601 YYYY-MM-DD.',
  options,
  reader: 'ocr',
  ocrDefaults(o) {
    const allowed = allowedCharacters(o);
    return allowed ? { mode: 'line', allowed } : { mode: 'line' };
  },
  interpret(reading, o, ctx) {
    return interpretText(ocrText(reading, 'date'), o, ctx.today);
  },
  acceptedInput(o) {
    const formats = [...new Set([...o.formats, 'YYYY-MM-DD'])];
    const limits = [o.notFuture ? 'not after today' : '', o.minYear !== undefined ? `not before ${o.minYear}` : ''].filter(Boolean);
    return `a date as ${formats.join(' or ')}${limits.length ? ` (${limits.join(', ')})` : ''}`;
  },
  parseCorrection(text, o, ctx) {
    // A reviewer may type the stored form directly; accept ISO 8601 YYYY-MM-DD besides the declared formats.
    const withIso = o.formats.includes('YYYY-MM-DD') ? o : { ...o, formats: [...o.formats, 'YYYY-MM-DD'] };
    const r = interpretText(text, withIso, ctx.today);
    // Typed text is not repaired: a letter where a digit belongs is the reviewer's typo, not an OCR confusion.
    return r.reasons.includes('repaired_digits') ? invalidInterpretation(['invalid_date']) : { ...r, confidence: 1 };
  },
};
