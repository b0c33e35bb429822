/** Text as a literal in a regular expression: every character with a meaning there is escaped. */
export function escapeRegex(s: string): string {
  return s.replace(/[.*+?^${}()|[\]\\/-]/g, '\\$&');
}
