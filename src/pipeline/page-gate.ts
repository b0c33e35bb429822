import type { Alignment } from '../page/alignment.js';
import type { Box } from '../image/geometry.js';
import type { GrayImage } from '../image/raster.js';

/**
 * The page gate: pages nothing can be read from are refused before any field is read, with the reason, so that an
 * empty or black page never yields "accepted" empty fields.
 *
 * Thresholds, measured with the gray level 128 as the ink cut (common practice for a first look at a scan): the
 * bundled demo scans have 3.2-9.4 % dark pixels and the blank IRS W-4 page 1 (test/fixtures/real-forms) 7.5 %.
 * A page under 0.1 % dark holds no printed form at all (blank paper, a white image); one over 90 % is black
 * (lid open, a negative, a dead scan). Both sit more than an order of magnitude from the measured pages.
 */
const INK_CUT = 128;
const BLANK_BELOW = 0.001;
const BLACK_ABOVE = 0.9;

/**
 * Shortest page side read: 500 px is a letter page at about 60 DPI, where 10-point print is some 8 px high, below
 * what OCR reads reliably (Tesseract's documentation on image quality asks for about 300 DPI; the bundled samples
 * are 150 DPI, 1275 px wide).
 */
export const MIN_PAGE_SIDE = 500;

/**
 * Alignment score (image correlation, or share of regions matched) under which the page is taken as not showing the
 * form: src/page/align.ts's own floor for trusting an image registration (0.3). A page aligned by nothing (method
 * "identity") is never trusted.
 */
export const MIN_ALIGNMENT_SCORE = 0.3;

/** Why a page cannot be read at all, or null when it can. Pure. */
export function pageProblem(page: GrayImage): string | null {
  if (Math.min(page.width, page.height) < MIN_PAGE_SIDE) {
    return `is ${page.width}x${page.height} pixels, too small to read a form (the short side needs at least ${MIN_PAGE_SIDE} px)`;
  }
  // Every 4th pixel of every 4th row: 1/16 of the page is plenty for a share, and fast.
  let dark = 0;
  let seen = 0;
  for (let y = 0; y < page.height; y += 4) {
    const row = y * page.width;
    for (let x = 0; x < page.width; x += 4) {
      if (page.data[row + x] < INK_CUT) dark++;
      seen++;
    }
  }
  const share = dark / seen;
  if (share < BLANK_BELOW) return 'is blank (no printed or written marks found)';
  if (share > BLACK_ABOVE) return `is almost all black (${Math.round(share * 100)} % dark pixels): not a readable scan`;
  return null;
}

/** Why a page's fit to its layout is not to be trusted, or null when it is. */
export function alignmentProblem(alignment: Alignment): string | null {
  if (alignment.method === 'identity') return 'the form layout was not found on the page';
  if (alignment.score < MIN_ALIGNMENT_SCORE) return `the page fits its form layout poorly (score ${alignment.score.toFixed(2)} < ${MIN_ALIGNMENT_SCORE})`;
  return null;
}

/**
 * How much of a field box may lie past the page's edge and the field still be read: a quarter of its height (the
 * written line sits in the middle of its box; a region drawn to the top edge of the sheet, FEC Form 99's filing
 * stamp, lies a few pixels past it once the page is aligned, with nothing there) and a tenth of its width (about one
 * character in ten of a full box; more, and the value may be read cut off). Common practice, not measured.
 */
const OFF_PAGE_HEIGHT = 0.25;
const OFF_PAGE_WIDTH = 0.1;

/**
 * Does a field box lie on the page? A box reaching further outside would be read cut off (its value possibly
 * accepted short) or not at all (a crop outside the page): such a field goes to review with reason off_page and the
 * rest of the document is read.
 */
export function boxOnPage(box: Box, page: Pick<GrayImage, 'width' | 'height'>): boolean {
  const outX = Math.max(0, -box.x) + Math.max(0, box.x + box.w - page.width);
  const outY = Math.max(0, -box.y) + Math.max(0, box.y + box.h - page.height);
  return outX <= OFF_PAGE_WIDTH * box.w && outY <= OFF_PAGE_HEIGHT * box.h;
}
