import type { Detection } from '../detect/types.js';
import type { Box } from '../image/geometry.js';
import { iou } from '../image/geometry.js';
import type { GrayImage } from '../image/raster.js';
import { snapToRules } from '../page/snap-box.js';
import type { DroppedAreas } from './drafted-field.js';
import { hasRule, hasWritingSpace, printedMark } from './printed-mark.js';

/**
 * One field per place: detections of different classes on the same spot (a checkbox found inside a text entry, a
 * text entry doubling a comb) are resolved in favour of the higher score. Boxes overlapping by IoU >= 0.3, or one
 * lying 70 % inside the other, count as the same spot (common practice for cross-class suppression).
 */
export function suppressAcrossClasses(dets: readonly Detection[]): Detection[] {
  const kept: Detection[] = [];
  const within = (a: Box, b: Box) => {
    const ix = Math.max(0, Math.min(a.x + a.w, b.x + b.w) - Math.max(a.x, b.x));
    const iy = Math.max(0, Math.min(a.y + a.h, b.y + b.h) - Math.max(a.y, b.y));
    return (ix * iy) / Math.max(1e-9, Math.min(a.w * a.h, b.w * b.h));
  };
  for (const d of [...dets].sort((a, b) => b.score - a.score)) {
    if (kept.some((k) => iou(k.box, d.box) >= 0.3 || within(k.box, d.box) >= 0.7)) continue;
    kept.push(d);
  }
  return kept;
}

/**
 * The entry areas of a blank page, top to bottom: one detection per place, each snapped to the printed rules it
 * stands on. Detector boxes are good to a few pixels; the blank's printed frames and underlines are exact. On a
 * blank form every checkbox is a printed square, so a checkbox detection without one is dropped, as are areas with
 * no rule along them and text entries with no room to write; `dropped` counts them.
 */
export function entryAreasOfBlank(page: GrayImage, detections: readonly Detection[], threshold: number, dropped: DroppedAreas): Detection[] {
  return suppressAcrossClasses(detections)
    .flatMap((d) => {
      if (d.className !== 'checkbox') {
        const box = snapToRules(page, d.box, { threshold, prefer: d.className === 'comb_field' ? 'outer' : 'inner' });
        if (!hasRule(page, box, threshold)) {
          dropped.withoutRule++;
          return [];
        }
        if (d.className === 'text_entry' && !hasWritingSpace(page, box, threshold)) {
          dropped.noWritingSpace++;
          return [];
        }
        return [{ ...d, box }];
      }
      const frame = printedMark(page, d.box, threshold);
      if (!frame) dropped.checkboxWithoutMark++;
      return frame ? [{ ...d, box: frame }] : [];
    })
    .sort((a, b) => a.box.y - b.box.y || a.box.x - b.box.x);
}
