import { readFile } from 'node:fs/promises';
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { z } from 'zod';
import { oneLine } from '../../errors.js';
import { recordedPath } from '../../results/recorded-path.js';
import { EMPTY_CORRECTION } from '../answers.js';
import { applyAnswers, defaultReviewer } from '../apply.js';
import { CROPS_DIR, queuePath, reviewDir } from '../../results/review-layout.js';
import { newPageToken, tokenMatches } from './token.js';
import { answerFromPage, buildPageView, pageRows, readPageQueue } from './view.js';

/** The page's own files: HTML, script and style, served from the package (nothing is fetched from elsewhere). */
const ASSETS = new URL('../../../assets/review-page/', import.meta.url);
const ASSET_TYPES: Record<string, string> = {
  'index.html': 'text/html; charset=utf-8',
  'app.js': 'text/javascript; charset=utf-8',
  'app.css': 'text/css; charset=utf-8',
};

/**
 * Content Security Policy: the page's own script, style and images only; no inline code, no frames, no forms
 * posting elsewhere (W3C CSP Level 3 directives).
 */
const CSP = "default-src 'none'; script-src 'self'; style-src 'self'; img-src 'self'; connect-src 'self'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'";

/** Crop names the queue lists: crops/<row id>.png and crops/<row id>.context.png (row-id.ts); nothing else is served. */
const CROP_NAME = /^r[0-9a-f]{16}(\.context)?\.png$/;

/** Largest answer body accepted: a correction and a note are short text (common practice for JSON APIs: a few kB). */
const MAX_BODY = 64 * 1024;

const PageAnswerBody = z
  .object({
    rowId: z.string().regex(/^r[0-9a-f]{16}$/),
    action: z.enum(['correct', 'confirm', 'blank', 'revert']),
    text: z.string().max(4000).optional(),
    note: z.string().max(4000).optional(),
  })
  .strict()
  .refine((a) => a.action !== 'correct' || (a.text ?? '').trim() !== '', { message: 'a correction needs text' });

export interface ReviewPageOptions {
  resultsDir: string;
  /** Port on 127.0.0.1; 0 (default) lets the system choose a free one. */
  port?: number;
  reviewer?: string;
  /** The secret in the address; a fresh random one by default. */
  token?: string;
  /** "Today" for date range checks (tests). */
  now?: () => Date;
}

export interface ReviewPage {
  /** The address to open, token included. */
  url: string;
  port: number;
  close(): Promise<void>;
}

function send(res: ServerResponse, status: number, type: string, body: string | Buffer): void {
  res.writeHead(status, {
    'Content-Type': type,
    'Content-Length': Buffer.byteLength(body),
    'Content-Security-Policy': CSP,
    'X-Content-Type-Options': 'nosniff',
    // The address carries the token: never hand it on, never keep the page or the crops in a cache.
    'Referrer-Policy': 'no-referrer',
    'Cache-Control': 'no-store',
    'Cross-Origin-Resource-Policy': 'same-origin',
  });
  res.end(body);
}

function sendJson(res: ServerResponse, status: number, value: unknown): void {
  send(res, status, 'application/json; charset=utf-8', JSON.stringify(value));
}

async function readBody(req: IncomingMessage): Promise<string | null> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of req) {
    size += (chunk as Buffer).length;
    if (size > MAX_BODY) return null;
    chunks.push(chunk as Buffer);
  }
  return Buffer.concat(chunks).toString('utf8');
}

/**
 * Serve the review page of a results folder on 127.0.0.1 only, at http://127.0.0.1:PORT/<token>/. A request whose
 * first path segment is not the token, or whose Host is not this loopback address (a page elsewhere reaching it
 * through DNS rebinding), is refused. Answers go through applyAnswers, the same path as `review apply`, one at a time.
 */
