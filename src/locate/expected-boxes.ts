import type { FieldSpec } from '../schema/definition.js';
import type { ResolvedField } from '../schema/resolved-field.js';
import type { Box } from '../image/geometry.js';

/** One box to find on the page: a field, or one box of a choice group. */
export interface ExpectedPart {
  field: FieldSpec;
  key: string;
  className: string;
  /** Region on the reference page, when the schema gives one. */
  region: Box | null;
}

/** The parts of every field, with their reference regions. */
export function expectedParts(fields: readonly ResolvedField[]): ExpectedPart[] {
  return fields.flatMap(({ spec, parts }) =>
    parts.map(({ key, region: r }) => ({
      field: spec,
      key,
      className: spec.class,
      region: r ? { x: r[0], y: r[1], w: r[2], h: r[3] } : null,
    })),
  );
}
