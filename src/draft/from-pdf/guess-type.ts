import { US_STATES } from '../../fields/us-states.js';
import { lastNameWord, partialName, tooltipCore, words } from './naming.js';
import type { PdfWidget } from './widgets.js';

/** A field type and its schema options, guessed for one text-like widget. */
export interface GuessedType {
  type: 'text' | 'date' | 'phone' | 'email' | 'number' | 'postal_code' | 'choice_text' | 'signature';
  options?: Record<string, unknown>;
}

/**
 * Date formats of US federal forms, tried in order: month first with a four- or two-digit year (common practice on
 * US forms; the forms here print "mm/dd/yyyy" beside their date fields).
 */
const US_DATE_FORMATS = ['MM/DD/YYYY', 'M/D/YYYY', 'MM/DD/YY', 'MM-DD-YYYY'];

/** Words naming one part of a date. */
export const DATE_PARTS = ['month', 'day', 'year', 'mm', 'dd', 'yyyy', 'yy', 'mo', 'yr'];

const has = (ws: Set<string>, ...any: string[]) => any.some((w) => ws.has(w));

/**
 * Guess a text widget's type from the words of its name and tooltip and its maximum length. The rules are
 * deliberately narrow: a field is left as `text` when no rule is sure, since a wrong type sends every filled value
 * to review while `text` only loses normalization.
 */
export function guessTextType(w: PdfWidget): GuessedType {
  const nameWords = words(partialName(w.fieldName));
  // Parenthetical asides list what else the printed item holds ("Number and street (..., ZIP Code and Country)").
  const tipWords = words(tooltipCore(w.tooltip));
  const all = new Set([...nameWords, ...tipWords]);
  const joined = ` ${[...nameWords, ...tipWords].join(' ')} `;
  const max = w.maxLength;
  const last = lastNameWord(w.fieldName);
  // One part of a date split over several boxes (month, day or year alone) is a small whole number.
  const part = DATE_PARTS.includes(last) || (has(all, ...DATE_PARTS) && max !== undefined && max <= 4);

  if (w.kind === 'dropdown') return w.options && w.options.length > 0 ? { type: 'choice_text', options: { choices: [...new Set(w.options)] } } : { type: 'text' };
  if (nameWords.includes('signature') && !has(all, 'date')) return { type: 'signature' };
  if (has(all, 'email', 'e') && /\be ?mail\b/.test(joined)) return { type: 'email' };
  // A whole number only: a widget holding fewer than 10 characters is one part of it ("Enter 3-digit Area Code",
  // "Enter 7-digit Telephone Number" on USCIS I-589), which a phone field could never accept. 10 digits: a North
  // American number without its country code (NANP numbering plan, from memory).
  if (has(all, 'phone', 'telephone', 'fax', 'tel') && !has(all, 'extension', 'ext') && (max === undefined || max >= 10)) return { type: 'phone' };
  if (/\b(zip|postal)\b/.test(joined) && (max === undefined || max >= 5)) return { type: 'postal_code', options: { country: 'US' } };
  if (part) return { type: 'number', options: { integer: true } };
  if (has(all, 'date', 'dob', 'birthday') || /\bexecuted on\b/.test(joined) || /\bmm dd yyyy\b/.test(joined)) {
    // Digits only when the field holds fewer characters than "MM/DD/YYYY" (comb date boxes).
    if (max === undefined || max >= 10) return { type: 'date', options: { formats: US_DATE_FORMATS } };
    if (max >= 8) return { type: 'date', options: { formats: ['MMDDYYYY'] } };
    if (max >= 6) return { type: 'date', options: { formats: ['MMDDYY'] } };
  }
  if (has(all, 'state') && !has(all, 'statement', 'states') && (max === 2 || nameWords.at(-1) === 'state')) {
    return { type: 'choice_text', options: { choices: US_STATES } };
  }
  // An amount needs room for at least "9.99".
  if (has(all, 'amount', 'total', 'dollars', 'wages', 'income', 'balance', 'salary', 'payment', 'fee', 'fees', 'subtotal') && (max === undefined || max >= 4)) {
    return { type: 'number', options: { unit: '$' } };
  }
  return { type: 'text' };
}
