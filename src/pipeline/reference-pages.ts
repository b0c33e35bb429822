import { decodeDocument } from '../input/decode.js';
import { configError } from '../errors.js';
import type { GrayImage } from '../image/raster.js';
import type { SchemaFile } from '../schema/load.js';
import { referenceImagePath } from '../schema/load.js';

/**
 * The blank reference pages of a run's schemas, decoded up front by whoever sets up the extraction (the batch, a
 * pool worker, a queue worker, or extractForms for a single call) and owned by it: no page is decoded mid-batch, and
 * a missing or broken blank stops the run before any document is read. Pages are held by image file, so schemas
 * that share a blank share its pixels.
 */
export class ReferencePages {
  private readonly byFile = new Map<string, GrayImage>();

  /** Decode every blank page the schemas name. A missing or broken file is a config error naming the schema and page. */
  static async decode(schemas: readonly SchemaFile[]): Promise<ReferencePages> {
    const refs = new ReferencePages();
    await refs.add(schemas);
    return refs;
  }

  /** Decode the blanks of further schemas (a queue worker meets schemas job by job); blanks held already are kept. */
  async add(schemas: readonly SchemaFile[]): Promise<void> {
    for (const loaded of schemas) {
      for (let i = 0; i < loaded.schema.pages.length; i++) {
        const file = referenceImagePath(loaded, i);
        if (!file || this.byFile.has(file)) continue;
        const page = await decodeDocument(file).then(
          (d) => d.pages[0],
          (err: unknown) => {
            throw configError(loaded.path, `pages[${i}].image: ${err instanceof Error ? err.message : String(err)}`);
          },
        );
        this.byFile.set(file, page);
      }
    }
  }

  /** Whether every blank the schemas name is held. */
  covers(schemas: readonly SchemaFile[]): boolean {
    return schemas.every((s) => s.schema.pages.every((_, i) => {
      const file = referenceImagePath(s, i);
      return !file || this.byFile.has(file);
    }));
  }

  /** The blank image of a schema page, or undefined when the schema names none. */
  page(loaded: SchemaFile, pageIndex: number): GrayImage | undefined {
    const file = referenceImagePath(loaded, pageIndex);
    if (!file) return undefined;
    const page = this.byFile.get(file);
    // A programming error, not a user's: the caller decodes every schema it extracts with before the first page.
    if (!page) throw new Error(`blank reference page ${file} was not decoded before extraction`);
    return page;
  }
}
