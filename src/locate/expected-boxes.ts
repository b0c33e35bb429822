import { fieldRegions } from '../schema/consistency.js';
import type { FieldSpec } from '../schema/definition.js';
import type { Affine, Box } from '../page/geometry.js';
import { transformBox } from '../page/geometry.js';
import { getFieldType } from '../fields/registry.js';

/** One box to find on the page: a field, or one box of a choice group. */
export interface ExpectedPart {
  field: FieldSpec;
  key: string;
  className: string;
  /** Region on the reference page, when the schema gives one. */
  region: Box | null;
}

export function regionBox(r: readonly [number, number, number, number]): Box {
  return { x: r[0], y: r[1], w: r[2], h: r[3] };
}

/** The parts of every field, with their reference regions. */
export function expectedParts(fields: readonly FieldSpec[]): ExpectedPart[] {
  const out: ExpectedPart[] = [];
  for (const field of fields) {
    const type = getFieldType(field.type);
    const options = type.options.parse(field.options ?? {});
    const parts = type.parts ? type.parts(options, field.name, field.region) : [{ key: field.name, region: field.region }];
    const withRegion = new Map(fieldRegions(field).map((p) => [p.key, p.region]));
    for (const p of parts) {
      const r = withRegion.get(p.key);
      out.push({ field, key: p.key, className: field.class, region: r ? regionBox(r) : null });
    }
  }
  return out;
}

/** A reference region carried onto the page by the reference→page transform. */
export function regionOnPage(part: ExpectedPart, refToPage: Affine): Box | null {
  return part.region ? transformBox(refToPage, part.region) : null;
}
