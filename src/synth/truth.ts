import { unionBox } from '../image/geometry.js';
import { boxTuple } from '../image/box-tuple.js';
import type { MarkKind } from './checkbox-mark.js';
import type { FieldFill, FillMode, Pen } from './fill.js';
import { scanBox } from './homography.js';
import type { TruthDocument, TruthField as TruthFieldContract } from '../result/truth.js';
import type { DetectorClass, FieldTypeName, Layout } from './layout-model.js';
import { writtenLines } from './page-svg.js';
import type { ScanParams } from './scan-params.js';

/** One field's truth: what was drawn for it and where it lies on the final pixels (the contract: result/truth.ts). */
export type TruthField = Omit<TruthFieldContract, 'parts'> & {
  type: FieldTypeName;
  class: DetectorClass;
  mark?: MarkKind;
  parts?: { key: string; box: [number, number, number, number]; mark: MarkKind; checked: boolean }[];
};

/** A generated page's truth: the writer fills in every optional member of the contract. */
export type PageTruth = Omit<TruthDocument, 'fields' | 'fill' | 'family' | 'file' | 'dpi' | 'pen' | 'rotation'> & {
  family: string;
  file: string;
  dpi: number;
  /** 0 or 180 (upside-down feed). */
  rotation: 0 | 180;
  fill: FillMode;
  pen: string | null;
  fields: TruthField[];
};


function truthField(f: FieldFill, pen: Pen | null, scan: ScanParams): TruthField {
  const field = f.field;
  const boxes = field.slots.map((s) => scanBox(scan.transform, s.box, scan.width, scan.height));
  const out: TruthField = {
    name: field.name,
    type: field.type,
    class: field.slots[0].class,
    page: 0,
    value: f.value,
    text: f.text,
    box: boxTuple(unionBox(boxes)),
  };
  if (field.slots[0].look.kind === 'lines' && f.text !== null && pen) {
    const lines = writtenLines(f, pen);
    out.text = lines.join('\n');
    if (field.type === 'text') out.value = lines.join(' ');
  }
  if (field.type === 'checkbox' && f.marks) out.mark = f.marks[0];
  if (field.type === 'choice' && f.marks) {
    const marks = f.marks;
    const chosen = new Set(Array.isArray(f.value) ? f.value : f.value === null ? [] : [String(f.value)]);
    out.parts = field.slots.map((s, i) => ({ key: s.key, box: boxTuple(boxes[i]), mark: marks[i], checked: chosen.has(s.key) }));
  }
  return out;
}

export function pageTruth(args: {
  layout: Layout;
  seed: number;
  index: number;
  file: string;
  fill: FillMode;
  pen: Pen | null;
  fills: FieldFill[];
  scan: ScanParams;
}): PageTruth {
  const { layout, scan } = args;
  return {
    layout: layout.name,
    family: layout.family,
    seed: args.seed,
    index: args.index,
    file: args.file,
    width: scan.width,
    height: scan.height,
    dpi: scan.dpi,
    rotation: scan.rotation,
    skew: scan.skew,
    fill: args.fill,
    pen: args.fill === 'blank' || !args.pen ? null : args.pen.font,
    fields: args.fills.map((f) => truthField(f, args.pen, scan)),
  };
}
