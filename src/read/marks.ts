import { formMask } from '../page/dropout.js';
import type { Box } from '../image/geometry.js';
import type { GrayImage } from '../image/raster.js';
import { thresholdAt, INK, PAPER } from '../image/binary.js';
import { labelComponents } from '../image/components.js';
import { estimateCropSkew, rotateCrop } from './cleanup/deskew.js';
import { removeRuledLines } from './cleanup/line-removal.js';
import { otsuThreshold } from '../image/otsu.js';

/**
 * Checkbox fill and signature ink, measured on a grayscale crop (0 = ink, 255 = paper).
 *
 * Binarization is Otsu's threshold (see cleanup/otsu.ts), computed twice: over the whole crop to learn the paper level
 * and to find the printed outline, then over the inside of the box alone so that a light pencil tick is judged
 * against the paper around it rather than against the black printed border.
 */

/**
 * Two tones whose means differ by less than this many gray levels are one tone (paper grain, or a solid fill): Otsu
 * always splits a histogram in two, even a flat one. 25 levels keeps a blurred light-pencil tick on a poor scan
 * (paper 220-250, noise sigma up to 12, JPEG 30-90) while leaving paper grain alone; 30 lost one pencil tick in
 * twenty, 40 lost half of them (measured with the heavy scan simulation of src/synth on rendered boxes, 22-42 px,
 * seeds 900000-900019; the figures are in test/fields/checkbox-pixels.test.ts).
 */
const MIN_CONTRAST = 25;

interface Split {
  threshold: number;
  darkMean: number;
  lightMean: number;
}

function otsuSplit(values: Uint8Array): Split {
  const hist = new Float64Array(256);
  for (const v of values) hist[v]++;
  // -1: a single gray level, no split; every pixel then falls in the "light" class and the contrast is zero.
  const threshold = otsuThreshold(hist);
  let dark = 0;
  let darkSum = 0;
  let lightSum = 0;
  for (const v of values) {
    if (v <= threshold) {
      dark++;
      darkSum += v;
    } else lightSum += v;
  }
  const light = values.length - dark;
  const lightMean = light ? lightSum / light : darkSum / dark;
  return { threshold, darkMean: dark ? darkSum / dark : lightMean, lightMean };
}

function maskInk(mask: Uint8Array, w: number, x: number, y: number): boolean {
  return mask[y * w + x] === 1;
}

/** 1 where a binary image holds ink. */
function maskOf(binary: GrayImage): Uint8Array {
  const m = new Uint8Array(binary.data.length);
  for (let i = 0; i < m.length; i++) m[i] = binary.data[i] === INK ? 1 : 0;
  return m;
}

/** Longest run of ink along each row (horizontal) or each column (vertical). */
function longestRuns(mask: Uint8Array, w: number, h: number, horizontal: boolean): Int32Array {
  const n = horizontal ? h : w;
  const len = horizontal ? w : h;
  const out = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    let run = 0;
    let best = 0;
    for (let j = 0; j < len; j++) {
      const ink = horizontal ? maskInk(mask, w, j, i) : maskInk(mask, w, i, j);
      run = ink ? run + 1 : 0;
      if (run > best) best = run;
    }
    out[i] = best;
  }
  return out;
}

interface Band {
  start: number;
  end: number;
}

/** Consecutive indices whose run reaches minRun, merged across one-pixel gaps (a broken scan line). */
function bands(runs: Int32Array, minRun: number): Band[] {
  const out: Band[] = [];
  for (let i = 0; i < runs.length; i++) {
    if (runs[i] < minRun) continue;
    const last = out[out.length - 1];
    if (last && i - last.end <= 2) last.end = i;
    else out.push({ start: i, end: i });
  }
  return out;
}

