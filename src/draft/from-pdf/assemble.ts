import type { Box } from '../../image/geometry.js';
import { unionBox } from '../../image/geometry.js';
import { boxTuple } from '../../image/box-tuple.js';
import type { SchemaFieldValue, SchemaValue } from '../../schema/schema-value.js';
import { guessTextType } from './guess-type.js';
import { fieldKey, fieldLabel, UniqueKeys } from './naming.js';
import type { PageWidgets, PdfRect, PdfWidget } from './widgets.js';

/** One schema field and the widgets it came from: the filler writes values back through them. */
export interface FieldSource {
  field: SchemaFieldValue;
  /** checkbox, radio (one field, a region per option), text, comb, signature or dropdown. */
  kind: 'text' | 'comb' | 'checkbox' | 'choice' | 'signature' | 'dropdown';
  /** The widgets, in option order for a choice. */
  widgets: PdfWidget[];
  /** Choice: the option value each widget stands for. */
  values?: string[];
  /** Each widget's area in reference-page pixels, same order as `widgets`. */
  boxes: Box[];
}

export interface PdfSchemaParts {
  fields: FieldSource[];
  /** Reference page size in pixels. */
  width: number;
  height: number;
}

/** A widget rectangle (points, origin bottom-left) as a box in pixels of the page rendered at `dpi`, rounded outward. */
export function rectToBox(r: PdfRect, pageHeightPt: number, dpi: number, width: number, height: number): Box {
  const s = dpi / 72; // PDF user space: 72 units to the inch (ISO 32000-1 §8.3.2.3)
  const x0 = Math.max(0, Math.floor(r.x * s));
  const y0 = Math.max(0, Math.floor((pageHeightPt - r.y - r.h) * s));
  const x1 = Math.min(width, Math.ceil((r.x + r.w) * s));
  const y1 = Math.min(height, Math.ceil((pageHeightPt - r.y) * s));
  return { x: x0, y: y0, w: Math.max(1, x1 - x0), h: Math.max(1, y1 - y0) };
}

const CLASS_OF = { text: 'text_entry', comb: 'comb_field', dropdown: 'text_entry', checkbox: 'checkbox', choice: 'checkbox', signature: 'signature_area' } as const;

/** Widgets that make one schema field: a radio group, or a checkbox field whose widgets carry different on-states
 *  (ISO 32000-1 §12.7.4.2.3: such check boxes behave as radio buttons); every other widget stands alone. */
function groups(widgets: readonly PdfWidget[]): PdfWidget[][] {
  const byName = new Map<string, PdfWidget[]>();
  for (const w of widgets) if (w.kind === 'radio' || w.kind === 'checkbox') byName.set(w.fieldName, [...(byName.get(w.fieldName) ?? []), w]);
  const out: PdfWidget[][] = [];
  const done = new Set<string>();
  for (const w of widgets) {
    const same = byName.get(w.fieldName);
    const grouped = same && (w.kind === 'radio' || new Set(same.map((x) => x.onValue)).size > 1);
    if (!grouped) out.push([w]);
    else if (!done.has(w.fieldName)) {
      done.add(w.fieldName);
      out.push(same);
    }
  }
  return out;
}

function optionValues(ws: readonly PdfWidget[]): string[] {
  const seen = new UniqueKeys();
  return ws.map((w) => seen.take((w.onValue ?? '').trim() || 'on'));
}

/**
 * The schema fields of one page of a fillable PDF: one field per widget (text, comb, checkbox, signature, dropdown)
 * and one choice field per radio group, regions in pixels of the page rendered at `dpi`.
 */
export function assembleFields(page: PageWidgets, dpi: number, width: number, height: number): PdfSchemaParts {
  const keys = new UniqueKeys();
  const fields: FieldSource[] = [];
  for (const g of groups(page.widgets)) {
    const first = g[0];
    const boxes = g.map((w) => rectToBox(w.rect, page.height, dpi, width, height));
    const region = boxTuple(unionBox(boxes));
    const name = keys.take(fieldKey(first.fieldName, first.tooltip));
    const common = { name, label: fieldLabel(first.fieldName, first.tooltip), page: 0, region };
    if (g.length > 1) {
      const values = optionValues(g);
      const choices = values.map((value, i) => ({ value, region: boxTuple(boxes[i]) }));
      fields.push({ kind: 'choice', widgets: g, values, boxes, field: { ...common, type: 'choice', class: CLASS_OF.choice, options: { multiple: false, choices } } });
      continue;
    }
    switch (first.kind) {
      case 'checkbox':
      case 'radio':
        fields.push({ kind: 'checkbox', widgets: g, boxes, field: { ...common, type: 'checkbox', class: CLASS_OF.checkbox } });
        break;
      case 'signature':
        fields.push({ kind: 'signature', widgets: g, boxes, field: { ...common, type: 'signature', class: CLASS_OF.signature } });
        break;
      default: {
        const guess = guessTextType(first);
        const kind = guess.type === 'signature' ? 'signature' : first.kind;
        const field: SchemaFieldValue = { ...common, type: guess.type, class: CLASS_OF[kind] };
        const options = { ...(guess.options ?? {}) };
        // A comb's cell count is its maximum length (ISO 32000-1 §12.7.4.3, Table 228, Comb flag), whatever the
        // value's type (a date or ZIP comb too): the reader cuts the box into that many cells. For free text it is
        // also the longest value.
        if (first.kind === 'comb' && first.maxLength) {
          field.cells = first.maxLength;
          if (guess.type === 'text') options.maxLength = first.maxLength;
        }
        if (Object.keys(options).length > 0) field.options = options;
        if (first.multiline && guess.type === 'text') field.ocr = { mode: 'block' };
        fields.push({ kind, widgets: g, boxes, field });
      }
    }
  }
  return { fields, width, height };
}

/** The whole schema value: the reference page (the blank image beside the schema) and the fields. */
export function assembleSchema(parts: PdfSchemaParts, form: { name: string; description: string; image: string }): SchemaValue {
  return {
    $schema: './form-schema.json',
    form: { name: form.name, version: '1', description: form.description },
    pages: [{ width: parts.width, height: parts.height, image: form.image }],
    fields: parts.fields.map((f) => f.field),
  };
}
