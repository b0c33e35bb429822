/** The middle value (the upper one of the two middles for an even count); 0 for no values. */
export function median(values: readonly number[]): number {
  const s = [...values].sort((a, b) => a - b);
  return s.length ? s[s.length >> 1] : 0;
}
