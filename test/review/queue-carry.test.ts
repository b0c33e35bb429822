import { readdir, readFile, rm, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import { afterAll, describe, expect, it } from 'vitest';
import { writeReviewQueue } from '../../src/review/queue-write.js';
import { makeResultsFolder } from './results-folder.js';

const dirs: string[] = [];
afterAll(async () => {
  for (const d of dirs) await rm(d, { recursive: true, force: true });
});

describe('rewriting a queue that already holds answers', () => {
  it('keeps answers typed for unchanged documents, and keeps the old file aside when an answer cannot be carried', async () => {
    const { dir, docs } = await makeResultsFolder(2, 'fg-review-carry-');
    dirs.push(dir);
    await writeReviewQueue(dir, docs);
    const queue = path.join(dir, 'review', 'queue.csv');
    const rows = parse(await readFile(queue), { bom: true, columns: true }) as Record<string, string>[];
    rows[0].correction = 'Robin Quill';
    rows[rows.length - 1].note = 'check with the owner';
    await writeFile(queue, stringify(rows, { header: true }));

    // Same results written again (an extract run that resumed): answers stay, nothing set aside.
    await writeReviewQueue(dir, docs);
    let again = parse(await readFile(queue), { bom: true, columns: true }) as Record<string, string>[];
    expect(again[0].correction).toBe('Robin Quill');
    expect(again[again.length - 1].note).toBe('check with the owner');
    expect((await readdir(path.join(dir, 'review'))).filter((n) => n.startsWith('queue.'))).toEqual(['queue.csv']);

    // intake-0002 extracted again: its answer is not attached to the new reading; the old queue is kept aside.
    const reextracted = docs.map((d) => (d.document.id === 'intake-0002' ? { ...d, createdAt: '2026-03-09T10:00:00.000Z' } : d));
    await writeReviewQueue(dir, reextracted);
    again = parse(await readFile(queue), { bom: true, columns: true }) as Record<string, string>[];
    expect(again[0].correction).toBe('Robin Quill');
    expect(again[again.length - 1].note).toBe('');
    const aside = (await readdir(path.join(dir, 'review'))).filter((n) => /^queue\..+\.csv$/.test(n) && n !== 'queue.csv');
    expect(aside).toHaveLength(1);
    const kept = parse(await readFile(path.join(dir, 'review', aside[0])), { bom: true, columns: true }) as Record<string, string>[];
    expect(kept[kept.length - 1].note).toBe('check with the owner');
  });
});
