import { Document, isScalar, isSeq, visit } from 'yaml';
import type { SchemaValue } from './schema-from-layout.js';

/** YAML text of a schema value, with short lists of numbers or words (regions, choices) kept on one line. */
export function schemaYaml(schema: SchemaValue): string {
  const doc = new Document(schema);
  visit(doc, {
    Seq(_, node) {
      if (isSeq(node) && node.items.every((i) => isScalar(i) && typeof i.value === 'number')) node.flow = true;
      if (isSeq(node) && node.items.length > 8 && node.items.every((i) => isScalar(i) && typeof i.value === 'string')) node.flow = true;
    },
  });
  return doc.toString({ lineWidth: 0, flowCollectionPadding: false });
}