export async function startReviewPage(options: ReviewPageOptions): Promise<ReviewPage> {
  // Refuse at once a folder without records or queue, with the usual one-line error.
  await buildPageView(options.resultsDir);
  const token = options.token ?? newPageToken();
  const reviewer = options.reviewer?.trim() || defaultReviewer();
  // Recorded in the audit log as recordedPath writes it (no absolute path in the records).
  const queueFile = recordedPath(queuePath(options.resultsDir));
  // Answers are applied one after another: the apply lock guards against other processes, this chain within one.
  let chain: Promise<unknown> = Promise.resolve();
  let port = 0;

  async function answer(req: IncomingMessage, res: ServerResponse): Promise<void> {
    if (!(req.headers['content-type'] ?? '').startsWith('application/json')) return sendJson(res, 415, { ok: false, message: 'send JSON' });
    const origin = req.headers.origin;
    if (origin !== undefined && origin !== `http://127.0.0.1:${port}` && origin !== `http://localhost:${port}`)
      return sendJson(res, 403, { ok: false, message: 'answers are taken from this page only' });
    const text = await readBody(req);
    if (text === null) return sendJson(res, 413, { ok: false, message: 'answer too long' });
    let json: unknown;
    try {
      json = JSON.parse(text);
    } catch {
      return sendJson(res, 400, { ok: false, message: 'not JSON' });
    }
    const parsed = PageAnswerBody.safeParse(json);
    if (!parsed.success) return sendJson(res, 400, { ok: false, message: parsed.error.issues[0].message });
    const run = chain.then(async () => {
      const entry = (await readPageQueue(options.resultsDir)).find((e) => e.cells.row_id?.trim() === parsed.data.rowId);
      if (!entry) return { ok: false, message: `row ${parsed.data.rowId} is not in the queue` };
      const report = await applyAnswers(
        options.resultsDir,
        [answerFromPage(entry, parsed.data, EMPTY_CORRECTION)],
        { queue: queueFile, via: 'page' },
        { reviewer, now: options.now?.() },
      );
      const [row = null] = await pageRows(options.resultsDir, [entry], report.documents);
      if (report.problems.length > 0) return { ok: false, message: report.problems[0].message, row };
      const what = report.reverted ? 'undone' : report.corrected ? 'corrected' : report.confirmed ? 'confirmed' : 'already saved';
      return { ok: true, message: what, row };
    });
    chain = run.catch(() => undefined);
    try {
      const out = await run;
      sendJson(res, out.ok ? 200 : 422, out);
    } catch (err) {
      sendJson(res, 500, { ok: false, message: oneLine(err) });
    }
  }

  async function handle(req: IncomingMessage, res: ServerResponse): Promise<void> {
    const host = req.headers.host ?? '';
    if (host !== `127.0.0.1:${port}` && host !== `localhost:${port}`) return send(res, 403, 'text/plain; charset=utf-8', 'forbidden\n');
    const url = new URL(req.url ?? '/', `http://${host}`);
    const [, first = '', ...rest] = url.pathname.split('/');
    if (!tokenMatches(first, token)) return send(res, 403, 'text/plain; charset=utf-8', 'forbidden: open the address formglean review serve printed\n');
    const route = rest.join('/');
    if (rest.length === 0) {
      res.writeHead(308, { Location: `/${token}/`, 'Referrer-Policy': 'no-referrer', 'Cache-Control': 'no-store' });
      return void res.end();
    }
    if (req.method === 'POST' && route === 'api/answer') return answer(req, res);
    if (req.method !== 'GET' && req.method !== 'HEAD') return send(res, 405, 'text/plain; charset=utf-8', 'method not allowed\n');
    if (route === 'api/rows') return sendJson(res, 200, await buildPageView(options.resultsDir));
    const asset = route === '' ? 'index.html' : route;
    if (asset in ASSET_TYPES) return send(res, 200, ASSET_TYPES[asset], await readFile(new URL(asset, ASSETS)));
    if (rest[0] === CROPS_DIR && rest.length === 2 && CROP_NAME.test(rest[1])) {
      try {
        return send(res, 200, 'image/png', await readFile(path.join(reviewDir(options.resultsDir), CROPS_DIR, rest[1])));
      } catch {
        return send(res, 404, 'text/plain; charset=utf-8', 'no such crop\n');
      }
    }
    return send(res, 404, 'text/plain; charset=utf-8', 'not found\n');
  }

  const server: Server = createServer((req, res) => {
    handle(req, res).catch((err: unknown) => {
      if (!res.headersSent) sendJson(res, 500, { ok: false, message: oneLine(err) });
      else res.destroy();
    });
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, '127.0.0.1', () => resolve());
  });
  port = (server.address() as AddressInfo).port;
  return {
    url: `http://127.0.0.1:${port}/${token}/`,
    port,
    close: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}
