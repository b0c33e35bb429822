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

/**
 * One-of groups: the fullest box wins when it is fuller than every other box by at least this share of the inside.
 * A writer ticks one box of a group; what the others hold (print near a box, a stray dot) is the same for all of
 * them, so the gap between the fullest and the next says more than either fill alone. Measured on
 * bench/real-form-marks.ts (14 development forms, 58 one-of rows, ink added over the blank): empty boxes <= 0.06
 * (95th percentile of stray dots 0.047-0.060), ticks >= 0.07 in 95 % of boxes; at 0.05 the rows came out 57 right,
 * 1 wrong, 0 to review on light and on heavy scans.
 */
export const DEFAULT_CHOICE_MARGIN = 0.05;

export const choiceMargin = z
  .number()
  .min(0)
  .max(1)
  .default(DEFAULT_CHOICE_MARGIN)
  .describe(`One answer expected: the fullest box wins when it beats every other by this fill ratio (default ${DEFAULT_CHOICE_MARGIN})`);

export interface OneOfDecision {
  /** Index of the chosen box; null when none or several are marked, or the group is unclear. */
  chosen: number | null;
  state: 'chosen' | 'none' | 'several' | 'ambiguous';
  confidence: number;
}

/**
 * A one-of group decided by the margin between its fullest box and the rest: nothing marked when even the fullest
 * is under uncheckedBelow; several marked when the next is itself over checkedAbove and at least half as full (a
 * changed mind); the fullest chosen when it is at least `margin` fuller than the next; otherwise unclear. Confidence follows decideMark's scale
 * on the margin: 0.8 right at it, 1.0 at twice it.
 */
export function decideOneOf(fills: readonly number[], o: { checkedAbove: number; uncheckedBelow: number; margin: number }): OneOfDecision {
  if (fills.length === 0) return { chosen: null, state: 'none', confidence: 1 };
  const order = fills.map((f, i) => [f, i] as const).sort((a, b) => b[0] - a[0]);
  const [top, topIndex] = order[0];
  const next = order.length > 1 ? order[1][0] : 0;
  if (top < o.uncheckedBelow) return { chosen: null, state: 'none', confidence: decideMark(top, o).confidence };
  const gap = top - next;
  const step = Math.max(o.margin, 0.01);
  // A second box that is itself ticked and at least half as full as the first is a second answer, not print or a
  // stray touch (a printed rule near a box adds a tenth at most: bench/real-form-marks.ts).
  if (next >= o.checkedAbove && next >= top / 2) return { chosen: null, state: 'several', confidence: 0.8 };
  if (gap >= o.margin) return { chosen: topIndex, state: 'chosen', confidence: 0.8 + 0.2 * Math.min(1, (gap - o.margin) / step) };
  return { chosen: null, state: 'ambiguous', confidence: 0.5 };
}

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
