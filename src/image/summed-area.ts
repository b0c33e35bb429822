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
  for (let y = 0; y < height; y++) {
    let row = 0;
    let rowSq = 0;
    for (let x = 0; x < width; x++) {
      const v = data[y * width + x];
      row += v;
      rowSq += v * v;
      sum[(y + 1) * W + x + 1] = sum[y * W + x + 1] + row;
      sumSq[(y + 1) * W + x + 1] = sumSq[y * W + x + 1] + rowSq;
    }
  }
  return { width, height, sum, sumSq };
}

/** Sum of a table over columns x0..x1-1 and rows y0..y1-1. */
export function windowTotal(table: Float64Array, width: number, x0: number, y0: number, x1: number, y1: number): number {
  const W = width + 1;
  return table[y1 * W + x1] - table[y0 * W + x1] - table[y1 * W + x0] + table[y0 * W + x0];
}
