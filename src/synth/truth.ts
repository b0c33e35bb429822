import { unionBox } from '../image/geometry.js';
import { boxTuple } from './box-tuple.js';
import type { MarkKind } from './checkbox-mark.js';
import type { FieldFill, FieldValue, FillMode, Pen } from './fill.js';
import { scanBox } from './homography.js';
import type { DetectorClass, FieldTypeName, Layout } from './layout-model.js';
import { writtenLines } from './page-svg.js';
import type { ScanParams } from './scan-params.js';

/** One field's truth: what was drawn for it and where it lies on the final pixels. */
export interface TruthField {
  name: string;
  type: FieldTypeName;
  class: DetectorClass;
  page: number;
  /** Normalized as results give it (ISO date, E.164 phone, number, boolean, choice value(s)); null when blank. */
  value: FieldValue;
  /** As written on the page; lines of a multi-line area joined by "\n"; null for marks, signatures, blanks. */
  text: string | null;
  /** [x, y, w, h] in page pixels; for a choice group, the bounds of all its boxes. */
  box: [number, number, number, number];
  /** Checkbox: the mark drawn in the box. */
  mark?: MarkKind;
  /** Choice: each printed box with its own mark. */
  parts?: { key: string; box: [number, number, number, number]; mark: MarkKind; checked: boolean }[];
}

export interface PageTruth {
  layout: string;
  /** Style family of the layout. */
  family: string;
  seed: number;
  index: number;
  file: string;
  width: number;
  height: number;
  dpi: number;
  /** 0 or 180 (upside-down feed). */
  rotation: 0 | 180;
  /** Small rotation in degrees, positive = clockwise on screen. */
  skew: number;
  fill: FillMode;
  /** Typed font or handwriting-style font family key used by the writer; null on blank pages. */
  pen: string | null;
  fields: TruthField[];
}


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
