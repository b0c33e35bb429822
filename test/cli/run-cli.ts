import { spawn } from 'node:child_process';
import path from 'node:path';
import { pathToFileURL } from 'node:url';

export const REPO = path.resolve(import.meta.dirname, '../..');

/** tsx's loader by file URL, so a command run from another working folder still finds it. */
export const TSX_LOADER = pathToFileURL(path.join(REPO, 'node_modules/tsx/dist/loader.mjs')).href;

export interface CliRun {
  code: number | null;
  stdout: string;
  stderr: string;
}

/** Run the real command line (TypeScript sources through tsx) in a child process, and wait for it to end. */
export async function runCli(args: readonly string[], options: { cwd?: string; env?: NodeJS.ProcessEnv } = {}): Promise<CliRun> {
  const { code, stdout, stderr } = await startCli(args, options).done;
  return { code, stdout, stderr };
}

export interface StartedCli {
  child: ReturnType<typeof spawn>;
  /** Everything written to stderr so far. */
  stderr(): string;
  done: Promise<CliRun & { signal: NodeJS.Signals | null }>;
}

/** Start the real command line without waiting for it (node --import tsx: the pid is the one that writes). */
export function startCli(args: readonly string[], options: { cwd?: string; env?: NodeJS.ProcessEnv } = {}): StartedCli {
  const child = spawn(process.execPath, ['--import', TSX_LOADER, path.join(REPO, 'src/cli/main.ts'), ...args], {
    cwd: options.cwd ?? REPO,
    env: { ...process.env, ...options.env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let stdout = '';
  let stderr = '';
  child.stdout.on('data', (d) => (stdout += d));
  child.stderr.on('data', (d) => (stderr += d));
  const done = new Promise<CliRun & { signal: NodeJS.Signals | null }>((resolve, reject) => {
    child.on('error', reject);
    child.on('close', (code, signal) => resolve({ code, signal, stdout, stderr }));
  });
  return { child, stderr: () => stderr, done };
}
