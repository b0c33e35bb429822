import {
  PDFArray,
  PDFButton,
  PDFCheckBox,
  PDFDict,
  PDFDocument,
  PDFDropdown,
  type PDFField,
  PDFHexString,
  PDFName,
  PDFOptionList,
  PDFRadioGroup,
  PDFSignature,
  PDFString,
  PDFTextField,
} from '@cantoo/pdf-lib';
import { configError, documentError } from '../../errors.js';

/** What a widget asks the person filling the form to do. */
export type WidgetKind = 'text' | 'comb' | 'checkbox' | 'radio' | 'signature' | 'dropdown';

/** A rectangle in PDF user space (points, origin bottom-left of the page's crop box). */
export interface PdfRect {
  x: number;
  y: number;
  w: number;
  h: number;
}

/** One widget of a fillable field on the chosen page. */
export interface PdfWidget {
  /** Fully qualified field name (ISO 32000-1 §12.7.3.2), e.g. "form1[0].#subform[0].f1_01[0]". */
  fieldName: string;
  /** The field's tooltip (/TU), trimmed; "" when absent. */
  tooltip: string;
  kind: WidgetKind;
  rect: PdfRect;
  /** Text: /MaxLen when set. */
  maxLength?: number;
  multiline?: boolean;
  /** Checkbox and radio: the appearance state name that means "on" (the option's export value). */
  onValue?: string;
  /** Dropdown: the listed options. */
  options?: string[];
}

/** Why widgets on the page were left out of a schema, counted. */
export interface SkippedWidgets {
  pushButton: number;
  hidden: number;
  readOnly: number;
  barcode: number;
  listBox: number;
}

export interface PageWidgets {
  /** 0-based page index. */
  page: number;
  /** Page crop box size in points, as the renderer draws it. */
  width: number;
  height: number;
  widgets: PdfWidget[];
  skipped: SkippedWidgets;
}

// Annotation flags (ISO 32000-1 §12.5.3, Table 165): bit 2 Hidden, bit 6 NoView.
const ANNOT_HIDDEN = 1 << 1;
const ANNOT_NO_VIEW = 1 << 5;

/** Fields carrying a machine-printed 2-D barcode of the form's own data, not something a person fills in. */
const BARCODE_NAME = /bar ?code|pdf ?417/i;

/**
 * Open a PDF with pdf-lib; an unreadable or password-protected file is a one-line configuration error. The XFA entry
 * is kept, to tell an XFA-only form from one without fields; the filler deletes it itself, so that every renderer
 * shows the AcroForm values.
 */
export async function loadPdf(bytes: Uint8Array, file: string): Promise<PDFDocument> {
  try {
    return await PDFDocument.load(bytes, { updateMetadata: false, preserveXFA: true });
  } catch (err) {
    const encrypted = /encrypt/i.test(String((err as Error).message));
    throw configError(file, encrypted ? 'the PDF is encrypted; save an unencrypted copy first' : 'not a readable PDF (corrupt or truncated)', err);
  }
}

function textOf(value: unknown): string {
  if (value instanceof PDFString || value instanceof PDFHexString) return value.decodeText().replace(/\s+/g, ' ').trim();
  return '';
}

/** The AcroForm dictionary, or a clear refusal when the file has none (or only an XFA form, which pdf-lib cannot read). */
function requireAcroForm(doc: PDFDocument, file: string): void {
  const acro = doc.catalog.lookupMaybe(PDFName.of('AcroForm'), PDFDict);
  const fields = acro?.lookupMaybe(PDFName.of('Fields'), PDFArray);
  const hasFields = fields !== undefined && fields.size() > 0;
  if (hasFields) return;
  if (acro?.has(PDFName.of('XFA'))) {
    throw configError(file, 'XFA-only form: its fields exist only in the XFA layer, which has no widget geometry to read');
  }
  throw configError(file, 'no fillable form fields (no AcroForm): draft a schema from a scan of it with "schema draft"');
}

