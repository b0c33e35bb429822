import type { Box } from '../image/geometry.js';
import type { DraftedField } from './drafted-field.js';

export interface TypeGuess {
  type: string;
  options?: Record<string, unknown>;
  ocr?: DraftedField['ocr'];
}

const mentions = (label: string, ...words: string[]) => words.some((w) => new RegExp(`(^|[^a-z])${w}([^a-z]|$)`).test(label));

/**
 * The field type a label and an area suggest. Words are matched whole, case-folded; the order puts the more
 * specific readings first (an "e-mail" label mentioning a date is still e-mail). Common practice of form design;
 * the word lists are ours.
 */
export function guessType(label: string | null, className: string, area: Box, charHeight: number): TypeGuess {
  if (className === 'checkbox') return { type: 'checkbox' };
  if (className === 'signature_area') return { type: 'signature' };
  const l = (label ?? '').toLowerCase();
  if (mentions(l, 'signature', 'signed by', 'sign here')) return { type: 'signature' };
  if (mentions(l, 'e-mail', 'email', 'e mail')) return { type: 'email' };
  if (mentions(l, 'phone', 'telephone', 'tel', 'mobile', 'cell', 'fax')) return { type: 'phone', options: { defaultRegion: 'US' } };
  if (mentions(l, 'zip', 'zip code')) return { type: 'postal_code', options: { country: 'US' } };
  if (mentions(l, 'postcode')) return { type: 'postal_code', options: { country: 'GB' } };
  if (mentions(l, 'postal code', 'postal')) return { type: 'postal_code', options: { country: l.includes('canada') ? 'CA' : 'US' } };
  if (mentions(l, 'date', 'dob', 'birth', 'born', 'arrival', 'departure', 'expires', 'expiry')) {
    return { type: 'date', options: { formats: ['MM/DD/YYYY', 'YYYY-MM-DD', 'D MMM YYYY'] } };
  }
  if (l.includes('$') || mentions(l, 'amount', 'total', 'income', 'deductions', 'withholding', 'fee', 'price', 'cost')) {
    return { type: 'number', options: { decimalSeparator: '.', ...(l.includes('$') ? { unit: '$' } : {}) } };
  }
  if (mentions(l, 'number of', 'qty', 'quantity', 'count', 'age', 'size', 'weight', 'length', 'beam', 'draft', 'height', 'width', 'kg', 'lb', 'ft', 'sq ft')) {
    const unit = /\((kg|lb|lbs|ft|m|cm|in|sq ft)\)/.exec(l)?.[1];
    return { type: 'number', options: { decimalSeparator: '.', ...(unit ? { unit } : {}) } };
  }
  // Tall areas hold several lines of writing.
  if (area.h > 3.5 * Math.max(8, charHeight) * 1.6) return { type: 'text', ocr: { mode: 'block' } };
  return { type: 'text' };
}