export interface MarkMeasure {
  /** Share of the inside of the box that is ink, 0..1. */
  fillRatio: number;
  /** Whether a printed outline was found; when not, the central part of the crop was measured instead. */
  boxFound: boolean;
  /** The printed outline (crop pixels), when found. */
  box?: Box;
  /** The measured inside (crop pixels). */
  inner: Box;
  shape: 'square' | 'circle' | 'solid' | 'none';
}

function insetBox(b: Box, dx: number, dy: number): Box {
  const w = Math.max(1, b.w - 2 * dx);
  const h = Math.max(1, b.h - 2 * dy);
  return { x: b.x + Math.min(dx, (b.w - 1) / 2), y: b.y + Math.min(dy, (b.h - 1) / 2), w, h };
}

/**
 * Margin kept clear of the border's inner edge: anti-aliasing and a slightly rotated scan put gray pixels there
 * (8 % of the box side, at least one pixel; common practice, checked on the rendered boxes of test/fields/checkbox-pixels.test.ts).
 */
function innerMargin(side: number): number {
  return Math.max(1, Math.round(side * 0.08));
}

interface Outline {
  box: Box;
  inner: Box;
  shape: 'square' | 'circle' | 'solid';
}

/**
 * Thickest printed edge, as a share of the box side: 15 % (4 px on a 29-px box at 200 dpi; printed borders are 1-3 px
 * and a scan's blur adds a pixel or two; common practice, checked on the rendered boxes of
 * test/fields/checkbox-pixels.test.ts).
 */
const EDGE_SHARE = 0.15;

/**
 * A printed square: the first and last rows (columns) whose longest ink run spans at least 40 % of the crop's shorter
 * side are its top and bottom (left and right) edges. Diagonal strokes of a tick or cross have short runs along
 * rows and columns, so they do not pass for edges even where they overshoot the box.
 */
function findSquare(mask: Uint8Array, w: number, h: number): Outline | null {
  const side = Math.min(w, h);
  const minRun = Math.max(3, Math.round(side * 0.4));
  const rows = bands(longestRuns(mask, w, h, true), minRun);
  const cols = bands(longestRuns(mask, w, h, false), minRun);
  if (rows.length === 0 || cols.length === 0) return null;
  const box0 = { x: cols[0].start, y: rows[0].start, w: cols[cols.length - 1].end - cols[0].start + 1, h: rows[rows.length - 1].end - rows[0].start + 1 };
  // A printed edge is thin. A heavy pen stroke running nearly along an edge has row (column) runs as long as an
  // edge's and merges with it into one thick band; measuring only inside that band lost the stroke (a heavy tick
  // with a shallow long stroke read fill 0.000 on DD Form 293; test/read/heavy-tick.test.ts). So each outer band
  // keeps at most EDGE_SHARE of the box side as edge, and the rest of it counts as inside.
  const edge = Math.max(3, Math.round(Math.min(box0.w, box0.h) * EDGE_SHARE));
  const trim = (b: Band, outer: 'start' | 'end'): Band =>
    outer === 'start' ? { start: b.start, end: Math.min(b.end, b.start + edge - 1) } : { start: Math.max(b.start, b.end - edge + 1), end: b.end };
  const single = rows.length === 1 || cols.length === 1;
  const top = single ? rows[0] : trim(rows[0], 'start');
  const bottom = single ? rows[rows.length - 1] : trim(rows[rows.length - 1], 'end');
  const left = single ? cols[0] : trim(cols[0], 'start');
  const right = single ? cols[cols.length - 1] : trim(cols[cols.length - 1], 'end');
  const box = { x: left.start, y: top.start, w: right.end - left.start + 1, h: bottom.end - top.start + 1 };
  if (box.w < minRun || box.h < minRun || box.w / box.h > 2 || box.h / box.w > 2) return null;
  const m = innerMargin(Math.min(box.w, box.h));
  if (single) {
    // One band each way covering the whole box: a solidly filled square; keep clear of its edges only.
    return { box, inner: insetBox(box, m * 2, m * 2), shape: 'solid' };
  }
  const inner = {
    x: left.end + 1 + m,
    y: top.end + 1 + m,
    w: right.start - left.end - 1 - 2 * m,
    h: bottom.start - top.end - 1 - 2 * m,
  };
  if (inner.w < 2 || inner.h < 2) return null;
  return { box, inner, shape: 'square' };
}

