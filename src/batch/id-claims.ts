import type { ResultsLine } from '../results/results-line.js';

/**
 * Document ids in a results folder, each held by one input file. A record is written to <id>.json, so two inputs
 * with one id would overwrite each other (a stack "scan.tif" read as scan.p1, scan.p2 beside a file "scan.p2.png"):
 * the later claim gets a suffix (-2, -3, ...), and the results line records the id it asked for. Ids are compared
 * without case, as case-insensitive file systems (macOS, Windows defaults) would.
 */
export class IdClaims {
  private readonly holders = new Map<string, string>();

  constructor(kept: readonly ResultsLine[]) {
    for (const l of kept) if (l.document) this.holders.set(l.document.toLowerCase(), l.path);
  }

  claim(id: string, file: string): string {
    let unique = id;
    for (let n = 2; ; n++) {
      const holder = this.holders.get(unique.toLowerCase());
      if (holder === undefined || holder === file) break;
      unique = `${id}-${n}`;
    }
    this.holders.set(unique.toLowerCase(), file);
    return unique;
  }
}
