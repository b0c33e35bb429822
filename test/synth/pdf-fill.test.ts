import { mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TruthDocument } from '../../src/result/truth.js';
import { getFieldType } from '../../src/fields/registry.js';
import { grayFromImage } from '../../src/image/raster.js';
import { checkSchemaAgainstClasses } from '../../src/schema/consistency.js';
import { loadSchema } from '../../src/schema/load.js';
import type { CocoDataset } from '../../src/synth/coco.js';
import { DETECTOR_CLASSES } from '../../src/synth/layout-model.js';
import { fillPdfSamples } from '../../src/synth/pdf-fill/fill-pdf.js';
import type { PageTruth } from '../../src/synth/truth.js';

const FORM = path.resolve('test/fixtures/real-forms/pdfs/uscourts-b121-2015.pdf');
const RADIO_FORM = path.resolve('test/fixtures/real-forms/pdfs/dol-wh384-2009.pdf');

let dir: string;
let truths: PageTruth[];

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'formglean-pdf-fill-'));
  // No scan degradation: page pixels are the reference page's, so truth boxes must equal the widget regions.
  await fillPdfSamples({ form: FORM, page: 0, count: 4, seed: 77, out: path.join(dir, 'b121'), degrade: 'none', upsideDownRate: 0, fill: 'mixed' });
  const truthDir = path.join(dir, 'b121', 'truth');
  truths = await Promise.all((await readdir(truthDir)).sort().map(async (f) => JSON.parse(await readFile(path.join(truthDir, f), 'utf8')) as PageTruth));
}, 120_000);

afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('samples fill on a real fillable form', () => {
  it('writes a schema that passes its own checks and uses only the detector classes', async () => {
    const loaded = await loadSchema(path.join(dir, 'b121', 'uscourts-b121-2015.yaml'));
    expect(checkSchemaAgainstClasses(loaded.schema, DETECTOR_CLASSES)).toEqual([]);
    expect(truths).toHaveLength(4);
    expect(truths.map((t) => t.fill)).toEqual(['typed', 'handwriting', 'typed', 'handwriting']);
    for (const t of truths) expect(TruthDocument.safeParse(t).success).toBe(true);
  });

  it('writes values each field type accepts as they are written, normalized as the truth says', async () => {
    const loaded = await loadSchema(path.join(dir, 'b121', 'uscourts-b121-2015.yaml'));
    const spec = new Map(loaded.schema.fields.map((f) => [f.name, f]));
    let checked = 0;
    for (const t of truths) {
      for (const f of t.fields) {
        if (f.text === null) continue;
        const s = spec.get(f.name)!;
        const type = getFieldType(s.type);
        // The field type's own check of a typed value (the one `review apply` uses for corrections).
        const r = type.parseCorrection(f.text, type.options.parse(s.options ?? {}), { today: new Date(Date.UTC(2026, 0, 1)) });
        expect(r.outcome, `${f.name} ${s.type}`).toBe('valid');
        expect(r.value, f.name).toEqual(f.value);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(20);
  });

  it('puts every truth box on its widget rectangle (the schema region), and labels each widget in COCO', async () => {
    const loaded = await loadSchema(path.join(dir, 'b121', 'uscourts-b121-2015.yaml'));
    const region = new Map(loaded.schema.fields.map((f) => [f.name, f.region]));
    for (const t of truths) {
      expect(t.fields.map((f) => f.name).sort()).toEqual([...region.keys()].sort());
      for (const f of t.fields) expect(f.box, f.name).toEqual(region.get(f.name));
    }
    const coco = JSON.parse(await readFile(path.join(dir, 'b121', 'coco.json'), 'utf8')) as CocoDataset;
    expect(coco.images).toHaveLength(4);
    // One annotation per widget: 24 fields on B121, none of them a group of several boxes.
    expect(coco.annotations).toHaveLength(4 * loaded.schema.fields.length);
  });

  it('leaves ink inside the boxes of written fields and none in blank ones (real pixels)', async () => {
    const t = truths[1];
    const page = await grayFromImage(path.join(dir, 'b121', t.file));
    const blank = await grayFromImage(path.join(dir, 'b121', 'uscourts-b121-2015.blank.png'));
    const inkIn = (box: number[]) => {
      const [x, y, w, h] = box;
      let n = 0;
      for (let yy = y; yy < y + h; yy++) for (let xx = x; xx < x + w; xx++) if (page.data[yy * page.width + xx] < blank.data[yy * blank.width + xx] - 60) n++;
      return n;
    };
    const written = t.fields.filter((f) => f.text !== null && f.class !== 'comb_field');
    expect(written.length).toBeGreaterThan(3);
    for (const f of written) expect(inkIn(f.box), f.name).toBeGreaterThan(20);
    for (const f of t.fields.filter((x) => x.value === null)) expect(inkIn(f.box), f.name).toBeLessThan(20);
  });

  it('draws comb characters through the cell hook when one is given', async () => {
    const out = path.join(dir, 'hook');
    const cells: number[][] = [];
    // A drawer that paints each cell solid: the hook's output must land in the comb cells of the page.
    await fillPdfSamples({
      form: FORM, page: 0, count: 1, seed: 3, out, degrade: 'none', upsideDownRate: 0, fill: 'handwriting',
      drawCombCell: (cell) => {
        cells.push([cell.x, cell.y, cell.w, cell.h]);
        return `<rect x="${cell.x + 2}" y="${cell.y + 2}" width="${cell.w - 4}" height="${cell.h - 4}" fill="black"/>`;
      },
    });
    expect(cells.length).toBeGreaterThan(0);
    const t = JSON.parse(await readFile(path.join(out, 'truth', (await readdir(path.join(out, 'truth')))[0]), 'utf8')) as PageTruth;
    const page = await grayFromImage(path.join(out, t.file));
    for (const [x, y, w, h] of cells) expect(page.data[Math.round(y + h / 2) * page.width + Math.round(x + w / 2)]).toBeLessThan(60);
  }, 60_000);

  it('fills a radio group through the form itself: one option ticked, as the truth says', async () => {
    const out = path.join(dir, 'wh384');
    await fillPdfSamples({ form: RADIO_FORM, page: 0, count: 2, seed: 5, out, degrade: 'light', upsideDownRate: 0, fill: 'typed' });
    for (const f of await readdir(path.join(out, 'truth'))) {
      const t = JSON.parse(await readFile(path.join(out, 'truth', f), 'utf8')) as PageTruth;
      const choice = t.fields.find((x) => x.type === 'choice')!;
      expect(choice.parts).toHaveLength(3);
      const ticked = choice.parts!.filter((p) => p.checked).map((p) => p.key);
      expect(ticked).toEqual(choice.value === null ? [] : [choice.value]);
      // Light degradation moves the page: every box still lies inside it.
      for (const p of choice.parts!) expect(p.box[0] + p.box[2]).toBeLessThanOrEqual(t.width);
    }
  }, 60_000);
});
