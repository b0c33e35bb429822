import { existsSync, mkdtempSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { Command } from 'commander';
import sharp from 'sharp';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { addDraftSubcommand } from '../../src/cli/schema-draft.js';
import { iou } from '../../src/image/geometry.js';
import { loadSchema, referenceImagePath } from '../../src/schema/load.js';
import { W4_BLANK } from '../real-form/w4-layout.js';

async function run(args: string[]): Promise<void> {
  const program = new Command().exitOverride();
  addDraftSubcommand(program.command('schema'));
  await program.parseAsync(['node', 'formglean', 'schema', 'draft', ...args]);
}

describe('formglean schema draft (real onnxruntime with a fixture model)', () => {
  // square-scores.onnx (test/fixtures/models) reports the bounding box of the page's ink as a checkbox (0.9) and,
  // shifted 2 model pixels, as a text entry (0.5): a detector with a known answer.
  it('writes a valid schema naming the blank as its reference, and an overlay', async () => {
    const dir = mkdtempSync(path.join(os.tmpdir(), 'draft-'));
    const blank = path.join(dir, 'blank.png');
    const square = Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" width="960" height="640"><rect x="0" y="0" width="960" height="640" fill="#fff"/><rect x="305" y="205" width="110" height="110" fill="none" stroke="#000" stroke-width="10"/></svg>');
    await sharp(square).grayscale().png().toFile(blank);
    const out = path.join(dir, 'drafts', 'form.yaml');
    await run([blank, '--out', out, '--model', 'test/fixtures/models/square-scores.onnx', '--name', 'square-form']);
    const loaded = await loadSchema(out);
    expect(loaded.schema.form.name).toBe('square-form');
    expect(referenceImagePath(loaded, 0)).toBe(blank);
    expect(loaded.schema.pages[0]).toMatchObject({ width: 960, height: 640 });
    const box = loaded.schema.fields.find((f) => f.class === 'checkbox');
    expect(box?.type).toBe('checkbox');
    const [x, y, w, h] = box!.region!;
    // The model sees the page at a tenth of its size: a model pixel is 10 page pixels.
    expect(iou({ x, y, w, h }, { x: 300, y: 200, w: 120, h: 120 })).toBeGreaterThan(0.7);
    expect(existsSync(path.join(dir, 'drafts', 'form.overlay.png'))).toBe(true);
  });

  it('fails in one line naming a missing blank form', async () => {
    const dir = mkdtempSync(path.join(os.tmpdir(), 'draft-'));
    await expect(run([path.join(dir, 'nope.png'), '--out', path.join(dir, 'x.yaml'), '--model', 'test/fixtures/models/square-scores.onnx'])).rejects.toThrow(/nope\.png: file not found/);
  });
});

/** What the command prints on stdout while `fn` runs. */
async function printed(fn: () => Promise<void>): Promise<string> {
  const lines: string[] = [];
  const spy = vi.spyOn(process.stdout, 'write').mockImplementation((chunk: string | Uint8Array) => {
    lines.push(String(chunk));
    return true;
  });
  try {
    await fn();
  } finally {
    spy.mockRestore();
  }
  return lines.join('');
}

describe('formglean schema draft on real forms', () => {
  afterEach(() => vi.restoreAllMocks());

  it('drafts a fillable PDF from its form fields, as schema from-pdf does', async () => {
    const dir = mkdtempSync(path.join(os.tmpdir(), 'draft-pdf-'));
    const out = path.join(dir, 'f8888.yaml');
    const text = await printed(() => run(['test/fixtures/real-forms/pdfs/irs-f8888-2025.pdf', '--out', out]));
    expect(text).toMatch(/a fillable PDF; drafted from the 19 form fields of page 1/);
    const loaded = await loadSchema(out);
    // 13 text widgets (one read-only skipped) and 6 checkboxes on page 1, per the reference counts (fixture forms.json).
    expect(loaded.schema.fields).toHaveLength(19);
    expect(referenceImagePath(loaded, 0)).toBe(path.join(dir, 'f8888.blank.png'));
    expect(existsSync(path.join(dir, 'f8888.overlay.png'))).toBe(false);
  });

  it('drafts a scanned blank from its pixels and lists the fields it is unsure of (real W-4 blank, shipped model)', async () => {
    const dir = mkdtempSync(path.join(os.tmpdir(), 'draft-w4-'));
    const out = path.join(dir, 'w4.yaml');
    const text = await printed(() => run([W4_BLANK, '--out', out]));
    const loaded = await loadSchema(out);
    expect(loaded.schema.fields.length).toBeGreaterThan(10);
    const m = /(\d+) field\(s\) to check:\n/.exec(text);
    expect(m).not.toBeNull();
    // One line per listed field: its name, type and place, then the reasons in words.
    const listed = text.split('\n').filter((l) => /^ {2}\S+ \(\w+, page 1 at \d+,\d+ \d+x\d+\): /.test(l));
    expect(listed.length).toBe(Math.min(40, Number(m![1])));
    expect(text).toMatch(/no printed label found: name it|weakly detected|check the name/);
  });
  it('--no-normalize drafts a rendered blank as it is (the DD 293, whose dense capitals can fool the orientation check)', async () => {
    const dir = mkdtempSync(path.join(os.tmpdir(), 'draft-dd293-'));
    const out = path.join(dir, 'dd293.yaml');
    const blank = path.resolve('test/fixtures/real-forms/dod-dd293-2023-page1-blank.png');
    await printed(() => run([blank, '--no-normalize', '--out', out]));
    const loaded = await loadSchema(out);
    // Taken as it is, the page is its own reference image (nothing turned, nothing written beside the draft).
    expect(referenceImagePath(loaded, 0)).toBe(blank);
    // Printed on the form beside its first row of boxes (the outside source): "Regular", "Reserve", "Guard".
    const names = loaded.schema.fields.map((f) => f.name);
    for (const n of ['regular', 'reserve', 'guard']) expect(names).toContain(n);
  });
});
