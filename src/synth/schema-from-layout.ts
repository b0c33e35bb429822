import { unionBox } from '../image/geometry.js';
import { boxTuple } from '../image/box-tuple.js';
import type { DemoCalibration } from './demo-calibration.js';
import type { Layout, LayoutField } from './layout-model.js';
import type { SchemaFieldValue, SchemaValue } from '../schema/schema-value.js';

function fieldValue(f: LayoutField): SchemaFieldValue {
  const region = boxTuple(unionBox(f.slots.map((s) => s.box)));
  const out: SchemaFieldValue = { name: f.name, label: f.label.replace(/\s*[*:]$/, ''), type: f.type, class: f.slots[0].class, page: 0, region };
  if (f.required) out.required = true;
  // Several ruled lines hold several lines of text: OCR must read them all, not pick the one holding a value.
  if (f.slots[0].look.kind === 'lines') out.ocr = { mode: 'block' };
  const options =
    f.type === 'choice'
      ? { multiple: Boolean(f.options.multiple), choices: f.slots.map((s) => ({ value: s.key, region: boxTuple(s.box) })) }
      : f.options;
  if (Object.keys(options).length > 0) out.options = options;
  return out;
}

/**
 * The form-schema value for a layout: the reference page, and for every field its type, options, detector class
 * and region on the reference page (a choice group's region bounds its boxes; each box is listed with its value).
 */
export function schemaFromLayout(
  layout: Layout,
  description = `${layout.title} (invented demo form)`,
  calibration?: DemoCalibration,
): SchemaValue {
  return {
    $schema: './form-schema.json',
    form: { name: layout.name, version: '1', description },
    pages: [{ width: layout.width, height: layout.height, image: `${layout.name}.blank.png` }],
    fields: layout.fields.map((f) => ({ ...fieldValue(f), ...(calibration?.fields[f.name] ?? {}) })),
  };
}
