/**
 * Summed-area tables of values and of their squares (F. Crow, "Summed-area tables for texture mapping", SIGGRAPH
 * 1984): the sum and the sum of squares over any axis-aligned window come from four lookups each, so windowed means
 * and variances (Sauvola binarization, normalized cross-correlation) cost the same for any window size.
 */
export interface SummedArea {
  width: number;
  height: number;
  /** sum[y * (width + 1) + x] = sum of the values over rows < y and columns < x. */
  sum: Float64Array;
  sumSq: Float64Array;
}

export function summedArea(data: ArrayLike<number>, width: number, height: number): SummedArea {
  const W = width + 1;
  const sum = new Float64Array(W * (height + 1));
  const sumSq = new Float64Array(W * (height + 1));
  // Row offsets kept in locals: the same additions in the same order as the textbook recurrence, fewer index
  // multiplications (this table is built for every field's touch-up, src/page/local-refine.ts).
  let src = 0;
  for (let y = 0; y < height; y++) {
    let row = 0;
    let rowSq = 0;
    const above = y * W + 1;
    const here = above + W;
    for (let x = 0; x < width; x++) {
      const v = data[src++];
      row += v;
      rowSq += v * v;
      sum[here + x] = sum[above + x] + row;
      sumSq[here + x] = sumSq[above + x] + rowSq;
    }
  }
  return { width, height, sum, sumSq };
}

/** Sum and sum of squares of all the values: what a summed-area table's last entry holds, without the table. */
export function totals(data: ArrayLike<number>): { sum: number; sumSq: number } {
  let sum = 0;
  let sumSq = 0;
  for (let i = 0; i < data.length; i++) {
    const v = data[i];
    sum += v;
    sumSq += v * v;
  }
  return { sum, sumSq };
}

/** Sum of a table over columns x0..x1-1 and rows y0..y1-1. */
export function windowTotal(table: Float64Array, width: number, x0: number, y0: number, x1: number, y1: number): number {
  const W = width + 1;
  return table[y1 * W + x1] - table[y0 * W + x1] - table[y1 * W + x0] + table[y0 * W + x0];
}
