import type { Detector } from '../../src/detect/types.js';
import type { Box } from '../../src/image/geometry.js';
import { iou } from '../../src/image/geometry.js';
import type { OcrEngine } from '../../src/read/ocr-engine.js';
import { fieldRegions, resolveField } from '../../src/schema/resolved-field.js';
import type { FormSchema } from '../../src/schema/definition.js';
import { draftSchema } from '../../src/draft/from-image.js';
import type { LoadedSchema } from '../../src/schema/load.js';
import { w4Blank } from './fill.js';

/** How much of the hand-labelled layout a schema drafted from the blank alone recovers. */
export interface DraftCoverage {
  /** Entry areas in the hand-labelled schema (each box of a choice group counts). */
  labelled: number;
  /** Areas the draft holds (each box of a drafted choice group counts). */
  drafted: number;
  /** Labelled areas with a drafted area at IoU >= 0.5 (PASCAL VOC's criterion, Everingham et al. 2010). */
  covered: number;
  /** Of those, the drafted area has the labelled area's detector class. */
  coveredSameClass: number;
  coverage: number;
}

interface Area {
  box: Box;
  className: string;
}

function areas(schema: FormSchema): Area[] {
  return schema.fields.flatMap((f) =>
    fieldRegions(resolveField(f)).map(({ region: [x, y, w, h] }) => ({ box: { x, y, w, h }, className: f.class })),
  );
}

/**
 * Draft a schema from the blank page with the detector and the OCR engine reading the labels, then count the
 * labelled areas the draft covers. The blank is upright and level as published, so it is drafted as it is.
 */
export async function draftCoverage(loaded: LoadedSchema, detector: Detector, engine: OcrEngine): Promise<DraftCoverage> {
  const blank = await w4Blank();
  const detections = await detector.detect(blank);
  const draft = await draftSchema([blank], [detections], async (crop) => (await engine.read(crop, { mode: 'line' })).text, {
    formName: 'w4-draft',
    referenceImages: [undefined],
  });
  const labelled = areas(loaded.schema);
  const drafted = areas(draft.schema);
  const best = labelled.map((l) => {
    const hits = drafted.filter((d) => iou(l.box, d.box) >= 0.5);
    return { any: hits.length > 0, same: hits.some((d) => d.className === l.className) };
  });
  const covered = best.filter((b) => b.any).length;
  return {
    labelled: labelled.length,
    drafted: drafted.length,
    covered,
    coveredSameClass: best.filter((b) => b.same).length,
    coverage: covered / labelled.length,
  };
}
