import { PDFCheckBox, PDFDropdown, PDFName, PDFRadioGroup, PDFTextField } from '@cantoo/pdf-lib';
import { flattenForm, formToFlatten } from '../../draft/from-pdf/flatten.js';
import { loadPdf } from '../../draft/from-pdf/widgets.js';
import type { PdfFieldFill } from './plan.js';

/**
 * Turn on the widget whose on-state is `onValue` and every other widget of the field off: the field's value and each
 * widget's appearance state (ISO 32000-1 §12.7.4.2.3-4). Set directly, since check boxes sharing one field with
 * different on-states are outside pdf-lib's check-box model.
 */
function turnOn(field: PDFCheckBox | PDFRadioGroup, onValue: string): void {
  const on = PDFName.of(onValue);
  field.acroField.dict.set(PDFName.of('V'), on);
  for (const w of field.acroField.getWidgets()) w.setAppearanceState(w.getOnValue()?.decodeText() === onValue ? on : PDFName.of('Off'));
}

/** Load the form and type the page's values into its fields (no appearances made yet). */
async function filledForm(bytes: Uint8Array, file: string, fills: readonly PdfFieldFill[]) {
  const doc = await loadPdf(bytes, file);
  const form = formToFlatten(doc);
  for (const f of fills) {
    const w = f.src.widgets[0];
    const field = form.getField(w.fieldName);
    const box = field instanceof PDFCheckBox || field instanceof PDFRadioGroup ? field : null;
    if (box && f.src.kind === 'checkbox' && f.value === true) turnOn(box, w.onValue ?? 'On');
    else if (box && f.src.kind === 'choice' && typeof f.value === 'string') turnOn(box, f.src.widgets[f.src.values!.indexOf(f.value)].onValue ?? 'On');
    else if (f.text !== null && field instanceof PDFTextField) field.setText(f.text);
    else if (f.text !== null && field instanceof PDFDropdown) field.select(f.text);
  }
  return { doc, form };
}

/**
 * The form with the page's values typed into its own fields and flattened: text drawn by appearance streams pdf-lib
 * makes from each field's default appearance, check boxes showing the form's own check glyph. Signatures are not
 * typed: the caller draws them. XFA is dropped so that the AcroForm values are what every renderer shows. Null when
 * pdf-lib cannot flatten this form's field tree (a kid it cannot remove, a default appearance it cannot use): the
 * caller then types the values over the blank itself.
 */
export async function typedPdf(bytes: Uint8Array, file: string, fills: readonly PdfFieldFill[]): Promise<Uint8Array | null> {
  const { doc, form } = await filledForm(bytes, file, fills);
  return flattenForm(doc, form);
}
