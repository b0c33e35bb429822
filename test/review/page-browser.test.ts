import { accessSync, constants } from 'node:fs';
import { mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OcrEngine, extractBatch, loadDetector, loadSchema } from '../../src/api.js';
import { DocumentResult } from '../../src/result/document.js';
import { readAudit } from '../../src/review/audit.js';
import { valueToCell } from '../../src/review/cell-value.js';
import { startReviewPage, type ReviewPage } from '../../src/review/page/server.js';

const repo = path.resolve(import.meta.dirname, '../..');

/** Debian's chromium (apt-get install chromium; .ci/run installs it), found on PATH or named by FORMGLEAN_CHROMIUM. */
function findChromium(): string | undefined {
  const named = process.env.FORMGLEAN_CHROMIUM;
  const candidates = named ? [named] : (process.env.PATH ?? '').split(path.delimiter).flatMap((d) => ['chromium', 'chromium-browser'].map((n) => path.join(d, n)));
  for (const c of candidates) {
    try {
      accessSync(c, constants.X_OK);
      return c;
    } catch {
      // next candidate
    }
  }
  return undefined;
}

const browserPath = findChromium();
// CI installs chromium: a missing browser there is a failure, not a skip.
if (!browserPath && process.env.CI) throw new Error('chromium not found on PATH in CI (set FORMGLEAN_CHROMIUM or apt-get install chromium)');

interface TruthField {
  name: string;
  value: string | number | boolean | string[] | null;
  text: string | null;
}

async function snapshot(dir: string): Promise<Map<string, string>> {
  const out = new Map<string, string>();
  for (const e of await readdir(dir, { recursive: true, withFileTypes: true })) {
    if (e.isFile()) out.set(path.relative(dir, path.join(e.parentPath, e.name)), (await readFile(path.join(e.parentPath, e.name))).toString('base64'));
  }
  return out;
}

async function readDoc(dir: string): Promise<DocumentResult> {
  return DocumentResult.parse(JSON.parse(await readFile(path.join(dir, 'clinic-intake-typed.json'), 'utf8')));
}

let out = '';
let truth = new Map<string, TruthField>();
let reviewPage: ReviewPage | undefined;
let browser: Browser | undefined;

beforeAll(async () => {
  out = await mkdtemp(path.join(tmpdir(), 'fg-review-page-'));
  // A real extract run of a bundled demo scan. The detector's skill is not under test: the tiny fixture model finds
  // almost nothing, so fields are read at the schema's regions and wait for review (as in extract-review.test.ts).
  const schema = await loadSchema(path.join(repo, 'schemas/clinic-intake.yaml'));
  const detector = await loadDetector(path.join(repo, 'test/fixtures/models/square-scores.onnx'), { intraOpThreads: 1 });
  await extractBatch({ ocr, inputs: [path.join(repo, 'samples/clinic-intake-typed.png')], schemas: [schema], detector, outDir: out });
  await detector.close();
  const t = JSON.parse(await readFile(path.join(repo, 'samples/truth/clinic-intake-typed.json'), 'utf8')) as { fields: TruthField[] };
  truth = new Map(t.fields.map((f) => [f.name, f]));
  reviewPage = await startReviewPage({ resultsDir: out, reviewer: 'R. Quill' });
}, 240_000);

const ocr = new OcrEngine();
afterAll(async () => {
  await browser?.close();
  await reviewPage?.close();
  await ocr.close();
  if (out) await rm(out, { recursive: true, force: true });
});

describe('review page without a browser', () => {
  it('refuses requests without the token or with a wrong one, and from another host name', async () => {
    const page = reviewPage!;
    const base = `http://127.0.0.1:${page.port}`;
    expect((await fetch(`${base}/`)).status).toBe(403);
    expect((await fetch(`${base}/not-the-token/api/rows`)).status).toBe(403);
    const ok = await fetch(`${page.url}api/rows`);
    expect(ok.status).toBe(200);
    // W3C CSP Level 3: only the page's own resources; OWASP secure headers: no referrer (the address holds the token).
    expect(ok.headers.get('content-security-policy')).toContain("default-src 'none'");
    expect(ok.headers.get('referrer-policy')).toBe('no-referrer');
    // A name that resolves elsewhere (DNS rebinding) is refused even with the token.
    const rebound = await new Promise<number>((resolve, reject) => {
      import('node:http').then(({ request }) => {
        const r = request(`${page.url}api/rows`, { headers: { Host: `attacker.example.com:${page.port}` } }, (res) => {
          res.resume();
          resolve(res.statusCode ?? 0);
        });
        r.on('error', reject);
        r.end();
      }, reject);
    });
    expect(rebound).toBe(403);
    // Crop names are checked: no path outside the crops folder is served.
    expect((await fetch(`${page.url}crops/..%2F..%2Fresults.jsonl`)).status).toBe(404);
  });
});

const browserTitle = browserPath
  ? 'review page in chromium'
  : 'review page in chromium (skipped: no chromium on PATH; apt-get install chromium, or set FORMGLEAN_CHROMIUM)';

