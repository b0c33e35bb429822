/**
 * OCR sanity of synthetic fills: character error rate of tesseract.js on the written text of clean demo pages,
 * typed and handwriting-style, read straight from each field's write box (no detector, no cleanup).
 * Usage: npx tsx bench/synth-ocr.ts [pages per fill=3]
 */
import { distance } from 'fastest-levenshtein';
import { createWorker, OEM, PSM } from 'tesseract.js';
import { englishLangPath } from '../src/read/ocr-engine.js';
import { cropGray, grayToPng } from '../src/image/raster.js';
import { DEMO_LAYOUTS, demoLayout, type DemoLayoutName } from '../src/synth/layouts.js';
import { renderPage } from '../src/synth/render-page.js';

const pages = Number(process.argv[2] ?? 3);
const worker = await createWorker('eng', OEM.LSTM_ONLY, { langPath: englishLangPath(), cacheMethod: 'none', gzip: true });
// Crops carry no resolution; a fixed one stops tesseract guessing (and warning) per crop.
await worker.setParameters({ tessedit_pageseg_mode: PSM.SINGLE_LINE, user_defined_dpi: '300' });
for (const fill of ['typed', 'handwriting'] as const) {
  let edits = 0;
  let chars = 0;
  let exact = 0;
  let fields = 0;
  for (const name of Object.keys(DEMO_LAYOUTS) as DemoLayoutName[])
    for (let i = 0; i < pages; i++) {
      const layout = demoLayout(name);
      const page = await renderPage({ layout, pageSeed: 700000 + i, runSeed: 700000, index: i, file: 'x.png', fill, scan: { level: 'none', upsideDownRate: 0 } });
      for (const f of page.truth.fields) {
        const slot = layout.fields.find((l) => l.name === f.name)!.slots[0];
        if (!f.text || f.text.includes('\n') || slot.look.kind === 'comb' || slot.look.kind === 'parts') continue;
        const { data } = await worker.recognize(await grayToPng(cropGray(page.image, slot.writeBox)));
        const read = data.text.trim();
        edits += distance(read, f.text);
        chars += f.text.length;
        exact += read === f.text ? 1 : 0;
        fields++;
      }
    }
  console.log(`${fill}: ${fields} single-line fields, CER ${((100 * edits) / chars).toFixed(2)} %, exact ${((100 * exact) / fields).toFixed(1)} %`);
}
await worker.terminate();
