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
export function markRuns(
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
export function repair(img: GrayImage, mark: Uint8Array, horizontal: boolean): void {
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
