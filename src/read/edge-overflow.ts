import type { Box } from '../image/geometry.js';
import type { GrayImage } from '../image/raster.js';
import { blankUnderCrop, type BlankPart } from './blank-crop.js';
import { cropField } from './crop.js';
import { measureAddedInk } from './marks.js';

/**
 * Added ink (share of paper pixels, see measureAddedInk) that counts as writing in a strip beside the region's edge:
 * above stray specks and JPEG noise in empty strips (empty boxes measure under 0.06 on bench/real-form-marks.ts),
 * below one pen stroke crossing the strip. Common practice for "ink present", not measured on this check.
 */
const WRITING = 0.06;

/**
 * Writing that runs on past the right edge of a text region (a long city name into the next cell, a date past its
 * box): ink added over the blank both just inside the edge and just outside it, along the region's rows. Strips are
 * half the region's height wide. Needs the blank, which tells printed text in the neighbouring cell from writing.
 */
export function writingPastEdge(page: GrayImage, blank: BlankPart): boolean {
  const b = blank.onPage;
  const side = Math.max(4, Math.round(b.h / 2));
  const edge = b.x + b.w;
  return addedInk(page, blank, { x: edge - side, y: b.y, w: side, h: b.h }) > WRITING && addedInk(page, blank, { x: edge, y: b.y, w: side, h: b.h }) > WRITING;
}

function addedInk(page: GrayImage, blank: BlankPart, strip: Box): number {
  if (strip.x + strip.w > page.width || strip.x < 0) return 0;
  const crop = cropField(page, strip, 0);
  const under = blankUnderCrop(blank.reference, blank.region, blank.onPage, crop.pageBox);
  return measureAddedInk(crop.image, under, crop.inner)?.fillRatio ?? 0;
}
