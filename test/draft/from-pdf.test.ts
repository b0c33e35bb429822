import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { draftFromPdf, type PdfSchemaDraft } from '../../src/draft/from-pdf/from-pdf.js';
import { fieldKey } from '../../src/draft/from-pdf/naming.js';
import { guessTextType } from '../../src/draft/from-pdf/guess-type.js';
import { loadPdf, readPageWidgets } from '../../src/draft/from-pdf/widgets.js';
import { FormSchema } from '../../src/schema/definition.js';
import { checkSchemaConsistency } from '../../src/schema/consistency.js';
import type { GrayImage } from '../../src/image/raster.js';
import { renderPdfPage } from '../../src/input/pdf.js';
import { typedPdf } from '../../src/synth/pdf-fill/typed.js';

const DIR = path.resolve('test/fixtures/real-forms/pdfs');

interface FormFacts {
  file: string;
  page1_size_pt: [number, number];
  page1_widgets: { text: number; checkbox: number; radio_groups: number; radio_buttons: number; comb: number; signature: number; choice: number; push_button: number };
  comb_max_lengths: number[];
}

async function facts(file: string): Promise<FormFacts> {
  const all = JSON.parse(await readFile(path.join(DIR, 'forms.json'), 'utf8')) as { forms: FormFacts[] };
  return all.forms.find((f) => f.file === file)!;
}

const drafts = new Map<string, Promise<PdfSchemaDraft>>();
function draft(file: string): Promise<PdfSchemaDraft> {
  if (!drafts.has(file)) drafts.set(file, draftFromPdf(path.join(DIR, file), { image: 'blank.png' }));
  return drafts.get(file)!;
}

/** Rows of the image, inside [x0, x1), that are dark (< 128) over at least `share` of the width: printed rules. */
function ruledRows(img: GrayImage, x0: number, x1: number, y0: number, y1: number, share: number): number[] {
  const rows: number[] = [];
  for (let y = Math.max(0, y0); y < Math.min(img.height, y1); y++) {
    let dark = 0;
    for (let x = x0; x < x1; x++) if (img.data[y * img.width + x] < 128) dark++;
    if (dark >= share * (x1 - x0)) rows.push(y);
  }
  return rows;
}

const FORMS = ['uscourts-b121-2015.pdf', 'dol-wh384-2009.pdf', 'irs-f8888-2025.pdf'];

describe('schema from-pdf: widget counts against the reference set', () => {
  // Expected counts: test/fixtures/real-forms/pdfs/forms.json, copied from the shared reference set, where they were
  // counted with pdf-lib 1.17.1 by walking page 1's /Annots (an independent reader, not formglean's).
  it.each(FORMS)('%s: every widget kind counted as the reference counts it', async (file) => {
    const f = await facts(file);
    const d = await draft(file);
    const widgets = d.sources.flatMap((s) => s.widgets);
    const kind = (k: string) => widgets.filter((w) => w.kind === k).length;
    const e = f.page1_widgets;
    // "text" counts every text-field widget, comb and read-only ones included; read-only ones are skipped here.
    expect(kind('text') + kind('comb') + d.skipped.readOnly + d.skipped.barcode).toBe(e.text);
    expect(kind('comb')).toBe(e.comb);
    expect(kind('checkbox')).toBe(e.checkbox);
    expect(kind('radio')).toBe(e.radio_buttons);
    expect(d.sources.filter((s) => s.kind === 'choice' && s.widgets[0].kind === 'radio')).toHaveLength(e.radio_groups);
    expect(kind('signature')).toBe(e.signature);
    expect(kind('dropdown')).toBe(e.choice);
    expect(d.skipped.pushButton).toBe(e.push_button);
    // Comb cell counts are the widgets' maximum lengths (a comb divides its box evenly into them: ISO 32000-1
    // §12.7.4.3), recorded as the field's `cells` whatever its type; a free-text comb's longest value is the same.
    const combs = d.sources.filter((s) => s.kind === 'comb');
    expect(combs.map((s) => s.field.cells).sort()).toEqual([...f.comb_max_lengths].sort());
    for (const s of combs) if (s.field.type === 'text') expect(s.field.options?.maxLength).toBe(s.field.cells);
    expect(combs.every((s) => s.field.class === 'comb_field')).toBe(true);
  });

  it.each(FORMS)('%s: the drafted schema passes the schema checks, with unique snake_case names', async (file) => {
    const d = await draft(file);
    const parsed = FormSchema.parse(d.schema);
    expect(checkSchemaConsistency(parsed)).toEqual([]);
    const names = parsed.fields.map((x) => x.name);
    expect(new Set(names).size).toBe(names.length);
    expect(names.every((n) => /^[a-z][a-z0-9_]*$/.test(n) && !n.includes('form1') && !n.includes('subform'))).toBe(true);
  });

  it.each(FORMS)('%s: the blank is the page at 200 DPI (72 points to the inch, ISO 32000-1 §8.3.2.3)', async (file) => {
    const f = await facts(file);
    const d = await draft(file);
    expect(d.blank.width).toBe(Math.round((f.page1_size_pt[0] * 200) / 72));
    expect(d.blank.height).toBe(Math.round((f.page1_size_pt[1] * 200) / 72));
    expect(d.schema.pages[0]).toMatchObject({ width: d.blank.width, height: d.blank.height, image: 'blank.png' });
  });
});

