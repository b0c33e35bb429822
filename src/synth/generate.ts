import path from 'node:path';
import { writeFileAtomic, writeJsonAtomic } from '../io/atomic-write.js';
import { CocoBuilder } from './coco.js';
import { encodePage, PAGE_EXTENSIONS, type PageFormat } from './encode-page.js';
import type { FillMode } from './fill.js';
import { layoutFor, type LayoutName } from './layouts.js';
import { pageSeed, Rng } from './prng.js';
import { renderPage } from './render-page.js';
import type { DegradeLevel } from './scan-params.js';
import type { StyleSelection } from './style-families.js';

export interface GenerateOptions {
  layout: LayoutName;
  count: number;
  seed: number;
  out: string;
  /** mixed: each page typed or handwriting-style at random. */
  fill: FillMode | 'mixed';
  degrade: DegradeLevel;
  dpi?: number;
  styles: StyleSelection;
  format: PageFormat;
  /** Share of pages fed upside down (only when degrading). */
  upsideDownRate: number;
  /** Digits in comb cells drawn from real handwriting (the MNIST test split) instead of a font. */
  realDigits?: boolean;
}

export interface GenerateSummary {
  pages: number;
  annotations: number;
  seconds: number;
}

export function pageStem(layout: string, seed: number, index: number): string {
  return `${layout}-${seed}-${String(index).padStart(5, '0')}`;
}

/**
 * Write `count` pages, their truth files and one COCO file. Page i depends only on (seed, i), so a set can be
 * regenerated or extended identically.
 */
export async function generateSamples(o: GenerateOptions, onPage?: (index: number) => void): Promise<GenerateSummary> {
  const started = performance.now();
  const coco = new CocoBuilder();
  const ext = PAGE_EXTENSIONS[o.format];
  for (let index = 0; index < o.count; index++) {
    const seedOfPage = pageSeed(o.seed, index, o.layout);
    const rng = new Rng(seedOfPage);
    const layout = layoutFor(o.layout, rng.fork('layout'), o.styles);
    const fill: FillMode = o.fill === 'mixed' ? (rng.fork('mode').chance(0.5) ? 'typed' : 'handwriting') : o.fill;
    const stem = pageStem(o.layout, o.seed, index);
    const file = `${stem}.${ext}`;
    const page = await renderPage({
      layout,
      pageSeed: seedOfPage,
      runSeed: o.seed,
      index,
      file,
      fill,
      scan: { level: o.degrade, dpi: o.dpi, upsideDownRate: o.upsideDownRate },
      encoderDoesJpeg: o.format === 'jpeg',
      realDigits: o.realDigits,
    });
    const bytes = await encodePage(page.image, o.format, page.scan.dpi, page.scan.jpegQuality ?? 88);
    await writeFileAtomic(path.join(o.out, file), bytes);
    await writeJsonAtomic(path.join(o.out, 'truth', `${stem}.json`), page.truth);
    coco.addPage(file, layout, page.scan);
    onPage?.(index);
  }
  await writeJsonAtomic(path.join(o.out, 'coco.json'), coco.build(`formglean synthetic ${o.layout} seed ${o.seed}`));
  return { pages: o.count, annotations: coco.annotationCount, seconds: (performance.now() - started) / 1000 };
}
