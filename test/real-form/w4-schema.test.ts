import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadCocoDataset } from '../../src/eval/detection-dataset.js';
import { referenceImagePath } from '../../src/schema/load.js';
import { fieldRegions } from '../../src/schema/resolved-field.js';
import type { GrayImage } from '../../src/image/raster.js';
import { DETECTOR_CLASSES } from '../../src/synth/layout-model.js';
import { renderW4Page, w4Blank } from './fill.js';
import { loadW4Schema, W4_BLANK, W4_BLANK_COCO, w4BlankCoco, w4Layout } from './w4-layout.js';

/** Ink on a 0..255 gray page: darker than mid-gray (common practice for printed black on white). */
const INK = 128;

/** Longest unbroken run of ink along a row, as a share of the span: a ruled line is one run across, text is not. */
function ruleShareOfRow(img: GrayImage, y: number, x0: number, x1: number): number {
  let run = 0;
  let best = 0;
  for (let x = x0; x < x1; x++) {
    run = img.data[y * img.width + x] < INK ? run + 1 : 0;
    best = Math.max(best, run);
  }
  return best / (x1 - x0);
}

/** Bounds of the dark pixels inside a window (null when none). */
function inkBounds(img: GrayImage, x0: number, y0: number, x1: number, y1: number) {
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (let y = Math.max(0, y0); y < Math.min(img.height, y1); y++) {
    for (let x = Math.max(0, x0); x < Math.min(img.width, x1); x++) {
      if (img.data[y * img.width + x] >= INK) continue;
      minX = Math.min(minX, x);
      minY = Math.min(minY, y);
      maxX = Math.max(maxX, x);
      maxY = Math.max(maxY, y);
    }
  }
  return minX === Infinity ? null : { x: minX, y: minY, w: maxX - minX + 1, h: maxY - minY + 1 };
}

describe('hand-labelled schema of the real blank layout', () => {
  it('is a valid form schema whose blank image resolves from the repository', async () => {
    const loaded = await loadW4Schema();
    expect(referenceImagePath(loaded, 0)).toBe(W4_BLANK);
    const blank = await w4Blank();
    // The blank is rendered at 200 dpi on US letter, 8.5 x 11 in (its README beside the image).
    expect([blank.width, blank.height]).toEqual([loaded.schema.pages[0].width, loaded.schema.pages[0].height]);
    expect(new Set(loaded.schema.fields.map((f) => f.class))).toEqual(new Set(['text_entry', 'checkbox', 'signature_area']));
    for (const f of loaded.schema.fields) expect(DETECTOR_CLASSES).toContain(f.class);
  });

  // The outside reference for the hand labels is the printed page itself: its ruled lines and printed squares.
  it('puts each checkbox region on a printed square: dark border all round, paper inside', async () => {
    const loaded = await loadW4Schema();
    const blank = await w4Blank();
    const boxes = loaded.fields.filter((f) => f.spec.class === 'checkbox').flatMap((f) => fieldRegions(f).map((p) => p.region));
    expect(boxes).toHaveLength(4);
    for (const [x, y, w, h] of boxes) {
      expect(inkBounds(blank, x - 3, y - 3, x + w + 3, y + h + 3)).toEqual({ x, y, w, h });
      const inside = inkBounds(blank, x + 3, y + 3, x + w - 3, y + h - 3);
      expect(inside).toBeNull();
    }
  });

  it('closes every writing area with a printed rule within 2 px below it and crosses no rule inside it', async () => {
    const loaded = await loadW4Schema();
    const blank = await w4Blank();
    const areas = loaded.schema.fields.filter((f) => f.class !== 'checkbox');
    expect(areas).toHaveLength(16);
    for (const f of areas) {
      const [x, y, w, h] = f.region!;
      const x0 = x + 2;
      const x1 = x + w - 2;
      const below = [0, 1, 2].map((d) => ruleShareOfRow(blank, y + h + d, x0, x1));
      expect(Math.max(...below), `${f.name}: rule under the area`).toBeGreaterThan(0.95);
      for (let yy = y + 1; yy < y + h - 1; yy++) {
        expect(ruleShareOfRow(blank, yy, x0, x1), `${f.name}: row ${yy} inside`).toBeLessThan(0.5);
      }
    }
  });

  it('has COCO truth that is exactly what the schema gives (test/real-form/make-coco.ts wrote it)', async () => {
    const loaded = await loadW4Schema();
    const written = JSON.parse(await readFile(W4_BLANK_COCO, 'utf8')) as unknown;
    expect(written).toEqual(w4BlankCoco(w4Layout(loaded), path.dirname(W4_BLANK_COCO)));
    const data = await loadCocoDataset(W4_BLANK_COCO);
    expect(data.images.map((i) => i.path)).toEqual([W4_BLANK]);
    // 15 text entry areas, 4 checkboxes (three filing-status boxes and the two-jobs box), 1 signature area.
    const perClass = Object.fromEntries(data.categoryNames.map((n) => [n, data.boxes.filter((b) => b.categoryName === n).length]));
    expect(perClass).toEqual({ text_entry: 15, checkbox: 4, signature_area: 1, comb_field: 0 });
  });
});

