import { describe, expect, it } from 'vitest';
import { failedLine, okLine } from '../../src/results/results-line.js';
import { summarize } from '../../src/results/summary.js';
import { documentResult, field } from '../review/fixture.js';

describe('summary straight-through', () => {
  it('counts per field (accepted fields) and per document (documents with every field accepted)', () => {
    const clean = documentResult('slip-0001', [field('boat_name', 'text', 'Gull', 'accepted'), field('phone', 'phone', '+12075550142', 'accepted')]);
    const doubtful = documentResult('slip-0002', [field('boat_name', 'text', 'Tern', 'accepted'), field('phone', 'phone', null, 'missing')]);
    const s = summarize([okLine(clean), okLine(doubtful), failedLine('slip-0003', '/scans/slip-0003.png', 'unreadable')]);
    // 3 of 4 fields accepted; 1 of the 2 processed documents needed nobody (a failed document is not processed).
    expect(s.straightThroughRate).toBe(0.75);
    expect(s.documentStraightThroughRate).toBe(0.5);
    expect(summarize([]).documentStraightThroughRate).toBeNull();
  });
});
