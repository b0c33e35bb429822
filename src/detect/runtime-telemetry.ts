/**
 * Keep the ONNX runtime's own telemetry off.
 *
 * Measured with strace on onnxruntime-node 1.30.0 (Linux x64): loading a session without this switch resolves a
 * remote telemetry host (DNS queries to the system resolver), writes a device id and an event database under
 * `~/.cache/Microsoft/DeveloperTools/.onnxruntime/`, and leaves `mat-debug-<pid>.log` and `.ses` in the temp folder.
 * With `ORT_DISABLE_TELEMETRY=1` in the environment before the first session is created, none of that happens
 * (test/privacy/no-network.test.ts checks it). The runtime reads the variable when it creates its environment,
 * which is why this module must be evaluated before any session exists: `onnx-runtime.ts` imports it first.
 *
 * Forms carry personal data and formglean promises to send nothing anywhere, so telemetry is off unless the user
 * opts in explicitly with FORMGLEAN_RUNTIME_TELEMETRY=on.
 */
export const RUNTIME_TELEMETRY_OPT_IN = 'FORMGLEAN_RUNTIME_TELEMETRY';

if (process.env[RUNTIME_TELEMETRY_OPT_IN] !== 'on') process.env.ORT_DISABLE_TELEMETRY = '1';
