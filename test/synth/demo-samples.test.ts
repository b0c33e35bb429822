import { mkdtemp, readFile, rm, stat } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import sharp from 'sharp';
import { afterAll, describe, expect, it } from 'vitest';
import { DEMO_SCANS, makeDemoSamples } from '../../tools/make-demo-samples.js';

const root = path.resolve(import.meta.dirname, '..', '..');
let tmp: string | undefined;

afterAll(async () => {
  if (tmp) await rm(tmp, { recursive: true, force: true });
});

describe('demo samples', () => {
  it('regenerate byte for byte from their seeds and stay small', async () => {
    tmp = await mkdtemp(path.join(os.tmpdir(), 'formglean-demo-'));
    const written = await makeDemoSamples(tmp);
    for (const file of written) {
      const rel = path.relative(tmp, file);
      const fresh = await readFile(file);
      const committed = await readFile(path.join(root, rel));
      expect(fresh.equals(committed), `${rel} differs from the committed file (run npm run samples:make)`).toBe(true);
    }
    for (const scan of DEMO_SCANS) {
      const file = path.join(root, 'samples', `${scan.stem}.${scan.format === 'jpeg' ? 'jpg' : scan.format === 'tiff' ? 'tif' : 'png'}`);
      expect((await stat(file)).size).toBeLessThan(400 * 1024);
      const meta = await sharp(file).metadata();
      expect(meta.pages ?? 1).toBe(scan.seeds.length);
      expect(meta.density).toBe(150);
    }
  });
});
