import { z } from 'zod';

/**
 * Fill-ratio thresholds for printed boxes. A box is ticked above checkedAbove, empty below uncheckedBelow, and
 * between the two nobody should guess (a stray dot, a half-erased tick, a faint pencil stroke). Common practice puts
 * an empty box at a few percent (speckle) and a deliberate tick well above a tenth of the inside; measured on
 * rendered boxes 22-42 px with the heavy scan simulation (seeds 900000-900019, see test/fields/checkbox-pixels.test.ts):
 * empty <= 0.022, stray dot median 0.024 (95th percentile 0.097), light pencil tick 5th percentile 0.109,
 * ink tick >= 0.16, cross >= 0.24.
 */
export const DEFAULT_CHECKED_ABOVE = 0.1;
export const DEFAULT_UNCHECKED_BELOW = 0.05;

export const markThresholds = {
  checkedAbove: z
    .number()
    .min(0)
    .max(1)
    .default(DEFAULT_CHECKED_ABOVE)
    .describe(`Fill ratio above which a box counts as ticked (default ${DEFAULT_CHECKED_ABOVE})`),
  uncheckedBelow: z
    .number()
    .min(0)
    .max(1)
    .default(DEFAULT_UNCHECKED_BELOW)
    .describe(`Fill ratio under which a box counts as empty (default ${DEFAULT_UNCHECKED_BELOW})`),
};

/** zod check that the two thresholds leave a (possibly empty) band between them. */
export function thresholdsOrdered(o: { checkedAbove: number; uncheckedBelow: number }): boolean {
  return o.uncheckedBelow <= o.checkedAbove;
}
export const THRESHOLD_ORDER_MESSAGE = 'uncheckedBelow must not exceed checkedAbove';

export interface MarkDecision {
  state: 'checked' | 'unchecked' | 'ambiguous';
  /** 0..1: 1 far from both thresholds, 0.8 right at one, 0.5 in the band between. */
  confidence: number;
}

/**
 * Confidence grows with the distance from the threshold that was crossed, measured in widths of the ambiguous band:
 * at the threshold it is 0.8, one band-width (or more) past it 1.0 — a clear mark is trusted, one that barely
 * crosses still passes the default review threshold 0.75 (common practice).
 */
export function decideMark(fillRatio: number, o: { checkedAbove: number; uncheckedBelow: number }): MarkDecision {
  const band = Math.max(o.checkedAbove - o.uncheckedBelow, 0.01);
  if (fillRatio >= o.checkedAbove)
    return { state: 'checked', confidence: 0.8 + 0.2 * Math.min(1, (fillRatio - o.checkedAbove) / band) };
  if (fillRatio < o.uncheckedBelow)
    return { state: 'unchecked', confidence: 0.8 + 0.2 * Math.min(1, (o.uncheckedBelow - fillRatio) / band) };
  return { state: 'ambiguous', confidence: 0.5 };
}

/** A box measured without its printed outline is less certain: 15 % off (common practice). */
export const NO_OUTLINE_FACTOR = 0.85;

const TRUE_WORDS = new Set(['yes', 'y', 'true', 'x', '1', 'checked', 'ticked', 'on', '\u2713', '\u2714', '\u2717', '\u2718']);
const FALSE_WORDS = new Set(['no', 'n', 'false', '0', 'unchecked', 'empty', 'off', '']);

/** A reviewer's typed yes/no; null when it is neither. */
export function parseYesNo(text: string): boolean | null {
  const t = text.trim().toLowerCase();
  if (TRUE_WORDS.has(t)) return true;
  if (FALSE_WORDS.has(t)) return false;
  return null;
}
