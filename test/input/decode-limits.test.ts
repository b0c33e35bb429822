import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { decodeDocument, DEFAULT_LIMITS, openDocument } from '../../src/input/decode.js';
import { whiteTiffPages } from './tiff-bomb.js';

describe('decoding limits and transparency', () => {
  it('puts transparent paper on white: an RGBA scan decodes like the same page saved opaque', async () => {
    // Black ink on transparent paper, as some scanning apps save a page.
    const svg = Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" width="600" height="400"><text x="40" y="200" font-size="80">Quill</text><rect x="30" y="250" width="500" height="4"/></svg>');
    const rgba = await sharp(svg).ensureAlpha().png().toBuffer();
    expect((await sharp(rgba).metadata()).hasAlpha).toBe(true);
    const opaque = await sharp(rgba).flatten({ background: '#ffffff' }).png().toBuffer();
    const [a, b] = [(await decodeDocument(rgba)).pages[0], (await decodeDocument(opaque)).pages[0]];
    expect(a.data[0]).toBe(255); // paper is white, not the black of a transparent pixel's colour channels
    let differ = 0;
    for (let i = 0; i < a.data.length; i++) if (Math.abs(a.data[i] - b.data[i]) > 2) differ++;
    expect(differ).toBe(0);
  });

  it('refuses a file whose pages add up past the total pixel limit from its headers, before decoding a page', async () => {
    // 50 pages of 7740 x 7740 one-bit white (each under the 60 MP page limit): a ~125 KB file of 3 billion pixels.
    const bomb = whiteTiffPages(50, 7740, 7740);
    expect(bomb.length).toBeLessThan(400_000);
    await expect(openDocument(bomb)).rejects.toThrow(
      /<buffer>: pages add up to \d+ pixels, over the 420000000-pixel limit for one file/,
    );
    // The same shape under the limit opens, and its pages are decoded only when asked for.
    const small = await openDocument(whiteTiffPages(3, 800, 600));
    expect(small.pageCount).toBe(3);
    const page = await small.page(2);
    expect([page.width, page.height, page.data[0]]).toEqual([800, 600, 255]);
  });

  it('refuses a strip a page side under 16 px from its header', async () => {
    const strip = await sharp({ create: { width: 1, height: 200_000, channels: 3, background: 'white' } }).png().toBuffer();
    await expect(decodeDocument(strip)).rejects.toThrow('<buffer>: page is 1x200000 pixels: a side under 16 px cannot hold a form');
    expect(DEFAULT_LIMITS.minSide).toBe(16);
  });
});
