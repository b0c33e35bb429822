import path from 'node:path';
import { writeFileAtomic, writeJsonAtomic } from '../../src/io/atomic-write.js';
import type { GrayImage } from '../../src/image/raster.js';
import { grayFromImage } from '../../src/image/raster.js';
import type { LoadedSchema } from '../../src/schema/load.js';
import { CocoBuilder } from '../../src/synth/coco.js';
import { encodePage } from '../../src/synth/encode-page.js';
import { drawPen, type FillMode } from '../../src/synth/fill.js';
import { pageStem } from '../../src/synth/generate.js';
import type { Layout } from '../../src/synth/layout-model.js';
import { pageSvg } from '../../src/synth/page-svg.js';
import { pageSeed, Rng } from '../../src/synth/prng.js';
import { rasterizeSvg } from '../../src/synth/rasterize.js';
import { drawScanParams, type DegradeLevel, type ScanParams } from '../../src/synth/scan-params.js';
import { simulateScan } from '../../src/synth/scan-simulate.js';
import { pageTruth, type PageTruth } from '../../src/synth/truth.js';
import { loadW4Schema, W4_BLANK, W4_LAYOUT, w4Layout } from './w4-layout.js';
import { fillW4 } from './w4-values.js';

/**
 * Fill the real blank with invented values for one seed: the writer's ink is rendered by the synthetic page
 * renderer (typed or handwriting-style fonts from npm, checkbox marks, a made-up signature scribble) on white paper,
 * laid onto the blank by taking the darker of the two pixels (ink does not lighten print), then optionally put through
 * the synthetic scan simulation, whose transform also moves the truth boxes.
 */

export interface W4PageRequest {
  /** Run seed (use >= 900000 for anything measured). */
  seed: number;
  index: number;
  fill: FillMode | 'mixed';
  degrade: DegradeLevel;
  /** Share of pages fed upside down (only when degrading); default 0. */
  upsideDownRate?: number;
}

export interface W4Page {
  image: GrayImage;
  scan: ScanParams;
  truth: PageTruth;
  stem: string;
}

let blank: Promise<GrayImage> | undefined;

/** The blank, decoded once per process. */
export function w4Blank(): Promise<GrayImage> {
  blank ??= grayFromImage(W4_BLANK);
  return blank;
}

/** Print and ink on one sheet: the darker pixel wins. */
function darken(print: GrayImage, ink: GrayImage): GrayImage {
  if (print.width !== ink.width || print.height !== ink.height) {
    throw new Error(`ink layer ${ink.width}x${ink.height} does not match the blank ${print.width}x${print.height}`);
  }
  const data = new Uint8Array(print.data.length);
  for (let i = 0; i < data.length; i++) data[i] = Math.min(print.data[i], ink.data[i]);
  return { width: print.width, height: print.height, data };
}

/** One filled page of the W-4 layout with its truth (same truth format as `samples generate`). */
export async function renderW4Page(layout: Layout, req: W4PageRequest): Promise<W4Page> {
  const seedOfPage = pageSeed(req.seed, req.index, W4_LAYOUT);
  const rng = new Rng(seedOfPage);
  const fill: FillMode = req.fill === 'mixed' ? (rng.fork('mode').chance(0.5) ? 'typed' : 'handwriting') : req.fill;
  const pen = drawPen(rng.fork('pen'), fill);
  const fills = fillW4(layout, fill, rng.fork('fill'));
  const ink = await rasterizeSvg(pageSvg(layout, fills, fill === 'blank' ? null : pen, rng.fork('ink')));
  const reference = darken(await w4Blank(), ink);
  const scan = drawScanParams(rng.fork('scan'), layout.width, layout.height, { level: req.degrade, upsideDownRate: req.upsideDownRate ?? 0 });
  const image = await simulateScan(reference, scan, rng.fork('noise'));
  const stem = pageStem(W4_LAYOUT, req.seed, req.index);
  const truth = pageTruth({ layout, seed: req.seed, index: req.index, file: `${stem}.png`, fill, pen, fills, scan });
  return { image, scan, truth, stem };
}

export interface W4SetOptions extends Omit<W4PageRequest, 'index'> {
  count: number;
  out: string;
  schema?: LoadedSchema;
}

export interface W4Set {
  out: string;
  /** Each page's stem and the scan drawn for it (its transform carries reference boxes onto the page). */
  pages: { stem: string; scan: ScanParams }[];
  coco: string;
}

/** Write `count` filled pages: OUT/<stem>.png, OUT/truth/<stem>.json and OUT/coco.json, each atomically. */
export async function writeW4Set(o: W4SetOptions): Promise<W4Set> {
  const layout = w4Layout(o.schema ?? (await loadW4Schema()));
  const coco = new CocoBuilder();
  const pages: W4Set['pages'] = [];
  for (let index = 0; index < o.count; index++) {
    const page = await renderW4Page(layout, { ...o, index });
    const file = `${page.stem}.png`;
    await writeFileAtomic(path.join(o.out, file), await encodePage(page.image, 'png', page.scan.dpi, 90));
    await writeJsonAtomic(path.join(o.out, 'truth', `${page.stem}.json`), page.truth);
    coco.addPage(file, layout, page.scan);
    pages.push({ stem: page.stem, scan: page.scan });
  }
  const cocoFile = path.join(o.out, 'coco.json');
  await writeJsonAtomic(cocoFile, coco.build(`Real blank layout ${W4_LAYOUT} filled with invented values, seed ${o.seed}`));
  return { out: o.out, pages, coco: cocoFile };
}
