import { mkdir, mkdtemp, readdir, readFile, rm, utimes, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { collectResults } from '../../src/queue/collect.js';
import { outcomeFileName, writeInputOutcome } from '../../src/results/input-outcome.js';
import { writeIndex } from '../../src/results/index-write.js';
import { failedLine, skippedLine } from '../../src/results/results-line.js';

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'fg-collect-'));
});
afterAll(async () => {
  if (dir) await rm(dir, { recursive: true, force: true });
});

describe('queue collect', () => {
  it('folds each input outcome into the index (newest of an input wins, other inputs kept), then removes only stale temp files', async () => {
    const out = path.join(dir, 'out');
    await mkdir(out);
    // An earlier run listed an input this batch does not touch: it stays listed.
    await writeIndex(out, [failedLine('kept', 'scans/kept.png', 'page 1 is blank')]);
    // A collect cut off earlier left one outcome taken; the worker then wrote that input again.
    await writeInputOutcome(out, { path: 'scans/a.png', lines: [failedLine('a', 'scans/a.png', 'first try')] });
    const outcomes = path.join(out, 'outcomes');
    const name = outcomeFileName('scans/a.png');
    await writeFile(path.join(outcomes, `${name}.taken`), await readFile(path.join(outcomes, name)));
    await writeInputOutcome(out, { path: 'scans/a.png', lines: [failedLine('a', 'scans/a.png', 'second try')] });
    await writeInputOutcome(out, { path: 'scans/notes.txt', lines: [skippedLine('scans/notes.txt', 'not an image')] });
    // Temp files as src/io/atomic-write.ts names them: one a killed worker left an hour ago, one being written now.
    const stale = path.join(out, '.b.json.4242.0badc0de.tmp');
    const fresh = path.join(out, '.c.json.4243.0badc0df.tmp');
    await writeFile(stale, '{');
    await writeFile(fresh, '{');
    const hourAgo = new Date(Date.now() - 3600_000);
    await utimes(stale, hourAgo, hourAgo);

    const r = await collectResults(out, () => {});
    expect(r.inputs).toBe(3);
    expect(r.orphans).toBe(1);
    const lines = (await readFile(path.join(out, 'results.jsonl'), 'utf8')).trim().split('\n').map((l) => JSON.parse(l));
    expect(lines).toEqual([
      { document: 'a', path: 'scans/a.png', ok: false, error: 'second try' },
      { document: 'kept', path: 'scans/kept.png', ok: false, error: 'page 1 is blank' },
      { document: '', path: 'scans/notes.txt', ok: false, skipped: 'not an image' },
    ]);
    expect(r.folder.documents).toEqual({ total: 2, processed: 0, failed: 2 });
    expect(await readdir(outcomes)).toEqual([]);
    const left = await readdir(out);
    expect(left).not.toContain(path.basename(stale));
    expect(left).toContain(path.basename(fresh));

    // Again with nothing new: the same index.
    const again = await collectResults(out, () => {});
    expect(again.inputs).toBe(0);
    expect((await readFile(path.join(out, 'results.jsonl'), 'utf8')).trim().split('\n').map((l) => JSON.parse(l))).toEqual(lines);
  });
});
