import path from 'node:path';
import { fileURLToPath } from 'node:url';
import sharp from 'sharp';
import { writeFileAtomic, writeJsonAtomic } from '../src/io/atomic-write.js';
import { writeDemoSchema } from '../src/synth/demo-assets.js';
import { encodePage, type PageFormat } from '../src/synth/encode-page.js';
import type { FillMode } from '../src/synth/fill.js';
import { DEMO_LAYOUTS, demoLayout, type DemoLayoutName } from '../src/synth/layouts.js';
import { renderPage, type RenderedPage } from '../src/synth/render-page.js';

/**
 * Regenerates the demo assets identically: schemas/<layout>.yaml with their blank reference images, and the small
 * demo scans in samples/ with their truth. Seeds 500001.. sit between the training (1..99999) and evaluation
 * (>= 900000) ranges, so demo scans are never training or evaluation data.
 */
interface DemoScan {
  stem: string;
  layout: DemoLayoutName;
  fill: FillMode;
  format: PageFormat;
  /** One seed per page; several pages make a multi-page file (a batch of forms scanned together). */
  seeds: number[];
}

export const DEMO_SCANS: readonly DemoScan[] = [
  { stem: 'clinic-intake-typed', layout: 'clinic-intake', fill: 'typed', format: 'png', seeds: [500001] },
  { stem: 'marina-slip-typed', layout: 'marina-slip', fill: 'typed', format: 'jpeg', seeds: [500002] },
  { stem: 'garden-plot-typed', layout: 'garden-plot', fill: 'typed', format: 'png', seeds: [500003] },
  { stem: 'marina-slip-handwriting', layout: 'marina-slip', fill: 'handwriting', format: 'png', seeds: [500004] },
  { stem: 'clinic-intake-batch', layout: 'clinic-intake', fill: 'typed', format: 'tiff', seeds: [500005, 500006] },
];

/** Demo scans are small: 150 DPI, an ordinary office scan. */
const DEMO_DPI = 150;

const EXT: Record<PageFormat, string> = { png: 'png', jpeg: 'jpg', tiff: 'tif' };

async function renderDemo(scan: DemoScan, seed: number, index: number, file: string): Promise<RenderedPage> {
  return renderPage({
    layout: demoLayout(scan.layout),
    pageSeed: seed,
    runSeed: seed,
    index,
    file,
    fill: scan.fill,
    scan: { level: 'light', dpi: DEMO_DPI, upsideDownRate: 0, noise: false },
    encoderDoesJpeg: scan.format === 'jpeg',
  });
}

async function encodeScan(pages: RenderedPage[], format: PageFormat): Promise<Buffer> {
  if (pages.length === 1) return encodePage(pages[0].image, format, DEMO_DPI, pages[0].scan.jpegQuality ?? 80, true);
  const singles = await Promise.all(pages.map((p) => encodePage(p.image, 'png', DEMO_DPI, 85, true)));
  // Joined pages come back as sRGB; one channel and deflate with the horizontal predictor keep two pages under
  // 400 KB (measured: 325 KB, against 634 KB for three-channel LZW).
  return sharp(singles, { join: { animated: true } })
    .extractChannel(0)
    .tiff({ compression: 'deflate', predictor: 'horizontal', xres: DEMO_DPI / 25.4, yres: DEMO_DPI / 25.4 })
    .toBuffer();
}

export async function makeDemoSamples(root: string): Promise<string[]> {
  const written: string[] = [];
  for (const name of Object.keys(DEMO_LAYOUTS) as DemoLayoutName[]) {
    const r = await writeDemoSchema(name, path.join(root, 'schemas'));
    written.push(r.schema, r.blank);
  }
  for (const scan of DEMO_SCANS) {
    const file = `${scan.stem}.${EXT[scan.format]}`;
    const pages: RenderedPage[] = [];
    for (const [i, seed] of scan.seeds.entries()) pages.push(await renderDemo(scan, seed, i, file));
    const out = path.join(root, 'samples', file);
    await writeFileAtomic(out, await encodeScan(pages, scan.format));
    written.push(out);
    for (const [i, p] of pages.entries()) {
      const truthFile = path.join(root, 'samples', 'truth', pages.length === 1 ? `${scan.stem}.json` : `${scan.stem}.p${i + 1}.json`);
      await writeJsonAtomic(truthFile, pages.length === 1 ? p.truth : { ...p.truth, filePage: i });
      written.push(truthFile);
    }
  }
  return written;
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
  const files = await makeDemoSamples(root);
  for (const f of files) process.stdout.write(`wrote ${path.relative(root, f)}\n`);
}
