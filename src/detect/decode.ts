import type { Box } from '../image/geometry.js';

/**
 * Decoders for the three output tensor layouts common among single-stage detectors exported to ONNX:
 *
 * - `xywh-scores`              [1, 4 + C, N]: cx, cy, w, h, then C class scores (anchor-free heads; our own model)
 * - `xywh-objectness-scores`   [1, N, 5 + C]: cx, cy, w, h, objectness, then C class scores; score = obj × cls
 * - `xyxy-score-class`         [1, N, 6]:     x1, y1, x2, y2, score, class index, already suppressed by the model
 *
 * Coordinates are input (letterboxed) pixels; scores are probabilities (already passed through a sigmoid).
 */
export type OutputLayout = 'xywh-scores' | 'xywh-objectness-scores' | 'xyxy-score-class';

export const OUTPUT_LAYOUTS: readonly OutputLayout[] = ['xywh-scores', 'xywh-objectness-scores', 'xyxy-score-class'];

/** One scored box before non-maximum suppression, in input pixels. */
export interface Candidate {
  box: Box;
  classId: number;
  score: number;
}

/** A dimension is a number, or a string when the model leaves it symbolic (it then fits anything). */
type Dim = number | string;

function fits(dim: Dim, want: number): boolean {
  return typeof dim === 'string' || dim === want;
}

/**
 * The layouts an output shape can be read as, for a model with `classCount` classes. Symbolic dimensions match
 * anything, so a shape known only at load time may fit more than one layout; a concrete shape rarely does.
 */
export function layoutsFitting(dims: readonly Dim[], classCount: number): OutputLayout[] {
  if (dims.length !== 3 || !fits(dims[0], 1)) return [];
  const out: OutputLayout[] = [];
  if (fits(dims[1], 4 + classCount)) out.push('xywh-scores');
  if (fits(dims[2], 5 + classCount)) out.push('xywh-objectness-scores');
  if (fits(dims[2], 6)) out.push('xyxy-score-class');
  return out;
}

/**
 * The one layout a concrete output shape is read as. `hint` (the model's `output_layout` metadata) settles shapes
 * that fit more than one, such as [1, 6, 6]. Throws a plain Error saying what was found; the caller names the file.
 */
export function resolveLayout(dims: readonly Dim[], classCount: number, hint?: OutputLayout): OutputLayout {
  const fitting = layoutsFitting(dims, classCount);
  const shape = `[${dims.join(', ')}]`;
  if (hint) {
    if (!fitting.includes(hint)) throw new Error(`output shape ${shape} does not fit its output_layout "${hint}" with ${classCount} classes`);
    return hint;
  }
  if (fitting.length === 0) {
    throw new Error(
      `unexpected output shape ${shape} for ${classCount} classes: expected [1, ${4 + classCount}, N], [1, N, ${5 + classCount}] or [1, N, 6]`,
    );
  }
  if (fitting.length > 1) {
    throw new Error(`output shape ${shape} fits several layouts (${fitting.join(', ')}); set metadata output_layout`);
  }
  return fitting[0];
}

/**
 * Read candidates with score >= scoreThreshold out of a raw output tensor. In the class-score layouts each
 * candidate takes its best class (argmax; single-label decoding, common practice).
 */
export function decodeOutput(
  data: Float32Array,
  dims: readonly number[],
  classCount: number,
  scoreThreshold: number,
  hint?: OutputLayout,
): Candidate[] {
  const layout = resolveLayout(dims, classCount, hint);
  switch (layout) {
    case 'xywh-scores':
      return decodeChannelsFirst(data, dims[2], classCount, scoreThreshold);
    case 'xywh-objectness-scores':
      return decodeRows(data, dims[1], classCount, scoreThreshold);
    case 'xyxy-score-class':
      return decodeSuppressed(data, dims[1], classCount, scoreThreshold);
  }
}

function centreBox(cx: number, cy: number, w: number, h: number): Box | undefined {
  if (!(w > 0 && h > 0 && Number.isFinite(cx) && Number.isFinite(cy) && Number.isFinite(w) && Number.isFinite(h))) {
    return undefined;
  }
  return { x: cx - w / 2, y: cy - h / 2, w, h };
}

/** [1, 4 + C, N]: value of channel k for candidate i sits at k * N + i. */
function decodeChannelsFirst(data: Float32Array, n: number, classCount: number, threshold: number): Candidate[] {
  const out: Candidate[] = [];
  for (let i = 0; i < n; i++) {
    let best = -1;
    let score = -Infinity;
    for (let k = 0; k < classCount; k++) {
      const s = data[(4 + k) * n + i];
      if (s > score) {
        score = s;
        best = k;
      }
    }
    if (!(score >= threshold)) continue;
    const box = centreBox(data[i], data[n + i], data[2 * n + i], data[3 * n + i]);
    if (box) out.push({ box, classId: best, score });
  }
  return out;
}

/** [1, N, 5 + C]: candidate i is the row starting at i * (5 + C). */
function decodeRows(data: Float32Array, n: number, classCount: number, threshold: number): Candidate[] {
  const out: Candidate[] = [];
  const stride = 5 + classCount;
  for (let i = 0; i < n; i++) {
    const row = i * stride;
    const objectness = data[row + 4];
    if (!(objectness >= threshold)) continue; // obj × cls ≤ obj, so nothing below can pass
    let best = -1;
    let cls = -Infinity;
    for (let k = 0; k < classCount; k++) {
      const s = data[row + 5 + k];
      if (s > cls) {
        cls = s;
        best = k;
      }
    }
    const score = objectness * cls;
    if (!(score >= threshold)) continue;
    const box = centreBox(data[row], data[row + 1], data[row + 2], data[row + 3]);
    if (box) out.push({ box, classId: best, score });
  }
  return out;
}

/** [1, N, 6]: x1, y1, x2, y2, score, class. Padding rows carry score 0 and fall under any positive threshold. */
function decodeSuppressed(data: Float32Array, n: number, classCount: number, threshold: number): Candidate[] {
  const out: Candidate[] = [];
  for (let i = 0; i < n; i++) {
    const row = i * 6;
    const score = data[row + 4];
    if (!(score >= threshold)) continue;
    const classId = Math.round(data[row + 5]);
    if (!(classId >= 0 && classId < classCount)) {
      throw new Error(`output row ${i} has class index ${data[row + 5]}, outside 0..${classCount - 1}`);
    }
    const [x1, y1, x2, y2] = [data[row], data[row + 1], data[row + 2], data[row + 3]];
    const box = centreBox((x1 + x2) / 2, (y1 + y2) / 2, x2 - x1, y2 - y1);
    if (box) out.push({ box, classId, score });
  }
  return out;
}
