import { spawn } from 'node:child_process';
import { appendFile, mkdir, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { carryReviewedFields } from '../../src/batch/carry-review.js';
import { IdClaims } from '../../src/batch/id-claims.js';
import { readIndex } from '../../src/results/index-read.js';
import { appendJournal, writeIndex } from '../../src/results/index-write.js';
import { JOURNAL_FILE, RESULTS_FILE, SUMMARY_FILE } from '../../src/results/layout.js';
import { failedLine, okLine } from '../../src/results/results-line.js';
import { removeOrphanTemps } from '../../src/results/temp-files.js';
import { documentResult, field } from '../review/fixture.js';
import { makeResultsFolder } from '../review/results-folder.js';

function collect(): { warn: (m: string) => void; messages: string[] } {
  const messages: string[] = [];
  return { warn: (m) => messages.push(m), messages };
}

describe('the index of a results folder', () => {
  it('drops a damaged last line with a warning and lists every record on disk again', async () => {
    const { dir, docs } = await makeResultsFolder(4, 'fg-index-damaged-');
    const file = path.join(dir, RESULTS_FILE);
    const text = await readFile(file, 'utf8');
    // Cut the last line in half, as a full disk or an editor might.
    await writeFile(file, text.slice(0, text.length - 40));
    const { warn, messages } = collect();
    const index = await readIndex(dir, warn);
    expect(index.lines.map((l) => l.document)).toEqual(docs.map((d) => d.document.id));
    expect(index.needsWrite).toBe(true);
    expect(messages).toHaveLength(1);
    expect(messages[0]).toMatch(/results\.jsonl: 1 damaged line\(s\) dropped; 1 document record\(s\) found in the folder listed again/);
    // The warning names files and counts only, never a field value.
    for (const d of docs) for (const f of d.fields) if (typeof f.value === 'string') expect(messages[0]).not.toContain(f.value);
  });

  it('rebuilds a missing results.jsonl from the document records, with a warning', async () => {
    const { dir, docs } = await makeResultsFolder(3, 'fg-index-missing-');
    await rm(path.join(dir, RESULTS_FILE));
    const { warn, messages } = collect();
    const index = await readIndex(dir, warn);
    expect(index.missing).toBe(true);
    expect(index.lines.map((l) => l.document)).toEqual(docs.map((d) => d.document.id));
    expect(messages[0]).toMatch(/missing; rebuilt the index from 3 document record\(s\)/);
  });

  it('replays the journal a killed run left, ignoring its torn last line, and folds it in on the next write', async () => {
    const { dir, docs } = await makeResultsFolder(2, 'fg-index-journal-');
    const extra = documentResult('intake-new', docs[0].fields);
    await appendJournal(dir, { path: extra.document.path, lines: [okLine(extra)] });
    await appendJournal(dir, { path: '/scans/broken.png', lines: [failedLine('broken', '/scans/broken.png', '/scans/broken.png: empty file')] });
    await appendFile(path.join(dir, JOURNAL_FILE), '{"path":"/scans/torn.png","lines":[{"docu');
    const index = await readIndex(dir, () => undefined);
    expect(index.lines.map((l) => l.document).sort()).toEqual(['broken', 'intake-0001', 'intake-0002', 'intake-new']);
    expect(index.needsWrite).toBe(true);
    await writeIndex(dir, index.lines);
    expect(await readdir(dir)).not.toContain(JOURNAL_FILE);
    const again = await readIndex(dir, () => undefined);
    expect(again.needsWrite).toBe(false);
    expect(again.lines).toEqual(index.lines);
  });

  it('sees a summary left behind by its index (a run cut off between the two writes)', async () => {
    const { dir, docs } = await makeResultsFolder(2, 'fg-index-summary-');
    const summary = await readFile(path.join(dir, SUMMARY_FILE), 'utf8');
    await writeIndex(dir, docs.slice(0, 1).map(okLine));
    await writeFile(path.join(dir, SUMMARY_FILE), summary); // the older summary, as a kill would leave it
    expect((await readIndex(dir, () => undefined)).needsWrite).toBe(true);
  });
});

describe('orphan temp files', () => {
  it('removes temp files of writers that have ended and leaves those of a running writer', async () => {
    const { dir } = await makeResultsFolder(1, 'fg-index-temps-');
    const sleeper = spawn(process.execPath, ['-e', 'setTimeout(() => {}, 20000)']);
    const ended = spawn(process.execPath, ['-e', '0']);
    await new Promise((r) => ended.on('close', r));
    const dead = path.join(dir, 'review', 'crops', `.abc.png.${ended.pid}.0123abcd.tmp`);
    const live = path.join(dir, `.results.jsonl.${sleeper.pid}.89abcdef.tmp`);
    await mkdir(path.dirname(dead), { recursive: true });
    await writeFile(dead, 'crop of a form');
    await writeFile(live, 'being written');
    try {
      expect(await removeOrphanTemps(dir)).toBe(1);
      expect(await readdir(path.dirname(dead))).not.toContain(path.basename(dead));
      expect(await readdir(dir)).toContain(path.basename(live));
    } finally {
      sleeper.kill();
    }
  });
});

describe('document ids', () => {
  it('gives a colliding id a suffix and keeps an input its own id', () => {
    const claims = new IdClaims([{ document: 'scan', path: '/a/scan.png', ok: true }]);
    expect(claims.claim('stack.p2', '/b/stack.p2.png')).toBe('stack.p2');
    expect(claims.claim('stack.p1', '/b/stack.tif')).toBe('stack.p1');
    expect(claims.claim('stack.p2', '/b/stack.tif')).toBe('stack.p2-2');
    expect(claims.claim('SCAN', '/b/scan.png')).toBe('SCAN-2'); // case-insensitive file systems
    expect(claims.claim('scan', '/a/scan.png')).toBe('scan');
  });
});

describe('carrying review work over', () => {
  it('keeps corrected and confirmed fields of the earlier record and recounts', () => {
    const earlier = documentResult('d', [
      field('owner_name', 'text', 'Robin Quill', 'corrected', { review: { previousValue: 'Robin Qui11', previousStatus: 'review', reviewer: 'R', at: '2026-03-02T10:00:00Z' } }),
      field('email', 'email', 'owner@example.org', 'confirmed'),
      field('phone', 'phone', null, 'missing'),
    ]);
    const read = documentResult('d', [
      field('owner_name', 'text', 'Robin Qui11', 'review'),
      field('email', 'email', 'owner@example.org', 'review'),
      field('phone', 'phone', '+12075550142', 'accepted'),
    ]);
    const merged = carryReviewedFields(read, earlier);
    expect(merged.fields.map((f) => [f.value, f.status])).toEqual([
      ['Robin Quill', 'corrected'],
      ['owner@example.org', 'confirmed'],
      ['+12075550142', 'accepted'],
    ]);
    expect(merged.counts).toMatchObject({ corrected: 1, confirmed: 1, accepted: 1, review: 0 });
  });
});
