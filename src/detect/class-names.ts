import { readFile } from 'node:fs/promises';
import { configError } from '../errors.js';

/**
 * Where a model's class names come from, first found wins:
 * 1. an explicit file given by the caller (`classNamesFile`);
 * 2. the model's metadata_props `class_names` (a JSON array of strings);
 * 3. a side file next to the model: `<model>.classes.json` (e.g. `form-elements.onnx.classes.json`), or the same
 *    name with `.onnx` dropped (`form-elements.classes.json`).
 */
export async function resolveClassNames(
  modelPath: string,
  metadata: ReadonlyMap<string, string>,
  classNamesFile?: string,
): Promise<string[]> {
  if (classNamesFile) {
    const text = await readSideFile(classNamesFile);
    if (text === undefined) throw configError(classNamesFile, 'class names file not found');
    return parseNames(classNamesFile, text, 'file');
  }
  const fromMeta = metadata.get('class_names');
  if (fromMeta !== undefined) return parseNames(modelPath, fromMeta, 'metadata class_names');
  const sideFiles = [`${modelPath}.classes.json`];
  if (/\.onnx$/i.test(modelPath)) sideFiles.push(modelPath.replace(/\.onnx$/i, '.classes.json'));
  for (const file of sideFiles) {
    const text = await readSideFile(file);
    if (text !== undefined) return parseNames(file, text, 'file');
  }
  throw configError(modelPath, `model has no class names: no metadata class_names and no side file ${sideFiles.join(' or ')}`);
}

async function readSideFile(file: string): Promise<string | undefined> {
  try {
    return await readFile(file, 'utf8');
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return undefined;
    throw configError(file, `cannot read class names: ${(err as Error).message}`, err);
  }
}

function parseNames(file: string, text: string, what: string): string[] {
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch (err) {
    throw configError(file, `${what} is not JSON: expected an array of class names`, err);
  }
  if (!Array.isArray(value) || value.length === 0 || !value.every((v) => typeof v === 'string' && v.length > 0)) {
    throw configError(file, `${what} must be a non-empty JSON array of non-empty strings, found ${JSON.stringify(value).slice(0, 80)}`);
  }
  if (new Set(value).size !== value.length) throw configError(file, `${what} repeats a class name`);
  return value as string[];
}
