import { mkdtemp, readFile, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { grayFromImage } from '../../src/image/raster.js';
import type { CocoDataset } from '../../src/synth/coco.js';
import { generateSamples } from '../../src/synth/generate.js';
import type { PageTruth } from '../../src/synth/truth.js';

let dir: string;
let coco: CocoDataset;

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'formglean-synth-'));
  // Heavy scans so boxes go through rotation, scale, keystone and resolution changes; every 2nd page upside down.
  await generateSamples({ layout: 'random', count: 4, seed: 4242, out: dir, fill: 'mixed', degrade: 'heavy', styles: 'all', format: 'png', upsideDownRate: 0.5 });
  coco = JSON.parse(await readFile(path.join(dir, 'coco.json'), 'utf8'));
});

afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('COCO labels', () => {
  it('has the four categories in the detector order with ids 1..4', () => {
    // COCO data format (cocodataset.org "Data format"): categories {id, name}; ids as our shared class order.
    expect(coco.categories.map((c) => [c.id, c.name])).toEqual([[1, 'text_entry'], [2, 'checkbox'], [3, 'signature_area'], [4, 'comb_field']]);
  });

  it('lists every page with its real pixel size and keeps every box inside its page', async () => {
    expect(coco.images).toHaveLength(4);
    for (const img of coco.images) {
      const meta = await sharp(path.join(dir, img.file_name)).metadata();
      expect([meta.width, meta.height]).toEqual([img.width, img.height]);
    }
    const byId = new Map(coco.images.map((i) => [i.id, i]));
    const ids = new Set<number>();
    for (const a of coco.annotations) {
      const img = byId.get(a.image_id)!;
      const [x, y, w, h] = a.bbox;
      expect(x).toBeGreaterThanOrEqual(0);
      expect(y).toBeGreaterThanOrEqual(0);
      expect(w).toBeGreaterThan(0);
      expect(h).toBeGreaterThan(0);
      expect(x + w).toBeLessThanOrEqual(img.width);
      expect(y + h).toBeLessThanOrEqual(img.height);
      // COCO: area of a bbox-only annotation is its width x height; iscrowd 0 for single objects.
      expect(a.area).toBe(w * h);
      expect(a.iscrowd).toBe(0);
      expect([1, 2, 3, 4]).toContain(a.category_id);
      ids.add(a.id);
    }
    expect(ids.size).toBe(coco.annotations.length);
    expect(new Set(coco.annotations.map((a) => a.category_id)).size).toBeGreaterThanOrEqual(3);
  });

  it('puts checkbox boxes on the printed boxes of the final (warped) pixels', async () => {
    // On a blank heavy scan each printed checkbox outline is ink along all four sides of its label box, and the
    // middle of the box is paper: a box that missed the warp by a few pixels fails one of the two.
    const blankDir = path.join(dir, 'blank');
    await generateSamples({ layout: 'random', count: 2, seed: 77, out: blankDir, fill: 'blank', degrade: 'heavy', styles: 'all', format: 'png', upsideDownRate: 0.5 });
    const blank: CocoDataset = JSON.parse(await readFile(path.join(blankDir, 'coco.json'), 'utf8'));
    let checked = 0;
    for (const img of blank.images) {
      const page = await grayFromImage(path.join(blankDir, img.file_name));
      const stats = (x0: number, y0: number, x1: number, y1: number) => {
        let min = 255;
        let sum = 0;
        let n = 0;
        for (let yy = y0; yy < y1; yy++)
          for (let xx = x0; xx < x1; xx++) {
            const v = page.data[yy * page.width + xx];
            min = Math.min(min, v);
            sum += v;
            n++;
          }
        return { min, mean: sum / n };
      };
      for (const a of blank.annotations.filter((x) => x.image_id === img.id && x.category_id === 2)) {
        const [x, y, w, h] = a.bbox;
        const bw = Math.max(3, Math.round(w * 0.2));
        const bh = Math.max(3, Math.round(h * 0.2));
        expect(stats(x, y, x + bw, y + h).min).toBeLessThan(110);
        expect(stats(x + w - bw, y, x + w, y + h).min).toBeLessThan(110);
        expect(stats(x, y, x + w, y + bh).min).toBeLessThan(110);
        expect(stats(x, y + h - bh, x + w, y + h).min).toBeLessThan(110);
        expect(stats(x + Math.round(w * 0.35), y + Math.round(h * 0.35), x + Math.round(w * 0.65), y + Math.round(h * 0.65)).mean).toBeGreaterThan(150);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(0);
  });
});

describe('truth files', () => {
  it('match the COCO pages and record rotation and skew', async () => {
    for (const img of coco.images) {
      const stem = img.file_name.replace(/\.png$/, '');
      const t: PageTruth = JSON.parse(await readFile(path.join(dir, 'truth', `${stem}.json`), 'utf8'));
      expect(t.file).toBe(img.file_name);
      expect([t.width, t.height]).toEqual([img.width, img.height]);
      expect([0, 180]).toContain(t.rotation);
      expect(Math.abs(t.skew)).toBeLessThanOrEqual(3);
      expect(['typed', 'handwriting']).toContain(t.fill);
      for (const f of t.fields) {
        const [x, y, w, h] = f.box;
        expect(x + w).toBeLessThanOrEqual(t.width);
        expect(y + h).toBeLessThanOrEqual(t.height);
      }
      const boxes = coco.annotations.filter((a) => a.image_id === img.id).length;
      const slots = t.fields.reduce((n, f) => n + (f.parts ? f.parts.length : 1), 0);
      expect(boxes).toBe(slots);
    }
  });
});
