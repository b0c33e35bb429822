import type { GrayImage } from '../../image/raster.js';
import { INK, PAPER } from '../../image/binary.js';
import { labelComponents } from '../../image/components.js';

export interface LineRemovalOptions {
  /** Shortest horizontal run counted as a ruled line, pixels. Default: 40 % of the crop width, at least 20 px. */
  minHorizontal?: number;
  /** Shortest vertical run counted as a ruled line or separator, pixels. Default: 60 % of the crop height, at least 12 px. */
  minVertical?: number;
  /**
   * Shortest vertical run counted as a separator when one of its ends touches a horizontal rule (comb ticks rising
   * from the cell's bottom line). Off by default; comb fields set it below the character height.
   */
  minAnchoredVertical?: number;
  /** Restore line pixels where a character stroke crosses the line (ink directly on both sides). Default true. */
  repairCrossings?: boolean;
}

export interface LineRemoval {
  image: GrayImage;
  /** 1 where a pixel was taken as part of a horizontal ruled line. */
  horizontal: Uint8Array;
  /** 1 where a pixel was taken as part of a vertical rule or separator. */
  vertical: Uint8Array;
}

/**
 * Mark ink that belongs to straight runs of at least `min` pixels along one axis: a morphological opening with a
 * 1 x min line element (common practice for form-line removal). The image is first dilated by one pixel across the
 * axis, so a rule tilted by a residual fraction of a degree (1-pixel steps) still reads as one run.
 */
function markRuns(
  img: GrayImage,
  horizontal: boolean,
  min: number,
  anchored?: { min: number; rules: Uint8Array },
): Uint8Array {
  const { width: w, height: h, data } = img;
  const mark = new Uint8Array(w * h);
  const along = horizontal ? w : h;
  const across = horizontal ? h : w;
  const at = (a: number, c: number) => (horizontal ? c * w + a : a * w + c);
  const inkNear = (a: number, c: number) =>
    data[at(a, c)] === INK || (c > 0 && data[at(a, c - 1)] === INK) || (c + 1 < across && data[at(a, c + 1)] === INK);
  for (let c = 0; c < across; c++) {
    let start = -1;
    for (let a = 0; a <= along; a++) {
      const on = a < along && inkNear(a, c);
      if (on && start < 0) start = a;
      if (!on && start >= 0) {
        const len = a - start;
        if (len >= min || (anchored && len >= anchored.min && touchesRule(img, anchored.rules, c, start, a))) {
          for (let k = start; k < a; k++) {
            for (let d = -1; d <= 1; d++) {
              const cc = c + d;
              if (cc >= 0 && cc < across && data[at(k, cc)] === INK) mark[at(k, cc)] = 1;
            }
          }
        }
        start = -1;
      }
    }
  }
  return mark;
}

/** Does a vertical run in column c over rows [y0, y1) end on a horizontal-rule pixel (within 2 px)? */
function touchesRule(img: GrayImage, rules: Uint8Array, c: number, y0: number, y1: number): boolean {
  const { width: w, height: h } = img;
  for (const [from, to] of [[y0 - 2, y0 + 2], [y1 - 3, y1 + 1]]) {
    for (let y = Math.max(0, from); y <= Math.min(h - 1, to); y++) {
      for (let x = Math.max(0, c - 1); x <= Math.min(w - 1, c + 1); x++) if (rules[y * w + x]) return true;
    }
  }
  return false;
}

/**
 * Give back line pixels where a stroke crosses the line: along each column (for a horizontal line) the masked
 * segment is restored when unmasked ink touches it on both ends, so a "t" or "p" written through a rule keeps its stem.
 */
function repair(img: GrayImage, mark: Uint8Array, horizontal: boolean): void {
  const { width: w, height: h, data } = img;
  const along = horizontal ? w : h;
  const across = horizontal ? h : w;
  const at = (a: number, c: number) => (horizontal ? c * w + a : a * w + c);
  for (let a = 0; a < along; a++) {
    let c = 0;
    while (c < across) {
      if (!mark[at(a, c)]) { c++; continue; }
      const c0 = c;
      while (c < across && mark[at(a, c)]) c++;
      const before = c0 > 0 && data[at(a, c0 - 1)] === INK && !mark[at(a, c0 - 1)];
      const after = c < across && data[at(a, c)] === INK && !mark[at(a, c)];
      if (before && after) for (let k = c0; k < c; k++) mark[at(a, k)] = 0;
    }
  }
}

