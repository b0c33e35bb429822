import type { Box } from '../image/geometry.js';
import type { GrayImage } from '../image/raster.js';
import { blankUnderCrop, type BlankPart } from './blank-crop.js';
import { removeRuledLines } from './cleanup/line-removal.js';
import { cropField } from './crop.js';
import { addedInkMask, countAddedInk, type AddedInk } from './marks.js';

/**
 * Added ink (share of paper pixels, see measureAddedInk) that counts as writing in a strip beside the region's edge:
 * above stray specks and JPEG noise in empty strips (empty boxes measure under 0.06 on bench/real-form-marks.ts),
 * below one pen stroke crossing the strip. Common practice for "ink present", not measured on this check.
 */
const WRITING = 0.06;

/**
 * A straight vertical run of added ink this share of the region's height is a rule, not writing: characters are
 * shorter than their cell (the cell-border share of cleanup/pipeline.ts ruleLengths, common practice).
 */
const RULE_HEIGHT = 0.8;

/**
 * Writing that runs on past the right edge of a text region (a long city name into the next cell, a date past its
 * box): ink added over the blank both just inside the edge and just outside it, along the region's rows. Strips are
 * half the region's height wide. Needs the blank, which tells printed text in the neighbouring cell from writing.
 * Ruled lines the blank lacks are not writing: the border and comb dividers a PDF viewer draws around a filled
 * widget, a box the writer ruled (they made every boxed typed value on va-21-0966 look cut off). Straight runs as
 * tall as the region or as wide as a strip are set aside before the strips are measured.
 */
export function writingPastEdge(page: GrayImage, blank: BlankPart): boolean {
  const b = blank.onPage;
  const side = Math.max(4, Math.round(b.h / 2));
  const edge = Math.round(b.x + b.w);
  // Both strips and a strip's width of context on each side (clamped to the page), with a quarter height above and
  // below, so a rule running on past the strips is seen at its length.
  const margin = Math.round(b.h / 4);
  const area = { x: edge - 2 * side, y: Math.round(b.y) - margin, w: 4 * side, h: Math.round(b.h) + 2 * margin };
  if (edge - side < 0 || edge + side > page.width) return false;
  const crop = cropField(page, area, 0);
  const under = blankUnderCrop(blank.reference, blank.region, blank.onPage, crop.pageBox);
  const added = addedInkMask(crop.image, under);
  if (!added) return false;
  const writing: AddedInk = {
    ink: removeRuledLines(added.ink, { minHorizontal: side, minVertical: Math.round(b.h * RULE_HEIGHT), repairCrossings: false }).image,
    print: added.print,
  };
  const strip = (x: number): Box => ({ x: x - crop.pageBox.x, y: Math.round(b.y) - crop.pageBox.y, w: side, h: Math.round(b.h) });
  return share(writing, strip(edge - side)) > WRITING && share(writing, strip(edge)) > WRITING;
}

function share(added: AddedInk, box: Box): number {
  const x0 = Math.max(0, box.x);
  const y0 = Math.max(0, box.y);
  const x1 = Math.min(added.ink.width, box.x + box.w);
  const y1 = Math.min(added.ink.height, box.y + box.h);
  const { area, ink } = countAddedInk(added, { x: x0, y: y0, w: x1 - x0, h: y1 - y0 });
  return area > 0 ? ink / area : 0;
}
