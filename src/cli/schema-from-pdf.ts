import type { Command } from 'commander';
import { configError } from '../errors.js';

interface FromPdfFlags {
  out: string;
  page: string;
  name?: string;
}

/** `formglean schema from-pdf`: a schema from the widgets of a fillable PDF page, on its rendered blank. */
export function addFromPdfSubcommand(schema: Command): void {
  schema
    .command('from-pdf')
    .description('Draft a schema from the form fields (widgets) of a fillable PDF page; writes the schema and its blank image')
    .argument('<form>', 'fillable PDF (AcroForm)')
    .requiredOption('--out <file>', 'schema file to write (YAML); the blank image <name>.blank.png is written beside it')
    .option('--page <n>', 'page of the PDF, from 1', '1')
    .option('--name <name>', 'form name in the schema (default: the file name)')
    .action(async (form: string, flags: FromPdfFlags) => {
      const page = Number(flags.page);
      if (!Number.isInteger(page) || page < 1) throw configError(undefined, `--page must be a page number from 1; got "${flags.page}"`);
      // Loaded on use: the PDF library is large, and every other command starts without it.
      const { blankImageName, draftFromPdf, writePdfSchema } = await import('../draft/from-pdf/from-pdf.js');
      const draft = await draftFromPdf(form, { page: page - 1, image: blankImageName(flags.out), name: flags.name });
      const written = await writePdfSchema(draft, flags.out);
      const byType = new Map<string, number>();
      for (const f of draft.schema.fields) byType.set(f.type, (byType.get(f.type) ?? 0) + 1);
      const types = [...byType].map(([t, n]) => `${n} ${t}`).join(', ');
      const s = draft.skipped;
      const skipped = s.pushButton + s.hidden + s.readOnly + s.barcode + s.listBox;
      process.stdout.write(
        `wrote ${written.schema} (${draft.schema.fields.length} fields: ${types}) and ${written.blank}` +
          `${skipped > 0 ? `; skipped ${skipped} widget(s): ${s.pushButton} push button, ${s.hidden} hidden, ${s.readOnly} read-only, ${s.barcode} barcode, ${s.listBox} list box` : ''}\n`,
      );
    });
}
