import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { REASONS, reasonInfo, reasonRows } from '../../src/fields/reasons.js';
import { scoreField } from '../../src/fields/scoring.js';
import { readmeWithReasons, reasonsMarkdown } from '../../src/review/reasons-text.js';

const repo = path.resolve(import.meta.dirname, '../..');

describe('reason codes', () => {
  it('the README carries the current table (run npm run docs:reasons after editing src/fields/reasons.ts)', async () => {
    const readme = await readFile(path.join(repo, 'README.md'), 'utf8');
    expect(readmeWithReasons(readme)).toBe(readme);
    for (const code of Object.keys(REASONS)) expect(readme).toContain(`| \`${code}\` |`);
  });

  it('gives every code a meaning and a check, snake_case and unique', () => {
    const rows = reasonRows();
    expect(new Set(rows.map((r) => r.code)).size).toBe(rows.length);
    for (const r of rows) {
      expect(r.code).toMatch(/^[a-z]+(_[a-z]+)*$/);
      expect(r.meaning.length).toBeGreaterThan(10);
      expect(r.check.length).toBeGreaterThan(3);
    }
    expect(reasonsMarkdown().split('\n').filter((l) => l.startsWith('| `'))).toHaveLength(rows.length);
  });

  it('reads the renamed low_confidence of older records as below_review_threshold, which scoring now writes', () => {
    expect(reasonInfo('low_confidence')?.code).toBe('below_review_threshold');
    expect(reasonInfo('no_such_code')).toBeUndefined();
    const s = scoreField({
      source: 'detection',
      detectionScore: 0.9,
      reading: { kind: 'text', text: 'Robin', words: [{ text: 'Robin', confidence: 0.9 }], confidence: 0.9 },
      interpretation: { value: 'Robin', outcome: 'valid', confidence: 0.6, reasons: [] },
      reviewThreshold: 0.75,
      required: false,
    });
    expect(s).toMatchObject({ status: 'review', reasons: ['below_review_threshold'] });
  });

  it('marks region_fallback as lowering the confidence only: accepted fields may carry it', () => {
    expect(REASONS.region_fallback.effect).toBe('confidence');
    const s = scoreField({
      source: 'region',
      detectionScore: null,
      reading: { kind: 'text', text: 'Robin', words: [{ text: 'Robin', confidence: 0.99 }], confidence: 0.99 },
      interpretation: { value: 'Robin', outcome: 'valid', confidence: 1, reasons: [] },
      reviewThreshold: 0.5,
      required: false,
    });
    expect(s.status).toBe('accepted');
    expect(s.reasons).toContain('region_fallback');
  });
});