/**
 * A printed circle (radio button): the largest 8-connected ink component whose bounding box is roughly square and
 * at least 40 % of the crop's shorter side.
 */
function findCircle(binary: GrayImage, mask: Uint8Array): Outline | null {
  const side = Math.min(binary.width, binary.height);
  let best: Box | null = null;
  for (const c of labelComponents(binary).components) {
    const { w: bw, h: bh } = c.box;
    if (bw < side * 0.4 || bh < side * 0.4 || bw / bh > 1.5 || bh / bw > 1.5) continue;
    if (!best || bw * bh > best.w * best.h) best = c.box;
  }
  if (!best) return null;
  const ring = ringWidth(mask, binary.width, best);
  if (ring >= best.w / 3) return { box: best, inner: insetBox(best, best.w * 0.2, best.h * 0.2), shape: 'solid' };
  const m = innerMargin(Math.min(best.w, best.h));
  return { box: best, inner: insetBox(best, ring + m, ring + m), shape: 'circle' };
}

/**
 * Width of a ring's stroke: on the five rows around the middle, the first ink run met from the left edge of its
 * bounding box (a slightly rotated or blurred ring need not have ink in the very first column); the widest counts.
 */
function ringWidth(mask: Uint8Array, w: number, b: Box): number {
  let widest = 0;
  const mid = b.y + Math.floor(b.h / 2);
  for (let y = Math.max(b.y, mid - 2); y <= Math.min(b.y + b.h - 1, mid + 2); y++) {
    let x = b.x;
    const end = b.x + Math.floor(b.w / 2);
    while (x < end && !maskInk(mask, w, x, y)) x++;
    let run = 0;
    while (x + run < end && maskInk(mask, w, x + run, y)) run++;
    widest = Math.max(widest, x - b.x + run);
  }
  return widest;
}

/** Pixels of the measured inside: the whole rectangle for squares, the inscribed ellipse for circles. */
function innerPixels(img: GrayImage, inner: Box, ellipse: boolean): Uint8Array {
  const x0 = Math.round(inner.x);
  const y0 = Math.round(inner.y);
  const w = Math.max(1, Math.round(inner.w));
  const h = Math.max(1, Math.round(inner.h));
  const out: number[] = [];
  const cx = (w - 1) / 2;
  const cy = (h - 1) / 2;
  for (let y = 0; y < h; y++)
    for (let x = 0; x < w; x++) {
      if (ellipse && ((x - cx) / (w / 2)) ** 2 + ((y - cy) / (h / 2)) ** 2 > 1) continue;
      const px = x0 + x;
      const py = y0 + y;
      if (px >= 0 && py >= 0 && px < img.width && py < img.height) out.push(img.data[py * img.width + px]);
    }
  return Uint8Array.from(out);
}

/**
 * Share of ink inside a set of pixels. Otsu over those pixels when they hold two clearly different tones (a mark on
 * paper); otherwise they are one tone, which counts as ink when clearly darker than the paper around the box.
 */
function fillRatioOf(values: Uint8Array, paper: number): number {
  if (values.length === 0) return 0;
  const s = otsuSplit(values);
  // Otsu's dark class is ink only when it is clearly darker both than the rest and than the paper: a white speck
  // on plain paper also splits the histogram, with the paper itself as the "dark" class.
  const twoTones = s.lightMean - s.darkMean >= MIN_CONTRAST && s.darkMean <= paper - MIN_CONTRAST;
  const threshold = twoTones ? s.threshold : paper - MIN_CONTRAST;
  let ink = 0;
  for (const v of values) if (v <= threshold) ink++;
  return ink / values.length;
}

