import type { GrayImage } from '../../image/raster.js';
import { INK, PAPER } from '../../image/binary.js';
import { labelComponents } from '../../image/components.js';
import { markRuns, repair } from './line-removal.js';

/**
 * Remove the rules the blank form prints under the crop where the page's ink lies on them. `print` is the blank's
 * print under the crop (INK where printed, PAPER elsewhere; grown by the registration tolerance, see printedUnderCrop).
 *
 * Horizontal rules: a straight run of print at least `minRule` long on the blank gives the rows the page's rule can
 * lie in; in each stretch of RULE_WINDOW columns the rows of it that the page's ink mostly fills are the rule, and
 * their ink goes. A rule the scan shows broken (a row of typed underscores) or joined to a descender is removed so,
 * though the run test of removeRuledLines on the page's ink alone missed it, and the letters touching it were then
 * dropped with it as one fragment at the crop's edge ("Port Aldery" read "Port Alde" on the real-form bench). Digits
 * and a decimal point sitting on the rule are in the rows above it and stay; strokes crossing it keep their pixels on
 * it (repairCrossings).
 */
export function removePrintedRules(img: GrayImage, print: GrayImage, o: { minRule: number; minUpright: number }): GrayImage {
  const { width: w, height: h } = img;
  const band = markRuns(print, true, o.minRule);
  const upright = printedUprights(print, band, o.minUpright);
  const rule = ruleRowsInk(img, band);
  const side = uprightInk(img, upright);
  const out = { width: w, height: h, data: img.data.slice() };
  for (let i = 0; i < out.data.length; i++) if (rule[i] || side[i]) out.data[i] = PAPER;
  dropPrintRemnants(out, print, band, upright);
  return out;
}

/** The page's ink in the rows of each RULE_WINDOW-wide stretch of the rule band that it mostly fills, less crossings. */
function ruleRowsInk(img: GrayImage, band: Uint8Array): Uint8Array {
  const { width: w, height: h } = img;
  const mark = new Uint8Array(img.data.length);
  for (let x0 = 0; x0 < w; x0 += RULE_WINDOW) {
    const x1 = Math.min(w, x0 + RULE_WINDOW);
    for (let y = 0; y < h; y++) {
      let inBand = 0;
      let inked = 0;
      for (let x = x0; x < x1; x++) {
        const i = y * w + x;
        if (!band[i]) continue;
        inBand++;
        if (img.data[i] === INK) inked++;
      }
      if (inBand < (x1 - x0) / 2 || inked < RULE_FILL * inBand) continue;
      for (let x = x0; x < x1; x++) if (band[y * w + x] && img.data[y * w + x] === INK) mark[y * w + x] = 1;
    }
  }
  repair(img, mark, true);
  return mark;
}

/**
 * Uprights the blank prints (box sides, the ticks along a comb's rule, shorter than any rule the page's ink is
 * searched for): the page's ink goes where it covers most of the printed upright's length. A letter's stem beside a
 * cell side is shorter than the side and stays; a tick joined to a descender goes, and the descender is a letter again
 * ("Foxglove" read "Fox love" with the g and the tick dropped as one tall sparse shape).
 */
function uprightInk(img: GrayImage, upright: Uint8Array): Uint8Array {
  const { width: w, height: h } = img;
  const mark = new Uint8Array(img.data.length);
  for (let x = 0; x < w; x++) {
    let y = 0;
    while (y < h) {
      if (!upright[y * w + x]) { y++; continue; }
      const y0 = y;
      while (y < h && upright[y * w + x]) y++;
      let inked = 0;
      for (let k = y0; k < y; k++) if (img.data[k * w + x] === INK) inked++;
      if (inked >= UPRIGHT_COVER * (y - y0)) for (let k = y0; k < y; k++) if (img.data[k * w + x] === INK) mark[k * w + x] = 1;
    }
  }
  repair(img, mark, false);
  return mark;
}

/**
 * What is left lying wholly on the blank's print is print, and goes: the remnant of a tick (the dots of a dotted
 * separator, the edge of a tick the scan moved a pixel, which read as "~~ EE" after a value), a placeholder printed in
 * the field ("D" above the day of a date, read into it), a label. A letter that touches the print has ink off it and
 * stays, and so does a piece lying wholly along a horizontal rule, a decimal point sitting on the rule, unless it
 * stands under a printed upright (the foot of a tick where it meets the rule).
 */
function dropPrintRemnants(out: GrayImage, print: GrayImage, band: Uint8Array, upright: Uint8Array): void {
  const w = out.width;
  const { labels, components } = labelComponents(out);
  const uprightColumn = new Uint8Array(w);
  for (let i = 0; i < upright.length; i++) if (upright[i]) uprightColumn[i % w] = 1;
  const keep = new Uint8Array(components.length + 1);
  const offRule = new Uint8Array(components.length + 1);
  for (let i = 0; i < labels.length; i++) {
    if (!labels[i]) continue;
    if (print.data[i] !== INK) keep[labels[i]] = 1;
    if (!band[i] || uprightColumn[i % w]) offRule[labels[i]] = 1;
  }
  for (let i = 0; i < labels.length; i++) if (labels[i] && !keep[labels[i]] && offRule[labels[i]]) out.data[i] = PAPER;
}

/**
 * The blank's printed uprights under a crop: print standing apart from the horizontal rules as a thin straight piece
 * at least `min` tall (a box side, a comb tick). The print of a label or a gray placeholder ("MM", "YYYY") is not one
 * even where a letter has a straight stem, since the stem is part of a wider piece; the page's value typed over such
 * a placeholder keeps its letters.
 */
function printedUprights(print: GrayImage, rules: Uint8Array, min: number): Uint8Array {
  const { width: w } = print;
  const apart: GrayImage = { width: w, height: print.height, data: print.data.map((v, i) => (v === INK && !rules[i] ? INK : PAPER)) };
  const { labels, components } = labelComponents(apart);
  const thin = new Uint8Array(components.length + 1);
  // Grown by the tolerance, a one- to three-pixel rule is at most about eight pixels wide.
  for (const c of components) if (c.box.h >= min && c.box.w <= UPRIGHT_WIDTH && c.box.h >= 2 * c.box.w) thin[c.id] = 1;
  const out = new Uint8Array(labels.length);
  for (let i = 0; i < labels.length; i++) if (thin[labels[i]]) out[i] = 1;
  return out;
}

/** Widest printed upright, pixels, once grown by the registration tolerance (a 1-3 px rule plus 2 px each side). */
const UPRIGHT_WIDTH = 8;

/** Columns judged together when finding the rows of a printed rule on the page (short enough that a rule tilted by
 *  a residual fraction of a degree stays within a row or two across them). */
const RULE_WINDOW = 48;

/** Share of a row's rule band the page's ink must fill for the row to be the rule (letters sitting on it fill a few
 *  tenths of the row above it at most, common practice for printed text). */
const RULE_FILL = 0.6;

/**
 * Share of a printed upright's length (grown by the tolerance at both ends) the page's ink must cover to be it. With
 * none (all ink on a printed upright goes) a digit that a dotted comb separator runs through lost its middle on the
 * development half ("942730" read "9427.0" on the IRS 1040); the dots of such a separator, left alone here, go as
 * pieces lying wholly on print.
 */
const UPRIGHT_COVER = 0.6;
