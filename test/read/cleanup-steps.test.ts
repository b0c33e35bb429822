import { describe, expect, it } from 'vitest';
import { renderCell } from './render-cell.js';
import { cropField } from '../../src/read/crop.js';
import { binarizeOtsu } from '../../src/image/otsu.js';
import { removeRuledLines } from '../../src/read/cleanup/line-removal.js';
import { filterComponents, labelComponents } from '../../src/image/components.js';
import { isolateTextBand, textBands } from '../../src/read/cleanup/text-band.js';
import { estimateCropSkew, rotateCrop, uprightBox } from '../../src/read/cleanup/deskew.js';
import { maskedGray } from '../../src/read/cleanup/pipeline.js';
import { characterHeight, upscaleToCharacterHeight } from '../../src/read/cleanup/upscale.js';
import { rowProfile, INK } from '../../src/image/binary.js';
import { createGray, type GrayImage } from '../../src/image/raster.js';

function drawRect(img: GrayImage, x: number, y: number, w: number, h: number): void {
  for (let yy = y; yy < y + h; yy++) for (let xx = x; xx < x + w; xx++) img.data[yy * img.width + xx] = INK;
}

describe('ruled-line removal (morphological opening with a line element; common practice)', () => {
  it('removes a rule drawn under rendered text and keeps the text', async () => {
    const { page, box } = await renderCell({ value: 'Juniper Oakhaven', underline: true, border: false });
    // Crop wide enough to include the rule drawn 30 px under the cell.
    const crop = cropField(page, { ...box, h: box.h + 40 }, 4);
    const bin = binarizeOtsu(crop.image);
    const ruleRow = box.y + box.h + 30 - crop.pageBox.y;
    const before = rowProfile(bin);
    expect(before[ruleRow]).toBeGreaterThan(crop.image.width * 0.9);
    const { image } = removeRuledLines(bin);
    const after = rowProfile(image);
    for (let y = ruleRow - 2; y <= ruleRow + 2; y++) expect(after[y]).toBe(0);
    // Text rows keep their ink: the glyphs are shorter than any line element.
    const textInk = (p: Int32Array) => p.slice(0, ruleRow - 5).reduce((s, v) => s + v, 0);
    expect(textInk(after)).toBe(textInk(before));
  });

  it('keeps a stroke that crosses the rule', () => {
    const img = createGray(100, 40);
    drawRect(img, 0, 20, 100, 2); // the rule
    drawRect(img, 50, 5, 2, 30); // a stem written through it
    const { image } = removeRuledLines(img, { minVertical: 40 });
    expect(image.data[21 * 100 + 50]).toBe(INK); // stem pixel on the rule row survives
    expect(image.data[21 * 100 + 10]).toBe(255); // rule elsewhere is gone
  });

  it('removes comb ticks that rise from the bottom rule but not digits of the same height', async () => {
    const { page, box } = await renderCell({ value: '7310', comb: 4, fontSize: 30 });
    const crop = cropField(page, box, 4);
    const bin = binarizeOtsu(crop.image);
    const { image, vertical } = removeRuledLines(bin, { minVertical: 45, minAnchoredVertical: 14 });
    const tickX = Math.round(box.x + box.w / 4) - crop.pageBox.x; // first separator
    const tickMid = Math.round(box.y + box.h * 0.8) - crop.pageBox.y;
    expect(vertical[tickMid * image.width + tickX] || vertical[tickMid * image.width + tickX - 1]).toBe(1);
    // Four digit components survive, none touches a rule any more.
    const kept = labelComponents(image).components.filter((c) => c.area > 20);
    expect(kept.length).toBe(4);
  });
});

describe('connected-component filter', () => {
  it('drops border fragments, specks and slivers, keeps characters', () => {
    const img = createGray(120, 50);
    drawRect(img, 0, 0, 3, 50); // border fragment on the left edge
    drawRect(img, 30, 10, 6, 24); // a character-sized stroke
    drawRect(img, 50, 12, 14, 20); // another
    drawRect(img, 80, 30, 1, 1); // a speck
    drawRect(img, 70, 45, 45, 2); // a 2-px sliver left by a rule
    const { kept, dropped } = filterComponents(img, { characterHeight: 16 });
    expect(kept.map((c) => c.box.x).sort((a, b) => a - b)).toEqual([30, 50]);
    expect(dropped).toBe(3);
  });
});