/** The shortest horizontal run removeRuledLines takes for a rule by default in a crop this wide. */
export function horizontalRuleLength(width: number): number {
  return Math.max(20, Math.round(width * 0.4));
}

/** Remove long horizontal and vertical ruled lines (cell borders, underlines, comb separators) from a binary crop. */
export function removeRuledLines(img: GrayImage, options: LineRemovalOptions = {}): LineRemoval {
  const minH = options.minHorizontal ?? horizontalRuleLength(img.width);
  const minV = options.minVertical ?? Math.max(12, Math.round(img.height * 0.6));
  const horizontal = markRuns(img, true, minH);
  const anchored = options.minAnchoredVertical;
  const vertical = markRuns(img, false, minV, anchored !== undefined ? { min: anchored, rules: horizontal } : undefined);
  if (options.repairCrossings ?? true) {
    repair(img, horizontal, true);
    repair(img, vertical, false);
  }
  const out = { width: img.width, height: img.height, data: img.data.slice() };
  for (let i = 0; i < out.data.length; i++) if (horizontal[i] || vertical[i]) out.data[i] = PAPER;
  return { image: out, horizontal, vertical };
}

/**
 * Remove the rules the blank form prints under the crop where the page's ink lies on them. `printed` is the blank's
 * print under the crop (0 print, 255 paper; grown by the registration tolerance, see printedUnderCrop).
 *
 * Horizontal rules: a straight run of print at least `minRule` long on the blank gives the rows the page's rule can
 * lie in; in each stretch of RULE_WINDOW columns the rows of it that the page's ink mostly fills are the rule, and
 * their ink goes. A rule the scan shows broken (a row of typed underscores) or joined to a descender is removed so,
 * though the run test of removeRuledLines on the page's ink alone missed it, and the letters touching it were then
 * dropped with it as one fragment at the crop's edge ("Port Aldery" read "Port Alde" on the real-form bench). Digits
 * and a decimal point sitting on the rule are in the rows above it and stay; strokes crossing it keep their pixels on
 * it (repairCrossings).
 */
