/**
 * Synthetic page speed: CPU milliseconds per page for each stage, one libvips thread, so the numbers hold on one
 * core whatever else the machine runs. Usage: npx tsx bench/synth-pages.ts [pages=8] [level=heavy] [format=png]
 */
import sharp from 'sharp';
import { encodePage, type PageFormat } from '../src/synth/encode-page.js';
import { drawPen, fillLayout } from '../src/synth/fill.js';
import { layoutFor } from '../src/synth/layouts.js';
import { pageSvg } from '../src/synth/page-svg.js';
import { pageSeed, Rng } from '../src/synth/prng.js';
import { rasterizeSvg } from '../src/synth/rasterize.js';
import { drawScanParams, type DegradeLevel } from '../src/synth/scan-params.js';
import { simulateScan } from '../src/synth/scan-simulate.js';

sharp.concurrency(1);
const pages = Number(process.argv[2] ?? 8);
const level = (process.argv[3] ?? 'heavy') as DegradeLevel;
const format = (process.argv[4] ?? 'png') as PageFormat;
const cpu = () => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
};
const totals = { layout: 0, raster: 0, scan: 0, encode: 0 };
let bytes = 0;
// One warm-up page so font loading is not counted.
for (let i = -1; i < pages; i++) {
  const rng = new Rng(pageSeed(1, Math.max(0, i), 'random'));
  let t = cpu();
  const layout = layoutFor('random', rng.fork('layout'), 'all');
  const pen = drawPen(rng.fork('pen'), 'typed');
  const svg = pageSvg(layout, fillLayout(layout, 'typed', rng.fork('fill')), pen, rng.fork('ink'));
  const t1 = cpu();
  const ref = await rasterizeSvg(svg);
  const t2 = cpu();
  const scan = drawScanParams(rng.fork('scan'), layout.width, layout.height, { level, upsideDownRate: 0.03 });
  const img = await simulateScan(ref, format === 'jpeg' ? { ...scan, jpegQuality: null } : scan, rng.fork('noise'));
  const t3 = cpu();
  const out = await encodePage(img, format, scan.dpi, scan.jpegQuality ?? 88);
  const t4 = cpu();
  if (i < 0) continue;
  totals.layout += t1 - t;
  totals.raster += t2 - t1;
  totals.scan += t3 - t2;
  totals.encode += t4 - t3;
  bytes += out.length;
  t = t4;
}
const per = (v: number) => (v / pages).toFixed(0);
const all = totals.layout + totals.raster + totals.scan + totals.encode;
console.log(`synth pages: ${pages}, degrade ${level}, ${format}; CPU ms/page: layout+svg ${per(totals.layout)}, rasterize ${per(totals.raster)}, scan ${per(totals.scan)}, encode ${per(totals.encode)}, total ${per(all)}; ${(bytes / pages / 1024).toFixed(0)} KiB/page`);
