import { mkdir, mkdtemp, symlink, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { discoverInputs } from '../../src/batch/discover.js';

describe('input discovery', () => {
  it('lists every input it does not try, with the reason, and never reads a results folder or its own outputs', async () => {
    const root = await mkdtemp(path.join(os.tmpdir(), 'fg-discover-'));
    const scans = path.join(root, 'scans');
    await mkdir(path.join(scans, 'week2'), { recursive: true });
    await mkdir(path.join(scans, 'out', 'review', 'crops'), { recursive: true });
    await mkdir(path.join(scans, '.cache'), { recursive: true });
    for (const f of ['a.png', 'week2/b.tif', '.hidden.png', 'notes.txt', 'form.overlay.png', 'detector-pr.png', 'score-reliability.png', '.cache/c.png']) {
      await writeFile(path.join(scans, f), 'x');
    }
    // A results folder inside the input folder (extract scans --out scans/out), with its crops.
    await writeFile(path.join(scans, 'out', 'results.jsonl'), '');
    await writeFile(path.join(scans, 'out', 'review', 'crops', 'row.png'), 'x');
    // A link loop back to the top and a second link to a scan already taken.
    await symlink(scans, path.join(scans, 'week2', 'loop'));
    await symlink(path.join(scans, 'a.png'), path.join(scans, 'week2', 'a-again.png'));
    await symlink(path.join(scans, 'gone.png'), path.join(scans, 'broken.png'));

    const found = await discoverInputs([scans]);
    expect(found.files).toEqual([path.join(scans, 'a.png'), path.join(scans, 'week2', 'b.tif')]);
    const reasons = Object.fromEntries(found.skipped.map((s) => [path.relative(scans, s.path), s.reason]));
    expect(reasons).toEqual({
      '.cache': 'hidden folder',
      '.hidden.png': 'hidden file',
      'broken.png': 'broken symbolic link',
      'detector-pr.png': "formglean's own output (a detector precision-recall plot)",
      'form.overlay.png': "formglean's own output (a field overlay)",
      'notes.txt': 'not a png, jpg, jpeg, tif, tiff, webp, pdf file (by its extension)',
      out: 'a formglean results folder (output, not input)',
      'score-reliability.png': "formglean's own output (a reliability diagram)",
      // The first file is named as records name paths: relative to the working folder.
      'week2/a-again.png': `same file as ${path.relative(process.cwd(), path.join(scans, 'a.png'))} (a second link to it)`,
      'week2/loop': 'folder already searched (a link back to it: a loop, or a second link)',
    });
  });

  it("skips this run's results folder before it holds anything", async () => {
    const root = await mkdtemp(path.join(os.tmpdir(), 'fg-discover-out-'));
    await mkdir(path.join(root, 'out'));
    await writeFile(path.join(root, 'a.png'), 'x');
    await writeFile(path.join(root, 'out', 'crop.png'), 'x');
    const found = await discoverInputs([root], { exclude: [path.join(root, 'out')] });
    expect(found.files).toEqual([path.join(root, 'a.png')]);
    expect(found.skipped).toEqual([{ path: path.join(root, 'out'), reason: "this run's results folder (output, not input)" }]);
  });

  it.skipIf(process.getuid?.() === 0)('lists a folder it cannot read (not testable as root, who reads every folder)', async () => {
    const root = await mkdtemp(path.join(os.tmpdir(), 'fg-discover-perm-'));
    await mkdir(path.join(root, 'locked'));
    await writeFile(path.join(root, 'a.png'), 'x');
    const { chmod } = await import('node:fs/promises');
    await chmod(path.join(root, 'locked'), 0);
    const found = await discoverInputs([root]);
    expect(found.skipped).toEqual([{ path: path.join(root, 'locked'), reason: 'cannot read folder (EACCES)' }]);
  });
});