describe('text band isolation (projection profile)', () => {
  it('keeps the value line and drops a printed label above it', async () => {
    const { page, box } = await renderCell({ value: 'Wrenfield Marsh', label: 'Boat name', border: false });
    // The label sits 8 px above the cell: a generous crop catches both lines.
    const crop = cropField(page, { ...box, y: box.y - 30, h: box.h + 30 }, 0);
    const bin = binarizeOtsu(crop.image);
    expect(textBands(bin).length).toBe(2);
    const inner = { x: box.x - crop.pageBox.x, y: box.y - crop.pageBox.y, w: box.w, h: box.h };
    const { bands } = isolateTextBand(bin, { mode: 'line', inside: inner });
    expect(bands.length).toBe(1);
    expect(bands[0].top).toBeGreaterThanOrEqual(inner.y);
  });
});

describe('deskew (projection-profile method)', () => {
  it('measures a rendered 3 degree tilt within half a degree and undoes it', async () => {
    const { page, box } = await renderCell({ value: 'Thistlewood Cottage 42', border: false, rotate: 3 });
    const crop = cropField(page, { x: box.x - 20, y: box.y - 30, w: box.w + 40, h: box.h + 60 }, 0);
    const bin = binarizeOtsu(crop.image);
    // sharp rotates clockwise on screen for positive angles, so lines fall to the right: +3 degrees.
    expect(Math.abs(estimateCropSkew(bin) - 3)).toBeLessThanOrEqual(0.5);
    const straight = binarizeOtsu(rotateCrop(crop.image, estimateCropSkew(bin)));
    expect(Math.abs(estimateCropSkew(straight))).toBeLessThanOrEqual(0.5);
  });
});

describe('upright field box after deskew', () => {
  it('recovers the size of a tilted rectangle from its axis-aligned bounds', () => {
    // A 200 x 40 rectangle turned by 3 degrees has bounds W = 200 cos 3 + 40 sin 3, H = 200 sin 3 + 40 cos 3
    // (rotation of the corner points; plane trigonometry). Centred in a 300 x 120 crop the centre stays put.
    const t = (3 * Math.PI) / 180;
    const W = 200 * Math.cos(t) + 40 * Math.sin(t);
    const H = 200 * Math.sin(t) + 40 * Math.cos(t);
    const b = uprightBox({ x: (299 - W) / 2, y: (119 - H) / 2, w: W, h: H }, 3, 300, 120);
    expect(b.w).toBeCloseTo(200, 6);
    expect(b.h).toBeCloseTo(40, 6);
    expect(b.x + b.w / 2).toBeCloseTo(149.5, 6);
    expect(b.y + b.h / 2).toBeCloseTo(59.5, 6);
  });
});

describe('gray levels behind the kept ink', () => {
  it('keeps the gray of kept ink and one pixel around it, paper elsewhere', () => {
    const gray = createGray(5, 1, 90);
    const mask = createGray(5, 1, 255);
    mask.data[2] = INK;
    expect(Array.from(maskedGray(gray, mask).data)).toEqual([255, 90, 90, 90, 255]);
  });
});

describe('upscale to character height', () => {
  it('brings small text to the target height', async () => {
    const { page, box } = await renderCell({ value: 'Fernbrook 118', fontSize: 12, border: false });
    const bin = binarizeOtsu(cropField(page, box, 4).image);
    const h0 = characterHeight(bin)!;
    const { image, factor } = upscaleToCharacterHeight(bin, { target: 24 });
    expect(factor).toBeGreaterThan(1.5);
    // Within 2 px of the target after resampling (rounding of the factor and of glyph edges).
    expect(Math.abs(characterHeight(image)! - 24)).toBeLessThanOrEqual(2);
    expect(h0).toBeLessThan(16);
  });
});
