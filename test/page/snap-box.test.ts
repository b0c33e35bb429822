import { describe, expect, it } from 'vitest';
import { iou } from '../../src/image/geometry.js';
import { snapToFrame, snapToRules } from '../../src/page/snap-box.js';
import { realBlank } from './real-form.js';

describe('snapToRules and snapToFrame on the real blank form', () => {
  // Cells and checkboxes of IRS Form W-4 (2025) page 1 at 200 dpi, measured by eye on the blank: rules run at
  // x = 260, 760, 1320 and y = 232, 300 (centres of the printed lines); the "Single" checkbox frame spans 319..343.
  it('moves rough cell edges onto the printed rules', async () => {
    const page = await realBlank();
    const s = snapToRules(page, { x: 280, y: 222, w: 470, h: 84 });
    expect(Math.abs(s.x - 261)).toBeLessThan(3);
    expect(Math.abs(s.x + s.w - 761)).toBeLessThan(3);
    expect(Math.abs(s.y - 233)).toBeLessThan(3);
    expect(Math.abs(s.y + s.h - 301)).toBeLessThan(3);
  });

  it("takes the cell's own side, not the neighbour's, when the found box spills over", async () => {
    const page = await realBlank();
    // Spills 20 px into the first-name cell: the nearer rule outward is the shared one at x = 760 anyway; the
    // right edge spills past the SSN rule at 1320 and must come back to it.
    const s = snapToRules(page, { x: 770, y: 236, w: 570, h: 60 });
    expect(Math.abs(s.x + s.w - 1321)).toBeLessThan(3);
  });

  it('leaves edges alone over running text, whose rows are dense but a dozen pixels thick', async () => {
    const page = await realBlank();
    // The paragraph under "TIP:" (no rules between y = 560 and 700).
    const box = { x: 300, y: 600, w: 600, h: 60 };
    expect(snapToRules(page, box)).toEqual(box);
  });

  it('finds the printed square of a checkbox from a box that takes in its label', async () => {
    const page = await realBlank();
    const s = snapToFrame(page, { x: 316, y: 436, w: 44, h: 28 });
    expect(iou(s!, { x: 319, y: 438, w: 24, h: 24 })).toBeGreaterThan(0.9);
  });

  it('finds no square where a box was found over plain text', async () => {
    const page = await realBlank();
    // Over "Single or Married filing separately": letters, no printed square.
    expect(snapToFrame(page, { x: 420, y: 440, w: 26, h: 26 })).toBeNull();
  });
});