function widgetKindOf(field: PDFField): WidgetKind | 'push' | 'list' {
  if (field instanceof PDFTextField) return field.isCombed() && field.getMaxLength() !== undefined ? 'comb' : 'text';
  if (field instanceof PDFCheckBox) return 'checkbox';
  if (field instanceof PDFRadioGroup) return 'radio';
  if (field instanceof PDFSignature) return 'signature';
  if (field instanceof PDFDropdown) return 'dropdown';
  if (field instanceof PDFButton) return 'push';
  if (field instanceof PDFOptionList) return 'list';
  return 'push';
}

/**
 * Every fillable widget on one page (0-based), in the page's annotation order, with the field facts a schema needs.
 * Push buttons, hidden and read-only widgets, barcode fields and list boxes (several visible options, nothing to
 * write by hand) are counted in `skipped`, not returned.
 */
export function readPageWidgets(doc: PDFDocument, page: number, file: string): PageWidgets {
  requireAcroForm(doc, file);
  const pages = doc.getPages();
  if (page < 0 || page >= pages.length) throw configError(file, `page ${page + 1} does not exist (the PDF has ${pages.length})`);
  const pdfPage = pages[page];
  if (pdfPage.getRotation().angle % 360 !== 0) {
    throw documentError(file, `page ${page + 1} is rotated ${pdfPage.getRotation().angle}°; only upright pages are supported`);
  }
  const crop = pdfPage.getCropBox();
  // Widgets of this page, by their dictionary (pdf-lib hands out one object per indirect object).
  const onPage = new Set<unknown>();
  for (const ref of pdfPage.node.Annots()?.asArray() ?? []) onPage.add(doc.context.lookup(ref));
  const order = [...onPage];

  const skipped: SkippedWidgets = { pushButton: 0, hidden: 0, readOnly: 0, barcode: 0, listBox: 0 };
  const found: { at: number; widget: PdfWidget }[] = [];
  let form;
  try {
    form = doc.getForm();
  } catch (err) {
    throw configError(file, `the form's field tree cannot be read (${(err as Error).message.split('\n')[0]})`, err);
  }
  for (const field of form.getFields()) {
    const widgets = field.acroField.getWidgets().filter((w) => onPage.has(w.dict));
    if (widgets.length === 0) continue;
    const kind = widgetKindOf(field);
    const name = field.getName();
    const tooltip = textOf(field.acroField.dict.lookup(PDFName.of('TU')));
    for (const w of widgets) {
      if (kind === 'push') skipped.pushButton++;
      else if (kind === 'list') skipped.listBox++;
      else if (w.hasFlag(ANNOT_HIDDEN) || w.hasFlag(ANNOT_NO_VIEW)) skipped.hidden++;
      else if (field.isReadOnly()) skipped.readOnly++;
      else if (BARCODE_NAME.test(name) || BARCODE_NAME.test(tooltip)) skipped.barcode++;
      else {
        const r = w.getRectangle();
        const rect = { x: Math.min(r.x, r.x + r.width) - crop.x, y: Math.min(r.y, r.y + r.height) - crop.y, w: Math.abs(r.width), h: Math.abs(r.height) };
        if (rect.w < 1 || rect.h < 1) {
          skipped.hidden++;
          continue;
        }
        const widget: PdfWidget = { fieldName: name, tooltip, kind, rect };
        if (field instanceof PDFTextField) {
          const max = field.getMaxLength();
          if (max !== undefined) widget.maxLength = max;
          if (field.isMultiline()) widget.multiline = true;
        }
        if (kind === 'checkbox' || kind === 'radio') widget.onValue = w.getOnValue()?.decodeText() ?? 'On';
        if (field instanceof PDFDropdown) widget.options = field.getOptions().filter((o) => o.trim() !== '');
        found.push({ at: order.indexOf(w.dict), widget });
      }
    }
  }
  found.sort((a, b) => a.at - b.at);
  return { page, width: crop.width, height: crop.height, widgets: found.map((f) => f.widget), skipped };
}
