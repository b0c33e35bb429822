// Rewrites the README's reason-code table from src/fields/reasons.ts (npm run docs:reasons).
import { readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { readmeWithReasons } from '../src/review/reasons-text.js';

const readme = path.resolve(import.meta.dirname, '..', 'README.md');
const before = await readFile(readme, 'utf8');
const after = readmeWithReasons(before);
if (after !== before) await writeFile(readme, after);
process.stdout.write(`${readme}: reason codes ${after === before ? 'already current' : 'rewritten'}\n`);
