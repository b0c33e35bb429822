/**
 * Write the `mnist` package's digits to training/data/digits/{train,test}.bin for training/digits/train.py.
 * The split is src/synth/mnist-digits.ts's (last 15 % of each class = test, never trained on).
 *
 * Format (little-endian): magic "FGD1", uint32 count, then `count` records of 1 byte label (0..9), 1 uint16 index
 * within its class, 784 bytes of pixels (28 x 28, row-major, 0 = paper, 255 = ink).
 *
 *   npx tsx training/digits/export_mnist.ts [--out training/data/digits]
 */
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { writeFileAtomic } from '../../src/io/atomic-write.js';
import { MNIST_SIZE, mnistDigit, testIndices, trainIndices } from '../../src/synth/mnist-digits.js';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const outIdx = process.argv.indexOf('--out');
const out = outIdx > 0 ? path.resolve(process.argv[outIdx + 1]) : path.join(root, 'training/data/digits');

function pack(records: { label: number; index: number }[]): Buffer {
  const px = MNIST_SIZE * MNIST_SIZE;
  const buf = Buffer.alloc(8 + records.length * (3 + px));
  buf.write('FGD1', 0, 'ascii');
  buf.writeUInt32LE(records.length, 4);
  let o = 8;
  for (const r of records) {
    buf.writeUInt8(r.label, o);
    buf.writeUInt16LE(r.index, o + 1);
    buf.set(mnistDigit(r.label, r.index), o + 3);
    o += 3 + px;
  }
  return buf;
}

const train: { label: number; index: number }[] = [];
const test: { label: number; index: number }[] = [];
for (let d = 0; d <= 9; d++) {
  for (const index of trainIndices(d)) train.push({ label: d, index });
  for (const index of testIndices(d)) test.push({ label: d, index });
}
await writeFileAtomic(path.join(out, 'train.bin'), pack(train));
await writeFileAtomic(path.join(out, 'test.bin'), pack(test));
process.stdout.write(`wrote ${train.length} training and ${test.length} test digits to ${out}\n`);
