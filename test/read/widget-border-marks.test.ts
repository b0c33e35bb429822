import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { PDFiumLibrary } from '@hyzyla/pdfium';
import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { draftFromPdf } from '../../src/draft/from-pdf/from-pdf.js';
import { grayFromImage, grayToPng, type GrayImage } from '../../src/image/raster.js';
import { blankUnderCrop } from '../../src/read/blank-crop.js';
import { cropField } from '../../src/read/crop.js';
import { measureAddedInk } from '../../src/read/marks.js';

// US Bankruptcy Court Official Form B 121 (public domain; source note: test/fixtures/real-forms/pdfs/README.md). Its
// check boxes have no appearance of their own: a viewer draws them, and PDFium's form filler draws a hairline border
// in light gray (207 on the 200 dpi page, 188 at the thicker side). A blank printed that way, scanned for the schema
// and scanned again empty, must measure no ink added in any box.
const PDF = path.resolve('test/fixtures/real-forms/pdfs/uscourts-b121-2015.pdf');

/** Page 1 at 200 dpi as PDFium's form filler draws it (@hyzyla/pdfium, renderFormFields). */
async function viewerPrint(): Promise<GrayImage> {
  const lib = await PDFiumLibrary.init();
  const doc = await lib.loadDocument(await readFile(PDF));
  try {
    const page = doc.getPage(0);
    const r = await page.render({ scale: 200 / 72, colorSpace: 'Gray', render: 'bitmap', renderFormFields: true } as Parameters<typeof page.render>[0]);
    return { width: r.width, height: r.height, data: new Uint8Array(r.data) };
  } finally {
    doc.destroy();
  }
}

describe('empty check boxes with a viewer-drawn hairline border (Official Form B 121)', () => {
  it('measure no ink added over the blank once the empty form is scanned', async () => {
    const draft = await draftFromPdf(PDF, { image: 'blank.png' });
    draft.blank = await viewerPrint();
    // The hairline is there: light gray, not black, around the first box.
    const [bx, by] = draft.schema.fields.find((f) => f.type === 'checkbox')!.region as [number, number, number, number];
    let lightest = 255;
    for (let x = bx - 4; x < bx + 8; x++) lightest = Math.min(lightest, draft.blank.data[(by + 10) * draft.blank.width + x]);
    expect(lightest).toBeGreaterThan(150);
    expect(lightest).toBeLessThan(230);
    // A light office scan of the empty form: slight blur and JPEG (libvips), shifted 1 px down and right on the sheet.
    const blankPng = await grayToPng(draft.blank);
    const scan = await sharp(await sharp(blankPng).blur(0.8).extend({ top: 1, left: 1, background: '#ffffff' }).jpeg({ quality: 70 }).toBuffer())
      .grayscale()
      .png()
      .toBuffer();
    const page = await grayFromImage(scan);
    const boxes = draft.schema.fields.filter((f) => f.type === 'checkbox');
    expect(boxes.length).toBe(4); // the reference set's count (forms.json)
    for (const f of boxes) {
      const [x, y, w, h] = f.region as [number, number, number, number];
      const region = { x, y, w, h };
      const onPage = { x: x + 1, y: y + 1, w, h };
      const crop = cropField(page, onPage, 4);
      const under = blankUnderCrop(draft.blank, region, onPage, crop.pageBox);
      const m = measureAddedInk(crop.image, under, crop.inner);
      // Under the schema's "unchecked" threshold (0.05; bench/real-form-marks.ts: empty boxes <= 0.06). The border
      // counted as added ink measured 0.11-0.16 on the real-form bench's scans.
      expect(m!.fillRatio, f.name).toBeLessThan(0.05);
    }
  }, 60_000);
});
