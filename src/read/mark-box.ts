import type { Box } from '../image/geometry.js';
import type { GrayImage } from '../image/raster.js';
import { blankUnderCrop, type BlankPart } from './blank-crop.js';
import { cropField, type Padding } from './crop.js';
import { measureAddedInk, measureMark } from './marks.js';

export interface BoxMark {
  fillRatio: number;
  boxFound: boolean;
  /** How it was measured: ink added over the blank, or the printed outline found in the crop. */
  method: 'added_ink' | 'outline';
}

/**
 * One printed box of a checkbox or choice field. Where the schema names a blank and the part has a region, the ink
 * added over the blank is measured (measureAddedInk): print near the box and the box's own outline do not count,
 * so an empty box measures near zero. Otherwise, or when the box leaves too little paper to judge, the printed
 * outline is looked for in the crop of `box` (measureMark). The added ink is measured at the aligned region, where
 * the blank is known to lie, even when a detection's box was matched to the part.
 */
export function measureBox(page: GrayImage, box: Box, padding: Padding, blank?: BlankPart): BoxMark {
  if (blank) {
    const crop = cropField(page, blank.onPage, padding);
    const under = blankUnderCrop(blank.reference, blank.region, blank.onPage, crop.pageBox);
    const added = measureAddedInk(crop.image, under, crop.inner);
    if (added) return { fillRatio: added.fillRatio, boxFound: true, method: 'added_ink' };
  }
  const m = measureMark(cropField(page, box, padding).image);
  return { fillRatio: m.fillRatio, boxFound: m.boxFound, method: 'outline' };
}