export function removePrintedRules(img: GrayImage, printed: GrayImage, o: { minRule: number; minUpright: number }): GrayImage {
  const { width: w, height: h } = img;
  const print: GrayImage = { width: w, height: h, data: printed.data.map((v) => (v === 0 ? INK : PAPER)) };
  const band = markRuns(print, true, o.minRule);
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
  // Uprights the blank prints (box sides, the ticks along a comb's rule, shorter than any rule the page's ink is
  // searched for): the page's ink goes where it covers most of the printed upright's length. A letter's stem beside a
  // cell side is shorter than the side and stays; a tick joined to a descender goes, and the descender is a letter
  // again ("Foxglove" read "Fox love" with the g and the tick dropped as one tall sparse shape).
  const upright = printedUprights(print, band, o.minUpright);
  const markV = new Uint8Array(img.data.length);
  for (let x = 0; x < w; x++) {
    let y = 0;
    while (y < h) {
      if (!upright[y * w + x]) { y++; continue; }
      const y0 = y;
      while (y < h && upright[y * w + x]) y++;
      let inked = 0;
      for (let k = y0; k < y; k++) if (img.data[k * w + x] === INK) inked++;
      if (inked >= UPRIGHT_COVER * (y - y0)) for (let k = y0; k < y; k++) if (img.data[k * w + x] === INK) markV[k * w + x] = 1;
    }
  }
  repair(img, markV, false);
  const out = { width: w, height: h, data: img.data.slice() };
  for (let i = 0; i < mark.length; i++) if (mark[i] || markV[i]) out.data[i] = PAPER;
  // What is left lying wholly on the blank's print is print: the remnant of a tick (the dots of a dotted separator,
  // the edge of a tick the scan moved a pixel, which read as "~~ EE" after a value), a placeholder printed in the
  // field ("D" above the day of a date, read into it), a label. A letter that touches the print has ink off it and
  // stays, and so does a piece lying wholly along a horizontal rule, a decimal point sitting on the rule, unless it
  // stands under a printed upright (the foot of a tick where it meets the rule).
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
  return out;
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

export interface DashedRuleOptions {
  /** Thickest dash or dot, pixels. Default 6 (a 1-2 pt rule scanned at up to 300 dpi, blurred). */
  maxThickness?: number;
  /** Fewest aligned pieces that make a dashed or dotted rule. Default 6. */
  minPieces?: number;
  /** Shortest span of the row of pieces, as a share of the crop width. Default 0.4. */
  minSpan?: number;
}

/**
 * Remove dashed and dotted rules, across the crop and down it: at least `minPieces` small pieces whose centres lie
 * within 2 px of one row (or column), that span a good part of the crop and cover at least a quarter of that span
 * (dashes and dots are regular; scattered specks that happen to share a row cover a few percent). Each dash is too
 * short for the run test of removeRuledLines. Shares are common practice, checked on bench/cleanup-gain.ts. Dotted
 * separators down a comb field (printed between the cells of the IRS Form 1040's SSN and name combs) read as "i"
 * and ";" beside the digits before they were removed too.
 */
export function removeDashedRules(img: GrayImage, options: DashedRuleOptions = {}): GrayImage {
  const across = dashedPieces(img, options);
  const down = dashedPieces(transpose(img), options);
  const out = { width: img.width, height: img.height, data: img.data.slice() };
  for (let y = 0; y < img.height; y++)
    for (let x = 0; x < img.width; x++) if (across[y * img.width + x] || down[x * img.height + y]) out.data[y * img.width + x] = PAPER;
  return out;
}

/** The image turned about its main diagonal (rows become columns). */
function transpose(img: GrayImage): GrayImage {
  const data = new Uint8Array(img.data.length);
  for (let y = 0; y < img.height; y++) for (let x = 0; x < img.width; x++) data[x * img.height + y] = img.data[y * img.width + x];
  return { width: img.height, height: img.width, data };
}

/** 1 where a pixel belongs to a dashed or dotted rule across the image (see removeDashedRules). */
function dashedPieces(img: GrayImage, options: DashedRuleOptions): Uint8Array {
  const maxThick = options.maxThickness ?? 6;
  const minPieces = options.minPieces ?? 6;
  const minSpan = (options.minSpan ?? 0.4) * img.width;
  const { labels, components } = labelComponents(img);
  const pieces = components.filter((c) => c.box.h <= maxThick && c.box.w <= Math.max(maxThick * 8, img.width * 0.1));
  const drop = new Uint8Array(components.length + 1);
  for (let y = 0; y < img.height; y++) {
    const near = pieces.filter((c) => Math.abs(c.box.y + c.box.h / 2 - y) <= 2);
    // Dashes of one rule have one length: a piece more than twice the row's middle length is a glyph beside the rule
    // (a "1" or "l" against a dotted separator), not a dash.
    const middle = near.map((c) => c.box.w).sort((a, b) => a - b)[Math.floor(near.length / 2)];
    const row = near.filter((c) => c.box.w <= 2 * middle).sort((a, b) => a.box.x - b.box.x);
    if (row.length < minPieces) continue;
    const left = row[0].box.x;
    const right = Math.max(...row.map((c) => c.box.x + c.box.w));
    if (right - left < minSpan) continue;
    let covered = 0, reach = left;
    for (const c of row) {
      const a = Math.max(reach, c.box.x), b = c.box.x + c.box.w;
      if (b > a) covered += b - a;
      reach = Math.max(reach, b);
    }
    if (covered >= 0.25 * (right - left)) for (const c of row) drop[c.id] = 1;
  }
  const mark = new Uint8Array(labels.length);
  for (let k = 0; k < labels.length; k++) if (drop[labels[k]]) mark[k] = 1;
  return mark;
}
