import { createHash } from 'node:crypto';
import { readFile, stat } from 'node:fs/promises';
import sharp, { type Metadata } from 'sharp';
import { documentError } from '../errors.js';
import type { GrayImage } from '../page/raster.js';
import { fromRawBuffer } from '../page/raster.js';
import { isPdf, renderPdfPages } from './pdf.js';

export interface DecodeLimits {
  /** Largest page accepted, in pixels (guards against decompression bombs). */
  maxPixels: number;
  /** Most pages read from one file. */
  maxPages: number;
  /** Largest file accepted, in bytes. */
  maxBytes: number;
}

/** 60 MP is a letter page at 900 DPI: far beyond any office scan (common practice: 200–300 DPI). */
export const DEFAULT_LIMITS: DecodeLimits = { maxPixels: 60_000_000, maxPages: 50, maxBytes: 200 * 1024 * 1024 };

export interface DecodedDocument {
  /** File path, or "<buffer>" for in-memory input. */
  source: string;
  sha256: string;
  format: string;
  pages: GrayImage[];
}

const FORMATS = new Set(['png', 'jpeg', 'tiff', 'webp']);

/**
 * Decode png, jpeg, tiff (multi-page), webp or PDF (rendered at 200 DPI) into upright grayscale page rasters
 * (EXIF orientation applied).
 */
export async function decodeDocument(
  input: string | Buffer,
  limits: DecodeLimits = DEFAULT_LIMITS,
): Promise<DecodedDocument> {
  const source = typeof input === 'string' ? input : '<buffer>';
  let bytes: Buffer;
  if (typeof input === 'string') {
    try {
      const st = await stat(input);
      if (!st.isFile()) throw documentError(source, 'not a regular file');
      if (st.size > limits.maxBytes) throw documentError(source, `file is ${st.size} bytes, over the ${limits.maxBytes}-byte limit`);
      bytes = await readFile(input);
    } catch (err) {
      if (err instanceof Error && err.name === 'FormgleanError') throw err;
      const code = (err as NodeJS.ErrnoException).code;
      throw documentError(source, code === 'ENOENT' ? 'file not found' : `cannot read file (${code ?? 'error'})`);
    }
  } else {
    bytes = input;
  }
  if (bytes.length === 0) throw documentError(source, 'empty file');
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  if (isPdf(bytes)) return { source, sha256, format: 'pdf', pages: await renderPdfPages(bytes, source, limits) };

  let meta: Metadata;
  try {
    meta = await sharp(bytes, { limitInputPixels: false }).metadata();
  } catch {
    throw documentError(source, 'not a readable image (expected png, jpeg, tiff, webp or pdf)');
  }
  const format = meta.format ?? 'unknown';
  if (!FORMATS.has(format)) throw documentError(source, `unsupported image format "${format}" (expected png, jpeg, tiff, webp or pdf)`);
  const width = meta.width ?? 0;
  const height = meta.pageHeight ?? meta.height ?? 0;
  if (width * height > limits.maxPixels) {
    throw documentError(source, `page is ${width}x${height} = ${width * height} pixels, over the ${limits.maxPixels}-pixel limit`);
  }
  const pageCount = meta.pages ?? 1;
  if (pageCount > limits.maxPages) throw documentError(source, `document has ${pageCount} pages, over the ${limits.maxPages}-page limit`);

  const pages: GrayImage[] = [];
  for (let page = 0; page < pageCount; page++) {
    try {
      const { data, info } = await sharp(bytes, { page, limitInputPixels: limits.maxPixels, failOn: 'error' })
        .rotate() // apply EXIF orientation
        .grayscale()
        .raw()
        .toBuffer({ resolveWithObject: true });
      pages.push(fromRawBuffer(data, info.width, info.height, info.channels));
    } catch (err) {
      const why = err instanceof Error ? err.message.split('\n')[0] : String(err);
      throw documentError(source, `page ${page + 1} cannot be decoded (corrupt or truncated image: ${why})`);
    }
  }
  return { source, sha256, format, pages };
}
