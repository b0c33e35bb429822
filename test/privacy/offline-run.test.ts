/**
 * "Nothing leaves the machine": a real `extract` (real detector, real OCR, a bundled sample scan) makes no network
 * attempt and writes nothing outside --out. The ONNX runtime, left to itself, resolves a telemetry host and writes a
 * device id under ~/.cache and log files in the temp folder (src/detect/runtime-telemetry.ts); HOME and TMPDIR point
 * at empty folders of this test's own so any such write shows up.
 */
import { spawn } from 'node:child_process';
import { mkdtemp, readFile, readdir, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { REPO, TSX_LOADER } from '../cli/run-cli.js';
import { missingProgram, skipUnlessPresent } from '../support/requirements.js';

let work: string;
beforeAll(async () => {
  work = await mkdtemp(path.join(os.tmpdir(), 'fg-offline-'));
});
afterAll(async () => {
  await rm(work, { recursive: true, force: true });
});

/** Every path below `dir`, relative to it. */
async function listTree(dir: string): Promise<string[]> {
  const entries = await readdir(dir, { recursive: true });
  return entries.map(String).sort();
}

/** Run the CLI from source with its own empty HOME and TMPDIR, optionally under strace. */
async function runIsolated(name: string, args: string[], traceFile?: string): Promise<{ code: number | null; home: string; tmp: string; stderr: string }> {
  const home = await mkdtemp(path.join(work, `${name}-home-`));
  const tmp = await mkdtemp(path.join(work, `${name}-tmp-`));
  const node = [process.execPath, '--import', TSX_LOADER, path.join(REPO, 'src/cli/main.ts'), ...args];
  // trace=%network: every socket, connect, sendto... call; DNS lookups open an AF_INET/AF_INET6 socket first.
  const argv = traceFile ? ['strace', '-f', '-qq', '-e', 'trace=%network', '-o', traceFile, ...node] : node;
  const env: NodeJS.ProcessEnv = { ...process.env, HOME: home, TMPDIR: tmp, TSX_DISABLE_CACHE: '1' };
  delete env.ORT_DISABLE_TELEMETRY; // the tool must switch telemetry off itself, not rely on the caller
  return new Promise((resolve, reject) => {
    const child = spawn(argv[0], argv.slice(1), { cwd: REPO, env, stdio: ['ignore', 'ignore', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (d) => (stderr += d));
    child.on('error', reject);
    child.on('close', (code) => resolve({ code, home, tmp, stderr }));
  });
}

const EXTRACT = ['extract', 'samples/garden-plot-typed.png', '--schema', 'schemas/garden-plot.yaml'];
// The runtime's telemetry resolves its host only once enough events have queued: seen with the five bundled scans
// (six forms, three layouts), not with one scan, so the network check runs the whole demo batch.
const DEMO = ['extract', 'samples', ...['clinic-intake', 'marina-slip', 'garden-plot'].flatMap((s) => ['--schema', `schemas/${s}.yaml`])];

describe('an extract run stays on the machine', () => {
  it('writes nothing outside --out: no runtime cache in HOME, nothing left in the temp folder', async () => {
    const out = path.join(work, 'out-files');
    const run = await runIsolated('files', [...EXTRACT, '--out', out]);
    expect(run.stderr).not.toMatch(/Error/);
    expect(run.code).toBe(0);
    expect(await listTree(run.home)).toEqual([]);
    expect(await listTree(run.tmp)).toEqual([]);
    expect(await listTree(out)).toContain('garden-plot-typed.json');
  });

  it('opens no internet socket and resolves no host name (traced with strace)', async (ctx) => {
    skipUnlessPresent(ctx, missingProgram('strace'));
    const trace = path.join(work, 'network.trace');
    const run = await runIsolated('net', [...DEMO, '--out', path.join(work, 'out-net')], trace);
    expect(run.code).toBe(0);
    const calls = (await readFile(trace, 'utf8')).split('\n').filter((l) => l.trim() !== '');
    // Local IPC (AF_UNIX socket pairs of Node's worker threads) is allowed; any IPv4/IPv6 socket is not.
    const internet = calls.filter((l) => /AF_INET6?\b/.test(l));
    expect(internet).toEqual([]);
    expect(calls.filter((l) => /connect\(/.test(l) && !/AF_UNIX/.test(l))).toEqual([]);
  });
});

describe('library use', () => {
  it('loading the runtime through the detector module switches its telemetry off', async () => {
    const saved = process.env.ORT_DISABLE_TELEMETRY;
    delete process.env.ORT_DISABLE_TELEMETRY;
    // A fresh module graph, as a library user importing formglean gets it.
    const { vi } = await import('vitest');
    vi.resetModules();
    await import('../../src/detect/onnx-detector.js');
    expect(process.env.ORT_DISABLE_TELEMETRY).toBe('1');
    if (saved === undefined) delete process.env.ORT_DISABLE_TELEMETRY;
    else process.env.ORT_DISABLE_TELEMETRY = saved;
  });
});
