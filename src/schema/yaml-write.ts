import { Document, isScalar, isSeq, visit } from 'yaml';
import type { SchemaValue } from './schema-value.js';

const numbers = (node: unknown): boolean => isSeq(node) && node.items.every((i) => isScalar(i) && typeof i.value === 'number');

/**
 * YAML text of a schema value, with short lists of numbers or words (regions, choices) and confidence maps (lists of
 * number pairs) kept on one line, as `formglean calibrate` writes them.
 */
export function schemaYaml(schema: SchemaValue): string {
  const doc = new Document(schema);
  visit(doc, {
    Seq(_, node) {
      if (numbers(node) || (isSeq(node) && node.items.length > 0 && node.items.every(numbers))) node.flow = true;
      if (isSeq(node) && node.items.length > 8 && node.items.every((i) => isScalar(i) && typeof i.value === 'string')) node.flow = true;
    },
  });
  return doc.toString({ lineWidth: 0, flowCollectionPadding: false });
}
