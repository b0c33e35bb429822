import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { grayFromImage, type GrayImage } from '../../src/image/raster.js';
import { cropField } from '../../src/read/crop.js';
import { evenCells, readDigitComb } from '../../src/read/digit-comb.js';
import { DigitReader } from '../../src/read/digit-reader.js';

// Real-form pixels: Debtor 1's SSN combs of US Bankruptcy Court Form B 121, filled with MNIST test-split handwriting
// (source note: test/fixtures/real-forms/README.md). Its combs are rows of short underlines with no printed
// separators, so separator search finds no cells; the widget's cell count (11, its maximum length) divides the box
// evenly, as a comb field lays out its characters (ISO 32000-1 §12.7.4.3).
const FIXTURE = path.resolve('test/fixtures/real-forms/uscourts-b121-ssn-handwritten.png');
const COMBS = [
  { box: { x: 27, y: 19, w: 381, h: 46 }, digits: '999324874' },
  { box: { x: 27, y: 82, w: 381, h: 46 }, digits: '940339415' },
];

let page: GrayImage;
let reader: DigitReader;
beforeAll(async () => {
  page = await grayFromImage(FIXTURE);
  reader = await DigitReader.open();
});
afterAll(async () => {
  await reader.close();
});

describe('digit combs without printed separators (a real form)', () => {
  it('finds no cells by separators alone', async () => {
    for (const c of COMBS) expect(await readDigitComb(cropField(page, c.box, 4), reader)).toBeNull();
  });

  it('reads the handwritten digits cell by cell once the schema gives the cell count', async () => {
    let right = 0;
    for (const c of COMBS) {
      const read = await readDigitComb(cropField(page, c.box, 4), reader, { cells: 11 });
      expect(read!.cells).toHaveLength(11);
      // The last two cells are left empty on the page.
      expect(read!.cells.slice(9).map((x) => x.label)).toEqual(['empty', 'empty']);
      const got = read!.reading.text;
      for (let i = 0; i < c.digits.length; i++) if (got[i] === c.digits[i]) right++;
    }
    // 18 handwritten digits; the reader's test-split accuracy is 98 % per digit (models/digit-cells.md): one miss allowed.
    expect(right).toBeGreaterThanOrEqual(17);
  });

  it('reads a comb whose dotted ticks group the cells 3-2-4 off the cell edges (IRS Form 1040 SSN)', async () => {
    const f1040 = await grayFromImage(path.resolve('test/fixtures/real-forms/irs-f1040-ssn-handwritten.png'));
    for (const c of [
      { box: { x: 23, y: 20, w: 299, h: 44 }, digits: '2059' },
      { box: { x: 24, y: 86, w: 299, h: 45 }, digits: '2593' },
    ]) {
      // Two dotted ticks are all the separators there are: too few cells without the count.
      const bare = await readDigitComb(cropField(f1040, c.box, 4), reader);
      expect(bare === null || bare.cells.length < 9).toBe(true);
      const read = await readDigitComb(cropField(f1040, c.box, 4), reader, { cells: 9 });
      expect(read!.cells).toHaveLength(9);
      // The ticks run down the middle of the third and fifth cells: painted out, they are no "1" in an empty cell.
      expect(read!.cells.slice(4).map((x) => x.label)).toEqual(['empty', 'empty', 'empty', 'empty', 'empty']);
      expect(read!.reading.text).toBe(c.digits);
    }
  });

  it('reads a date of birth written on a bare baseline once the schema gives each comb its cell count (VA Form 21-0966)', async () => {
    // Month, day and year combs of item 4, drawn as one baseline with no cell marks; `schema from-pdf` drafts them as
    // number fields with `cells` 2, 2 and 4, the widgets' maximum lengths. MNIST test-split digits (their labels are
    // the truth), source note in test/fixtures/real-forms/README.md.
    const dob = await grayFromImage(path.resolve('test/fixtures/real-forms/va-21-0966-dob-handwritten.png'));
    const combs = [
      { box: { x: 21, y: 17, w: 85, h: 43 }, cells: 2, digits: '11' },
      { box: { x: 154, y: 17, w: 85, h: 44 }, cells: 2, digits: '23' },
      { box: { x: 286, y: 18, w: 185, h: 43 }, cells: 4, digits: '1956' },
    ];
    for (const c of combs) {
      const bare = await readDigitComb(cropField(dob, c.box, 4), reader);
      expect(bare === null || bare.cells.length < c.cells).toBe(true);
      const read = await readDigitComb(cropField(dob, c.box, 4), reader, { cells: c.cells });
      expect(read!.cells).toHaveLength(c.cells);
      expect(read!.reading.text).toBe(c.digits);
    }
  });

  it('cuts n equal cells across the box', () => {
    const cells = evenCells({ x: 10, y: 5, w: 110, h: 40 }, 11);
    expect(cells).toHaveLength(11);
    expect(cells[0]).toEqual({ x: 10, y: 5, w: 10, h: 40 });
    expect(cells[10].x + cells[10].w).toBeCloseTo(120, 9);
  });
});
