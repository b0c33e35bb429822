import { format } from 'date-fns';
import type { Rng } from '../prng.js';

/**
 * Schema date formats ("MM/DD/YYYY", "D MMM YYYY", ...) use the upper-case tokens people print on forms; date-fns
 * wants Unicode TR35 tokens (yyyy, dd, d). Translate token by token.
 */
export function toDateFnsPattern(schemaFormat: string): string {
  return schemaFormat.replace(/YYYY|YY|DD|D|MMMM|MMM|MM|M/g, (t) => (t === 'YYYY' ? 'yyyy' : t === 'YY' ? 'yy' : t === 'DD' ? 'dd' : t === 'D' ? 'd' : t));
}

/** Fixed date windows so that the same seed gives the same dates whatever day the generator runs. */
const WINDOWS = {
  birth: [Date.UTC(1940, 0, 1), Date.UTC(2006, 11, 31)],
  pet_birth: [Date.UTC(2008, 0, 1), Date.UTC(2024, 11, 31)],
  past: [Date.UTC(2019, 0, 1), Date.UTC(2025, 4, 31)],
  upcoming: [Date.UTC(2026, 0, 1), Date.UTC(2027, 11, 31)],
} as const;

export type DateWindow = keyof typeof WINDOWS;

export function isDateWindow(kind: string): kind is DateWindow {
  return kind in WINDOWS;
}

/** A date in the window, as [ISO "YYYY-MM-DD", text in the schema format]. */
export function drawDate(rng: Rng, window: DateWindow, schemaFormat: string): { iso: string; text: string } {
  const [lo, hi] = WINDOWS[window];
  const day = Math.floor(rng.range(lo, hi) / 86400000) * 86400000;
  const d = new Date(day);
  // date-fns formats in local time; build a local date with the same calendar fields as the UTC day.
  const local = new Date(d.getUTCFullYear(), d.getUTCMonth(), d.getUTCDate());
  return { iso: format(local, 'yyyy-MM-dd'), text: format(local, toDateFnsPattern(schemaFormat)) };
}