describe('schema from-pdf: regions on the printed page', () => {
  it('WH-384: every text field sits on its printed underline', async () => {
    // The form prints an underline under each fill-in (visible in the rendered blank): the widget's bottom edge lies
    // on it. A region a few pixels off would still find it; one off by a line height would not.
    const d = await draft('dol-wh384-2009.pdf');
    const texts = d.sources.filter((s) => s.kind === 'text');
    expect(texts).toHaveLength(10);
    for (const s of texts) {
      const [x, y, w, h] = s.field.region;
      const band = ruledRows(d.blank, x + 4, x + w - 4, y + Math.floor(h / 2), y + h + 4, 0.6);
      expect(band.length, s.field.name).toBeGreaterThan(0);
      // Control: the upper half of the region holds no rule, so the rule found is the field's own bottom line.
      expect(ruledRows(d.blank, x + 4, x + w - 4, y, y + Math.floor(h / 2) - 2, 0.6), s.field.name).toEqual([]);
    }
  });

  it('WH-384: the radio group is one choice field with a region per printed box', async () => {
    const d = await draft('dol-wh384-2009.pdf');
    const choice = d.sources.find((s) => s.kind === 'choice')!;
    const choices = (choice.field.options as { choices: { value: string; region: number[] }[] }).choices;
    expect(choices).toHaveLength(3);
    for (const c of choices) {
      const [x, y, w, h] = c.region;
      // A printed box: dark rules along its bottom and over most of its height on the left (the box outline).
      expect(ruledRows(d.blank, x + 2, x + w - 2, y + h - 6, y + h + 4, 0.6).length).toBeGreaterThan(0);
    }
  });

  it('WH-384: the blank shows the boxes a viewer draws for the radio buttons, as every page filled through the form does', async () => {
    // The buttons carry no appearance for "off", only border settings (their MK entry, ISO 32000-1 §12.5.6.19): a
    // viewer draws the box from those, and the schema's blank must show what the printed form shows. Before, the
    // blank had only the printed underline there, and the box on a filled page read as ink added in every option.
    const d = await draft('dol-wh384-2009.pdf');
    const choices = (d.sources.find((s) => s.kind === 'choice')!.field.options as { choices: { region: number[] }[] }).choices;
    for (const c of choices) {
      const [x, y, w, h] = c.region;
      // The box's left side: a column of print (gray here, as the form's border colour is) over most of the region's
      // height; the region is the widget's rectangle, the box is drawn a few pixels inside it.
      let side = 0;
      for (let xx = x - 2; xx <= x + 6; xx++) {
        let dark = 0;
        for (let yy = y; yy < y + h; yy++) if (d.blank.data[yy * d.blank.width + xx] < 200) dark++;
        side = Math.max(side, dark / h);
      }
      expect(side).toBeGreaterThan(0.6);
    }
    // And the whole blank is the form as every page filled through it shows it when nothing is typed (samples fill
    // renders the form flattened by pdf-lib): 519 pixels differed before.
    const bytes = new Uint8Array(await readFile(path.join(DIR, 'dol-wh384-2009.pdf')));
    const flat = await renderPdfPage((await typedPdf(bytes, 'dol-wh384-2009.pdf', []))!, 'dol-wh384-2009.pdf', 0);
    let differ = 0;
    for (let i = 0; i < flat.data.length; i++) if (Math.abs(flat.data[i] - d.blank.data[i]) > 96) differ++;
    expect(differ).toBe(0);
  });
});

