import { Command } from 'commander';
import { readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import sharp from 'sharp';
import { afterAll, describe, expect, it } from 'vitest';
import { registerScoreCommand } from '../../src/cli/score.js';
import { FormgleanError } from '../../src/errors.js';
import { runScore } from '../../src/eval/score-run.js';
import { formatScore } from '../../src/eval/score-table.js';
import { scoreDocument, summarizeFields } from '../../src/eval/score.js';
import { documentResult, removeTempDirs, resultField, tempDir, truthDoc, truthField, writeSet } from './score-fixtures.js';

afterAll(removeTempDirs);

// A worked example, every figure computed by hand below. Invented data: a clinic-intake form read twice;
// document a-002 failed in extract, so its fields count as absent.
const truth = {
  'a-001': truthDoc('clinic-intake', 'typed', [
    truthField('owner_name', 'text', 'Ada Finch', 'Ada Finch', [100, 100, 200, 30]),
    truthField('visit_date', 'date', '2024-03-07', '03/07/2024', [100, 200, 120, 30]),
    truthField('phone', 'phone', '+12075550142', '(207) 555-0142', [100, 300, 200, 30]),
    truthField('vaccinated', 'checkbox', true, null, [50, 400, 20, 20]),
  ]),
  'a-002': truthDoc('clinic-intake', 'handwriting', [
    truthField('owner_name', 'text', 'Bo Lark', 'Bo Lark', [100, 100, 200, 30]),
    truthField('vaccinated', 'checkbox', false, null, [50, 400, 20, 20]),
  ]),
};
const results = {
  'a-001': documentResult('/scans/a-001.png', 'clinic-intake', [
    // one letter dropped, accepted anyway: an error that slipped through; box exact
    resultField('owner_name', 'text', 'Ada Fich', 'Ada Fich', 'accepted', 0.9, { x: 100, y: 100, w: 200, h: 30 }),
    // right; box shifted 10 px: IoU = (110 x 30) / (2 x 3600 - 3300) = 3300 / 3900 = 0.846 >= 0.5
    resultField('visit_date', 'date', '2024-03-07', '03/07/2024', 'accepted', 0.95, { x: 110, y: 200, w: 120, h: 30 }),
    // two digits swapped, sent to review: an error caught; box elsewhere on the page (IoU 0)
    resultField('phone', 'phone', '+12075550124', '(207) 555-0124', 'review', 0.4, { x: 600, y: 900, w: 200, h: 30 }),
    resultField('vaccinated', 'checkbox', true, null, 'accepted', 0.99, { x: 50, y: 400, w: 20, h: 20 }),
    resultField('notes', 'text', null, '', 'accepted', 1, null), // not in the truth: counted, not scored
  ]),
};

describe('score: worked example with real files', () => {
  it('computes exact match, CER, location recall, straight-through and review figures by hand', async () => {
    const { truthDir, resultsDir } = await writeSet(truth, results, ['a-002']);
    const out = path.join(resultsDir, 'score.json');
    const { report } = await runScore({ results: resultsDir, truth: truthDir, out });
    const m = report.overall;
    expect(report.documents).toEqual({ truth: 2, scored: 1, withoutResult: 1, failed: 1, resultsWithoutTruth: 0 });
    expect(report.fields).toEqual({ scored: 6, extraInResults: 1 });
    // Exact match: visit_date and a-001 vaccinated are right; the rest wrong (a-002 absent) = 2 / 6.
    expect(m.fields).toBe(6);
    expect(m.exactMatch).toBeCloseTo(2 / 6, 12);
    // CER of normalized values (text-valued fields read by OCR), pooled, by hand:
    //   "Ada Fich" vs "Ada Finch" 1 / 9; dates 0 / 10; "+12075550124" vs "+12075550142" 2 / 12 (two
    //   substitutions); a-002 "" vs "Bo Lark" 7 / 7. Total (1 + 0 + 2 + 7) / (9 + 10 + 12 + 7) = 10 / 38.
    expect(m.cer).toBeCloseTo(10 / 38, 12);
    // Raw OCR text against the text as written: 1/9, 0/10, "(207) 555-0124" vs "(207) 555-0142" 2/14, 7/7
    //   = 10 / 40.
    expect(m.rawCer).toBeCloseTo(0.25, 12);
    // Location: owner_name, visit_date (IoU 0.846), vaccinated found; phone not; a-002 nothing = 3 / 6.
    expect([m.located, m.withBox]).toEqual([3, 6]);
    // Accepted: owner_name, visit_date, vaccinated = 3 / 6; one of them wrong (owner_name) = 1 / 3.
    expect(m.straightThrough).toBe(0.5);
    expect(m.errorAmongAccepted).toBeCloseTo(1 / 3, 12);
    // Errors 4: caught by review 3 (phone, both a-002 fields), slipped through 1; no right value held back.
    expect([m.errors, m.caughtByReview, m.slippedThrough, m.needlessReview]).toEqual([4, 3, 1, 0]);
    // ECE (Guo et al. 2017), M = 15, by hand: confidences 0.9 (wrong) -> bin 14, 0.95 and 0.99 (right) -> bin 15,
    // 0.4 (wrong) -> bin 6 = (1/3, 0.4], two absent fields at 0 (wrong) -> bin 1.
    //   1/6 |0 - 0.9| + 2/6 |1 - 0.97| + 1/6 |0 - 0.4| + 2/6 |0 - 0| = 0.15 + 0.01 + 0.0667 = 0.22667
    expect(m.ece).toBeCloseTo(0.15 + 0.01 + 0.4 / 6, 12);
    // Checkbox accuracy: a-001 ticked and read ticked; a-002 unticked but not read = 1 / 2.
    expect(report.byType.checkbox.exactMatch).toBe(0.5);
    expect([m.marks, m.markAccuracy]).toEqual([2, 0.5]);
    expect(report.byFillType['typed/checkbox'].exactMatch).toBe(1);
    expect(report.byFill.handwriting.fields).toBe(2);
    expect(report.byField['clinic-intake/phone']).toMatchObject({ type: 'phone', fields: 1, caughtByReview: 1 });

    // Files: score.json as written, and the diagram beside it.
    const written = JSON.parse(await readFile(out, 'utf8'));
    expect(written.overall.exactMatch).toBeCloseTo(2 / 6, 12);
    const meta = await sharp(path.join(resultsDir, 'score-reliability.png')).metadata();
    expect(meta.format).toBe('png');
    // The printed table names no field value (logs never print values unless asked).
    const table = formatScore(report, { perField: true });
    for (const v of ['Ada', 'Finch', '2024-03-07', '555', 'Lark']) expect(table).not.toContain(v);
    expect(table).toContain('33.33%');
  });

  it('stops with one line naming the file when a result is malformed', async () => {
    const { truthDir, resultsDir } = await writeSet(truth, results);
    const bad = path.join(resultsDir, 'a-009.json');
    await writeFile(bad, JSON.stringify({ document: { id: 'a-009' }, fields: 'none' }));
    const err = await runScore({ results: resultsDir, truth: truthDir }).catch((e: Error) => e);
    expect(err).toBeInstanceOf(Error);
    expect((err as Error).message).toContain(bad);
    expect((err as Error).message).not.toContain('\n');
  });
});

describe('tick decisions', () => {
  it('counts one per checkbox and one per printed box of a choice group (hand computation)', () => {
    const t = truthDoc('marina-slip', 'typed', [
      { ...truthField('boat_type', 'choice', 'sail', null, [10, 10, 300, 20]), parts: [
        { key: 'power', checked: false }, { key: 'sail', checked: true }, { key: 'kayak', checked: false },
      ] },
      { ...truthField('services', 'choice', ['water', 'power'], null, [10, 50, 300, 20]), parts: [
        { key: 'water', checked: true }, { key: 'power', checked: true }, { key: 'wifi', checked: false },
      ] },
      truthField('insured', 'checkbox', false, null, [10, 90, 20, 20]),
    ]);
    const r = documentResult('/scans/m-001.png', 'marina-slip', [
      resultField('boat_type', 'choice', 'power', null, 'accepted', 0.9, null), // power wrongly on, sail missed
      resultField('services', 'choice', ['water', 'wifi'], null, 'review', 0.5, null), // power missed, wifi wrong
      resultField('insured', 'checkbox', false, null, 'accepted', 0.99, null),
    ]);
    const { fields } = scoreDocument('m-001', t, r);
    // By hand: boat_type 1 of 3 right (kayak); services 1 of 3 (water); insured 1 of 1. Total 3 of 7.
    expect(fields.map((f) => f.marks)).toEqual([
      { decisions: 3, correct: 1 },
      { decisions: 3, correct: 1 },
      { decisions: 1, correct: 1 },
    ]);
    expect(summarizeFields(fields, 15).markAccuracy).toBeCloseTo(3 / 7, 12);
  });
});

describe('formglean score (command)', () => {
  it('prints the table; a missing folder is a configuration error (exit 2) in one line', async () => {
    const { truthDir, resultsDir } = await writeSet(truth, results, ['a-002']);
    const program = new Command().exitOverride();
    registerScoreCommand(program);
    const printed: string[] = [];
    const write = process.stdout.write.bind(process.stdout);
    process.stdout.write = ((chunk: string) => printed.push(chunk) > 0) as typeof process.stdout.write;
    try {
      await program.parseAsync(['score', '--results', resultsDir, '--truth', truthDir], { from: 'user' });
    } finally {
      process.stdout.write = write;
    }
    expect(printed.join('')).toMatch(/all fields\s+6\s+33\.33%/);
    expect(printed.join('')).toContain('score.json');
    const missing = path.join(await tempDir('score-none-'), 'nothing-here');
    const err = await program
      .parseAsync(['score', '--results', missing, '--truth', truthDir], { from: 'user' })
      .catch((e: unknown) => e);
    expect(err).toBeInstanceOf(FormgleanError);
    expect((err as FormgleanError).exitCode).toBe(2);
    expect((err as FormgleanError).message).toBe(`${missing}: results folder not found`);
  });
});
