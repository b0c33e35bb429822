import { createRequire } from 'node:module';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { createWorker, OEM, PSM, type Worker } from 'tesseract.js';
import type { OcrMode, OcrWord, TextReading } from '../fields/types.js';
import type { GrayImage } from '../image/raster.js';
import { grayToPng } from '../image/raster.js';

/** What one OCR call needs besides the pixels. */
export interface OcrRequest {
  mode: OcrMode;
  /** The only characters tesseract may return (tessedit_char_whitelist); all when absent. */
  allowed?: string;
}

/** Tesseract page-segmentation mode per field mode (tesseract's --psm table: 6 block, 7 line, 8 word, 10 char). */
export const PSM_FOR_MODE: Record<OcrMode, PSM> = {
  block: PSM.SINGLE_BLOCK,
  line: PSM.SINGLE_LINE,
  word: PSM.SINGLE_WORD,
  char: PSM.SINGLE_CHAR,
};

/**
 * The traineddata shipped in @tesseract.js-data/eng (integerized "best" LSTM model). A local folder path makes
 * tesseract.js read the file from disk; it fetches only when langPath is a URL or absent, so this never downloads.
 */
export function englishLangPath(): string {
  const require = createRequire(import.meta.url);
  return path.join(path.dirname(require.resolve('@tesseract.js-data/eng/package.json')), '4.0.0_best_int');
}

interface TesseractWord {
  text: string;
  confidence: number;
}
interface TesseractPage {
  text: string;
  confidence: number;
  blocks: { paragraphs: { lines: { words: TesseractWord[] }[] }[] }[] | null;
}

function wordsOf(page: TesseractPage): OcrWord[] {
  const out: OcrWord[] = [];
  for (const block of page.blocks ?? [])
    for (const par of block.paragraphs)
      for (const line of par.lines)
        for (const w of line.words) if (w.text.trim() !== '') out.push({ text: w.text, confidence: w.confidence / 100 });
  return out;
}

/**
 * Tesseract's whitelist with the space always in it. Without the space the LSTM engine glues a spaced line
 * ("2026 - 09 - 24") into one word and reports confidence 0 for it; with it, word confidences come back as usual
 * (measured on the marina-slip sample's date cells: 0 without, 0.67–0.96 with). Spaces are removed by the field
 * types' own cleanup where a format has none.
 */
export function whitelist(allowed: string | undefined): string {
  if (!allowed) return '';
  return allowed.includes(' ') ? allowed : `${allowed} `;
}

/**
 * One tesseract.js worker, started on the first read and reused for every crop. Whoever creates an engine closes
 * it, as with a detector session: a run (the CLI, a batch worker thread, a queue worker, a test file) makes one and
 * hands it to every read. Calls are serialized because the page-segmentation mode and whitelist are worker-wide
 * parameters set right before each recognize.
 */
export class OcrEngine {
  private worker: Promise<Worker> | null = null;
  private queue: Promise<unknown> = Promise.resolve();
  private lastParams = '';
  private busy = 0;

  /** Milliseconds tesseract has spent recognizing since this engine was made (setting parameters included). */
  get busyMs(): number {
    return this.busy;
  }

  private start(): Promise<Worker> {
    this.worker ??= createWorker('eng', OEM.LSTM_ONLY, {
      langPath: englishLangPath(),
      cacheMethod: 'none',
      gzip: true,
    });
    return this.worker;
  }

  /** Read a crop; text is trimmed, confidences are 0..1. */
  read(image: GrayImage, request: OcrRequest): Promise<TextReading> {
    const job = this.queue.then(() => this.recognize(image, request));
    this.queue = job.catch(() => undefined);
    return job;
  }

  private async recognize(image: GrayImage, request: OcrRequest): Promise<TextReading> {
    const worker = await this.start();
    const params = {
      tessedit_pageseg_mode: PSM_FOR_MODE[request.mode],
      tessedit_char_whitelist: whitelist(request.allowed),
      // Crops carry no resolution; a fixed value stops tesseract guessing one per crop. 300 dpi is the scan
      // resolution tesseract's documentation recommends (tessdoc "Improving the quality of the output", from memory).
      user_defined_dpi: '300',
    };
    const png = await grayToPng(image);
    const started = performance.now();
    const key = JSON.stringify(params);
    if (key !== this.lastParams) {
      await worker.setParameters(params);
      this.lastParams = key;
    }
    const { data } = await worker.recognize(png, {}, { text: true, blocks: true }).finally(() => (this.busy += performance.now() - started));
    const page = data as unknown as TesseractPage;
    return { kind: 'text', text: page.text.trim(), words: wordsOf(page), confidence: page.confidence / 100 };
  }

  /** Terminate the worker; a later read starts a fresh one. */
  async close(): Promise<void> {
    const w = this.worker;
    this.worker = null;
    this.lastParams = '';
    if (w) await (await w).terminate();
  }
}