describe('filling the real blank with invented values', () => {
  it('moves the truth boxes with the pixels: a scanned page shows each printed square where the truth puts it', async () => {
    const layout = w4Layout(await loadW4Schema());
    const page = await renderW4Page(layout, { seed: 900000, index: 1, fill: 'typed', degrade: 'light' });
    expect(Math.abs(page.truth.skew)).toBeGreaterThan(0.3); // a page that really is turned, so the check means something
    const squares = page.truth.fields.flatMap((f) => (f.parts ? f.parts.map((p) => p.box) : f.type === 'checkbox' ? [f.box] : []));
    expect(squares).toHaveLength(4);
    for (const [x, y, w, h] of squares) {
      // The truth box is the outward-rounded bound of the warped square; the dark bound of the scanned square lies
      // within a pixel and a half of it (bilinear resampling and blur spread the stroke by about a pixel).
      const ink = inkBounds(page.image, x - 3, y - 3, x + w + 3, y + h + 3)!;
      expect(Math.abs(ink.x - x)).toBeLessThanOrEqual(1.5);
      expect(Math.abs(ink.y - y)).toBeLessThanOrEqual(1.5);
      expect(Math.abs(ink.x + ink.w - (x + w))).toBeLessThanOrEqual(1.5);
      expect(Math.abs(ink.y + ink.h - (y + h))).toBeLessThanOrEqual(1.5);
    }
  });

  it('writes only invented identifiers and one filing status per page', async () => {
    const layout = w4Layout(await loadW4Schema());
    for (const index of [0, 1, 2]) {
      const { truth } = await renderW4Page(layout, { seed: 900000, index, fill: 'handwriting', degrade: 'none' });
      const value = (name: string) => truth.fields.find((f) => f.name === name)!.value;
      // 987-65-4320..4329: set aside by the Social Security Administration for examples, never issued (from memory).
      expect(value('ssn')).toMatch(/^987-65-432\d$/);
      const ein = value('employer_ein');
      // EIN prefix 00 is not among the prefixes the IRS assigns (from memory of its published prefix list).
      if (ein !== null) expect(ein).toMatch(/^00-\d{7}$/);
      const status = truth.fields.find((f) => f.name === 'filing_status')!;
      expect(status.parts!.filter((p) => p.checked)).toHaveLength(1);
      // Line 3 is the sum of the two amounts above it (the form's own arithmetic).
      const n = (name: string) => (value(name) as number | null) ?? 0;
      expect(n('credits_total')).toBe(n('qualifying_children_amount') + n('other_dependents_amount'));
    }
  });
});
