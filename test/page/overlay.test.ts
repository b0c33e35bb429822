import { createHash } from 'node:crypto';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import sharp from 'sharp';
import { Command } from 'commander';
import { describe, expect, it } from 'vitest';
import { registerOverlayCommand, resultOverlayItems, STATUS_COLOURS } from '../../src/cli/overlay.js';
import { decodeDocument } from '../../src/input/decode.js';
import { captionPlates, overlaySvg } from '../../src/page/overlay.js';
import { countStatuses, RESULT_FORMAT } from '../../src/result/document.js';
import type { DocumentResult, FieldResult, FieldStatus } from '../../src/result/document.js';

const SAMPLE = path.resolve('samples/clinic-intake-typed.png');
const TRUTH = JSON.parse(readFileSync('samples/truth/clinic-intake-typed.json', 'utf8'));
const STATUSES: FieldStatus[] = ['accepted', 'review', 'invalid', 'missing', 'corrected', 'confirmed'];

/** A result for the demo scan built from its truth file: every field at its true box, statuses in rotation. */
function resultFor(doc: string): DocumentResult {
  const fields: FieldResult[] = TRUTH.fields.map((f: { name: string; type: string; value: FieldResult['value']; box: number[] }, i: number) => ({
    name: f.name,
    type: f.type,
    page: 0,
    value: f.value,
    raw: null,
    status: STATUSES[i % STATUSES.length],
    confidence: 0.9,
    reasons: [],
    box: { page: 0, x: f.box[0], y: f.box[1], w: f.box[2], h: f.box[3] },
    source: i % 2 ? 'detection' : 'region',
    scores: {},
  }));
  const bytes = readFileSync(doc);
  return {
    format: RESULT_FORMAT,
    document: { id: 'clinic-intake-typed', path: doc, sha256: createHash('sha256').update(bytes).digest('hex') },
    schema: { name: 'clinic-intake', version: '1', path: 'schemas/clinic-intake.yaml', sha256: '0'.repeat(64) },
    model: { id: 'none', path: 'none', sha256: '0'.repeat(64) },
    createdAt: '2025-01-01T00:00:00Z',
    pages: [{ index: 0, width: TRUTH.width, height: TRUTH.height, rotation: 0, skew: 0, alignment: null, detections: 0 }],
    fields,
    counts: countStatuses(fields),
    seconds: 1,
  };
}

async function runOverlay(args: string[]): Promise<void> {
  const program = new Command().exitOverride();
  registerOverlayCommand(program);
  await program.parseAsync(['node', 'formglean', 'overlay', ...args]);
}

function hex(c: string): [number, number, number] {
  return [1, 3, 5].map((i) => parseInt(c.slice(i, i + 2), 16)) as [number, number, number];
}

