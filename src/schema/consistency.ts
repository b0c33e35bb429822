import type { FormSchema } from './definition.js';
import { fieldRegions, resolveFields, type ResolvedField } from './resolved-field.js';

/**
 * Checks zod cannot express: unique names, pages that exist, regions inside their page.
 * Returns one line per problem, each starting with the JSON path.
 */
export function checkSchemaConsistency(schema: FormSchema, resolved: readonly ResolvedField[] = resolveFields(schema)): string[] {
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
    for (const { key, region } of fieldRegions(resolved[i])) {
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
