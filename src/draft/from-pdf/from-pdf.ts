import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { configError } from '../../errors.js';
import { PDF_DPI, renderPdfPage } from '../../input/pdf.js';
import { printedBlankPdf } from './flatten.js';
import { writeFileAtomic } from '../../io/atomic-write.js';
import { grayToPng, type GrayImage } from '../../image/raster.js';
import { FormSchema } from '../../schema/definition.js';
import { formatJsonPath } from '../../schema/load.js';
import type { SchemaValue } from '../../schema/schema-value.js';
import { schemaYaml } from '../../schema/yaml-write.js';
import { assembleFields, assembleSchema, type FieldSource } from './assemble.js';
import { loadPdf, readPageWidgets, type SkippedWidgets } from './widgets.js';

/** A schema drafted from a fillable PDF page, with the blank it is drawn on and each field's widgets. */
export interface PdfSchemaDraft {
  schema: SchemaValue;
  blank: GrayImage;
  sources: FieldSource[];
  /** 0-based page of the PDF. */
  page: number;
  /** Page height in points (widget rectangles are measured from the bottom). */
  pageHeightPt: number;
  dpi: number;
  skipped: SkippedWidgets;
}

/** "forms/irs-f1040.pdf" -> "irs-f1040". */
export function formNameOf(file: string): string {
  return path.basename(file).replace(/\.pdf$/i, '');
}

/**
 * Draft a schema from the widgets of one page (0-based) of a fillable PDF, on the page rendered at 200 DPI by PDFium.
 * `image` is the blank's file name as the schema names it.
 */
export async function draftFromPdf(file: string, o: { page?: number; image: string; name?: string; bytes?: Uint8Array }): Promise<PdfSchemaDraft> {
  let bytes = o.bytes;
  if (!bytes) {
    try {
      bytes = await readFile(file);
    } catch (err) {
      throw configError(file, `cannot read (${(err as NodeJS.ErrnoException).code ?? 'error'})`);
    }
  }
  const page = o.page ?? 0;
  const doc = await loadPdf(bytes, file);
  const widgets = readPageWidgets(doc, page, file);
  if (widgets.widgets.length === 0) throw configError(file, `page ${page + 1} has no fillable widgets (only push buttons, hidden, read-only or barcode fields)`);
  const dpi = PDF_DPI;
  // The blank as the form prints, the boxes a viewer draws for fields with no appearance of their own included.
  // The widgets are read: the document they came from can be flattened now, not parsed a second time.
  const blank = await renderPdfPage((await printedBlankPdf(doc)) ?? bytes, file, page, dpi);
  const parts = assembleFields(widgets, dpi, blank.width, blank.height);
  const name = o.name ?? formNameOf(file);
  const schema = assembleSchema(parts, { name, image: o.image, description: `Drafted from the fillable PDF ${path.basename(file)}, page ${page + 1}` });
  // The drafted value must pass the schema's own checks before anything is written: a failure here is a bug.
  const parsed = FormSchema.safeParse(schema);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw configError(file, `drafted schema does not validate: ${formatJsonPath(issue.path)}: ${issue.message}`);
  }
  return { schema, blank, sources: parts.fields, page, pageHeightPt: widgets.height, dpi, skipped: widgets.skipped };
}

/** The blank image's name beside a schema file: "out/form.yaml" -> "form.blank.png". */
export function blankImageName(out: string): string {
  return `${path.basename(out).replace(/\.(ya?ml|json)$/i, '')}.blank.png`;
}

/** Write the schema YAML and its blank reference image beside it (both atomically). */
export async function writePdfSchema(draft: PdfSchemaDraft, out: string): Promise<{ schema: string; blank: string }> {
  const blank = path.join(path.dirname(out), draft.schema.pages[0].image);
  await writeFileAtomic(blank, await grayToPng(draft.blank, 6));
  await writeFileAtomic(out, schemaYaml(draft.schema));
  return { schema: out, blank };
}
