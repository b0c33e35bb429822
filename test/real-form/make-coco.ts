/**
 * Write the COCO truth of the blank W-4 page from its schema: `npx tsx test/real-form/make-coco.ts`.
 * The JSON is derived, never edited by hand; test/real-form/w4-schema.test.ts checks it still matches the schema.
 */
import path from 'node:path';
import { writeJsonAtomic } from '../../src/io/atomic-write.js';
import { loadW4Schema, W4_BLANK_COCO, w4BlankCoco, w4Layout } from './w4-layout.js';

const coco = w4BlankCoco(w4Layout(await loadW4Schema()), path.dirname(W4_BLANK_COCO));
await writeJsonAtomic(W4_BLANK_COCO, coco);
process.stdout.write(`${W4_BLANK_COCO}: ${coco.annotations.length} entry areas\n`);
