import { binarizeOtsu } from '../image/otsu.js';
import { INK } from '../image/binary.js';
import { labelComponents, typicalHeight, type Component } from '../image/components.js';
import type { GrayImage } from '../image/raster.js';
import type { ScriptMeasures } from '../fields/script.js';
import { median } from '../image/median.js';
import { round3 } from '../result/rounding.js';

/**
 * Measures of an entry's ink that tell handwriting from machine print (pure, pixels only; no text). The decision
 * itself is src/fields/script.ts; these are its inputs, kept in the result's details so a model can be refitted.
 *
 * - strokeSpread: spread of the stroke width: the coefficient of variation (standard deviation over mean) of the
 *   horizontal ink runs through glyph components. A font's strokes come in one or two widths; a pen pressed harder
 *   and lighter, crossing itself at slants, gives a broader spread (stroke-width variation: common practice in
 *   telling handwriting from print, e.g. Zheng, Li and Doermann 2004, cited from memory).
 * - heightSpread: mean absolute deviation of glyph heights from their median, over the median. Printed letters sit
 *   at a few fixed heights (x-height, cap height); written ones vary letter to letter.
 * - baselineSpread: mean absolute deviation of glyph bottoms from their median, over the median height. Printed
 *   glyphs sit on one baseline (descenders aside); written ones drift.
 * - heightShare: median glyph height over the height of the area read. Hands write larger in a box than a form's
 *   font types (common practice), and the generator fills them that way (src/synth/fill.ts drawPen).
 * - strokeShare: median stroke width over the median glyph height (a pen's line against its letters' size).
 * - axisShare: share of the ink's edge strength (Sobel gradient magnitude inside the glyphs' boxes) whose direction
 *   lies within 15° of horizontal or vertical. Type is built of upright stems and flat bars; a hand slants and
 *   curves (edge-direction distributions: common practice in telling print from handwriting, cited from memory).
 * - aspect: median width over height of the glyph components. Joined-up writing makes wide components of several
 *   letters; type gives one per letter.
 * - components: glyph components measured.
 */

/** Fewest glyph components for the measures to mean anything (common practice: spreads of one or two glyphs are noise). */
export const MIN_GLYPHS = 3;

/** Mean absolute deviation from the median: continuous where a median of deviations is 0 for most short entries. */
function meanDeviation(v: number[]): number {
  const m = median(v);
  return v.reduce((s, x) => s + Math.abs(x - m), 0) / v.length;
}

function coefficientOfVariation(v: readonly number[]): number {
  const mean = v.reduce((s, x) => s + x, 0) / v.length;
  const sd = Math.sqrt(v.reduce((s, x) => s + (x - mean) ** 2, 0) / v.length);
  return mean > 0 ? sd / mean : 0;
}

/**
 * Glyph-like components: not touching the area's border (rules, box sides, neighbours' ink), at least 3 px tall and
 * no long flat or tall thin stroke (the same shape test as typicalHeight), and at least a quarter of the typical
 * height (dots, commas and specks carry no height or baseline).
 */
export function glyphs(components: Component[]): Component[] {
  const h = typicalHeight(components);
  if (h === null) return [];
  return components.filter((c) => !c.touchesBorder && c.box.h >= Math.max(3, 0.25 * h) && c.box.w <= 6 * c.box.h && c.box.h <= 8 * c.box.w);
}

/** Measures of the ink in a field's crop (the located box, no padding); null when no glyph is found. */
export function scriptMeasures(crop: GrayImage): ScriptMeasures | null {
  if (crop.width < 8 || crop.height < 8) return null;
  const binary = binarizeOtsu(crop);
  const { labels, components } = labelComponents(binary);
  const kept = glyphs(components);
  if (kept.length === 0) return null;
  const keep = new Uint8Array(components.length + 1);
  for (const c of kept) keep[c.id] = 1;
  const runs: number[] = [];
  const { width, height } = binary;
  for (let y = 0; y < height; y++) {
    let run = 0;
    for (let x = 0; x <= width; x++) {
      const id = x < width && binary.data[y * width + x] === INK ? labels[y * width + x] : 0;
      if (id > 0 && keep[id]) run++;
      else if (run > 0) {
        runs.push(run);
        run = 0;
      }
    }
  }
  const stroke = Math.max(1, median(runs));
  const heights = kept.map((c) => c.box.h);
  const mh = Math.max(1, median(heights));
  return {
    strokeSpread: round3(coefficientOfVariation(runs)),
    heightSpread: kept.length >= MIN_GLYPHS ? round3(meanDeviation(heights) / mh) : null,
    // Capped at 1: a glyph a full height off the line is a second line or a stray mark, not a drifting baseline.
    baselineSpread: kept.length >= MIN_GLYPHS ? round3(Math.min(1, meanDeviation(kept.map((c) => c.box.y + c.box.h)) / mh)) : null,
    heightShare: round3(mh / height),
    strokeShare: round3(stroke / mh),
    axisShare: round3(axisShare(crop, kept)),
    aspect: round3(median(kept.map((c) => c.box.w / c.box.h))),
    components: kept.length,
  };
}

/** Within this angle of horizontal or vertical an edge counts as axis-aligned (common practice for "straight" strokes). */
const AXIS_TOLERANCE_DEG = 15;

/** Share of gradient magnitude, inside the glyphs' boxes, pointing within AXIS_TOLERANCE_DEG of an axis. */
function axisShare(img: GrayImage, glyphBoxes: readonly Component[]): number {
  const { width, height, data } = img;
  const inside = new Uint8Array(width * height);
  for (const c of glyphBoxes) {
    for (let y = Math.max(1, c.box.y - 1); y < Math.min(height - 1, c.box.y + c.box.h + 1); y++)
      for (let x = Math.max(1, c.box.x - 1); x < Math.min(width - 1, c.box.x + c.box.w + 1); x++) inside[y * width + x] = 1;
  }
  const tan = Math.tan((AXIS_TOLERANCE_DEG * Math.PI) / 180);
  let axis = 0;
  let total = 0;
  for (let y = 1; y < height - 1; y++) {
    for (let x = 1; x < width - 1; x++) {
      const i = y * width + x;
      if (!inside[i]) continue;
      const gx = data[i - width + 1] + 2 * data[i + 1] + data[i + width + 1] - data[i - width - 1] - 2 * data[i - 1] - data[i + width - 1];
      const gy = data[i + width - 1] + 2 * data[i + width] + data[i + width + 1] - data[i - width - 1] - 2 * data[i - width] - data[i - width + 1];
      const ax = Math.abs(gx);
      const ay = Math.abs(gy);
      const mag = Math.hypot(gx, gy);
      if (mag === 0) continue;
      total += mag;
      if (Math.min(ax, ay) <= tan * Math.max(ax, ay)) axis += mag;
    }
  }
  return total > 0 ? axis / total : 0;
}
