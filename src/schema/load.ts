import { createHash } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { parseDocument } from 'yaml';
import type { z } from 'zod';
import { configError, oneLine } from '../errors.js';
import { FormSchema } from './definition.js';
import { checkSchemaConsistency } from './consistency.js';
import { resolveFields, type ResolvedField } from './resolved-field.js';

/** A schema file as read: validated, with where it came from (plain data: it crosses into worker threads). */
export interface SchemaFile {
  schema: FormSchema;
  /** Absolute path of the schema file. */
  path: string;
  sha256: string;
}

/** A schema ready for reading: its file, and each field resolved once (type, typed options, parts), in the schema's order. */
export interface LoadedSchema extends SchemaFile {
  fields: readonly ResolvedField[];
}

/** Resolve a schema file's fields (for a file read earlier, or one that crossed into a worker thread as plain data). */
export function resolveSchema(file: SchemaFile): LoadedSchema {
  return { ...file, fields: resolveFields(file.schema) };
}

/** `fields[2].region[3]` from a zod issue path. */
export function formatJsonPath(p: readonly PropertyKey[]): string {
  let out = '';
  for (const k of p) out += typeof k === 'number' ? `[${k}]` : out ? `.${String(k)}` : String(k);
  return out || '(top level)';
}

function valueAt(root: unknown, p: readonly PropertyKey[]): unknown {
  let v: unknown = root;
  for (const k of p) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<PropertyKey, unknown>)[k as string];
  }
  return v;
}

function describeFound(v: unknown): string {
  if (v === undefined) return 'nothing';
  const s = JSON.stringify(v);
  return s.length > 60 ? `${s.slice(0, 57)}...` : s;
}

/** One line for the first zod issue: JSON path, what was expected, what was found. */
export function describeIssue(issue: z.core.$ZodIssue, input: unknown): string {
  const where = formatJsonPath(issue.path);
  const found = describeFound(valueAt(input, issue.path));
  return `${where}: ${issue.message} (found ${found})`;
}

/** Parse and validate schema text; `file` names the source in errors. */
export function parseSchemaText(text: string, file: string): FormSchema {
  return parseAndResolve(text, file).schema;
}

/** Parse, validate and resolve schema text: the consistency checks need the resolved fields' parts. */
function parseAndResolve(text: string, file: string): { schema: FormSchema; fields: ResolvedField[] } {
  const doc = parseDocument(text, { prettyErrors: false });
  if (doc.errors.length > 0) {
    const e = doc.errors[0];
    const line = e.linePos?.[0]?.line;
    throw configError(file, `not valid YAML/JSON${line ? ` at line ${line}` : ''}: ${e.message.split('\n')[0]}`);
  }
  let input: unknown;
  try {
    input = doc.toJS();
  } catch (err) {
    // The yaml library refuses alias expansion past its limit ("billion laughs"): a file error like any other.
    throw configError(file, `not valid YAML/JSON: ${oneLine(err)}`);
  }
  if (input === null || typeof input !== 'object' || Array.isArray(input)) {
    throw configError(file, 'expected a schema object with form, pages and fields');
  }
  const parsed = FormSchema.safeParse(input);
  if (!parsed.success) {
    const more = parsed.error.issues.length > 1 ? ` (+${parsed.error.issues.length - 1} more)` : '';
    throw configError(file, `${describeIssue(parsed.error.issues[0], input)}${more}`);
  }
  const fields = resolveFields(parsed.data);
  const problems = checkSchemaConsistency(parsed.data, fields);
  if (problems.length > 0) {
    const more = problems.length > 1 ? ` (+${problems.length - 1} more)` : '';
    throw configError(file, `${problems[0]}${more}`);
  }
  return { schema: parsed.data, fields };
}

export async function loadSchema(file: string): Promise<LoadedSchema> {
  const abs = path.resolve(file);
  let bytes: Buffer;
  try {
    bytes = await readFile(abs);
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    throw configError(file, code === 'ENOENT' ? 'schema file not found' : `cannot read schema file (${code ?? 'error'})`);
  }
  const { schema, fields } = parseAndResolve(bytes.toString('utf8'), file);
  return { schema, fields, path: abs, sha256: createHash('sha256').update(bytes).digest('hex') };
}

/** Absolute path of a page's blank reference image, if the schema names one. */
export function referenceImagePath(loaded: SchemaFile, pageIndex: number): string | undefined {
  const img = loaded.schema.pages[pageIndex]?.image;
  return img ? path.resolve(path.dirname(loaded.path), img) : undefined;
}
