import { EFFECT_WORDS, reasonRows } from '../fields/reasons.js';

/** The reason-code table as Markdown: the README's section is this text (tools/readme-reasons.ts writes it). */
export function reasonsMarkdown(): string {
  const cell = (s: string) => s.replace(/\|/g, '\\|');
  const lines = ['| code | sends to review | meaning | what to check |', '| --- | --- | --- | --- |'];
  for (const r of reasonRows()) lines.push(`| \`${r.code}\` | ${EFFECT_WORDS[r.effect]} | ${cell(r.meaning)} | ${cell(r.check)} |`);
  return lines.join('\n') + '\n';
}

/** The same table as plain text for a terminal: one block per code. */
export function reasonsText(): string {
  return reasonRows()
    .map((r) => `  ${r.code} (sends to review: ${EFFECT_WORDS[r.effect]})\n      ${r.meaning}\n      check: ${r.check}`)
    .join('\n');
}

/** Markers around the README's generated reason-code table. */
export const README_REASONS_START = '<!-- reason codes: generated from src/fields/reasons.ts by `npm run docs:reasons`; edit there -->';
export const README_REASONS_END = '<!-- end of reason codes -->';

/** The README text with its reason-code section replaced by the current table; throws when the markers are missing. */
export function readmeWithReasons(readme: string): string {
  const start = readme.indexOf(README_REASONS_START);
  const end = readme.indexOf(README_REASONS_END);
  if (start < 0 || end < start) throw new Error('README.md has no reason-code section (markers missing)');
  return `${readme.slice(0, start)}${README_REASONS_START}\n\n${reasonsMarkdown()}\n${readme.slice(end)}`;
}
