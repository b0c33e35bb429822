import { copyFile, mkdtemp } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from '../cli/run-cli.js';
import { W4_BLANK, W4_SCHEMA } from '../real-form/w4-layout.js';

describe('schema check and extract with the blank image the schema names', () => {
  it('fails up front, in one line with exit 2, when the blank image is missing; passes once it is there', async () => {
    // The hand-labelled schema of the real W-4 blank, copied alone: its pages[0].image no longer exists beside it.
    const dir = await mkdtemp(path.join(os.tmpdir(), 'fg-blank-'));
    const schema = path.join(dir, 'w4-page1.yaml');
    await copyFile(W4_SCHEMA, schema);

    let run = await runCli(['schema', 'check', schema]);
    expect(run.code).toBe(2);
    expect(run.stderr.trim().split('\n')).toHaveLength(1);
    expect(run.stderr).toContain(schema);
    expect(run.stderr).toMatch(/pages\[0\]\.image: blank image "irs-w4-2025-page1-blank\.png" not found/);

    // extract refuses before reading any page (no results folder is written).
    run = await runCli(['extract', W4_BLANK, '--schema', schema, '--out', path.join(dir, 'out')]);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/pages\[0\]\.image: blank image .* not found/);

    await copyFile(W4_BLANK, path.join(dir, 'irs-w4-2025-page1-blank.png'));
    run = await runCli(['schema', 'check', schema]);
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(/ok/);
  }, 120_000);
});