/**
 * Fill ratio of a checkbox crop: find the printed square (or circle), measure its inside with the border excluded.
 * Without an outline (a crop that missed it, or no printed box at all) the middle 70 % of the crop is measured and
 * boxFound is false so that scoring can lower the confidence.
 */
export function measureMark(img: GrayImage): MarkMeasure {
  const whole = otsuSplit(img.data);
  const paper = whole.lightMean;
  const fallback = insetBox({ x: 0, y: 0, w: img.width, h: img.height }, img.width * 0.15, img.height * 0.15);
  if (whole.lightMean - whole.darkMean < MIN_CONTRAST) {
    // One tone over the whole crop: blank paper (or a crop entirely inside a solid fill).
    return { fillRatio: fillRatioOf(img.data, 255), boxFound: false, inner: fallback, shape: 'none' };
  }
  const binary = thresholdAt(img, whole.threshold);
  const mask = maskOf(binary);
  const outline = findSquare(mask, img.width, img.height) ?? findCircle(binary, mask);
  if (!outline) {
    return { fillRatio: fillRatioOf(innerPixels(img, fallback, false), paper), boxFound: false, inner: fallback, shape: 'none' };
  }
  const values = innerPixels(img, outline.inner, outline.shape === 'circle');
  return { fillRatio: fillRatioOf(values, paper), boxFound: true, box: outline.box, inner: outline.inner, shape: outline.shape };
}

/**
 * Misregistration absorbed when the blank is subtracted, in pixels: the blank's printed ink is grown by this much
 * before it is set aside. 2 px is what page alignment and local refinement leave on the real W-4 (mean 1.43 px, see
 * test/real-form/w4-extract.test.ts); on bench/real-form-marks.ts (development forms, heavy scans) 3 px lost more
 * ticks than it removed noise (boxes right 92.4 % against 95.4 % at 2 px, contrast 40).
 */
export const ADDED_INK_TOLERANCE = 2;

/**
 * How much darker than the blank (at the page's paper tone) a pixel must be to be added ink, in gray levels.
 * Measured on bench/real-form-marks.ts (14 development forms, 306 boxes, 58 one-of rows, light and heavy scans):
 * 25 let heavy-scan noise and JPEG ringing reach 0.147 in empty boxes; 40 lost light pencil ticks; 32 gave boxes
 * right 96.7 % / 96.1 % (light / heavy; the printed-outline measure 75.5 % / 72.9 %) and one-of rows 57 of 58 right
 * with none sent to review (outline measure with thresholds: 38 and 37 right, 19 and 20 to review).
 */
export const ADDED_INK_CONTRAST = 32;

/** Blank pixels at or below this gray are printed ink (anti-aliased edges of thin rules included; as dropout). */
const BLANK_INK = 200;

/**
 * Lighter print that is still print when it forms a hairline: the border a viewer draws around a check box in light
 * gray (207 on Official Form B 121, 188 at its thicker side), which a scan darkens and which read as a tick in every
 * empty box of that form. Only thin straight runs count: a light background fill of a box is paper to a writer, and
 * set aside whole it left no paper to judge a mark on (bench/real-form-marks.ts, development forms).
 */
const HAIRLINE_INK = 230;
/** Shortest hairline, pixels (a 6 pt check box side is 17 px at 200 dpi). */
const HAIRLINE_RUN = 12;
/** A hairline is at most this thick, pixels: print this far on either side of it across the line is paper. */
const HAIRLINE_HALF = 2;

