import { escapeXml, svgDocument } from '../../src/image/svg.js';
import { FONT_FAMILIES, type FontKey } from '../../src/image/fonts.js';
import { rasterizeSvg } from '../../src/synth/rasterize.js';

/**
 * A value written into a printed entry box 48 px high (sharp/librsvg with the bundled fonts): the page and the box.
 * The text starts 12 px inside the box, its baseline set so the glyphs sit about centred.
 */
export async function entryBox(text: string, font: FontKey = 'sans', size = 24, boxWidth = 400) {
  const box = { x: 10, y: 8, w: boxWidth, h: 48 };
  const body =
    `<rect x="${box.x}" y="${box.y}" width="${box.w}" height="${box.h}" fill="none" stroke="black" stroke-width="2"/>` +
    `<text x="${box.x + 12}" y="${box.y + box.h / 2 + size * 0.36}" font-family="${FONT_FAMILIES[font]}" font-size="${size}">${escapeXml(text)}</text>`;
  return { page: await rasterizeSvg(svgDocument(box.w + 20, 64, body)), box };
}
