import { createHash } from 'node:crypto';
import { mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import os from 'node:os';
import path from 'node:path';
import { escapeXml } from './svg.js';

/**
 * Fonts for synthetic pages come from npm packages, not from the system, so that every machine draws the same
 * glyphs. librsvg (inside sharp) finds fonts through fontconfig, which reads the file named by FONTCONFIG_FILE the
 * first time text is laid out; so this must run before sharp renders any SVG text.
 */

/** Family names as the font files declare them. */
export const FONT_FAMILIES = {
  sans: 'DejaVu Sans',
  serif: 'DejaVu Serif',
  mono: 'DejaVu Sans Mono',
  caveat: 'Caveat',
  pen: 'Nanum Pen',
} as const;

export type FontKey = keyof typeof FONT_FAMILIES;

const require = createRequire(import.meta.url);

function packageDir(name: string): string {
  return path.dirname(require.resolve(`${name}/package.json`));
}

/** Folders holding the npm-installed font files. */
export function fontFolders(): string[] {
  return [
    path.join(packageDir('dejavu-fonts-ttf'), 'ttf'),
    packageDir('@expo-google-fonts/caveat'),
    packageDir('@expo-google-fonts/nanum-pen-script'),
  ];
}


let configured: string | undefined;

/**
 * Write a fonts.conf listing only the npm font folders and point FONTCONFIG_FILE at it. The file sits in a temp
 * folder named by a hash of its content, so processes share it and fontconfig's cache beside it (fonts are scanned
 * once, not per process). Idempotent within a process; returns the config path.
 */
export function useBundledFonts(): string {
  if (configured) return configured;
  const dirs = fontFolders()
    .map((d) => `  <dir>${escapeXml(d)}</dir>`)
    .join('\n');
  const key = createHash('sha256').update(dirs).digest('hex').slice(0, 16);
  const dir = path.join(os.tmpdir(), `formglean-fonts-${key}`);
  const conf = `<?xml version="1.0"?>
<!DOCTYPE fontconfig SYSTEM "fonts.dtd">
<fontconfig>
${dirs}
  <cachedir>${escapeXml(path.join(dir, 'cache'))}</cachedir>
</fontconfig>
`;
  const file = path.join(dir, 'fonts.conf');
  let current: string | undefined;
  try {
    current = readFileSync(file, 'utf8');
  } catch {
    current = undefined;
  }
  if (current !== conf) {
    // Written under a unique name and renamed, so a process reading it never sees half a file.
    mkdirSync(dir, { recursive: true });
    const tmp = `${file}.${process.pid}.tmp`;
    writeFileSync(tmp, conf);
    renameSync(tmp, file);
  }
  process.env.FONTCONFIG_FILE = file;
  configured = file;
  return file;
}