describe('schema from-pdf: names, types and refusals', () => {
  it('names come from the field name, or from the tooltip when the name was generated', () => {
    expect(fieldKey('topmostSubform[0].Page1[0].f1_01[0]', 'Your first name and middle initial')).toBe('first_name_middle_initial');
    expect(fieldKey('F[0].Page_1[0].VeteransLastName[0]', '5. Last Name.')).toBe('veterans_last_name');
    expect(fieldKey('form1[0].#subform[0].Text12[0]', '')).toBe('text_12');
    // A tooltip in a broken encoding (letters shifted) is not used.
    expect(fieldKey('f2_3', ' D $JUZ 4UBUFBOE;*1$PEF')).toBe('f_2_3');
  });

  it('guesses types from names and tooltips: B121 dates, state district list, signature line', async () => {
    const d = await draft('uscourts-b121-2015.pdf');
    const byType = (t: string) => d.schema.fields.filter((f) => f.type === t).map((f) => f.name);
    expect(byType('date')).toHaveLength(2); // "Executed on (Date mm/dd/yyyy)" for each debtor
    expect(byType('signature')).toHaveLength(2); // text widgets named "Debtor1.signature", "Debtor2.signature"
    expect(byType('choice_text')).toHaveLength(1); // the district dropdown
  });

  it('types a widget that holds one part of a phone number as text, a whole one as phone', () => {
    // The widgets of USCIS Form I-589 (2025), page 1, as the PDF gives them (name, tooltip, /MaxLen): its area code
    // and 7-digit number boxes. A phone field needs the whole number (10 digits in North America: NANP, from memory).
    const widget = (fieldName: string, tooltip: string, maxLength?: number) => ({ fieldName, tooltip, kind: 'text' as const, rect: { x: 0, y: 0, w: 50, h: 14 }, maxLength });
    const item8 = 'Part. A. 1. Information About You. 8. Residence in the U. S. (where you physically reside).';
    expect(guessTextType(widget('form1[0].#subform[0].PtAILine8_AreaCode[0]', `${item8} Telephone Number. Enter 3-digit Area Code.`, 3)).type).toBe('text');
    expect(guessTextType(widget('form1[0].#subform[0].PtAILine8_TelephoneNumber[0]', `${item8} Enter 7-digit Telephone Number.`, 8)).type).toBe('text');
    expect(guessTextType(widget('form1[0].#subform[0].Telephone[0]', 'Daytime telephone number')).type).toBe('phone');
    expect(guessTextType(widget('form1[0].#subform[0].Telephone[0]', 'Daytime telephone number', 14)).type).toBe('phone');
  });

  it('refuses a PDF without fillable fields with a one-line error naming the file', async () => {
    const { PDFDocument } = await import('@cantoo/pdf-lib');
    const doc = await PDFDocument.create();
    doc.addPage([612, 792]);
    const bytes = await doc.save();
    await expect(draftFromPdf('plain.pdf', { image: 'x.png', bytes })).rejects.toThrow(/^plain\.pdf: no fillable form fields/);
  });

  it('refuses an XFA-only form (an AcroForm with no fields, the form in its XFA entry)', async () => {
    // ISO 32000-1 §12.7.8: the XFA entry of the interactive form dictionary holds the XML form; its fields then have
    // no widget annotations to read.
    const { PDFDocument, PDFName } = await import('@cantoo/pdf-lib');
    const doc = await PDFDocument.create();
    doc.addPage([612, 792]);
    const xfa = doc.context.flateStream('<xdp:xdp xmlns:xdp="http://ns.adobe.com/xdp/"/>');
    const acro = doc.context.obj({ Fields: [], XFA: doc.context.register(xfa) });
    doc.catalog.set(PDFName.of('AcroForm'), doc.context.register(acro));
    const bytes = await doc.save();
    await expect(draftFromPdf('xfa.pdf', { image: 'x.png', bytes })).rejects.toThrow(/^xfa\.pdf: XFA-only form/);
  });

  it('refuses a page that does not exist', async () => {
    const bytes = await readFile(path.join(DIR, 'dol-wh384-2009.pdf'));
    const doc = await loadPdf(bytes, 'wh384.pdf');
    expect(() => readPageWidgets(doc, 9, 'wh384.pdf')).toThrow('wh384.pdf: page 10 does not exist (the PDF has 3)');
  });
});
