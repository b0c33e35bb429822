import { describe, expect, it } from 'vitest';
import type { Detection } from '../../src/detect/types.js';
import { locateFields } from '../../src/locate/locate-fields.js';
import { IDENTITY } from '../../src/image/geometry.js';
import { parseSchemaText } from '../../src/schema/load.js';
import { resolveFields } from '../../src/schema/resolved-field.js';

const schema = parseSchemaText(
  `
form: { name: Slip rental, version: "2" }
pages: [{ width: 1000, height: 1400 }]
fields:
  - { name: boat_name, type: text, class: text_entry, region: [100, 100, 400, 50] }
  - { name: owner_name, type: text, class: text_entry, region: [100, 200, 400, 50] }
  - { name: berth_length, type: number, class: text_entry, region: [600, 200, 200, 50] }
  - { name: insured, type: checkbox, class: checkbox, region: [100, 300, 24, 24] }
  - name: hull
    type: choice
    class: checkbox
    options:
      multiple: false
      choices:
        - { value: mono, region: [300, 300, 24, 24] }
        - { value: multi, region: [400, 300, 24, 24] }
  - { name: signature, type: signature, class: signature_area, region: [100, 1200, 500, 80] }
`,
  'slip.yaml',
);

const det = (className: string, x: number, y: number, w: number, h: number, score = 0.9): Detection => ({
  box: { x, y, w, h },
  classId: ['text_entry', 'checkbox', 'signature_area'].indexOf(className),
  className,
  score,
});

/** The page is the reference scaled by 1.5 and shifted by (+30, -12): a scan at 150 % with the paper slid. */
const S = 1.5;
const T = [30, -12];
const onPage = (x: number, y: number, w: number, h: number) => [x * S + T[0], y * S + T[1], w * S, h * S] as const;

describe('locating fields', () => {
  const refToPage = { a: S, b: 0, c: T[0], d: 0, e: S, f: T[1] };

  it('matches shared classes by region, takes the best detection of a unique class, falls back to regions', () => {
    const dets = [
      // owner_name slightly off, boat_name exact; berth_length not detected
      det('text_entry', ...onPage(104, 203, 396, 48)),
      det('text_entry', ...onPage(100, 100, 400, 50)),
      det('checkbox', ...onPage(100, 300, 24, 24), 0.8),
      det('checkbox', ...onPage(400, 300, 24, 24), 0.7),
      // two signature candidates: the best-scored wins (unique class)
      det('signature_area', ...onPage(100, 1200, 500, 80), 0.95),
      det('signature_area', ...onPage(90, 1190, 520, 90), 0.5),
    ];
    const located = locateFields(resolveFields(schema), dets, refToPage);
    const byName = new Map(located.map((l) => [l.field.name, l]));
    expect(byName.get('boat_name')!.parts[0]).toMatchObject({ source: 'detection', box: dets[1].box });
    expect(byName.get('owner_name')!.parts[0]).toMatchObject({ source: 'detection', box: dets[0].box });
    const berth = byName.get('berth_length')!.parts[0];
    expect(berth.source).toBe('region');
    expect(berth.reasons).toEqual(['region_fallback']);
    const [x, y, w, h] = onPage(600, 200, 200, 50);
    expect(berth.box).toEqual({ x, y, w, h });
    const hull = byName.get('hull')!.parts;
    expect(hull.map((p) => [p.key, p.source])).toEqual([
      ['mono', 'region'],
      ['multi', 'detection'],
    ]);
    expect(byName.get('signature')!.parts[0].detectionScore).toBe(0.95);
  });

  it('never gives one detection to two fields', () => {
    // One box halfway between the two name rows: it may stand for one of them at most.
    const dets = [det('text_entry', ...onPage(100, 150, 400, 50))];
    const located = locateFields(resolveFields(schema), dets, refToPage, { minMatch: 0.2, preferRegion: false });
    const used = located.flatMap((l) => l.parts).filter((p) => p.source === 'detection');
    expect(used.length).toBeLessThanOrEqual(1);
  });

  it('does not read a unique-class field at a detection far from its region, and reports a field with no region as not found', () => {
    const custom = parseSchemaText(
      `
form: { name: Custom classes, version: "1" }
pages: [{ width: 1000, height: 1400 }]
fields:
  - { name: member_no, type: text, class: member_number, region: [100, 100, 300, 50] }
  - { name: notes, type: text, class: notes_box }
`,
      'custom.yaml',
    );
    const dets: Detection[] = [{ box: { x: 700, y: 900, w: 200, h: 40 }, classId: 0, className: 'member_number', score: 0.9 }];
    const located = locateFields(resolveFields(custom), dets, IDENTITY);
    // The only detection of the class lies elsewhere: another box, not this field's; the aligned region is read.
    expect(located[0].parts[0]).toMatchObject({ source: 'region', box: { x: 100, y: 100, w: 300, h: 50 }, reasons: ['region_fallback'] });
    expect(located[1].parts[0]).toMatchObject({ source: 'none', box: null, reasons: [] });
  });
});
