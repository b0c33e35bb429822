import { existsSync } from 'node:fs';
import path from 'node:path';
import type { DocumentResult } from '../result/document.js';
import type { LoadedSchema } from '../schema/load.js';
import { loadSchema } from '../schema/load.js';
import type { ResolvedField } from '../schema/resolved-field.js';
import { oneLine } from '../errors.js';

/** A field's type and its options as the schema resolved them at load, or why they cannot be had. */
export type FieldTyping = Pick<ResolvedField, 'type' | 'options'> | { error: string };

/**
 * The schema options of every field, loaded from the schema file each document records (schema.path), so a
 * correction is checked exactly like the reading it replaces. Schemas are loaded once per path.
 */
export class FieldOptionsSource {
  private readonly schemas = new Map<string, Promise<LoadedSchema | string>>();

  constructor(private readonly resultsDir: string) {}

  /** Absolute paths are used as they are; a relative one is tried from the working folder, then from the results folder. */
  private resolve(p: string): string {
    if (path.isAbsolute(p)) return p;
    const fromCwd = path.resolve(p);
    return existsSync(fromCwd) ? fromCwd : path.resolve(this.resultsDir, p);
  }

  private schema(p: string): Promise<LoadedSchema | string> {
    const abs = this.resolve(p);
    let s = this.schemas.get(abs);
    if (!s) {
      s = loadSchema(abs).catch((err: unknown) => oneLine(err));
      this.schemas.set(abs, s);
    }
    return s;
  }

  async typing(doc: DocumentResult, fieldName: string, typeName: string): Promise<FieldTyping> {
    const loaded = await this.schema(doc.schema.path);
    if (typeof loaded === 'string') return { error: `schema of document "${doc.document.id}": ${loaded}` };
    const field = loaded.fields.find((f) => f.spec.name === fieldName);
    if (!field) return { error: `field "${fieldName}" is not in schema ${loaded.path}` };
    if (field.spec.type !== typeName) return { error: `field "${fieldName}" is of type ${field.spec.type} in schema ${loaded.path}, ${typeName} in the result` };
    return { type: field.type, options: field.options };
  }

  /** Schemas whose file changed since the documents were extracted (their corrections are checked by the new file). */
  async changedSchemas(docs: readonly DocumentResult[]): Promise<string[]> {
    const out = new Set<string>();
    for (const d of docs) {
      const loaded = await this.schema(d.schema.path);
      if (typeof loaded !== 'string' && loaded.sha256 !== d.schema.sha256) out.add(loaded.path);
    }
    return [...out];
  }
}
