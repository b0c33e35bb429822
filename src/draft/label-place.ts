import type { Box } from '../image/geometry.js';
import { center } from '../image/geometry.js';
import type { Phrase } from '../page/text-phrases.js';
import type { LabelSide } from './drafted-field.js';

/**
 * The phrase that labels an area, with the side it sits on. Distances are in units of the phrase's character
 * height so the rule holds at any resolution; the limits (a cell-corner label within half the cell; a left
 * label within 12 characters' height; an above label within 3; a checkbox's right label within 2; a caption
 * below a signature or date line within 2) follow how printed forms are laid out (common practice). `rowLabels` are phrases that
 * already stand right before some area on their own row ("City ____"); they are not taken as a label above.
 * `cellCaptions` are phrases printed inside some area's upper part (a cell's corner label); they are not taken as
 * the caption below another area.
 */
export function labelFor(
  area: Box,
  className: string,
  phrases: readonly Phrase[],
  rowLabels: ReadonlySet<Phrase> = new Set(),
  cellCaptions: ReadonlySet<Phrase> = new Set(),
): { phrase: Phrase; side: LabelSide; far: boolean } | null {
  let best: { phrase: Phrase; side: LabelSide; cost: number; far: boolean } | null = null;
  // `far`: the gap is over half of what the side allows, so the phrase may be another area's label.
  const consider = (phrase: Phrase, side: LabelSide, cost: number, far = false) => {
    if (!best || cost < best.cost) best = { phrase, side, cost, far };
  };
  const [acx, acy] = center(area);
  for (const p of phrases) {
    // A lone component is a required-mark, a bullet or the "X" of a signature line, not a label.
    if (p.glyphs < 2) continue;
    const b = p.box;
    const ch = Math.max(4, p.charHeight);
    const [pcx, pcy] = center(b);
    const inRowBand = pcy >= area.y - 0.25 * area.h && pcy <= area.y + 1.25 * area.h;
    const overlapsColumns = b.x < area.x + area.w && b.x + b.w > area.x;
    // Inside the cell, in its upper part: the label printed in the cell's corner. A caption inside the cell's own
    // rules belongs to it whatever stands outside (a step heading in the margin, "Enter ..." on the W-4), so it
    // is preferred by two character heights.
    if (pcx > area.x && pcx < area.x + area.w && b.y >= area.y - 2 && b.y + b.h <= area.y + 0.6 * area.h && b.h < 0.6 * area.h) {
      consider(p, 'inside', (b.y - area.y) / ch + (0.1 * (b.x - area.x)) / ch - 2);
    }
    // Left, on the same row (a label may touch the start of an underline).
    const leftGap = area.x - (b.x + b.w);
    if (leftGap >= -0.5 * ch && pcx < area.x && inRowBand && leftGap <= 12 * ch) {
      consider(p, 'left', leftGap / ch + (className === 'checkbox' ? 1 : 0), leftGap > 6 * ch);
    }
    // Above, starting over the area's left part — unless the phrase is the row label of another area.
    const aboveGap = area.y - (b.y + b.h);
    if (!rowLabels.has(p) && aboveGap >= -2 && aboveGap <= 3 * ch && b.x >= area.x - 2 * ch && b.x <= area.x + 0.5 * area.w) {
      consider(p, 'above', aboveGap / ch + Math.abs(b.x - area.x) / (4 * ch) + (className === 'checkbox' ? 2 : className === 'signature_area' ? 1 : 0), aboveGap > 1.5 * ch);
    }
    // Right of a checkbox (or of any small square mark area).
    const rightGap = b.x - (area.x + area.w);
    if (className === 'checkbox' && rightGap >= -2 && rightGap <= 2 * ch && Math.abs(pcy - acy) <= 0.6 * Math.max(area.h, b.h)) {
      consider(p, 'right', rightGap / ch, rightGap > ch);
    }
    // Below: the caption under a signature or date line; for other areas only when nothing sits left or above,
    // unless the layout prints its captions under the lines: a phrase starting where the line starts, right under
    // it, and not the corner caption of another cell, is that line's caption ("First name" under the first of
    // three lines) and comes before a phrase on the left.
    const belowGap = b.y - (area.y + area.h);
    if (className !== 'checkbox' && belowGap >= -2 && belowGap <= 2 * ch && overlapsColumns && b.x >= area.x - 2 * ch && Math.abs(pcx - acx) <= area.w) {
      const caption = belowGap <= 1.5 * ch && Math.abs(b.x - area.x) <= 1.5 * ch && !cellCaptions.has(p);
      consider(p, 'below', (className === 'signature_area' || caption ? -1 : 3) + belowGap / ch, belowGap > ch);
    }
  }
  const found = best as { phrase: Phrase; side: LabelSide; cost: number; far: boolean } | null;
  return found ? { phrase: found.phrase, side: found.side, far: found.far } : null;
}

/** Phrases that end right before an area on its row, within two character heights: that area's label. */
export function rowLabelPhrases(areas: readonly Box[], phrases: readonly Phrase[]): Set<Phrase> {
  const out = new Set<Phrase>();
  for (const p of phrases) {
    const ch = Math.max(4, p.charHeight);
    const cy = p.box.y + p.box.h / 2;
    for (const a of areas) {
      const gap = a.x - (p.box.x + p.box.w);
      if (gap >= -0.5 * ch && gap <= 2 * ch && p.box.x + p.box.w / 2 < a.x && cy >= a.y - 0.25 * a.h && cy <= a.y + 1.25 * a.h) {
        out.add(p);
        break;
      }
    }
  }
  return out;
}

/** Phrases printed in the upper part of some area (a cell's corner caption). */
export function cellCaptionPhrases(areas: readonly Box[], phrases: readonly Phrase[]): Set<Phrase> {
  const out = new Set<Phrase>();
  for (const p of phrases) {
    const [cx, cy] = center(p.box);
    if (areas.some((a) => cx > a.x && cx < a.x + a.w && p.box.y >= a.y - 2 && cy <= a.y + 0.6 * a.h)) out.add(p);
  }
  return out;
}

/** The nearest phrase left of an area on its row, within six character heights (a group's lead label). */
export function leftPhrase(area: Box, phrases: readonly Phrase[]): Phrase | null {
  let best: Phrase | null = null;
  let bestGap = Infinity;
  for (const p of phrases) {
    const gap = area.x - (p.box.x + p.box.w);
    const cy = p.box.y + p.box.h / 2;
    if (gap >= -2 && gap <= 6 * Math.max(4, p.charHeight) && cy >= area.y - 0.25 * area.h && cy <= area.y + 1.25 * area.h && gap < bestGap) {
      best = p;
      bestGap = gap;
    }
  }
  return best;
}

