import { PDFiumLibrary, type PDFiumDocument } from '@hyzyla/pdfium';
import { documentError } from '../errors.js';
import type { GrayImage } from '../image/raster.js';
import type { DecodeLimits, PageSource } from './limits.js';
import { checkPageSize, checkTotalPixels } from './limits.js';

/**
 * Scanned PDFs are rendered at 200 DPI, the resolution the demo reference layouts are drawn at and a usual office
 * scan setting (common practice: 200–300 DPI).
 */
export const PDF_DPI = 200;

/** PDF files start with "%PDF-" (ISO 32000-1:2008 §7.5.2, file header). */
export function isPdf(bytes: Uint8Array): boolean {
  return bytes.length >= 5 && Buffer.from(bytes.subarray(0, 5)).toString('latin1') === '%PDF-';
}

// PDFium (WebAssembly, in the package: nothing is downloaded) is started once per process.
let library: Promise<PDFiumLibrary> | null = null;

/**
 * Open a PDF for page-at-a-time rendering. Every page's rendered size is checked against the page and total pixel
 * limits from the page dictionaries before any page is rendered.
 */
export async function openPdf(bytes: Buffer, source: string, limits: DecodeLimits, dpi = PDF_DPI): Promise<PageSource> {
  library ??= PDFiumLibrary.init();
  const lib = await library;
  let doc: PDFiumDocument;
  try {
    doc = await lib.loadDocument(bytes);
  } catch {
    throw documentError(source, 'not a readable PDF (corrupt, truncated or encrypted)');
  }
  const scale = dpi / 72; // PDF user space is in points, 72 to the inch (ISO 32000-1 §8.3.2.3)
  try {
    const count = doc.getPageCount();
    if (count === 0) throw documentError(source, 'PDF has no pages');
    if (count > limits.maxPages) throw documentError(source, `document has ${count} pages, over the ${limits.maxPages}-page limit`);
    const sizes = [...doc.pages()].map((page) => {
      const { originalWidth, originalHeight } = page.getOriginalSize();
      return { w: Math.round(originalWidth * scale), h: Math.round(originalHeight * scale) };
    });
    sizes.forEach(({ w, h }, i) => checkPageSize(source, `page ${i + 1} renders to`, w, h, limits));
    checkTotalPixels(source, sizes.reduce((a, s) => a + s.w * s.h, 0), limits);
  } catch (err) {
    doc.destroy();
    throw err;
  }
  return {
    pageCount: doc.getPageCount(),
    async page(index: number): Promise<GrayImage> {
      const r = await doc.getPage(index).render({ scale, colorSpace: 'Gray', render: 'bitmap' } as Parameters<ReturnType<PDFiumDocument['getPage']>['render']>[0]);
      if (r.data.length !== r.width * r.height) throw documentError(source, `page ${index + 1} did not render as a grayscale image`);
      return { width: r.width, height: r.height, data: new Uint8Array(r.data) };
    },
    close: () => doc.destroy(),
  };
}

/**
 * Render one page (0-based) of a PDF at `dpi` to a grayscale raster, widget appearances included: used to draw a
 * fillable form's blank (flattened first, src/draft/from-pdf/flatten.ts), and its filled copies, without rendering the
 * other pages.
 */
export async function renderPdfPage(bytes: Uint8Array, source: string, pageIndex: number, dpi = PDF_DPI): Promise<GrayImage> {
  library ??= PDFiumLibrary.init();
  const lib = await library;
  let doc;
  try {
    doc = await lib.loadDocument(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength));
  } catch {
    throw documentError(source, 'not a readable PDF (corrupt, truncated or encrypted)');
  }
  try {
    const count = doc.getPageCount();
    if (pageIndex < 0 || pageIndex >= count) throw documentError(source, `page ${pageIndex + 1} does not exist (the PDF has ${count})`);
    const page = doc.getPage(pageIndex);
    const r = await page.render({ scale: dpi / 72, colorSpace: 'Gray', render: 'bitmap' } as Parameters<typeof page.render>[0]);
    if (r.data.length !== r.width * r.height) throw documentError(source, `page ${pageIndex + 1} did not render as a grayscale image`);
    return { width: r.width, height: r.height, data: new Uint8Array(r.data) };
  } finally {
    doc.destroy();
  }
}