describe('formglean overlay', () => {
  it('draws each field frame in its status colour on the page', async () => {
    const dir = mkdtempSync(path.join(os.tmpdir(), 'overlay-'));
    const resultFile = path.join(dir, 'r.json');
    writeFileSync(resultFile, JSON.stringify(resultFor(SAMPLE)));
    const out = path.join(dir, 'o.png');
    await runOverlay([resultFile, '--out', out]);
    const { data, info } = await sharp(out).removeAlpha().raw().toBuffer({ resolveWithObject: true });
    expect([info.width, info.height]).toEqual([TRUTH.width, TRUTH.height]);
    // Sample the middle of each frame's left edge (solid stretch for both solid and dashed frames is not
    // guaranteed, so look along a few pixels of the edge for the colour).
    let hits = 0;
    TRUTH.fields.forEach((f: { box: number[] }, i: number) => {
      const want = hex(STATUS_COLOURS[STATUSES[i % STATUSES.length]]);
      const x = Math.round(f.box[0]);
      for (let dy = 0; dy < 24; dy++) {
        const y = Math.round(f.box[1] + f.box[3] / 2) + dy;
        const o = (y * info.width + x) * info.channels;
        if (Math.abs(data[o] - want[0]) + Math.abs(data[o + 1] - want[1]) + Math.abs(data[o + 2] - want[2]) < 40) {
          hits++;
          break;
        }
      }
    });
    expect(hits).toBe(TRUTH.fields.length);
  });

  it('counts --page from 1, as every other --page does', async () => {
    const dir = mkdtempSync(path.join(os.tmpdir(), 'overlay-'));
    const resultFile = path.join(dir, 'r.json');
    writeFileSync(resultFile, JSON.stringify(resultFor(SAMPLE)));
    const out = path.join(dir, 'o.png');
    await runOverlay([resultFile, '--out', out, '--page', '1']);
    expect(existsSync(out)).toBe(true);
    await expect(runOverlay([resultFile, '--out', out, '--page', '0'])).rejects.toThrow(/--page must be a page number from 1; got "0"/);
    await expect(runOverlay([resultFile, '--out', out, '--page', '2'])).rejects.toThrow(/--page 2 asked, but the record has 1 page\(s\)/);
  });

  it('keeps values off the page unless --show-values', () => {
    const r = resultFor(SAMPLE);
    const name = TRUTH.fields[0].value as string;
    const items = (show: boolean) =>
      r.fields.map((f) => ({ box: { x: f.box!.x, y: f.box!.y, w: f.box!.w, h: f.box!.h }, colour: '#000000', caption: `${f.name}${show ? ` = ${String(f.value)}` : ''}` }));
    expect(overlaySvg(100, 100, items(false))).not.toContain(name);
    expect(overlaySvg(100, 100, items(true))).toContain(name);
  });

  it('fails with one line naming the file when the document changed', async () => {
    const dir = mkdtempSync(path.join(os.tmpdir(), 'overlay-'));
    const copy = path.join(dir, 'scan.png');
    writeFileSync(copy, readFileSync('samples/garden-plot-typed.png'));
    const r = resultFor(SAMPLE);
    r.document.path = copy;
    const resultFile = path.join(dir, 'r.json');
    writeFileSync(resultFile, JSON.stringify(r));
    await expect(runOverlay([resultFile, '--out', path.join(dir, 'o.png')])).rejects.toThrow(/scan\.png: differs from the document/);
  });

  it('rejects a file that is not a result', async () => {
    const dir = mkdtempSync(path.join(os.tmpdir(), 'overlay-'));
    const bad = path.join(dir, 'bad.json');
    writeFileSync(bad, '{"format": 1}');
    await expect(runOverlay([bad, '--out', path.join(dir, 'o.png')])).rejects.toThrow(/bad\.json: not a formglean document result/);
  });

  /** Mean absolute gray difference between the overlay written and a decoded page (same size). */
  async function meanDiff(png: string, page: { data: Uint8Array; width: number; height: number }): Promise<number> {
    const { data, info } = await sharp(png).greyscale().raw().toBuffer({ resolveWithObject: true });
    expect([info.width, info.height]).toEqual([page.width, page.height]);
    let sum = 0;
    for (let i = 0; i < page.data.length; i++) sum += Math.abs(data[i] - page.data[i]);
    return sum / page.data.length;
  }

  /** The record of the second form of a two-form file, built from its truth: boxes scaled to the decoded page. */
  function secondFormRecord(file: string, scale: number): DocumentResult {
    const truth = JSON.parse(readFileSync('samples/truth/clinic-intake-batch.p2.json', 'utf8'));
    const r = resultFor(file);
    r.document.id = 'clinic-intake-batch.p2';
    r.fields = r.fields.slice(0, 0).concat(
      truth.fields.map((f: { name: string; type: string; box: number[] }) => ({
        ...r.fields[0], name: f.name, type: f.type, status: 'review' as const,
        box: { page: 0, x: f.box[0] * scale, y: f.box[1] * scale, w: f.box[2] * scale, h: f.box[3] * scale },
      })),
    );
    r.counts = countStatuses(r.fields);
    r.pages = [{ index: 0, filePage: truth.filePage, width: truth.width * scale, height: truth.height * scale, rotation: 0, skew: 0, alignment: null, detections: 0 }];
    return r;
  }

  for (const [file, scale] of [
    ['samples/clinic-intake-batch.tif', 1],
    // Rendered at 200 DPI from 150-DPI page images (test/fixtures/pdf/README.md).
    ['test/fixtures/pdf/clinic-intake-batch.pdf', 200 / 150],
  ] as const) {
    it(`draws the second form of ${path.basename(file)} on the file's second page, not its first`, async () => {
      const dir = mkdtempSync(path.join(os.tmpdir(), 'overlay-'));
      const resultFile = path.join(dir, 'clinic-intake-batch.p2.json');
      writeFileSync(resultFile, JSON.stringify(secondFormRecord(path.resolve(file), scale)));
      const out = path.join(dir, 'o.png');
      await runOverlay([resultFile, '--out', out]);
      const doc = await decodeDocument(path.resolve(file));
      expect(doc.pages).toHaveLength(2);
      const toSecond = await meanDiff(out, doc.pages[1]);
      const toFirst = await meanDiff(out, doc.pages[0]);
      // Frames and captions change a small share of pixels; the other form's page differs everywhere it was filled
      // in and scanned with other skew and light.
      expect(toSecond).toBeLessThan(toFirst / 2);
    });
  }

  it('places captions where they cover no field box', () => {
    const r = resultFor(SAMPLE);
    const items = resultOverlayItems(r, 0, false);
    const k = TRUTH.width / 1700;
    const plates = captionPlates(TRUTH.width, TRUTH.height, items, Math.round(22 * k), Math.round(4 * k));
    const hits = plates.filter((p) => p !== null && items.some((it) => p.x < it.box.x + it.box.w && it.box.x < p.x + p.w && p.y < it.box.y + it.box.h && it.box.y < p.y + p.h));
    expect(hits).toEqual([]);
  });
});
