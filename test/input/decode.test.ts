import { mkdtemp, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import sharp from 'sharp';
import { beforeAll, describe, expect, it } from 'vitest';
import { decodeDocument, DEFAULT_LIMITS } from '../../src/input/decode.js';

let dir: string;
let png: Buffer;

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'fg-decode-'));
  png = await sharp({ create: { width: 120, height: 80, channels: 3, background: { r: 200, g: 10, b: 10 } } }).png().toBuffer();
});

describe('document decoding', () => {
  it('decodes png and jpeg to grayscale rasters of the right size', async () => {
    const doc = await decodeDocument(png);
    expect(doc.format).toBe('png');
    expect(doc.pages).toHaveLength(1);
    expect([doc.pages[0].width, doc.pages[0].height]).toEqual([120, 80]);
    // A dark red page becomes one mid-dark gray: one channel, uniform, neither paper nor ink black.
    const values = new Set(doc.pages[0].data);
    expect(values.size).toBe(1);
    expect(doc.pages[0].data[0]).toBeGreaterThan(40);
    expect(doc.pages[0].data[0]).toBeLessThan(160);
    const jpeg = await sharp(png).jpeg({ quality: 90 }).toBuffer();
    expect((await decodeDocument(jpeg)).format).toBe('jpeg');
  });

  it('reads every page of a multi-page TIFF', async () => {
    const black = await sharp({ create: { width: 120, height: 80, channels: 3, background: 'black' } }).png().toBuffer();
    const tiff = await sharp([png, black], { join: { animated: true } }).tiff().toBuffer();
    const file = path.join(dir, 'two.tiff');
    await writeFile(file, tiff);
    const doc = await decodeDocument(file);
    expect(doc.pages).toHaveLength(2);
    expect(doc.pages[1].data[0]).toBe(0);
  });

  it('applies EXIF orientation so pages come out upright', async () => {
    const turned = await sharp(await sharp({ create: { width: 120, height: 80, channels: 3, background: 'white' } }).png().toBuffer())
      .jpeg()
      .withMetadata({ orientation: 6 })
      .toBuffer();
    const doc = await decodeDocument(turned);
    expect([doc.pages[0].width, doc.pages[0].height]).toEqual([80, 120]);
  });

  it('gives one-line errors naming the file for text, truncated, empty and missing files', async () => {
    const text = path.join(dir, 'notes.jpg');
    await writeFile(text, 'this is a text file, not a photo\n');
    await expect(decodeDocument(text)).rejects.toThrow(`${text}: not a readable image (expected png, jpeg, tiff, webp or pdf)`);
    const truncated = path.join(dir, 'cut.png');
    const big = await sharp({ create: { width: 400, height: 400, channels: 3, background: 'white' } })
      .composite([{ input: Buffer.from('<svg width="400" height="400"><circle cx="200" cy="200" r="150"/></svg>') }])
      .png({ compressionLevel: 0 })
      .toBuffer();
    await writeFile(truncated, big.subarray(0, Math.floor(big.length / 2)));
    await expect(decodeDocument(truncated)).rejects.toThrow(/cut\.png: page 1 cannot be decoded \(corrupt or truncated image/);
    const empty = path.join(dir, 'empty.png');
    await writeFile(empty, '');
    await expect(decodeDocument(empty)).rejects.toThrow(`${empty}: empty file`);
    await expect(decodeDocument(path.join(dir, 'absent.png'))).rejects.toThrow(/absent\.png: file not found$/);
  });

  it('refuses pages over the pixel limit and documents over the page limit', async () => {
    await expect(decodeDocument(png, { ...DEFAULT_LIMITS, maxPixels: 5000 })).rejects.toThrow(
      '<buffer>: page is 120x80 = 9600 pixels, over the 5000-pixel limit',
    );
    const tiff = await sharp([png, png, png], { join: { animated: true } }).tiff().toBuffer();
    await expect(decodeDocument(tiff, { ...DEFAULT_LIMITS, maxPages: 2 })).rejects.toThrow(/3 pages, over the 2-page limit/);
  });
});
