import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { REPO } from '../cli/run-cli.js';

/**
 * The floors of src/, lowest first (DEVELOPERS.md, "Floors"): a module may import from its own folder and from
 * folders on lower floors, never from a higher one, so there is no cycle between folders. Files at the top of src/
 * are named by their file: errors.ts and models.ts sit on the ground floor, api.ts on the roof.
 */
const FLOORS: readonly string[][] = [
  ['errors.ts', 'models.ts', 'image', 'io'],
  ['result'],
  ['fields'],
  ['schema'],
  ['detect', 'input'],
  ['page'],
  ['read'],
  ['locate'],
  ['results'],
  ['pipeline'],
  ['review'],
  ['batch', 'eval', 'draft'],
  ['queue'],
  ['synth'],
  ['cli'],
  ['api.ts'],
];

const floorOf = new Map(FLOORS.flatMap((names, i) => names.map((n) => [n, i] as const)));

function sourceFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const p = path.join(dir, e.name);
    return e.isDirectory() ? sourceFiles(p) : p.endsWith('.ts') ? [p] : [];
  });
}

/** The top-level entry of src/ a path belongs to: its folder, or the file itself at the top. */
function unit(file: string): string {
  return path.relative(path.join(REPO, 'src'), file).split(path.sep)[0];
}

describe('import floors of src/', () => {
  it('every folder is on a floor, and no module imports from a higher floor', () => {
    const src = path.join(REPO, 'src');
    const upward: string[] = [];
    const unplaced = new Set<string>();
    for (const file of sourceFiles(src)) {
      const from = unit(file);
      if (!floorOf.has(from)) unplaced.add(from);
      for (const m of readFileSync(file, 'utf8').matchAll(/(?:from|import)\s*\(?\s*'(\.{1,2}\/[^']+)'/g)) {
        const to = unit(path.resolve(path.dirname(file), m[1]).replace(/\.js$/, '.ts'));
        if (to === from) continue;
        if (!floorOf.has(to)) unplaced.add(to);
        else if ((floorOf.get(to) as number) > (floorOf.get(from) as number)) upward.push(`${path.relative(src, file)} imports ${m[1]}`);
      }
    }
    expect([...unplaced], 'folders missing from FLOORS').toEqual([]);
    expect(upward).toEqual([]);
  });
});