describe.skipIf(!browserPath)(browserTitle, () => {
  const label = (p: Page, id: string) => p.locator(`#${id}`).innerText();
  const progressSays = (p: Page, done: number) =>
    p.waitForFunction((n) => (document.getElementById('progress-text')?.textContent ?? '').startsWith(`${n} of `), done);

  it('is reviewed by keyboard alone: answers saved as given, a bad date refused at once, undo, progress kept on reload', async () => {
    browser = await chromium.launch({ executablePath: browserPath, args: ['--no-sandbox'] });
    const page = await browser.newPage();
    const url = reviewPage!.url;

    // A wrong token gets nothing.
    const refused = await page.goto(url.replace(/\/[^/]+\/$/, '/wrong-token/'));
    expect(refused?.status()).toBe(403);

    await page.goto(url);
    await page.locator('#card').waitFor();
    const total = Number(/of (\d+) fields/.exec(await label(page, 'progress-text'))![1]);
    expect(total).toBeGreaterThan(3);
    // Keyboard first: the correction box has focus as soon as a field is shown.
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('correction');

    const fieldShown = async () => (await label(page, 'field-title')).split(' — ')[0];

    // Filters narrow the view: one field name leaves one row (one document); clearing it brings all back.
    const first = await fieldShown();
    await page.selectOption('#filter-field', first);
    await page.waitForFunction(() => (document.getElementById('progress-text')?.textContent ?? '').includes('0 of 1 in this view'));
    await page.selectOption('#filter-field', '');
    await page.waitForFunction(() => !(document.getElementById('progress-text')?.textContent ?? '').includes('in this view'));
    await page.locator('#correction').focus();
    let done = 0;
    let badDateTried = false;
    let undone = false;
    let reloaded = false;
    while (done < total) {
      const name = await fieldShown();
      const t = truth.get(name)!;
      const type = await label(page, 'type');
      if (type === 'date' && !badDateTried) {
        // 30 February does not exist in the Gregorian calendar: refused at once, with the formats, nothing written.
        const before = await snapshot(out);
        await page.keyboard.type('02/30/2026');
        await page.keyboard.press('Enter');
        await page.waitForFunction(() => (document.getElementById('error')?.textContent ?? '') !== '');
        const error = await label(page, 'error');
        expect(error).toMatch(new RegExp(`field "${name}" is not a valid date \\(invalid_date\\); the field accepts a date as .*YYYY-MM-DD`));
        expect(await snapshot(out)).toEqual(before);
        expect(await fieldShown()).toBe(name);
        await page.keyboard.press('Escape');
        badDateTried = true;
      }
      const read = await label(page, 'value');
      if (t.value === null) await page.keyboard.press('Alt+B');
      else {
        if (read !== valueToCell(t.value)) await page.keyboard.type(t.text ?? (typeof t.value === 'boolean' ? (t.value ? 'yes' : 'no') : valueToCell(t.value)));
        await page.keyboard.press('Enter');
      }
      done++;
      await progressSays(page, done);

      if (done === 2 && !undone) {
        // Undo the answer just given: the record goes back, the audit says so, the field is shown again.
        await page.keyboard.press('Alt+U');
        done--;
        await progressSays(page, done);
        expect(await fieldShown()).toBe(name);
        const f = (await readDoc(out)).fields.find((x) => x.name === name)!;
        expect(['review', 'missing', 'invalid']).toContain(f.status);
        expect(f.review).toBeUndefined();
        const audit = await readAudit(path.join(out, 'review', 'audit.jsonl'));
        expect(audit.at(-1)).toMatchObject({ action: 'reverted', field: name, via: 'page' });
        undone = true;
      }
      if (done === 3 && !reloaded) {
        // A closed tab loses nothing: after a reload the progress is read back from the records.
        await page.reload();
        await page.locator('#card').waitFor();
        await progressSays(page, 3);
        reloaded = true;
      }
    }
    await page.locator('#empty').waitFor();
    expect(await label(page, 'empty')).toContain('Every field in this view is answered');

    // The records: every reviewed field holds the generator's true value (the truth file is the reference).
    const doc = await readDoc(out);
    const audit = await readAudit(path.join(out, 'review', 'audit.jsonl'));
    const answeredFields = new Set(audit.filter((e) => e.action !== 'reverted').map((e) => e.field));
    expect(answeredFields.size).toBe(total);
    for (const name of answeredFields) {
      const f = doc.fields.find((x) => x.name === name)!;
      expect({ field: name, value: f.value }).toEqual({ field: name, value: truth.get(name)!.value });
      expect(['corrected', 'confirmed']).toContain(f.status);
      expect(f.review).toMatchObject({ reviewer: 'R. Quill' });
    }
    expect(audit.every((e) => e.via === 'page' && e.reviewer === 'R. Quill' && e.queue === path.relative(process.cwd(), path.join(out, 'review', 'queue.csv')))).toBe(true);
    expect(audit.filter((e) => e.action === 'reverted')).toHaveLength(1);
    const summary = JSON.parse(await readFile(path.join(out, 'summary.json'), 'utf8'));
    expect(summary.fields.byStatus).toMatchObject(doc.counts);
  }, 180_000);
});
