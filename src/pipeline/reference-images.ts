import { decodeDocument } from '../input/decode.js';
import { configError } from '../errors.js';
import type { GrayImage } from '../image/raster.js';
import type { LoadedSchema } from '../schema/load.js';
import { referenceImagePath } from '../schema/load.js';

// Blank reference pages are decoded once per process and shared by every document of the batch.
const cache = new Map<string, Promise<GrayImage>>();

/** The blank reference image of a schema page, when the schema names one. A missing or broken file is a config error. */
export function referencePageImage(loaded: LoadedSchema, pageIndex: number): Promise<GrayImage> | undefined {
  const file = referenceImagePath(loaded, pageIndex);
  if (!file) return undefined;
  let pending = cache.get(file);
  if (!pending) {
    pending = decodeDocument(file)
      .then((d) => d.pages[0])
      .catch((err: unknown) => {
        cache.delete(file);
        throw configError(loaded.path, `pages[${pageIndex}].image: ${err instanceof Error ? err.message : String(err)}`);
      });
    cache.set(file, pending);
  }
  return pending;
}
