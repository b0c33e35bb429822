import path from 'node:path';
import type { Box } from '../../src/image/geometry.js';
import { loadSchema, type LoadedSchema } from '../../src/schema/load.js';
import type { FieldSpec } from '../../src/schema/definition.js';
import { fieldRegions, resolveField } from '../../src/schema/resolved-field.js';
import type { CocoDataset } from '../../src/synth/coco.js';
import { CocoBuilder } from '../../src/synth/coco.js';
import { IDENTITY_H } from '../../src/synth/homography.js';
import type { DetectorClass, EntrySlot, FieldTypeName, Layout, LayoutField } from '../../src/synth/layout-model.js';
import { DETECTOR_CLASSES, REFERENCE_DPI } from '../../src/synth/layout-model.js';
import type { ScanParams } from '../../src/synth/scan-params.js';

/** Repository root, from this file's place in test/real-form/. */
export const REPO_ROOT = path.resolve(import.meta.dirname, '../..');

/** The hand-labelled schema of the real blank (test layout only, not demo material). */
export const W4_SCHEMA = path.join(REPO_ROOT, 'test/fixtures/real-forms/w4-page1.yaml');

/** COCO truth of the blank page, written from the schema by test/real-form/make-coco.ts. */
export const W4_BLANK_COCO = path.join(REPO_ROOT, 'test/fixtures/real-forms/w4-page1.coco.json');

/** The public-domain blank itself, copied into the fixtures with its source note (test/fixtures/real-forms/README.md). */
export const W4_BLANK = path.join(REPO_ROOT, 'test/fixtures/real-forms/irs-w4-2025-page1-blank.png');

/** Layout name used in truth files and page stems. */
export const W4_LAYOUT = 'w4-page1';

/**
 * Where a person writes inside each entry area: below the label printed in a cell's top-left corner, right of a
 * printed "$", above a signature or date line. Measured on the blank's pixels (label ink rows and "$" glyph columns
 * found by a projection profile of each region). Only the filler uses these; the truth boxes are the schema regions.
 */
const WRITE_BOXES: Record<string, Box> = {
  first_name: { x: 265, y: 258, w: 490, h: 40 },
  last_name: { x: 765, y: 256, w: 550, h: 42 },
  ssn: { x: 1325, y: 258, w: 272, h: 40 },
  address: { x: 265, y: 321, w: 1050, h: 44 },
  city_state_zip: { x: 265, y: 392, w: 1050, h: 39 },
  qualifying_children_amount: { x: 1142, y: 1242, w: 176, h: 40 },
  other_dependents_amount: { x: 1142, y: 1290, w: 176, h: 40 },
  credits_total: { x: 1422, y: 1372, w: 176, h: 42 },
  other_income: { x: 1422, y: 1470, w: 176, h: 44 },
  deductions: { x: 1422, y: 1586, w: 176, h: 44 },
  extra_withholding: { x: 1422, y: 1652, w: 176, h: 44 },
  employee_signature: { x: 300, y: 1814, w: 700, h: 66 },
  signature_date: { x: 1290, y: 1830, w: 300, h: 50 },
  employer_name_address: { x: 265, y: 1995, w: 810, h: 60 },
  first_date_of_employment: { x: 1085, y: 1998, w: 210, h: 56 },
  employer_ein: { x: 1305, y: 1998, w: 292, h: 56 },
};

export async function loadW4Schema(): Promise<LoadedSchema> {
  return loadSchema(W4_SCHEMA);
}

function detectorClass(field: FieldSpec): DetectorClass {
  const c = field.class as DetectorClass;
  if (!DETECTOR_CLASSES.includes(c)) throw new Error(`${W4_SCHEMA}: field ${field.name} has class "${field.class}", not a detector class`);
  return c;
}

const box = (r: readonly [number, number, number, number]): Box => ({ x: r[0], y: r[1], w: r[2], h: r[3] });

/**
 * The schema as a synthetic-renderer layout with nothing printed (the blank already carries the print): one slot per
 * schema region, drawn "as a cell" so the renderer adds only the writer's ink. Slots follow the schema, so the COCO
 * and truth boxes are the hand-labelled regions and nothing else.
 */
export function w4Layout(loaded: LoadedSchema): Layout {
  const { schema } = loaded;
  const page = schema.pages[0];
  const fields: LayoutField[] = schema.fields.map((field) => {
    const cls = detectorClass(field);
    const slots: EntrySlot[] = fieldRegions(resolveField(field)).map(({ key, region }) => {
      const b = box(region);
      const writeBox = field.type === 'checkbox' || field.type === 'choice' ? b : WRITE_BOXES[field.name];
      if (!writeBox) throw new Error(`no write box for W-4 field ${field.name}`);
      return { key, class: cls, box: b, writeBox, look: { kind: 'cell', labelHeight: 0 } };
    });
    return {
      name: field.name,
      label: field.label ?? field.name,
      type: field.type as FieldTypeName,
      options: (field.options ?? {}) as Record<string, unknown>,
      valueKind: field.name,
      required: field.required,
      slots,
    };
  });
  return { name: W4_LAYOUT, title: schema.form.description ?? schema.form.name, family: 'real', width: page.width, height: page.height, printed: [], fields };
}

/** The scan that leaves the reference page as it is. */
export function identityScan(layout: Layout): ScanParams {
  return {
    dpi: REFERENCE_DPI,
    width: layout.width,
    height: layout.height,
    transform: IDENTITY_H,
    rotation: 0,
    skew: 0,
    blurSigma: 0,
    noiseSigma: 0,
    saltPepper: 0,
    shading: [1, 1, 1, 1],
    paper: 255,
    jpegQuality: null,
  };
}

/** COCO truth of the blank page, with the image named relative to `cocoDir` (where the JSON will live). */
export function w4BlankCoco(layout: Layout, cocoDir: string): CocoDataset {
  const coco = new CocoBuilder();
  coco.addPage(path.relative(cocoDir, W4_BLANK).split(path.sep).join('/'), layout, identityScan(layout));
  return coco.build('Hand-labelled entry areas of a real public-domain blank (test layout), from test/fixtures/real-forms/w4-page1.yaml');
}
