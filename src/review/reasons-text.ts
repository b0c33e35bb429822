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
