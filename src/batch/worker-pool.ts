import { MessageChannel } from 'node:worker_threads';
import Tinypool from 'tinypool';
import { FormgleanError, oneLine } from '../errors.js';
import { failedLine } from '../results/results-line.js';
import type { InputReader } from './input-reader.js';
import type { ClaimAnswer, ClaimRequest, WorkerOutcome, WorkerSpec } from './worker-messages.js';

/**
 * The worker thread's entry beside this file: pool-worker.js after `npm run build`. From the TypeScript sources (tests,
 * `npx tsx`) Node 20 does not carry tsx's loader into worker threads (tsx issue #354: ERR_UNKNOWN_FILE_EXTENSION), so
 * the thread starts from a two-line module that registers tsx and then imports pool-worker.ts.
 */
function workerEntry(): string {
  const here = import.meta.url;
  if (!here.endsWith('.ts')) return new URL('./pool-worker.js', here).href;
  const tsx = import.meta.resolve('tsx/esm/api');
  const entry = new URL('./pool-worker.ts', here).href;
  const boot =
    `import { register } from ${JSON.stringify(tsx)}; register();\n` +
    `const m = await import(${JSON.stringify(entry)}); export default m.default; export const closeWorker = m.closeWorker;\n`;
  return `data:text/javascript,${encodeURIComponent(boot)}`;
}

/**
 * Inputs read by `workers` threads at once, each holding its own detector session, digit reader and OCR worker for
 * its life (opened on its first input), each reading `inputsPerThread` inputs at once. Id claims stay in this thread: a worker asks for each one by message.
 */
export function openWorkerPool(spec: WorkerSpec, workers: number, inputsPerThread: number): InputReader {
  // Started on the first input read, so a run that keeps every input (--resume) starts no thread.
  let pool: Tinypool | null = null;
  const started = () =>
    (pool ??= new Tinypool({
      filename: workerEntry(),
      minThreads: workers,
      maxThreads: workers,
      workerData: spec,
      // A thread reads several inputs at once (two by default): one's geometry runs while another waits on OCR.
      concurrentTasksPerWorker: inputsPerThread,
      // Let each thread close its sessions and its tesseract worker before it ends.
      teardown: 'closeWorker',
    }));
  return {
    concurrency: workers * inputsPerThread,
    async read(job, claim) {
      const { port1, port2 } = new MessageChannel();
      port1.on('message', (request: ClaimRequest) => {
        void Promise.resolve(claim(request.requested)).then((granted) => port1.postMessage({ id: request.id, granted } satisfies ClaimAnswer));
      });
      try {
        // A thread that dies (out of memory, a crash in a native library) fails its input; the pool starts another.
        const crashed = (err: unknown): WorkerOutcome => ({ lines: [], failure: { message: `${job.file}: worker thread failed (${oneLine(err)})`, exitCode: 1 } });
        const outcome = await (started().run({ job, port: port2 }, { transferList: [port2] }) as Promise<WorkerOutcome>).catch(crashed);
        if (outcome.failure?.exitCode === 2) throw new FormgleanError(outcome.failure.message, { exitCode: 2 });
        const lines = outcome.failure ? [failedLine(await claim(job.stem), job.recorded, outcome.failure.message)] : outcome.lines;
        return { lines, results: [], stages: outcome.stages };
      } finally {
        port1.close();
      }
    },
    close: async () => pool?.destroy(),
  };
}
