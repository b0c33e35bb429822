import { createHash } from 'node:crypto';
import { readFile, stat } from 'node:fs/promises';
import sharp, { type Metadata } from 'sharp';
import { documentError } from '../errors.js';
import type { GrayImage } from '../image/raster.js';
import { fromRawBuffer } from '../image/raster.js';
import type { DecodeLimits, PageSource } from './limits.js';
import { checkPageSize, checkTotalPixels, DEFAULT_LIMITS } from './limits.js';
import { isPdf, openPdf } from './pdf.js';

export { DEFAULT_LIMITS, type DecodeLimits } from './limits.js';

export interface DecodedDocument {
  /** File path, or "<buffer>" for in-memory input. */
  source: string;
  sha256: string;
  format: string;
  pages: GrayImage[];
}

/** An opened document: its identity and its pages, decoded one at a time. */
export interface OpenedDocument extends PageSource {
  source: string;
  sha256: string;
  format: string;
}

const FORMATS = new Set(['png', 'jpeg', 'tiff', 'webp']);

async function readBytes(input: string | Buffer, limits: DecodeLimits): Promise<Buffer> {
  if (typeof input !== 'string') return input;
  try {
    const st = await stat(input);
    if (!st.isFile()) throw documentError(input, 'not a regular file');
    if (st.size > limits.maxBytes) throw documentError(input, `file is ${st.size} bytes, over the ${limits.maxBytes}-byte limit`);
    return await readFile(input);
  } catch (err) {
    if (err instanceof Error && err.name === 'FormgleanError') throw err;
    const code = (err as NodeJS.ErrnoException).code;
    throw documentError(input, code === 'ENOENT' ? 'file not found' : `cannot read file (${code ?? 'error'})`);
  }
}

async function pageMeta(bytes: Buffer, source: string, page: number): Promise<Metadata> {
  try {
    return await sharp(bytes, { page, limitInputPixels: false }).metadata();
  } catch {
    throw documentError(source, page === 0 ? 'not a readable image (expected png, jpeg, tiff, webp or pdf)' : `page ${page + 1} cannot be read`);
  }
}

/**
 * Open png, jpeg, tiff (multi-page), webp or PDF (rendered at 200 DPI). Every page's size is checked from the file's
 * headers against the page, side and total pixel limits before any page is decoded.
 */
export async function openDocument(input: string | Buffer, limits: DecodeLimits = DEFAULT_LIMITS): Promise<OpenedDocument> {
  const source = typeof input === 'string' ? input : '<buffer>';
  const bytes = await readBytes(input, limits);
  if (bytes.length === 0) throw documentError(source, 'empty file');
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  if (isPdf(bytes)) return { source, sha256, format: 'pdf', ...(await openPdf(bytes, source, limits)) };

  const meta = await pageMeta(bytes, source, 0);
  const format = meta.format ?? 'unknown';
  if (!FORMATS.has(format)) throw documentError(source, `unsupported image format "${format}" (expected png, jpeg, tiff, webp or pdf)`);
  const pageCount = meta.pages ?? 1;
  if (pageCount > limits.maxPages) throw documentError(source, `document has ${pageCount} pages, over the ${limits.maxPages}-page limit`);
  let total = 0;
  for (let page = 0; page < pageCount; page++) {
    // Pages of a TIFF may differ in size: each page's own header (cheap: nothing is decoded).
    const m = page === 0 ? meta : await pageMeta(bytes, source, page);
    const w = m.width ?? 0;
    const h = m.pageHeight ?? m.height ?? 0;
    checkPageSize(source, pageCount > 1 ? `page ${page + 1} is` : 'page is', w, h, limits);
    total += w * h;
    checkTotalPixels(source, total, limits);
  }
  return {
    source,
    sha256,
    format,
    pageCount,
    async page(page: number): Promise<GrayImage> {
      try {
        const { data, info } = await sharp(bytes, { page, limitInputPixels: limits.maxPixels, failOn: 'error' })
          .rotate() // apply EXIF orientation
          // Transparent parts are paper: flatten onto white before dropping colour (alone, grayscale() keeps the
          // colour channels of a transparent pixel, which are usually black).
          .flatten({ background: '#ffffff' })
          .grayscale()
          .raw()
          .toBuffer({ resolveWithObject: true });
        return fromRawBuffer(data, info.width, info.height, info.channels);
      } catch (err) {
        const why = err instanceof Error ? err.message.split('\n')[0] : String(err);
        throw documentError(source, `page ${page + 1} cannot be decoded (corrupt or truncated image: ${why})`);
      }
    },
    close: () => undefined,
  };
}

/** Decode every page of a document into upright grayscale rasters (EXIF orientation applied, alpha onto white). */
export async function decodeDocument(input: string | Buffer, limits: DecodeLimits = DEFAULT_LIMITS): Promise<DecodedDocument> {
  const doc = await openDocument(input, limits);
  try {
    const pages: GrayImage[] = [];
    for (let i = 0; i < doc.pageCount; i++) pages.push(await doc.page(i));
    return { source: doc.source, sha256: doc.sha256, format: doc.format, pages };
  } finally {
    doc.close();
  }
}
