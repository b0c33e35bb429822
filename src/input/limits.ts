import { documentError } from '../errors.js';
import type { GrayImage } from '../image/raster.js';

export interface DecodeLimits {
  /** Largest page accepted, in pixels (guards against decompression bombs). */
  maxPixels: number;
  /** Most pixels of all pages of one file together: a small file of many huge pages is refused before decoding. */
  maxTotalPixels: number;
  /** Shortest page side accepted, in pixels: a thinner strip is no page and is refused from its header. */
  minSide: number;
  /** Most pages read from one file. */
  maxPages: number;
  /** Largest file accepted, in bytes. */
  maxBytes: number;
}

/**
 * 60 MP is a letter page at 900 DPI: far beyond any office scan (common practice: 200–300 DPI). The total allows
 * the 50-page limit at a letter page at 300 DPI (8.4 MP) each, about 420 MP; a file past it is refused from its
 * headers instead of being decoded (a 370 KB TIFF of 50 one-bit 7740 x 7740 pages would otherwise take 3 GB).
 * A side under 16 px holds nothing a form could be read from; refusing it from the header saves decoding a
 * 1 x 59 000 000 strip that the per-page limit lets through. Whether a page is big enough to read is the page gate's
 * question (src/pipeline/page-gate.ts).
 */
export const DEFAULT_LIMITS: DecodeLimits = {
  maxPixels: 60_000_000,
  maxTotalPixels: 420_000_000,
  minSide: 16,
  maxPages: 50,
  maxBytes: 200 * 1024 * 1024,
};

/** A document's pages, decoded one at a time on request, so that only the pages in use are held. */
export interface PageSource {
  pageCount: number;
  page(index: number): Promise<GrayImage>;
  close(): void;
}

/** `page` says which page and how it was measured: "page is", "page 3 is", "page 3 renders to". */
export function checkPageSize(source: string, page: string, w: number, h: number, limits: DecodeLimits): void {
  if (w * h > limits.maxPixels) {
    throw documentError(source, `${page} ${w}x${h} = ${w * h} pixels, over the ${limits.maxPixels}-pixel limit`);
  }
  if (Math.min(w, h) < limits.minSide) {
    throw documentError(source, `${page} ${w}x${h} pixels: a side under ${limits.minSide} px cannot hold a form`);
  }
}

export function checkTotalPixels(source: string, total: number, limits: DecodeLimits): void {
  if (total > limits.maxTotalPixels) {
    throw documentError(source, `pages add up to ${total} pixels, over the ${limits.maxTotalPixels}-pixel limit for one file`);
  }
}
