import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { enclosedShare } from '../../src/draft/printed-mark.js';
import { inkShare, inkThreshold } from '../../src/image/ink.js';
import { cropGray, grayFromImage } from '../../src/image/raster.js';
import type { CocoDataset } from '../../src/synth/coco.js';
import { fillOf, writeRealLayoutPages } from '../../src/synth/real-layouts.js';

const work = mkdtempSync(path.join(os.tmpdir(), 'real-layouts-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

describe('detector pages from a real fillable form (IRS Form 8888 page 1, public domain fixture)', () => {
  it('labels every widget on blank, typed and handwriting pages, checkbox labels on the printed squares', async () => {
    const out = path.join(work, 'f8888');
    // No scan degradation: the labels can then be checked against the page pixels exactly.
    const s = await writeRealLayoutPages({ forms: ['test/fixtures/real-forms/pdfs/irs-f8888-2025.pdf'], out, seed: 31, perPage: 3, maxPages: 1, degrade: 'none', upsideDownRate: 0 });
    expect(s.pages).toBe(3);
    const coco = JSON.parse(readFileSync(path.join(out, 'coco.json'), 'utf8')) as CocoDataset;
    expect(coco.images).toHaveLength(3);
    // Page-1 widgets of the fixture's forms.json: 14 text (one read-only, left out), 6 checkboxes; 6 of the text
    // widgets are combs. One label per widget on every page.
    for (const im of coco.images) {
      const anns = coco.annotations.filter((a) => a.image_id === im.id);
      const byClass = (id: number) => anns.filter((a) => a.category_id === id).length;
      expect([byClass(1), byClass(2), byClass(4)]).toEqual([7, 6, 6]);
    }
    expect([0, 1, 2].map(fillOf)).toEqual(['blank', 'typed', 'handwriting']);
    const [blank, typed] = await Promise.all(coco.images.slice(0, 2).map((im) => grayFromImage(path.join(out, im.file_name))));
    const t = inkThreshold(blank);
    for (const a of coco.annotations.filter((x) => x.image_id === coco.images[0].id && x.category_id === 2)) {
      const [x, y, w, h] = a.bbox;
      // Snapped onto the printed square: a closed ring around an empty middle (geometry: > 0.6 for a ruled square).
      expect(enclosedShare(blank, { x, y, w, h }, t)).toBeGreaterThan(0.6);
    }
    // The typed page carries its values inside the labelled text areas: more ink there than on the blank.
    const textAreas = coco.annotations.filter((x) => x.image_id === coco.images[1].id && x.category_id === 1);
    const inkIn = (img: typeof blank) => textAreas.reduce((sum, a) => sum + inkShare(cropGray(img, { x: a.bbox[0], y: a.bbox[1], w: a.bbox[2], h: a.bbox[3] }), t), 0);
    expect(inkIn(typed)).toBeGreaterThan(inkIn(blank) + 0.05 * textAreas.length);
  }, 120_000);
});
