import { describe, expect, it } from 'vitest';
import { isChecked, MARK_KINDS, renderCheckbox } from '../../src/synth/checkbox-mark.js';

/** Share of dark pixels (< 128) in the box's inner 60 %, away from the printed outline. */
async function innerInk(mark: (typeof MARK_KINDS)[number], shape: 'square' | 'round', size: number, seed: number): Promise<number> {
  const { image, box } = await renderCheckbox({ size, shape, mark, seed });
  const x0 = Math.round(box.x + box.w * 0.2);
  const y0 = Math.round(box.y + box.h * 0.2);
  const x1 = Math.round(box.x + box.w * 0.8);
  const y1 = Math.round(box.y + box.h * 0.8);
  let dark = 0;
  for (let y = y0; y < y1; y++) for (let x = x0; x < x1; x++) if (image.data[y * image.width + x] < 128) dark++;
  return dark / ((x1 - x0) * (y1 - y0));
}

describe('checkbox drawings', () => {
  it('deliberate marks put ink inside the box; empty boxes and stray dots leave it (almost) clear', async () => {
    // Fill-ratio reading of marks (common practice): a tick, cross, fill or scribble covers several percent of the
    // inner box; a stray dot covers well under that; a light pencil tick is faint (above 128), so it is checked by
    // its gray level instead.
    for (const shape of ['square', 'round'] as const)
      for (const size of [26, 40]) {
        expect(await innerInk('empty', shape, size, 1)).toBe(0);
        expect(await innerInk('dot', shape, size, 2)).toBeLessThan(0.03);
        for (const mark of ['tick', 'cross', 'fill', 'scribble'] as const) expect(await innerInk(mark, shape, size, 3)).toBeGreaterThan(0.04);
      }
  });

  it('a light pencil tick is a visible but faint mark', async () => {
    const { image, box } = await renderCheckbox({ size: 40, shape: 'square', mark: 'light', seed: 5 });
    let min = 255;
    for (let y = box.y + 6; y < box.y + box.h - 6; y++) for (let x = box.x + 6; x < box.x + box.w - 6; x++) min = Math.min(min, image.data[y * image.width + x]);
    expect(min).toBeGreaterThan(100);
    expect(min).toBeLessThan(215);
    expect(isChecked('light')).toBe(true);
    expect(isChecked('dot')).toBe(false);
  });

  it('draws the same pixels for the same seed', async () => {
    const a = await renderCheckbox({ size: 32, shape: 'round', mark: 'scribble', seed: 9 });
    const b = await renderCheckbox({ size: 32, shape: 'round', mark: 'scribble', seed: 9 });
    expect(Buffer.from(a.image.data).equals(Buffer.from(b.image.data))).toBe(true);
  });
});
