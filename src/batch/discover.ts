import type { Dirent } from 'node:fs';
import { readdir, realpath, stat } from 'node:fs/promises';
import path from 'node:path';
import { glob } from 'tinyglobby';
import { configError } from '../errors.js';
import { isReservedId, JOURNAL_FILE, RESULTS_FILE } from '../results/layout.js';
import { recordedPath } from '../results/recorded-path.js';

/** File extensions taken from folders; a file named explicitly is always tried (and fails cleanly if not an image). */
export const IMAGE_EXTENSIONS = ['png', 'jpg', 'jpeg', 'tif', 'tiff', 'webp', 'pdf'];

/**
 * Images formglean itself writes beside other files (schema draft overlays, the detector's precision-recall plot,
 * score's reliability diagram): found in a folder of scans they are outputs, not forms. Crops and records live in a
 * results folder, which is skipped whole.
 */
const OWN_OUTPUT_NAMES: readonly { pattern: RegExp; what: string }[] = [
  { pattern: /\.overlay\.png$/i, what: 'a field overlay' },
  { pattern: /^detector-pr\.png$/i, what: 'a detector precision-recall plot' },
  { pattern: /-reliability\.png$/i, what: 'a reliability diagram' },
];

export interface SkippedInput {
  path: string;
  reason: string;
}

export interface DiscoveredInputs {
  /** Absolute paths, sorted, each file once. */
  files: string[];
  /** Everything found in the folders searched and not tried, with the reason; never silent. */
  skipped: SkippedInput[];
}

export interface DiscoverOptions {
  /** Folders never searched (the run's own results folder). */
  exclude?: readonly string[];
}

async function isResultsFolder(dir: string): Promise<boolean> {
  for (const name of [RESULTS_FILE, JOURNAL_FILE]) {
    if (await stat(path.join(dir, name)).then(() => true, () => false)) return true;
  }
  return false;
}

class Discovery {
  readonly files = new Map<string, string>(); // real path -> path as found
  readonly skipped: SkippedInput[] = [];
  private readonly searched = new Set<string>();
  private readonly excluded: Set<string>;

  constructor(exclude: readonly string[]) {
    this.excluded = new Set(exclude.map((d) => path.resolve(d)));
  }

  private skip(file: string, reason: string): void {
    this.skipped.push({ path: path.resolve(file), reason });
  }

  /** A file found by a folder search or a pattern; `named` files skip the hidden/extension rules. */
  async addFile(file: string, named: boolean): Promise<void> {
    const base = path.basename(file);
    if (!named && base.startsWith('.')) return this.skip(file, 'hidden file');
    if (!named && !IMAGE_EXTENSIONS.includes(path.extname(base).slice(1).toLowerCase())) {
      return this.skip(file, `not a ${IMAGE_EXTENSIONS.join(', ')} file (by its extension)`);
    }
    const own = OWN_OUTPUT_NAMES.find((o) => o.pattern.test(base));
    if (own && !named) return this.skip(file, `formglean's own output (${own.what})`);
    const real = await realpath(file).catch(() => path.resolve(file));
    const here = path.resolve(file);
    const first = this.files.get(real);
    if (first === undefined || first === here) {
      this.files.set(real, here);
    } else if (here === real) {
      // The file itself, found after a link to it: the file keeps its own name and id, the link is skipped.
      this.files.set(real, here);
      this.skip(first, `same file as ${recordedPath(here)} (a second link to it)`);
    } else {
      this.skip(file, `same file as ${recordedPath(first)} (a second link to it)`);
    }
  }

  async addFolder(dir: string): Promise<void> {
    const real = await realpath(dir).catch(() => path.resolve(dir));
    if (this.searched.has(real)) return this.skip(dir, 'folder already searched (a link back to it: a loop, or a second link)');
    if (this.excluded.has(path.resolve(dir)) || this.excluded.has(real)) return this.skip(dir, "this run's results folder (output, not input)");
    if (await isResultsFolder(dir)) return this.skip(dir, 'a formglean results folder (output, not input)');
    this.searched.add(real);
    let entries: Dirent[];
    try {
      entries = await readdir(dir, { withFileTypes: true });
    } catch (err) {
      return this.skip(dir, `cannot read folder (${(err as NodeJS.ErrnoException).code ?? 'error'})`);
    }
    entries.sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
    for (const e of entries) {
      const full = path.join(dir, e.name);
      let isDir = e.isDirectory();
      let isFile = e.isFile();
      if (e.isSymbolicLink()) {
        const target = await stat(full).catch(() => null);
        if (target === null) {
          this.skip(full, 'broken symbolic link');
          continue;
        }
        isDir = target.isDirectory();
        isFile = target.isFile();
      }
      if (isDir) {
        if (e.name.startsWith('.')) this.skip(full, 'hidden folder');
        else await this.addFolder(full);
      } else if (isFile) {
        await this.addFile(full, false);
      } else {
        this.skip(full, 'not a regular file');
      }
    }
  }
}

/**
 * Expand the command line's files, folders (searched recursively, following links once) and glob patterns into a
 * sorted list of absolute paths, each real file once. Whatever a folder holds that is not tried is listed with the
 * reason: hidden entries, other formats, unreadable folders, results folders (so output written inside an input
 * folder is never read back as input), formglean's own images, second links to a file or folder already taken.
 * A name that matches nothing is a usage error.
 */
export async function discoverInputs(inputs: readonly string[], options: DiscoverOptions = {}): Promise<DiscoveredInputs> {
  const d = new Discovery(options.exclude ?? []);
  for (const input of inputs) {
    const st = await stat(input).catch(() => null);
    if (st?.isFile()) {
      await d.addFile(input, true);
      continue;
    }
    if (st?.isDirectory()) {
      const [files, skipped] = [d.files.size, d.skipped.length];
      await d.addFolder(input);
      if (d.files.size === files) {
        const n = d.skipped.length - skipped;
        throw configError(input, `folder holds no png, jpeg, tiff, webp or pdf files${n > 0 ? ` to read (${n} entr${n === 1 ? 'y' : 'ies'} skipped)` : ''}`);
      }
      continue;
    }
    const matches = await glob(input, { cwd: process.cwd(), absolute: true, onlyFiles: true, caseSensitiveMatch: false, dot: false });
    if (matches.length === 0) throw configError(input, 'no such file, folder or matching files');
    for (const f of matches.sort()) {
      const inResults = await Promise.all([path.dirname(f), path.dirname(path.dirname(f)), path.dirname(path.dirname(path.dirname(f)))].map(isResultsFolder));
      if (inResults.some(Boolean)) d.skipped.push({ path: f, reason: 'inside a formglean results folder (output, not input)' });
      else await d.addFile(f, true);
    }
  }
  return { files: [...d.files.values()].sort(), skipped: d.skipped };
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
    // Letters and digits of any script stay (Müller stays Müller, not M_ller); NFC so one name gives one id.
    let id = rel.normalize('NFC').replace(/\.[^.\\/]+$/, '').replace(/[\\/]+/g, '__').replace(/[^\p{L}\p{N}._-]+/gu, '_');
    if (isReservedId(id)) id = `${id}_doc`;
    let unique = id;
    for (let n = 2; used.has(unique.toLowerCase()); n++) unique = `${id}-${n}`;
    used.add(unique.toLowerCase());
    ids.set(f, unique);
  }
  return ids;
}
