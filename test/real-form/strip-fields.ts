import path from 'node:path';
import type { OcrEngine } from '../../src/read/ocr-engine.js';
import type { Box } from '../../src/image/geometry.js';
import { grayFromImage, type GrayImage } from '../../src/image/raster.js';
import type { LocatedField } from '../../src/locate/locate-fields.js';
import { readLocatedField } from '../../src/pipeline/read-field.js';
import { FieldSpec } from '../../src/schema/definition.js';
import { resolveField } from '../../src/schema/resolved-field.js';
import { REPO_ROOT } from './w4-layout.js';

/**
 * A strip cut from a real filled page as `extract` normalizes it (upright, deskewed) and the same strip of its blank
 * (test/fixtures/real-forms, see the README there): fields are read by the pipeline's own reader (readLocatedField)
 * at the boxes `extract` reads them at on that page (schema region through the page's alignment), with the blank
 * under their schema regions.
 */
export interface Strip {
  page: string;
  blank: string;
  /** Where both strips were cut on their 1700 x 2200 pages. */
  origin: { x: number; y: number };
}

export interface StripField {
  name: string;
  type: string;
  /** Reference pixels of the whole blank page, as the drafted schema gives it. */
  region: readonly [number, number, number, number];
  /** Where `extract` reads the field on the whole normalized page (the region through the page's alignment). */
  box: readonly [number, number, number, number];
  class?: string;
  options?: Record<string, unknown>;
}

/** The strip's page and blank images, and a field's box on the page and region on the blank in strip pixels. */
export async function stripField(strip: Strip, f: StripField): Promise<{ page: GrayImage; reference: GrayImage; box: Box; region: Box }> {
  const dir = path.join(REPO_ROOT, 'test/fixtures/real-forms');
  const shift = (b: Box): Box => ({ x: b.x - strip.origin.x, y: b.y - strip.origin.y, w: b.w, h: b.h });
  const [x, y, w, h] = f.region;
  return {
    page: await grayFromImage(path.join(dir, strip.page)),
    reference: await grayFromImage(path.join(dir, strip.blank)),
    box: shift({ x: f.box[0], y: f.box[1], w: f.box[2], h: f.box[3] }),
    region: shift({ x, y, w, h }),
  };
}

export async function readStripFields(strip: Strip, fields: readonly StripField[], ocr: OcrEngine): Promise<Record<string, { value: unknown; reasons: string[] }>> {
  const got: Record<string, { value: unknown; reasons: string[] }> = {};
  for (const f of fields) {
    const options = f.options ?? {};
    const field = FieldSpec.parse({ name: f.name, type: f.type, class: f.class ?? 'comb_field', page: 0, region: f.region, options });
    const { page, reference, box, region } = await stripField(strip, f);
    const located: LocatedField = {
      field,
      parts: [{ key: f.name, box, source: 'region', detectionScore: null, expected: box, region, reasons: [] }],
    };
    const { type, options: typed } = resolveField(field);
    const out = await readLocatedField(located, type, typed, { ocr,
      page,
      reference,
      padding: 4,
      typeContext: { today: new Date('2026-12-02') },
    });
    got[f.name] = { value: out.interpretation?.value ?? null, reasons: out.interpretation?.reasons ?? [] };
  }
  return got;
}
