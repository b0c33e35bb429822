import { stat } from 'node:fs/promises';
import path from 'node:path';
import { configError } from '../errors.js';
import { writeFileAtomic, writeJsonAtomic } from '../io/atomic-write.js';
import type { DocumentResult } from '../result/document.js';
import { reliabilityPng } from './reliability-diagram.js';
import { DEFAULT_BINS } from './reliability.js';
import type { TruthDocument } from '../result/truth.js';
import { loadFailedStems, loadResults, loadTruth } from './score-input.js';
import { scoreAll, type ScoreReport, type ScoredField } from './score.js';

export interface ScoreOptions {
  results: string;
  truth: string;
  /** score.json path; default <results>/score.json. */
  out?: string;
  /** Reliability diagram PNG; default beside `out`, named <out stem>-reliability.png. */
  diagram?: string;
  bins?: number;
}

export interface ScoreRun {
  report: ScoreReport;
  items: ScoredField[];
  out: string;
  diagram: string;
}

export async function requireFolder(dir: string, what: string): Promise<void> {
  const st = await stat(dir).catch(() => null);
  if (!st?.isDirectory()) throw configError(dir, `${what} folder not found`);
}

/** Truth and results of two folders, matched by image stem. */
export async function loadScoreInputs(resultsDir: string, truthDir: string) {
  await requireFolder(resultsDir, 'results');
  await requireFolder(truthDir, 'truth');
  const truthEntries = await loadTruth(truthDir);
  const resultEntries = await loadResults(resultsDir);
  const failed = await loadFailedStems(resultsDir);
  const truth = new Map<string, TruthDocument>([...truthEntries].map(([k, v]) => [k, v.truth]));
  const results = new Map<string, DocumentResult>([...resultEntries].map(([k, v]) => [k, v.result]));
  return { truth, results, failed };
}

/** Load, score, write score.json and the reliability diagram (atomically). */
export async function runScore(options: ScoreOptions): Promise<ScoreRun> {
  const bins = options.bins ?? DEFAULT_BINS;
  if (!Number.isInteger(bins) || bins < 1 || bins > 100) {
    throw configError(undefined, `--bins must be an integer from 1 to 100, got ${bins}`);
  }
  const inputs = await loadScoreInputs(options.results, options.truth);
  const { report, items } = scoreAll({ ...inputs, bins });
  const out = options.out ?? path.join(options.results, 'score.json');
  const diagram = options.diagram ?? path.join(path.dirname(out), `${path.parse(out).name}-reliability.png`);
  const png = await reliabilityPng(report.reliability, { title: `Reliability: ${items.length} fields` });
  await writeFileAtomic(diagram, png);
  await writeJsonAtomic(out, { ...report, createdAt: new Date().toISOString(), results: options.results, truth: options.truth, diagram });
  return { report, items, out, diagram };
}
