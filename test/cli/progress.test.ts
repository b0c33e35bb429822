import { PassThrough } from 'node:stream';
import { describe, expect, it } from 'vitest';
import type { InputEvent } from '../../src/batch/run-batch.js';
import { BatchProgress } from '../../src/cli/progress.js';
import { failedLine, type ResultsLine } from '../../src/results/results-line.js';

function sink(): { stream: PassThrough; text: () => string } {
  const stream = new PassThrough();
  let text = '';
  stream.on('data', (d) => (text += d));
  return { stream, text: () => text };
}

const form = (id: string, accepted: number, review: number): ResultsLine => ({
  document: id,
  path: `scans/${id}.png`,
  ok: true,
  pages: 1,
  counts: { accepted, review, invalid: 0, missing: 0, corrected: 0, confirmed: 0 },
  seconds: 2.5,
});

const event = (over: Partial<InputEvent>): InputEvent => ({
  index: 0,
  done: 1,
  total: 4,
  file: 'scans/slip-0001.png',
  lines: [form('slip-0001', 20, 2)],
  reused: false,
  pages: 1,
  seconds: 2.5,
  ...over,
});

describe('batch progress on stderr', () => {
  it('on a terminal: one line per input, a status line redrawn in place with pages/s, ETA and failures', () => {
    const out = sink();
    const p = new BatchProgress('tty', 4, 2, out.stream);
    p.input(event({}));
    p.input(event({ index: 1, done: 2, file: 'scans/stack.tif', lines: [form('stack.p1', 10, 1), form('stack.p2', 11, 0)], pages: 2 }));
    p.input(event({ index: 2, done: 3, file: 'scans/torn.png', lines: [failedLine('torn', 'scans/torn.png', 'scans/torn.png: page 1 is blank')], pages: 0 }));
    p.finish({});
    const text = out.text();
    expect(text).toContain('[1/4] scans/slip-0001.png: 20 accepted, 2 to review in 2.5 s\n');
    expect(text).toContain('[2/4] scans/stack.tif: 2 forms, 21 accepted, 1 to review in 2.5 s\n');
    expect(text).toContain('[3/4] scans/torn.png: FAILED: scans/torn.png: page 1 is blank\n');
    // The status line is rewritten in place: carriage return and erase-in-line (ECMA-48 §8.3.41), never a newline.
    expect(text).toMatch(/\r\x1b\[K3\/4 inputs, 3 pages, \d+\.\d\d pages\/s, ETA \d+ s, 1 failed, 2 worker\(s\)/);
    expect(text.endsWith('\r\x1b[K')).toBe(true);
  });

  it('says when a form fits none of the schemas (it waits for a person as a whole)', () => {
    const out = sink();
    const p = new BatchProgress('lines', 1, 1, out.stream);
    p.input(event({ total: 1, lines: [{ ...form('slip-0001', 0, 22), unknownLayout: true }] }));
    p.finish({});
    expect(out.text()).toContain('[1/1] scans/slip-0001.png: 0 accepted, 22 to review; layout unknown: fits none of the schemas in 2.5 s\n');
  });

  it('kept inputs show no time; quiet prints nothing', () => {
    const out = sink();
    const p = new BatchProgress('lines', 1, 1, out.stream);
    p.input(event({ total: 1, reused: true, pages: 0, seconds: 0 }));
    p.finish({});
    expect(out.text()).toBe('[1/1] scans/slip-0001.png: 20 accepted, 2 to review (unchanged, kept)\n');
    const quiet = sink();
    const q = new BatchProgress('quiet', 1, 1, quiet.stream);
    q.input(event({ total: 1 }));
    q.finish({});
    expect(quiet.text()).toBe('');
  });

  it('--json-log: one JSON object per line, counts and ids only', () => {
    const out = sink();
    const p = new BatchProgress('json', 2, 2, out.stream);
    p.input(event({ total: 2 }));
    p.finish({ interrupted: false });
    const events = out.text().trim().split('\n').map((l) => JSON.parse(l));
    expect(events.map((e) => e.event)).toEqual(['start', 'input', 'done']);
    expect(events[1]).toMatchObject({ done: 1, total: 2, pages: 1, documents: [{ id: 'slip-0001', ok: true, counts: { accepted: 20, review: 2 } }] });
    expect(events[2]).toMatchObject({ done: 1, total: 2, failed: 0, interrupted: false });
    for (const e of events) expect(Number.isNaN(Date.parse(e.time))).toBe(false);
  });
});
