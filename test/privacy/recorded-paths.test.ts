/**
 * Scan file names often carry a person's name, and absolute paths carry the account and folders above the work.
 * Records, the index and the audit log hold the path as given relative to the working folder; a document id keeps
 * the letters of its file name in any script.
 */
import { copyFile, mkdir, mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { documentIds } from '../../src/batch/discover.js';
import { REPO, runCli } from '../cli/run-cli.js';

let work: string;
beforeAll(async () => {
  work = await mkdtemp(path.join(os.tmpdir(), 'fg-paths-'));
  await mkdir(path.join(work, 'scans'));
  // An invented name with letters outside ASCII, as a clinic might name a scan after its client.
  await copyFile(path.join(REPO, 'samples/garden-plot-typed.png'), path.join(work, 'scans', 'Müller, Zoë.png'));
});
afterAll(async () => {
  await rm(work, { recursive: true, force: true });
});

/** Every file under dir, as text. */
async function allText(dir: string): Promise<string> {
  const names = (await readdir(dir, { recursive: true, withFileTypes: true })).filter((e) => e.isFile() && /\.(json|jsonl|csv)$/.test(e.name));
  return (await Promise.all(names.map((e) => readFile(path.join(e.parentPath, e.name), 'utf8')))).join('\n');
}

describe('paths and ids in what formglean writes', () => {
  it('keeps letters of any script in document ids (NFC)', () => {
    const ids = documentIds(['/in/Müller, Zoë.png', '/in/Mu\u0308ller, Zoe\u0308 2.png', '/in/Ωmega.tif']);
    expect([...ids.values()]).toEqual(['Müller_Zoë', 'Müller_Zoë_2', 'Ωmega']);
  });

  it('records the scan path relative to the working folder in records, index and audit log, never the absolute path', async () => {
    const schema = path.join(REPO, 'schemas/garden-plot.yaml');
    const run = await runCli(['extract', 'scans', '--schema', schema, '--out', 'out'], { cwd: work });
    expect(run.code).toBe(0);
    const record = JSON.parse(await readFile(path.join(work, 'out', 'Müller_Zoë.json'), 'utf8'));
    expect(record.document.path).toBe(path.join('scans', 'Müller, Zoë.png'));
    const index = (await readFile(path.join(work, 'out', 'results.jsonl'), 'utf8')).trim().split('\n').map((l) => JSON.parse(l));
    expect(index.map((l) => l.path)).toEqual([path.join('scans', 'Müller, Zoë.png')]);

    // A reviewer confirms one row; the audit log names the queue as given.
    const queue = path.join(work, 'out', 'review', 'queue.csv');
    const rows = parse(await readFile(queue), { bom: true, columns: true }) as Record<string, string>[];
    expect(rows.length).toBeGreaterThan(0);
    const pending = rows.find((r) => r.status === 'review' || r.status === 'missing') ?? rows[0];
    pending.correction = '(empty)';
    await import('node:fs/promises').then((fs) => fs.writeFile(queue, stringify(rows, { header: true })));
    const apply = await runCli(['review', 'apply', path.join('out', 'review', 'queue.csv'), '--results', 'out', '--reviewer', 'R. Quill'], { cwd: work });
    expect(apply.stderr).toBe('');
    const audit = (await readFile(path.join(work, 'out', 'review', 'audit.jsonl'), 'utf8')).trim().split('\n').map((l) => JSON.parse(l));
    expect(audit.map((e) => e.queue)).toEqual([path.join('out', 'review', 'queue.csv')]);

    expect(await allText(path.join(work, 'out'))).not.toContain(work);
  });
});
