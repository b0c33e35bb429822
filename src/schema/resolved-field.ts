import { getFieldType } from '../fields/registry.js';
import type { FieldPart, FieldType } from '../fields/types.js';
import type { FieldSpec, FormSchema, RegionTuple } from './definition.js';

/**
 * A schema field as every stage uses it, resolved once when the schema loads: its spec, its field type (the model in
 * src/fields/ that owns the type's option schema), the type's options with every default filled in, and the boxes
 * it has on the page. `type` and `options` travel together so a type is only ever handed its own options.
 */
export interface ResolvedField<O = unknown> {
  readonly spec: FieldSpec;
  readonly type: FieldType<O>;
  readonly options: O;
  /** One part keyed by the field name, or one per printed box of a choice group. */
  readonly parts: readonly FieldPart[];
}

/** Resolve one field; options the schema validated already, so parsing here only fills in the type's defaults. */
export function resolveField(spec: FieldSpec): ResolvedField {
  const type = getFieldType(spec.type);
  const options: unknown = type.options.parse(spec.options ?? {});
  const parts = type.parts ? type.parts(options, spec.name, spec.region) : [{ key: spec.name, region: spec.region }];
  return { spec, type, options, parts };
}

/** Every field of a schema, in the schema's order. */
export function resolveFields(schema: FormSchema): ResolvedField[] {
  return schema.fields.map(resolveField);
}

/** Every region a field uses: its own, and its parts' (a choice group's boxes). */
export function fieldRegions(field: ResolvedField): { key: string; region: RegionTuple }[] {
  return field.parts.flatMap((p) => (p.region ? [{ key: p.key, region: p.region }] : []));
}
