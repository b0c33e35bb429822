import { constants } from 'node:fs';
import { access, stat } from 'node:fs/promises';
import { referenceImagePath, type LoadedSchema } from './load.js';

/**
 * Blank reference images the schema names that cannot be read: a missing file, a folder, or one without read
 * permission. Checked up front (by `schema check` and before `extract` reads a page) so that a batch never stops at
 * its first document over a configuration problem. One line per problem, starting with the JSON path.
 */
export async function checkReferenceImages(loaded: LoadedSchema): Promise<string[]> {
  const problems: string[] = [];
  for (let i = 0; i < loaded.schema.pages.length; i++) {
    const file = referenceImagePath(loaded, i);
    if (!file) continue;
    const named = loaded.schema.pages[i].image;
    const info = await stat(file).catch(() => null);
    if (!info) problems.push(`pages[${i}].image: blank image "${named}" not found (looked for ${file})`);
    else if (!info.isFile()) problems.push(`pages[${i}].image: "${named}" is not a file`);
    else if (!(await access(file, constants.R_OK).then(() => true, () => false))) problems.push(`pages[${i}].image: "${named}" cannot be read`);
  }
  return problems;
}
