import { stat } from 'node:fs/promises';
import path from 'node:path';
import { glob } from 'tinyglobby';
import { configError } from '../errors.js';

/** File extensions taken from folders; a file named explicitly is always tried (and fails cleanly if not an image). */
export const IMAGE_EXTENSIONS = ['png', 'jpg', 'jpeg', 'tif', 'tiff', 'webp', 'pdf'];

/**
 * Expand the command line's files, folders (searched recursively) and glob patterns into a sorted, de-duplicated list
 * of absolute paths. A name that matches nothing is a usage error.
 */
export async function discoverInputs(inputs: readonly string[]): Promise<string[]> {
  const found = new Set<string>();
  for (const input of inputs) {
    let st;
    try {
      st = await stat(input);
    } catch {
      st = null;
    }
    if (st?.isFile()) {
      found.add(path.resolve(input));
      continue;
    }
    const pattern = st?.isDirectory()
      ? `**/*.{${IMAGE_EXTENSIONS.join(',')}}`
      : input;
    const cwd = st?.isDirectory() ? path.resolve(input) : process.cwd();
    const files = await glob(pattern, { cwd, absolute: true, onlyFiles: true, caseSensitiveMatch: false, dot: false });
    if (files.length === 0) {
      throw configError(input, st?.isDirectory() ? 'folder holds no png, jpeg, tiff, webp or pdf files' : 'no such file, folder or matching files');
    }
    for (const f of files) found.add(path.resolve(f));
  }
  return [...found].sort();
}

/**
 * A document id that is safe as a file name and unique in the batch: the path relative to the common folder of all
 * inputs, extension dropped, separators replaced.
 */
export function documentIds(files: readonly string[]): Map<string, string> {
  const dirs = files.map((f) => path.dirname(f));
  let common = dirs[0] ?? '';
  for (const d of dirs) {
    while (common && !(d === common || d.startsWith(common + path.sep))) common = path.dirname(common) === common ? '' : path.dirname(common);
  }
  const ids = new Map<string, string>();
  const used = new Set<string>();
  for (const f of files) {
    const rel = path.relative(common || path.parse(f).root, f);
    let id = rel.replace(/\.[^.\\/]+$/, '').replace(/[\\/]+/g, '__').replace(/[^A-Za-z0-9._-]+/g, '_');
    if (id === 'results' || id === 'summary') id = `${id}_doc`;
    let unique = id;
    for (let n = 2; used.has(unique.toLowerCase()); n++) unique = `${id}-${n}`;
    used.add(unique.toLowerCase());
    ids.set(f, unique);
  }
  return ids;
}