/** Blank pixels of light print (up to HAIRLINE_INK) lying in a thin straight run along a row or a column (0 there). */
function hairlines(blank: GrayImage): GrayImage {
  const { width: w, height: h, data } = blank;
  const out = new Uint8Array(w * h).fill(255);
  const gap = HAIRLINE_HALF + 1;
  for (const horizontal of [true, false]) {
    // Along a row (step 1) or down a column (step w); `across` is the offset to the pixels either side of the line.
    const [len, lines, step, stride, acrossLen] = horizontal ? [w, h, 1, w, h] : [h, w, w, 1, w];
    const across = gap * stride;
    for (let line = 0; line < lines; line++) {
      const base = line * stride;
      // The pixels `gap` away on either side; off the image counts as paper.
      const before = line - gap >= 0;
      const after = line + gap < acrossLen;
      let start = -1;
      for (let a = 0; a <= len; a++) {
        const i = base + a * step;
        const light = a < len && data[i] <= HAIRLINE_INK;
        const thin = light && !(before && data[i - across] <= HAIRLINE_INK && after && data[i + across] <= HAIRLINE_INK);
        if (thin && start < 0) start = a;
        if (!thin && start >= 0) {
          if (a - start >= HAIRLINE_RUN) for (let k = start; k < a; k++) out[base + k * step] = 0;
          start = -1;
        }
      }
    }
  }
  return { width: w, height: h, data: out };
}

/** Fewer paper pixels than this inside the box after the print is set aside: too few to judge (common practice). */
const MIN_PAPER_PIXELS = 16;

/**
 * Ink a writer added inside a printed box, judged against the blank form under the same crop (`blank`, same size
 * as `img`, see blankUnderCrop). Each pixel of the box is compared with the lightest the blank is within
 * `tolerance` pixels of it (misregistration), scaled to the page's paper tone: a pixel clearly darker than that is
 * added ink. Printed outlines, a ruled line a few pixels past the box, printed shading: all are the blank's, so an
 * empty box measures near zero whatever is printed around it; a tick or cross that overflows the box counts for the
 * part inside it. The share is taken over the box's pixels that are paper on the blank (print grown by the
 * tolerance set aside). `box` is the printed box in crop pixels. Null when too few paper pixels are left to judge.
 */
export function measureAddedInk(
  img: GrayImage,
  blank: GrayImage,
  box: Box,
  tolerance = ADDED_INK_TOLERANCE,
  contrast = ADDED_INK_CONTRAST,
): MarkMeasure | null {
  const added = addedInkMask(img, blank, tolerance, contrast);
  if (!added) return null;
  const { width: w, height: h } = img;
  const x0 = Math.max(0, Math.round(box.x));
  const y0 = Math.max(0, Math.round(box.y));
  const x1 = Math.min(w, Math.round(box.x + box.w));
  const y1 = Math.min(h, Math.round(box.y + box.h));
  const { area, ink } = countAddedInk(added, { x: x0, y: y0, w: x1 - x0, h: y1 - y0 });
  if (area < MIN_PAPER_PIXELS) return null;
  const inner = { x: x0, y: y0, w: x1 - x0, h: y1 - y0 };
  return { fillRatio: ink / area, boxFound: true, box: inner, inner, shape: 'square' };
}

/** Ink added over the blank under a crop: `ink` is a binary image (INK where added), `print` 1 where the blank has
 *  print (grown by the tolerance), which is neither paper nor added ink. */
export interface AddedInk {
  ink: GrayImage;
  print: Uint8Array;
}

/**
 * The pixels of a crop that are added ink over the blank (see measureAddedInk for the comparison), as a binary
 * image, with the blank's print grown by `tolerance` set aside. Null when too few paper pixels are left to judge.
 */
