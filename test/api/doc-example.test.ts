import { execFile } from 'node:child_process';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { afterAll, describe, expect, it } from 'vitest';
import { REPO, TSX_LOADER } from '../cli/run-cli.js';

const run = promisify(execFile);

/** The example lines of src/api.ts's header comment, as written there. */
async function docExample(): Promise<string[]> {
  const text = await readFile(path.join(REPO, 'src/api.ts'), 'utf8');
  const header = text.slice(0, text.indexOf('*/'));
  return header
    .split('\n')
    .filter((l) => l.startsWith(' *   '))
    .map((l) => l.slice(5));
}

describe('the library example in src/api.ts', () => {
  const made: string[] = [];
  afterAll(async () => {
    for (const d of made) await rm(d, { recursive: true, force: true });
  });

  it('type-checks against the public API and runs on a bundled scan', async () => {
    const lines = await docExample();
    expect(lines.length).toBeGreaterThan(5);
    const work = await mkdtemp(path.join(os.tmpdir(), 'formglean-api-example-'));
    made.push(work);
    const api = path.join(REPO, 'src/api.js');
    // Every name the example uses comes from the one public module; nothing else is imported.
    const source = `import { DEFAULT_MODEL_PATH, DigitReader, extractDocument, loadDetector, loadSchema, OcrEngine, runBatch } from ${JSON.stringify(api)};\n` +
      `process.chdir(${JSON.stringify(REPO)});\n` +
      `const out = ${JSON.stringify(path.join(work, 'out'))};\n` +
      lines.map((l) => l.replace("outDir: 'out'", 'outDir: out')).join('\n') + '\n';
    const file = path.join(work, 'example.mts');
    await writeFile(file, source);
    await writeFile(
      path.join(work, 'tsconfig.json'),
      JSON.stringify({
        compilerOptions: { target: 'ES2022', module: 'NodeNext', moduleResolution: 'NodeNext', strict: true, noEmit: true, skipLibCheck: true, types: ['node'], typeRoots: [path.join(REPO, 'node_modules/@types')] },
        files: [file],
      }),
    );
    // Type-check first: an example that drifted from the API fails here with the compiler's message.
    await run(process.execPath, [path.join(REPO, 'node_modules/typescript/bin/tsc'), '-p', path.join(work, 'tsconfig.json')], { cwd: REPO }).catch((err) => {
      throw new Error(`the example does not type-check:\n${err.stdout}${err.stderr}`);
    });
    const { stdout } = await run(process.execPath, ['--import', TSX_LOADER, file], { cwd: REPO, timeout: 170_000 });
    const accepted = Number(/^(\d+) fields accepted/m.exec(stdout)?.[1]);
    expect(accepted).toBeGreaterThan(10);
    const summary = JSON.parse(await readFile(path.join(work, 'out', 'summary.json'), 'utf8'));
    expect(summary.documents.processed).toBe(1);
  }, 240_000);
});
