import { getFieldType } from '../fields/registry.js';
import type { FieldPart } from '../fields/types.js';
import type { FieldSpec, FormSchema } from './definition.js';

type RegionTuple = [number, number, number, number];

/** The boxes a field has on the page: one keyed by the field name, or one per printed box of a choice group. */
export function fieldParts(field: FieldSpec): FieldPart[] {
  const type = getFieldType(field.type);
  const options = type.options.parse(field.options ?? {});
  return type.parts ? type.parts(options, field.name, field.region) : [{ key: field.name, region: field.region }];
}

/** Every region a field uses: its own, and its parts' (a choice group's boxes). */
export function fieldRegions(field: FieldSpec): { key: string; region: RegionTuple }[] {
  return fieldParts(field).flatMap((p) => (p.region ? [{ key: p.key, region: p.region }] : []));
}

/**
 * Checks zod cannot express: unique names, pages that exist, regions inside their page.
 * Returns one line per problem, each starting with the JSON path.
 */
export function checkSchemaConsistency(schema: FormSchema): string[] {
  const problems: string[] = [];
  const seen = new Map<string, number>();
  schema.fields.forEach((field, i) => {
    const at = `fields[${i}]`;
    const prev = seen.get(field.name);
    if (prev !== undefined) problems.push(`${at}.name: duplicate field name "${field.name}" (first used at fields[${prev}])`);
    else seen.set(field.name, i);
    const page = schema.pages[field.page];
    if (!page) {
      problems.push(`${at}.page: expected a page index below ${schema.pages.length} (found ${field.page})`);
      return;
    }
    for (const { key, region } of fieldRegions(field)) {
      const [x, y, w, h] = region;
      if (x + w > page.width + 0.5 || y + h > page.height + 0.5) {
        const which = key === field.name ? 'region' : `region of part "${key}"`;
        problems.push(
          `${at}: ${which} [${region.join(', ')}] must lie inside the ${page.width}x${page.height} reference page`,
        );
      }
    }
  });
  return problems;
}

/** Classes the schema needs that the model does not have; one line per problem. */
export function checkSchemaAgainstClasses(schema: FormSchema, classNames: readonly string[]): string[] {
  const known = new Set(classNames);
  const problems: string[] = [];
  schema.fields.forEach((field, i) => {
    if (!known.has(field.class)) {
      problems.push(
        `fields[${i}].class: class "${field.class}" is not in the model (model classes: ${classNames.join(', ')})`,
      );
    }
  });
  return problems;
}
