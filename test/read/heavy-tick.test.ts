import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { grayFromImage } from '../../src/image/raster.js';
import { cropField } from '../../src/read/crop.js';
import { measureMark } from '../../src/read/marks.js';
import { DD293_BLANK, filledBlank } from '../real-form/blank-variant.js';

describe('a heavy tick whose long stroke runs along the box edge, on DD Form 293', () => {
  it('is measured inside the printed outline, not taken for its edge', async () => {
    // The "reserve" box of item 2 (hand-measured on the blank), ticked with a heavy felt-tip stroke that runs low and
    // shallow across the box; invented. Its rows are ink runs as long as the printed bottom edge's: before the fix
    // they merged into one thick "edge", the inside was measured above them, and the fill read 0.006 and 0.000.
    const box = { x: 546, y: 502, w: 29, h: 29 };
    for (const [width, d] of [
      [8, 'M 544 520 L 552 530 L 592 516'],
      [10, 'M 544 520 L 552 530 L 592 516'],
      [8, 'M 544 516 L 552 528 L 590 508'],
    ] as const) {
      const svg = `<path d="${d}" fill="none" stroke="#181818" stroke-width="${width}" stroke-linecap="round"/>`;
      const page = await grayFromImage(await sharp(await filledBlank([], svg, DD293_BLANK)).blur(0.8).png().toBuffer());
      const m = measureMark(cropField(page, box, 4).image);
      expect(m.boxFound).toBe(true);
      // Over the default checkedAbove (0.1, src/fields/mark-decision.ts): a tick, not an empty box.
      expect(m.fillRatio, `${width}px ${d}`).toBeGreaterThan(0.1);
    }
    // The empty box itself still measures empty.
    const blank = await grayFromImage(DD293_BLANK);
    expect(measureMark(cropField(blank, box, 4).image).fillRatio).toBeLessThan(0.05);
  }, 60_000);
});
