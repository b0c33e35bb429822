import type { Detection } from '../detect/types.js';
import type { Alignment } from '../page/alignment.js';
import type { GrayImage } from '../page/raster.js';
import type { LoadedSchema } from '../schema/load.js';
import { alignToSchemaPage } from './align-page.js';

export interface LayoutChoice {
  schema: LoadedSchema;
  /** Alignment of the document's first page to the chosen schema's first page. */
  alignment: Alignment;
  status: 'assigned' | 'unknown_layout';
  candidates: { schema: string; score: number }[];
}

/**
 * Under this fit quality no schema is believed: the page is some other form (or not a form). Alignment scores are
 * image correlation of ink (or the share of regions matched). Measured on the five bundled samples against the three
 * demo schemas: the right layout scored 0.92–0.98, the wrong ones 0.27–0.54; 0.7 sits between with room both ways.
 */
export const MIN_LAYOUT_SCORE = 0.7;

/** Align the first page to every schema's first page and keep the best fit; ties go to the earlier schema. */
export async function chooseLayout(
  schemas: readonly LoadedSchema[],
  page: GrayImage,
  detections: readonly Detection[],
): Promise<LayoutChoice> {
  let best: { schema: LoadedSchema; alignment: Alignment } | null = null;
  const candidates: LayoutChoice['candidates'] = [];
  for (const schema of schemas) {
    const alignment = await alignToSchemaPage(schema, 0, page, detections);
    candidates.push({ schema: schema.schema.form.name, score: Math.round(alignment.score * 1000) / 1000 });
    if (!best || alignment.score > best.alignment.score) best = { schema, alignment };
  }
  if (!best) throw new Error('chooseLayout needs at least one schema');
  const status = schemas.length === 1 || best.alignment.score >= MIN_LAYOUT_SCORE ? 'assigned' : 'unknown_layout';
  return { ...best, status, candidates };
}
