/**
 * How long the review page takes to save one answer, over HTTP, for results folders of a few sizes. Each answer takes
 * the whole review apply path (lock, read every record, check, write the record, audit, results.jsonl and summary)
 * and then rebuilds the page's view of the queue. Prints the median and p90 per folder size.
 *
 *   npx tsx bench/review-page-answer.ts [--sizes 50,200,500] [--answers 20]
 */
import { rm } from 'node:fs/promises';
import { parseArgs } from 'node:util';
import { percentile } from '../src/eval/percentile.js';
import { startReviewPage } from '../src/review/page/server.js';
import type { PageView } from '../src/review/page/view.js';
import { writeReviewQueue } from '../src/review/queue-write.js';
import { makeResultsFolder } from '../test/review/results-folder.js';

const { values: args } = parseArgs({
  options: { sizes: { type: 'string', default: '50,200,500' }, answers: { type: 'string', default: '20' } },
});
const answers = Number(args.answers);

for (const size of args.sizes!.split(',').map(Number)) {
  const { dir, docs } = await makeResultsFolder(size, 'fg-bench-page-');
  await writeReviewQueue(dir, docs);
  const page = await startReviewPage({ resultsDir: dir, reviewer: 'bench' });
  const view = (await (await fetch(`${page.url}api/rows`)).json()) as PageView;
  const rows = view.rows.filter((r) => r.field === 'phone').slice(0, answers);
  const ms: number[] = [];
  for (const r of rows) {
    const t0 = performance.now();
    const res = await fetch(`${page.url}api/answer`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify({ rowId: r.rowId, action: 'confirm' }),
    });
    if (!res.ok) throw new Error(`answer refused: ${(await res.json()).message}`);
    ms.push(performance.now() - t0);
  }
  await page.close();
  await rm(dir, { recursive: true, force: true });
  console.log(`${size} documents (${view.rows.length} queue rows): ${ms.length} answers, median ${percentile(ms, 50).toFixed(0)} ms, p90 ${percentile(ms, 90).toFixed(0)} ms`);
}
