import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { draftFromPdf, formNameOf, type PdfSchemaDraft } from '../draft/from-pdf/from-pdf.js';
import { loadPdf, readPageWidgets } from '../draft/from-pdf/widgets.js';
import type { Box } from '../image/geometry.js';
import { inkThreshold } from '../image/ink.js';
import type { GrayImage } from '../image/raster.js';
import { writeFileAtomic, writeJsonAtomic } from '../io/atomic-write.js';
import { snapToFrame, snapToRules } from '../page/snap-box.js';
import { CocoBuilder } from './coco.js';
import { encodePage } from './encode-page.js';
import type { DetectorClass } from './layout-model.js';
import { fillPage, type FillPdfOptions } from './pdf-fill/fill-pdf.js';
import { pageSeed, Rng } from './prng.js';
import { drawScanParams, type DegradeLevel } from './scan-params.js';
import { simulateScan } from './scan-simulate.js';

/**
 * Detector pages from real layouts: the widget pages of fillable PDFs rendered blank and filled (typed through the
 * form's own fields, or written in the handwriting fonts), scanned by the simulator, labelled from the widget
 * rectangles. Every page's unlabelled print (letters, brackets, bullets, small print, rules) is the negative the
 * synthetic pages lack.
 *
 * Labels, our choices: one box per widget (each option of a radio group on its own); a multi-line text widget is one
 * text entry (the area a person writes in), a table cell is one text entry (each cell is its own widget); a comb is
 * one comb field. A widget rectangle drawn loosely around a printed box or rule is snapped onto it
 * (src/page/snap-box.ts, the same snap drafting uses); where no printed box or rule is near, the rectangle is kept.
 */

export type RealPageFill = 'blank' | 'typed' | 'handwriting';

export interface RealLayoutOptions {
  /** Fillable PDF files (full paths). */
  forms: readonly string[];
  out: string;
  seed: number;
  /** Pages drawn per PDF page with widgets. */
  perPage: number;
  /** At most this many pages with widgets per form, the first ones (page 1 first). */
  maxPages: number;
  /** Scan degradation of every page; 'mixed' draws heavy for two pages in three and light for the rest. */
  degrade: DegradeLevel | 'mixed';
  /** Share of pages fed upside down. */
  upsideDownRate: number;
}

export interface RealLayoutSummary {
  pages: number;
  annotations: number;
  /** Labels moved onto a printed box or rule, and labels kept as the widget drew them. */
  snapped: number;
  kept: number;
  perClass: Record<string, number>;
  seconds: number;
}

/** The fill of the i-th drawn page: blank, typed, handwriting in turn (a third each). */
export function fillOf(index: number): RealPageFill {
  return (['blank', 'typed', 'handwriting'] as const)[index % 3];
}

/**
 * Entry-area labels of one drafted PDF page, snapped onto the blank's printed boxes and rules. A checkbox takes the
 * printed square or circle it overlaps (`snapToFrame`); other areas move each edge to a nearby rule
 * (`snapToRules`, combs to their outer frame).
 */
export function snappedAreas(draft: PdfSchemaDraft): { areas: { class: DetectorClass; box: Box }[]; snapped: number } {
  const threshold = inkThreshold(draft.blank);
  let snapped = 0;
  const areas = draft.sources.flatMap((s) =>
    s.boxes.map((box) => {
      const cls = s.field.class as DetectorClass;
      const to = cls === 'checkbox' ? snapToFrame(draft.blank, box, { threshold }) : snapToRules(draft.blank, box, { threshold, prefer: cls === 'comb_field' ? 'outer' : 'inner' });
      const moved = to !== null && (to.x !== box.x || to.y !== box.y || to.w !== box.w || to.h !== box.h);
      if (moved) snapped++;
      return { class: cls, box: to ?? box };
    }),
  );
  return { areas, snapped };
}

async function blankScan(blank: GrayImage, rng: Rng, level: DegradeLevel, upsideDownRate: number) {
  const scan = drawScanParams(rng.fork('scan'), blank.width, blank.height, { level, upsideDownRate });
  return { scan, image: await simulateScan(blank, scan, rng.fork('noise')) };
}

/** Write OUT/<stem>.png for every drawn page and OUT/coco.json. Page i of a form page depends only on (seed, form, page, i). */
export async function writeRealLayoutPages(o: RealLayoutOptions, say: (line: string) => void = () => {}): Promise<RealLayoutSummary> {
  const started = performance.now();
  const coco = new CocoBuilder();
  const perClass: Record<string, number> = {};
  let pages = 0;
  let snappedTotal = 0;
  let keptTotal = 0;
  for (const form of o.forms) {
    const bytes = await readFile(form);
    const doc = await loadPdf(bytes, form);
    const name = formNameOf(form);
    const withWidgets = [...Array(doc.getPageCount()).keys()].filter((p) => readPageWidgets(doc, p, form).widgets.length > 0).slice(0, o.maxPages);
    for (const p of withWidgets) {
      const draft = await draftFromPdf(form, { page: p, image: 'blank.png', bytes });
      const { areas, snapped } = snappedAreas(draft);
      snappedTotal += snapped;
      keptTotal += areas.length - snapped;
      const layoutName = `${name}-p${p + 1}`;
      for (let i = 0; i < o.perPage; i++) {
        const rng = new Rng(pageSeed(o.seed, i, layoutName));
        const level: DegradeLevel = o.degrade === 'mixed' ? (rng.fork('level').chance(2 / 3) ? 'heavy' : 'light') : o.degrade;
        const fill = fillOf(i);
        const stem = `${layoutName}-${o.seed}-${String(i).padStart(4, '0')}`;
        let drawn;
        if (fill === 'blank') {
          drawn = await blankScan(draft.blank, rng, level, o.upsideDownRate);
        } else {
          const fo: FillPdfOptions = { form, page: p, count: o.perPage, seed: o.seed, out: o.out, degrade: level, upsideDownRate: o.upsideDownRate, fill };
          drawn = await fillPage(bytes, draft, fo, i, layoutName);
        }
        await writeFileAtomic(path.join(o.out, `${stem}.png`), await encodePage(drawn.image, 'png', drawn.scan.dpi));
        coco.addAreas(`${stem}.png`, areas, drawn.scan);
        pages++;
      }
      for (const a of areas) perClass[a.class] = (perClass[a.class] ?? 0) + o.perPage;
      say(`${layoutName}: ${areas.length} areas (${snapped} snapped), ${o.perPage} pages`);
    }
  }
  await writeJsonAtomic(path.join(o.out, 'coco.json'), coco.build(`formglean real layouts seed ${o.seed}`));
  return { pages, annotations: coco.annotationCount, snapped: snappedTotal, kept: keptTotal, perClass, seconds: (performance.now() - started) / 1000 };
}
