import { thresholdAt } from '../image/binary.js';
import { labelComponents } from '../image/components.js';
import type { Box } from '../image/geometry.js';
import { inkThreshold } from '../image/ink.js';
import type { GrayImage } from '../image/raster.js';

/** Character-sized components: a few pixels to a few millimetres tall, not slivers, not frames. */
export function glyphBoxes(img: GrayImage): Box[] {
  const { components } = labelComponents(thresholdAt(img, inkThreshold(img)));
  // Sizes scale with resolution; the limits are set for a letter page 2200 px tall (200 dpi): 6..90 px is
  // about 0.75..11 mm, from a small x-height to large handwriting (common practice for glyph filters).
  const k = Math.max(img.width, img.height) / 2200;
  const out: Box[] = [];
  for (const c of components) {
    const b = c.box;
    if (c.touchesBorder || b.h < 6 * k || b.h > 90 * k || b.w > 120 * k || c.area < 12 * k * k) continue;
    if (c.area / (b.w * b.h) < 0.08) continue;
    out.push(b);
  }
  return out;
}

