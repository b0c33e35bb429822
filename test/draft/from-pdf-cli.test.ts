import { existsSync, mkdtempSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { Command } from 'commander';
import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { addFromPdfSubcommand } from '../../src/cli/schema-from-pdf.js';
import { loadSchema, referenceImagePath } from '../../src/schema/load.js';

async function run(args: string[]): Promise<void> {
  const program = new Command().exitOverride();
  addFromPdfSubcommand(program.command('schema'));
  await program.parseAsync(['node', 'formglean', 'schema', 'from-pdf', ...args]);
}

describe('formglean schema from-pdf', () => {
  it('writes the schema and its 200 DPI blank beside it', async () => {
    const dir = mkdtempSync(path.join(os.tmpdir(), 'from-pdf-'));
    const out = path.join(dir, 'drafts', 'f8888.yaml');
    await run(['test/fixtures/real-forms/pdfs/irs-f8888-2025.pdf', '--out', out, '--name', 'refund-allocation']);
    const loaded = await loadSchema(out);
    expect(loaded.schema.form.name).toBe('refund-allocation');
    const blank = referenceImagePath(loaded, 0)!;
    expect(blank).toBe(path.join(dir, 'drafts', 'f8888.blank.png'));
    // US letter, 8.5 x 11 in, at 200 DPI.
    expect(await sharp(blank).metadata()).toMatchObject({ width: 1700, height: 2200 });
    // 13 text widgets (one read-only skipped) and 6 checkboxes on page 1, per the reference counts (fixture forms.json).
    expect(loaded.schema.fields).toHaveLength(19);
  });

  it('fails in one line naming a missing file, and a page past the end', async () => {
    const dir = mkdtempSync(path.join(os.tmpdir(), 'from-pdf-'));
    await expect(run([path.join(dir, 'none.pdf'), '--out', path.join(dir, 's.yaml')])).rejects.toThrow(/none\.pdf: cannot read \(ENOENT\)$/);
    await expect(run(['test/fixtures/real-forms/pdfs/dol-wh384-2009.pdf', '--page', '4', '--out', path.join(dir, 's.yaml')])).rejects.toThrow(
      'page 4 does not exist (the PDF has 3)',
    );
    expect(existsSync(path.join(dir, 's.yaml'))).toBe(false);
  });
});
