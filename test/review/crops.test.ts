import { mkdtemp, readdir, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import sharp from 'sharp';
import { afterAll, describe, expect, it } from 'vitest';
import { createGray } from '../../src/image/raster.js';
import { writeReviewCrops } from '../../src/review/crops.js';
import { writeReviewQueue } from '../../src/review/queue-write.js';
import { readReviewQueue } from '../../src/review/queue-read.js';
import { reviewRowId } from '../../src/review/row-id.js';
import { documentResult, field } from './fixture.js';

const dirs: string[] = [];
afterAll(async () => {
  for (const d of dirs) await rm(d, { recursive: true, force: true });
});

describe('review crops', () => {
  it('writes a padded field crop and a framed context crop for each field waiting for review', async () => {
    const out = await mkdtemp(path.join(tmpdir(), 'fg-crops-'));
    dirs.push(out);
    // A page with one inked block exactly where the field box is.
    const page = createGray(800, 600);
    for (let y = 300; y < 330; y++) for (let x = 100; x < 300; x++) page.data[y * 800 + x] = 0;
    const box = { page: 0, x: 100, y: 300, w: 200, h: 30 };
    const doc = documentResult('intake-0002', [
      field('owner_name', 'text', 'Robin Quill', 'review', { box }),
      field('pet_name', 'text', 'Biscuit', 'accepted', { box }),
      field('email', 'text', null, 'missing', { box: null }),
    ]);
    await writeReviewCrops(out, doc, [page]);
    const id = reviewRowId(doc.document.sha256, 'owner_name');
    const files = (await readdir(path.join(out, 'review', 'crops'))).sort();
    expect(files).toEqual([`${id}.context.png`, `${id}.png`]);

    // Decoded by sharp (an independent PNG reader): box plus 4 px padding on each side, ink in the middle, paper at the rim.
    const crop = await sharp(path.join(out, 'review', 'crops', `${id}.png`)).raw().toBuffer({ resolveWithObject: true });
    expect([crop.info.width, crop.info.height]).toEqual([208, 38]);
    expect(crop.data[19 * 208 * crop.info.channels + 104 * crop.info.channels]).toBe(0);
    expect(crop.data[0]).toBe(255);

    const ctx = await sharp(path.join(out, 'review', 'crops', `${id}.context.png`)).raw().toBuffer({ resolveWithObject: true });
    expect(ctx.info.channels).toBeGreaterThanOrEqual(3);
    expect(ctx.info.width).toBeGreaterThan(208);
    expect(ctx.info.height).toBeGreaterThan(38);

    // The queue lists the crops relative to queue.csv; a field without a box has none.
    await writeReviewQueue(out, [doc]);
    const q = await readReviewQueue(path.join(out, 'review', 'queue.csv'));
    expect(q.entries.map((e) => [e.cells.field, e.cells.crop, e.cells.context_crop])).toEqual([
      ['owner_name', `crops/${id}.png`, `crops/${id}.context.png`],
      ['email', '', ''],
    ]);
  });
});
