import path from 'node:path';
import { performance } from 'node:perf_hooks';
import type { InputEvent } from '../batch/run-batch.js';
import { printable } from '../errors.js';
import type { ResultsLine } from '../results/results-line.js';
import { isFailed } from '../results/results-line.js';

/**
 * How a batch reports progress on stderr: `tty` one line per input with a status line (pages/s, ETA, failures)
 * redrawn under them; `lines` the same lines with a status line every few seconds (logs, pipes); `json` one JSON
 * object per event (machines); `quiet` nothing. No mode ever prints a field value.
 */
export type ProgressMode = 'tty' | 'lines' | 'json' | 'quiet';

/** Seconds between status lines where the output is not a terminal (a log keeps the rate without a line per tick). */
const STATUS_EVERY_S = 5;
/** Redraw of the terminal's status line, so the ETA moves between inputs. */
const TTY_REDRAW_MS = 1000;

function documentsSaid(lines: readonly ResultsLine[], reused: boolean): string {
  const failed = lines.find(isFailed);
  if (failed) return `FAILED: ${printable(failed.error ?? '')}`;
  let accepted = 0;
  let review = 0;
  for (const l of lines) {
    accepted += l.counts?.accepted ?? 0;
    review += (l.counts?.review ?? 0) + (l.counts?.invalid ?? 0) + (l.counts?.missing ?? 0);
  }
  const forms = lines.length > 1 ? `${lines.length} forms, ` : '';
  const unknown = lines.filter((l) => l.unknownLayout).length;
  // Such a form waits as a whole: the review queue asks which form it is before any of its fields.
  const layout = unknown > 0 ? `; ${unknown === lines.length && unknown === 1 ? 'layout' : `${unknown} layout(s)`} unknown: fits none of the schemas` : '';
  return `${forms}${accepted} accepted, ${review} to review${layout}${reused ? ' (unchanged, kept)' : ''}`;
}

function duration(seconds: number): string {
  if (seconds < 90) return `${Math.round(seconds)} s`;
  if (seconds < 5400) return `${Math.round(seconds / 60)} min`;
  return `${Math.floor(seconds / 3600)} h ${Math.round((seconds % 3600) / 60)} min`;
}

export class BatchProgress {
  private readonly started = performance.now();
  private done = 0;
  private read = 0;
  private readSeconds = 0;
  private pages = 0;
  private failed = 0;
  private statusShown = false;
  private finished = false;
  private timer: NodeJS.Timeout | null = null;

  constructor(
    private readonly mode: ProgressMode,
    private readonly total: number,
    private readonly workers: number,
    private readonly stream: NodeJS.WritableStream = process.stderr,
  ) {
    this.json({ event: 'start', inputs: total, workers });
    if (mode !== 'quiet' && total > 0) {
      this.timer = mode === 'tty' ? setInterval(() => this.drawStatus(), TTY_REDRAW_MS) : setInterval(() => this.statusLine(), STATUS_EVERY_S * 1000);
      this.timer.unref();
    }
  }

  input(e: InputEvent): void {
    this.done = e.done;
    if (!e.reused) {
      this.read++;
      this.readSeconds += e.seconds;
      this.pages += e.pages;
    }
    if (e.lines.some(isFailed)) this.failed++;
    if (this.mode === 'json') {
      this.json({
        event: 'input',
        index: e.index,
        done: e.done,
        total: e.total,
        file: e.file,
        reused: e.reused,
        pages: e.pages,
        seconds: Math.round(e.seconds * 1000) / 1000,
        documents: e.lines.map((l) => ({ id: l.document, ok: l.ok, pages: l.pages, counts: l.counts, error: l.error })),
      });
      return;
    }
    if (this.mode === 'quiet') return;
    const name = printable(path.relative(process.cwd(), e.file) || e.file);
    const time = e.reused || e.lines.some(isFailed) ? '' : ` in ${e.seconds.toFixed(1)} s`;
    this.clearStatus();
    this.stream.write(`[${e.done}/${e.total}] ${name}: ${documentsSaid(e.lines, e.reused)}${time}\n`);
    this.drawStatus();
  }

  /** A line about the run itself (an interruption), printed above the status line. */
  note(event: string, text: string): void {
    if (this.mode === 'json') return this.json({ event, message: text });
    this.clearStatus();
    this.stream.write(`${text}\n`);
    this.drawStatus();
  }

  /** Stop redrawing and leave the terminal's last line clean. */
  finish(final: Record<string, unknown>): void {
    if (this.finished) return;
    this.finished = true;
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
    this.clearStatus();
    this.json({ event: 'done', ...this.figures(), ...final });
  }

  private figures(): { done: number; total: number; pages: number; pagesPerSecond: number | null; etaSeconds: number | null; failed: number } {
    const elapsed = (performance.now() - this.started) / 1000;
    // The ETA assumes the inputs left are read, at the rate this run has read so far with all its workers.
    const perInput = this.read > 0 ? elapsed / this.read : null;
    const left = this.total - this.done;
    return {
      done: this.done,
      total: this.total,
      pages: this.pages,
      pagesPerSecond: elapsed > 0 && this.pages > 0 ? Math.round((this.pages / elapsed) * 100) / 100 : null,
      etaSeconds: perInput === null ? null : Math.round(perInput * left),
      failed: this.failed,
    };
  }

  private statusText(): string {
    const f = this.figures();
    const rate = f.pagesPerSecond === null ? '- pages/s' : `${f.pagesPerSecond.toFixed(2)} pages/s`;
    const eta = f.done >= f.total ? 'finishing' : f.etaSeconds === null ? 'ETA -' : `ETA ${duration(f.etaSeconds)}`;
    return `${f.done}/${f.total} inputs, ${f.pages} pages, ${rate}, ${eta}, ${f.failed} failed, ${this.workers} worker(s)`;
  }

  private statusLine(): void {
    if (this.mode === 'json') this.json({ event: 'progress', ...this.figures() });
    else this.stream.write(`progress: ${this.statusText()}\n`);
  }

  private drawStatus(): void {
    if (this.mode !== 'tty') return;
    // \r and "erase in line" (ECMA-48 §8.3.41, EL): the status line is rewritten in place.
    this.stream.write(`\r\x1b[K${this.statusText()}`);
    this.statusShown = true;
  }

  private clearStatus(): void {
    if (!this.statusShown) return;
    this.stream.write('\r\x1b[K');
    this.statusShown = false;
  }

  private json(event: Record<string, unknown>): void {
    if (this.mode !== 'json') return;
    this.stream.write(`${JSON.stringify({ time: new Date().toISOString(), ...event })}\n`);
  }
}
