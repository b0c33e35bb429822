import { readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { runCalibrate } from '../../src/eval/calibration-run.js';
import { parseSchemaText } from '../../src/schema/load.js';
import { documentResult, removeTempDirs, resultField, tempDir, truthDoc, truthField, writeSet } from '../eval/score-fixtures.js';

afterAll(removeTempDirs);

const SCHEMA_YAML = `# Invented demo form for tests: a small animal clinic's intake sheet.
form:
  name: clinic-intake
  version: "1"
pages:
  - width: 1000
    height: 1300
defaults:
  reviewThreshold: 0.75
fields:
  # owner block
  - name: owner_name
    label: Owner
    class: text_entry
    type: text
    region: [100, 100, 200, 30]
  - name: visit_date
    class: text_entry
    type: date
    options:
      formats: ["MM/DD/YYYY"]
    reviewThreshold: 0.8
    region: [100, 200, 120, 30]
`;

// owner_name, by hand: outcomes by confidence 0 0 1 0 1 1 1 1 1 1 -> levels [0.2, 0.4] 0, [0.5, 0.6] 1/2,
// [0.7, 1] 1. visit_date: always right, confidences 0.55 .. 1 -> one level at 1 from 0.55.
const owner: [number, boolean][] = [
  [0.2, false], [0.4, false], [0.5, true], [0.6, false], [0.7, true],
  [0.8, true], [0.9, true], [0.95, true], [0.98, true], [1, true],
];
const dates = [0.55, 0.6, 0.65, 0.7, 0.75, 0.8, 0.85, 0.9, 0.95, 1];

async function calibrationSet() {
  const truth: Record<string, ReturnType<typeof truthDoc>> = {};
  const results: Record<string, ReturnType<typeof documentResult>> = {};
  owner.forEach(([conf, right], i) => {
    const stem = `c-${String(i).padStart(3, '0')}`;
    truth[stem] = truthDoc('clinic-intake', 'typed', [
      truthField('owner_name', 'text', 'Cleo Marsh', 'Cleo Marsh', [100, 100, 200, 30]),
      truthField('visit_date', 'date', '2024-05-02', '05/02/2024', [100, 200, 120, 30]),
    ]);
    results[stem] = documentResult(`/scans/${stem}.png`, 'clinic-intake', [
      resultField('owner_name', 'text', right ? 'Cleo Marsh' : 'Cleo Mash', 'x', conf >= 0.75 ? 'accepted' : 'review', conf, null),
      resultField('visit_date', 'date', '2024-05-02', 'x', dates[i] >= 0.8 ? 'accepted' : 'review', dates[i], null),
    ]);
  });
  // A document read with another schema is left out of this schema's calibration.
  truth['m-000'] = truthDoc('marina-slip', 'typed', [truthField('owner_name', 'text', 'Ivo Reed', 'Ivo Reed', [1, 1, 9, 9])]);
  results['m-000'] = documentResult('/scans/m-000.png', 'marina-slip', [
    resultField('owner_name', 'text', 'wrong', 'x', 'accepted', 0.99, null),
  ]);
  return writeSet(truth, results);
}

describe('calibrate: thresholds into a copy of the schema', () => {
  it('writes hand-computed thresholds into a YAML copy that keeps its comments', async () => {
    const { truthDir, resultsDir } = await calibrationSet();
    const dir = await tempDir('calibrate-');
    const schemaFile = path.join(dir, 'clinic-intake.yaml');
    await writeFile(schemaFile, SCHEMA_YAML);
    const mapFile = path.join(dir, 'map.json');
    const run = await runCalibrate({
      results: resultsDir,
      truth: truthDir,
      schema: schemaFile,
      targetError: 0.1,
      minSamples: 1,
      map: mapFile,
    });
    // By hand, target 10 %: the two levels at accuracy 1 (visit_date 10, owner_name 6; 0 errors) go first;
    // owner_name's 1/2 level adds 1 expected error: 1 / 18 = 5.6 % <= 10 %; its 0 level would make
    // 3 / 20 = 15 % > 10 %. So owner_name 0.5, visit_date 0.55; 18 of 20 accepted, 1 wrong.
    expect(run.documents).toBe(10);
    const by = Object.fromEntries(run.proposal.fields.map((f) => [f.field, f]));
    expect(by.owner_name.threshold).toBe(0.5);
    expect(by.visit_date.threshold).toBe(0.55);
    expect([run.proposal.accepted, run.proposal.acceptedErrors]).toEqual([18, 1]);
    expect(run.current.get('owner_name')).toBe(0.75); // the schema default
    expect(run.current.get('visit_date')).toBe(0.8);

    expect(run.out).toBe(path.join(dir, 'clinic-intake.calibrated.yaml'));
    const copy = await readFile(run.out, 'utf8');
    expect(copy).toContain('# owner block');
    expect(copy).toContain('# Invented demo form for tests');
    expect(copy).toMatch(/calibrated by formglean calibrate on 10 labeled documents/);
    const parsed = parseSchemaText(copy, run.out);
    // Written on the mapped scale: each field gets its map (the levels above as [from, accuracy]) and the
    // accuracy of its lowest accepted level as the threshold.
    expect(parsed.fields.map((f) => [f.name, f.reviewThreshold, f.confidenceMap])).toEqual([
      ['owner_name', 0.5, [[0, 0], [0.5, 0.5], [0.7, 1]]],
      ['visit_date', 1, [[0, 0], [0.55, 1]]], // accuracy 0 under the lowest confidence the fit saw
    ]);
    expect(copy).toContain('confidenceMap: [[0, 0], [0.5, 0.5], [0.7, 1]]');
    expect(await readFile(schemaFile, 'utf8')).toBe(SCHEMA_YAML); // the input is left alone
    const map = JSON.parse(await readFile(mapFile, 'utf8'));
    expect(map.fields.owner_name.steps.map((s: { value: number }) => s.value)).toEqual([0, 0.5, 1]);
  });

  it('keeps JSON schemas JSON, and names the schema file in one line when it is invalid', async () => {
    const { truthDir, resultsDir } = await calibrationSet();
    const dir = await tempDir('calibrate-json-');
    const jsonFile = path.join(dir, 'clinic.json');
    await writeFile(jsonFile, JSON.stringify(parseSchemaText(SCHEMA_YAML, 'inline'), null, 2));
    const run = await runCalibrate({ results: resultsDir, truth: truthDir, schema: jsonFile, targetError: 0, minSamples: 1 });
    // Target 0: only the accuracy-1 levels: owner_name from raw 0.7, visit_date from raw 0.55; both at mapped 1.
    expect(run.proposal.fields.map((f) => f.threshold)).toEqual([0.7, 0.55]);
    const copy = JSON.parse(await readFile(run.out, 'utf8'));
    expect(copy.fields.map((f: { reviewThreshold: number }) => f.reviewThreshold)).toEqual([1, 1]);
    expect(copy.fields[0].confidenceMap).toEqual([[0, 0], [0.5, 0.5], [0.7, 1]]);

    const bad = path.join(dir, 'bad.yaml');
    await writeFile(bad, SCHEMA_YAML.replace('type: date', 'type: calendar'));
    const err = await runCalibrate({ results: resultsDir, truth: truthDir, schema: bad, targetError: 0.005 }).catch(
      (e: Error) => e,
    );
    expect((err as Error).message.startsWith(`${bad}: fields[1]`)).toBe(true);
    expect((err as Error).message).not.toContain('\n');
  });
});
