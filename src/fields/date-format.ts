import { DIGITISH } from './digit-repair.js';
import { escapeRegex } from './escape-regex.js';

/**
 * Declared date formats such as "MM/DD/YYYY", "DD.MM.YYYY", "YYYY-MM-DD" or "D MMM YYYY": the tokens are
 * YYYY (four-digit year), YY (two-digit year), MM/M (month number), MMM (month name or abbreviation), MMMM (month
 * name), DD/D (day); every other character is a literal separator. The upper-case spelling is the one form
 * designers write on paper ("MM/DD/YYYY" printed under the line), not date-fns's Unicode tokens.
 */
export type DateToken = 'YYYY' | 'YY' | 'MMMM' | 'MMM' | 'MM' | 'M' | 'DD' | 'D';
export type FormatPart = { token: DateToken } | { literal: string };

const TOKENS: DateToken[] = ['YYYY', 'YY', 'MMMM', 'MMM', 'MM', 'M', 'DD', 'D'];

export function tokenizeDateFormat(format: string): FormatPart[] {
  const parts: FormatPart[] = [];
  let i = 0;
  while (i < format.length) {
    const token = TOKENS.find((t) => format.startsWith(t, i));
    if (token) {
      parts.push({ token });
      i += token.length;
    } else {
      const last = parts[parts.length - 1];
      if (last && 'literal' in last) last.literal += format[i];
      else parts.push({ literal: format[i] });
      i++;
    }
  }
  return parts;
}

/** Why a declared format cannot work, or null when it names exactly one year, one month and one day. */
export function dateFormatProblem(format: string): string | null {
  const tokens = tokenizeDateFormat(format).flatMap((p) => ('token' in p ? [p.token] : []));
  const count = (set: DateToken[]) => tokens.filter((t) => set.includes(t)).length;
  if (count(['YYYY', 'YY']) !== 1) return 'needs exactly one year token (YYYY or YY)';
  if (count(['MMMM', 'MMM', 'MM', 'M']) !== 1) return 'needs exactly one month token (MM, M, MMM or MMMM)';
  if (count(['DD', 'D']) !== 1) return 'needs exactly one day token (DD or D)';
  if (/[A-Za-z]/.test(tokenizeDateFormat(format).flatMap((p) => ('literal' in p ? [p.literal] : [])).join('')))
    return 'has letters that are not date tokens (use YYYY, YY, MM, M, MMM, MMMM, DD, D)';
  return null;
}

const isNumeric = (p: FormatPart | undefined) => p !== undefined && 'token' in p && !p.token.startsWith('MMM');

/**
 * A lenient pattern for one format: digit positions also accept the letters OCR confuses with digits (repaired
 * later), one- or two-digit months and days where a separator delimits them (people rarely write the leading zero),
 * spaces around separators, and "," for "." (a common OCR confusion, common practice).
 */
export function datePattern(parts: FormatPart[]): RegExp {
  let src = '';
  parts.forEach((p, i) => {
    if ('literal' in p) {
      src += p.literal
        .split('')
        .map((c) => (/\s/.test(c) ? '\\s+' : c === '.' ? '\\s*[.,]\\s*' : `\\s*${escapeRegex(c)}\\s*`))
        .join('');
      return;
    }
    const glued = isNumeric(parts[i - 1]) || isNumeric(parts[i + 1]);
    switch (p.token) {
      case 'YYYY':
        src += `(${DIGITISH}{4})`;
        break;
      case 'YY':
        src += `(${DIGITISH}{2})`;
        break;
      case 'MMMM':
      case 'MMM':
        src += '([A-Za-z]{3,9})\\.?';
        break;
      default:
        src += glued ? `(${DIGITISH}{2})` : `(${DIGITISH}{1,2})`;
    }
  });
  return new RegExp(`^${src}$`);
}
