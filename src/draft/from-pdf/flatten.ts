import { PDFSignature, PDFTextField, type PDFDocument, type PDFForm } from '@cantoo/pdf-lib';

/** The form of a loaded fillable PDF, its XFA dropped so that the AcroForm is what every renderer shows. */
export function formToFlatten(doc: PDFDocument): PDFForm {
  const form = doc.getForm();
  form.deleteXFA();
  return form;
}

/**
 * Flatten the form's fields into its pages (pdf-lib): a field with no appearance gets one made from its own border,
 * background and default-appearance settings, as a viewer draws it; the others keep theirs. Null when pdf-lib cannot
 * flatten this form's field tree (a kid it cannot remove, a default appearance it cannot use).
 */
export async function flattenForm(doc: PDFDocument, form: PDFForm): Promise<Uint8Array | null> {
  // pdf-lib cannot lay out rich text (ISO 32000-1 §12.7.3.4): such fields get plain appearances like the rest.
  for (const field of form.getFields()) if (field instanceof PDFTextField && field.isRichFormatted()) field.disableRichFormatting();
  // Signature fields have no appearance to flatten (pdf-lib would log an error for each).
  for (const field of form.getFields()) if (field instanceof PDFSignature) form.removeField(field);
  try {
    form.flatten();
  } catch {
    return null;
  }
  return doc.save({ useObjectStreams: false });
}

/**
 * The empty form as it prints: flattened with nothing typed. Check boxes and radio buttons that carry no appearance
 * for "off" (DOL WH-384, US Courts B 108, NARA SF 180; 11 of the 28 reference forms differ) show no box when the page
 * is rendered as it is, though a viewer draws one from the widget's border settings, and so does every page filled
 * through the form; rendered from this, the blank shows the box. Null when pdf-lib cannot flatten the form. Flattening
 * changes `doc`: read what else it is needed for first.
 */
export async function printedBlankPdf(doc: PDFDocument): Promise<Uint8Array | null> {
  return flattenForm(doc, formToFlatten(doc));
}
