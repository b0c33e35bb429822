import { readdir } from 'node:fs/promises';
import path from 'node:path';
import { writeFileAtomic } from '../io/atomic-write.js';
import type { Box } from '../image/geometry.js';
import { clampBox, roundBox } from '../image/geometry.js';
import type { GrayImage } from '../image/raster.js';
import { cropGray, grayToPng, sharpFromGray } from '../image/raster.js';
import type { DocumentResult, ResultBox } from '../result/document.js';
import { contextCropName, CROPS_DIR, cropName, reviewDir } from '../results/review-layout.js';
import { isPending } from './pending.js';
import { hasLayoutRow, LAYOUT_ROW_FIELD } from './layout-question.js';
import { reviewRowId } from './row-id.js';

/**
 * zlib level of the review crops' PNGs. Scans carry grain that deflate gains little on: level 3 against sharp's
 * default 6 measured 7-12 % larger files for a third of the encoding time (a 700 x 120 field crop and a 1500 x 400
 * framed context crop of a generated scan; bench/crop-png.ts), and crops are written for every field sent to review.
 */
const CROP_PNG = { compressionLevel: 3 } as const;

/** Pixels added around the field box in the field crop: the schema's default reading padding (4 px). */
const FIELD_PAD = 4;

/**
 * Margins of the context crop: wide enough to take in a printed label beside or above the field
 * (labels sit left of or above entry areas on most forms: common practice), capped so a page-wide
 * field does not turn into a whole-page image.
 */
function contextMargins(b: Box): { mx: number; my: number } {
  const mx = Math.min(400, Math.max(48, 0.5 * b.w, 4 * b.h));
  const my = Math.min(200, Math.max(32, 1.5 * b.h));
  return { mx, my };
}

function grow(b: Box, mx: number, my: number): Box {
  return { x: b.x - mx, y: b.y - my, w: b.w + 2 * mx, h: b.h + 2 * my };
}

/** Frame stroke and the gap left between it and the field box, so the frame never covers ink in the field. */
const FRAME_STROKE = 2;
const FRAME_GAP = 3;

/** The context crop as RGB PNG with a coloured frame around the field so the eye finds it among its neighbours. */
async function contextPng(page: GrayImage, box: Box): Promise<Buffer> {
  const { mx, my } = contextMargins(box);
  const area = clampBox(roundBox(grow(box, mx, my)), page.width, page.height);
  const crop = cropGray(page, area);
  const fx = box.x - area.x - FRAME_GAP;
  const fy = box.y - area.y - FRAME_GAP;
  const fw = box.w + 2 * FRAME_GAP;
  const fh = box.h + 2 * FRAME_GAP;
  const svg =
    `<svg xmlns="http://www.w3.org/2000/svg" width="${crop.width}" height="${crop.height}">` +
    `<rect x="${fx.toFixed(1)}" y="${fy.toFixed(1)}" width="${fw.toFixed(1)}" height="${fh.toFixed(1)}" ` +
    `fill="none" stroke="#d9480f" stroke-width="${FRAME_STROKE}"/></svg>`;
  return sharpFromGray(crop)
    .toColourspace('srgb')
    .composite([{ input: Buffer.from(svg), top: 0, left: 0 }])
    .png(CROP_PNG)
    .toBuffer();
}

/** Width of the page preview: enough to read a form's title and headings, small enough for a queue (common practice). */
const PREVIEW_WIDTH = 1000;

async function pagePreviewPng(page: GrayImage): Promise<Buffer> {
  return sharpFromGray(page)
    .resize({ width: Math.min(PREVIEW_WIDTH, page.width) })
    .png()
    .toBuffer();
}

function usableBox(box: ResultBox | null, pages: readonly GrayImage[]): box is ResultBox {
  if (box === null || box.page >= pages.length) return false;
  const page = pages[box.page];
  const c = clampBox(box, page.width, page.height);
  return c.w >= 1 && c.h >= 1;
}

/**
 * For each field still waiting for review, write review/crops/<row id>.png (the field with a small padding)
 * and review/crops/<row id>.context.png (the field and its surroundings, framed). `pages` are the upright page
 * rasters the result boxes refer to (box.page indexes them). Fields without a usable box get no crop.
 */
export async function writeReviewCrops(outDir: string, result: DocumentResult, pages: GrayImage[]): Promise<void> {
  const dir = reviewDir(outDir);
  if (hasLayoutRow(result) && pages.length > 0) {
    // The layout row's crop is the whole first page: the reviewer tells the form by its look.
    const id = reviewRowId(result.document.sha256, LAYOUT_ROW_FIELD);
    await writeFileAtomic(path.join(dir, cropName(id)), await pagePreviewPng(pages[0]));
  }
  for (const field of result.fields) {
    if (!isPending(field.status) || !usableBox(field.box, pages)) continue;
    const page = pages[field.box.page];
    const id = reviewRowId(result.document.sha256, field.name);
    const fieldCrop = cropGray(page, grow(field.box, FIELD_PAD, FIELD_PAD));
    await writeFileAtomic(path.join(dir, cropName(id)), await grayToPng(fieldCrop, CROP_PNG.compressionLevel));
    await writeFileAtomic(path.join(dir, contextCropName(id)), await contextPng(page, field.box));
  }
}

/** Names of the crop files present, relative to the review folder (as the queue lists them). */
export async function listCrops(outDir: string): Promise<Set<string>> {
  try {
    return new Set((await readdir(path.join(reviewDir(outDir), CROPS_DIR))).map((n) => `${CROPS_DIR}/${n}`));
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return new Set();
    throw err;
  }
}
