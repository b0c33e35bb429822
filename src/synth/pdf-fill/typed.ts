import { PDFCheckBox, PDFDropdown, PDFName, PDFRadioGroup, PDFSignature, PDFTextField, StandardFonts } from '@cantoo/pdf-lib';
import { loadPdf } from '../../draft/from-pdf/widgets.js';
import { documentError } from '../../errors.js';
import type { PdfFieldFill } from './plan.js';

/** Turn on the widget whose on-state is `onValue` (a radio group, or check boxes sharing one field). */
function turnOn(field: unknown, onValue: string): void {
  // By appearance-state name, not by the export values of /Opt, which may differ (ISO 32000-1 §12.7.4.2.4).
  if (field instanceof PDFRadioGroup || field instanceof PDFCheckBox) field.acroField.setValue(PDFName.of(onValue));
}

/**
 * The form with the page's values typed into its own fields and flattened: text drawn by the PDF's appearance
 * streams (pdf-lib regenerates them from each field's default appearance), check boxes showing the form's own
 * check glyph. Signatures are not typed: the caller draws them. XFA is dropped so the AcroForm values are what
 * every renderer shows.
 */
export async function typedPdf(bytes: Uint8Array, file: string, fills: readonly PdfFieldFill[]): Promise<Uint8Array> {
  const doc = await loadPdf(bytes, file);
  const form = doc.getForm();
  form.deleteXFA();
  for (const f of fills) {
    const w = f.src.widgets[0];
    const field = form.getField(w.fieldName);
    if (f.src.kind === 'checkbox' && f.value === true) turnOn(field, w.onValue ?? 'On');
    else if (f.src.kind === 'choice' && typeof f.value === 'string') turnOn(field, f.src.widgets[f.src.values!.indexOf(f.value)].onValue ?? 'On');
    else if (f.text !== null && field instanceof PDFTextField) field.setText(f.text);
    else if (f.text !== null && field instanceof PDFDropdown) field.select(f.text);
  }
  // Signature fields have no appearance to flatten (pdf-lib would log an error for each); signatures are drawn.
  for (const field of form.getFields()) if (field instanceof PDFSignature) form.removeField(field);
  try {
    form.flatten();
  } catch {
    // Fields whose default appearance names no usable font: regenerate every appearance in Helvetica (a standard
    // 14 font every renderer has, ISO 32000-1 §9.6.2.2), then flatten.
    try {
      form.updateFieldAppearances(await doc.embedFont(StandardFonts.Helvetica));
      form.flatten({ updateFieldAppearances: false });
    } catch (err) {
      throw documentError(file, `cannot type values into the form (${(err as Error).message.split('\n')[0]})`, err);
    }
  }
  return doc.save({ useObjectStreams: false });
}
