import type { GrayImage } from '../image/raster.js';
import { drawPen, fillLayout, type FillMode } from './fill.js';
import type { Layout } from './layout-model.js';
import { pageSvg } from './page-svg.js';
import { Rng } from './prng.js';
import { rasterizeSvg } from './rasterize.js';
import { drawScanParams, type ScanOptions, type ScanParams } from './scan-params.js';
import { simulateScan } from './scan-simulate.js';
import { pageTruth, type PageTruth } from './truth.js';

export interface RenderedPage {
  image: GrayImage;
  scan: ScanParams;
  truth: PageTruth;
}

export interface PageRequest {
  layout: Layout;
  /** Seed of this page (already derived from the run seed and index). */
  pageSeed: number;
  runSeed: number;
  index: number;
  file: string;
  fill: FillMode;
  scan: ScanOptions;
  /** Leave the scan's JPEG step to the final encoder (when the output itself is JPEG). */
  encoderDoesJpeg?: boolean;
  /** Write comb digits as real handwriting from the MNIST test split (handwritten-digits.ts). */
  realDigits?: boolean;
}

/** One filled, scanned page with its truth. Every random choice comes from the page seed. */
export async function renderPage(req: PageRequest): Promise<RenderedPage> {
  const rng = new Rng(req.pageSeed);
  const pen = { ...drawPen(rng.fork('pen'), req.fill), ...(req.realDigits ? { realDigits: true } : {}) };
  const fills = fillLayout(req.layout, req.fill, rng.fork('fill'));
  const svg = pageSvg(req.layout, fills, req.fill === 'blank' ? null : pen, rng.fork('ink'));
  const reference = await rasterizeSvg(svg);
  const scan = drawScanParams(rng.fork('scan'), req.layout.width, req.layout.height, req.scan);
  const simulated = req.encoderDoesJpeg ? { ...scan, jpegQuality: null } : scan;
  const image = await simulateScan(reference, simulated, rng.fork('noise'));
  const truth = pageTruth({ layout: req.layout, seed: req.runSeed, index: req.index, file: req.file, fill: req.fill, pen, fills, scan });
  return { image, scan, truth };
}

/** The blank reference page of a layout (no fills, no scan effects). */
export async function renderBlank(layout: Layout): Promise<GrayImage> {
  return rasterizeSvg(pageSvg(layout, null, null, new Rng(0)));
}
