/**
 * Plain-text table: a header, then one line per row, the first column left-aligned and the others right-aligned
 * (figures). With `rule`, a line of dashes under the header.
 */
export function formatTable(
  head: readonly string[],
  rows: readonly (readonly (string | number)[])[],
  options: { rule?: boolean } = {},
): string {
  const cells = [head, ...rows].map((r) => r.map(String));
  const widths = head.map((_, i) => Math.max(...cells.map((r) => r[i].length)));
  const line = (r: readonly string[]) => r.map((c, i) => (i === 0 ? c.padEnd(widths[i]) : c.padStart(widths[i]))).join('  ');
  const [top, ...body] = cells;
  return [line(top), ...(options.rule ? [widths.map((w) => '-'.repeat(w)).join('  ')] : []), ...body.map(line)].join('\n');
}
