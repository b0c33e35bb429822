import { stat } from 'node:fs/promises';
import { glob } from 'tinyglobby';
import { configError } from '../errors.js';
import type { LoadedSchema } from './load.js';
import { loadSchema } from './load.js';

/**
 * Load every schema named: files, or folders holding *.yaml / *.yml / *.json schema files (the JSON Schema of the
 * format itself, form-schema.json, is skipped). Form names must be unique, since results name their schema by it.
 */
export async function loadSchemas(paths: readonly string[]): Promise<LoadedSchema[]> {
  const files: string[] = [];
  for (const p of paths) {
    const st = await stat(p).catch(() => null);
    if (st?.isDirectory()) {
      const found = (await glob('*.{yaml,yml,json}', { cwd: p, absolute: true })).filter((f) => !f.endsWith('form-schema.json')).sort();
      if (found.length === 0) throw configError(p, 'folder holds no schema files (*.yaml, *.yml, *.json)');
      files.push(...found);
    } else {
      files.push(p);
    }
  }
  const loaded: LoadedSchema[] = [];
  for (const f of files) {
    const s = await loadSchema(f);
    const clash = loaded.find((l) => l.schema.form.name === s.schema.form.name);
    if (clash) throw configError(f, `form name "${s.schema.form.name}" is already used by ${clash.path}`);
    loaded.push(s);
  }
  return loaded;
}
