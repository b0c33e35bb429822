/**
 * Tests that need something outside Node (a Python with PyTorch, strace) run where it exists and are skipped with a
 * one-line reason elsewhere, so `npm ci && npm test` passes on a user's fresh clone. CI installs every such
 * requirement and sets FORMGLEAN_REQUIRE_ALL=1: there a missing requirement fails the test instead of skipping it
 * (and .ci/run also fails when any test was skipped).
 */
import { spawnSync } from 'node:child_process';
import type { TestContext } from 'vitest';

export const REQUIRE_ALL = process.env.FORMGLEAN_REQUIRE_ALL === '1';

/** Skip the running test with `reason`, or fail it where every requirement must be present. */
export function skipUnlessPresent(ctx: TestContext, missing: string | null): void {
  if (missing === null) return;
  if (REQUIRE_ALL) throw new Error(`required for this run (FORMGLEAN_REQUIRE_ALL=1): ${missing}`);
  ctx.skip(missing);
}

/** The Python interpreter for training code: FORMGLEAN_PYTHON, else `python3` on PATH. */
export const PYTHON = process.env.FORMGLEAN_PYTHON || 'python3';

/** Null when PYTHON imports every module named, else a one-line reason naming what is missing. */
export function missingPythonModules(modules: readonly string[]): string | null {
  const run = spawnSync(PYTHON, ['-c', `import ${modules.join(', ')}`], { encoding: 'utf8', timeout: 60_000 });
  if (run.error) return `no Python interpreter '${PYTHON}' (${run.error.message}); set FORMGLEAN_PYTHON`;
  if (run.status !== 0) {
    const last = (run.stderr ?? '').trim().split('\n').pop() ?? '';
    return `${PYTHON} cannot import ${modules.join(', ')} (${last}); install them (Debian: python3-torch python3-onnx python3-numpy python3-pil) or set FORMGLEAN_PYTHON`;
  }
  return null;
}

/** Null when the named program runs with `--version`, else a one-line reason. */
export function missingProgram(program: string): string | null {
  const run = spawnSync(program, ['-V'], { encoding: 'utf8', timeout: 10_000 });
  return run.error ? `${program} is not installed` : null;
}