export function addedInkMask(
  img: GrayImage,
  blank: GrayImage,
  tolerance = ADDED_INK_TOLERANCE,
  contrast = ADDED_INK_CONTRAST,
): AddedInk | null {
  const print = formMask(blank, tolerance, BLANK_INK);
  const hairline = formMask(hairlines(blank), tolerance, 0);
  for (let i = 0; i < print.length; i++) if (hairline[i]) print[i] = 1;
  const lightest = maxFilter(blank, tolerance);
  const paperPixels: number[] = [];
  for (let i = 0; i < img.data.length; i++) if (!print[i]) paperPixels.push(img.data[i]);
  if (paperPixels.length < MIN_PAPER_PIXELS) return null;
  // The page's paper tone (scanners rarely give 255), from the crop with the print set aside.
  const paper = otsuSplit(Uint8Array.from(paperPixels)).lightMean;
  const gain = paper / 255;
  const ink = new Uint8Array(img.data.length).fill(PAPER);
  for (let i = 0; i < img.data.length; i++) if (!print[i] && lightest[i] * gain - img.data[i] >= contrast) ink[i] = INK;
  return { ink: { width: img.width, height: img.height, data: ink }, print };
}

/** Paper pixels of the blank inside `box` (crop pixels, whole numbers) and how many of them hold added ink. */
export function countAddedInk(added: AddedInk, box: Box): { area: number; ink: number } {
  const { width: w, data } = added.ink;
  let area = 0;
  let ink = 0;
  for (let y = box.y; y < box.y + box.h; y++)
    for (let x = box.x; x < box.x + box.w; x++) {
      const i = y * w + x;
      if (added.print[i]) continue;
      area++;
      if (data[i] === INK) ink++;
    }
  return { area, ink };
}

/** Brightest value within a (2r+1)-square around each pixel (separable: along rows, then along columns). */
function maxFilter(img: GrayImage, r: number): Uint8Array {
  const { width: w, height: h } = img;
  return maxAlong(maxAlong(img.data, w, h, r, 1, w), w, h, r, w, 1);
}

/** Running maximum over ±r samples along one axis: `step` between neighbours, `stride` between lines. */
function maxAlong(data: Uint8Array, w: number, h: number, r: number, step: number, stride: number): Uint8Array {
  const out = new Uint8Array(w * h);
  const [len, lines] = step === 1 ? [w, h] : [h, w];
  for (let line = 0; line < lines; line++) {
    const base = line * stride;
    for (let i = 0; i < len; i++) {
      let m = 0;
      for (let k = Math.max(0, i - r); k <= Math.min(len - 1, i + r); k++) m = Math.max(m, data[base + k * step]);
      out[base + i * step] = m;
    }
  }
  return out;
}

/**
 * Ink coverage of a signature area: share of the area covered by pen strokes. The crop is deskewed (so the printed
 * signature line is straight), printed rules are removed (ink runs spanning half the width or height; a signature
 * stroke is never that straight, common practice), and only components at least a fifth of the crop height tall
 * are kept: printed label words ("Signature of applicant") are flatter, a signature's connected loops taller
 * (measured on rendered areas in test/fields/signature-pixels.test.ts). A 4 % margin at each edge is left out
 * (border fragments of a padded crop).
 */
export function inkCoverage(img: GrayImage): number {
  const { width: w, height: h } = img;
  const s = otsuSplit(img.data);
  if (s.lightMean - s.darkMean < MIN_CONTRAST) return 0;
  let binary = thresholdAt(img, s.threshold);
  const skew = estimateCropSkew(binary, 4, 0.25);
  if (skew !== 0) binary = thresholdAt(rotateCrop(img, skew), s.threshold);
  const clean = removeRuledLines(binary, { minHorizontal: Math.round(w * 0.5), minVertical: Math.round(h * 0.5) }).image;
  const { labels, components } = labelComponents(clean);
  const minSize = h * 0.2;
  const stroke = new Uint8Array(components.length + 1);
  for (const c of components) if (c.box.h >= minSize) stroke[c.id] = 1;
  const mx = Math.round(w * 0.04);
  const my = Math.round(h * 0.04);
  let ink = 0;
  let area = 0;
  for (let y = my; y < h - my; y++)
    for (let x = mx; x < w - mx; x++) {
      area++;
      if (stroke[labels[y * w + x]]) ink++;
    }
  return area ? ink / area : 0;
}
