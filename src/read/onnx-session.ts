// onnxruntime's POSIX build carries a telemetry client that stays off when ORT_DISABLE_TELEMETRY is set (the
// variable named in the runtime's own library). Forms carry personal data and the tool sends nothing anywhere, so it
// is set before the runtime is loaded (this module is imported ahead of onnxruntime-node) unless the user set it.
process.env.ORT_DISABLE_TELEMETRY ??= '1';

const ort = await import('onnxruntime-node');
const { InferenceSession } = ort;

/** onnxruntime's tensor class, loaded after the setting above. */
export const Tensor = ort.Tensor;

/**
 * A CPU session for a small model: sequential execution, one inter-op thread, full graph optimisation, and
 * `intraOpThreads` threads inside an operator (onnxruntime's own choice when undefined).
 */
export function createCpuSession(bytes: Uint8Array, intraOpThreads?: number) {
  return InferenceSession.create(bytes, {
    executionProviders: ['cpu'],
    graphOptimizationLevel: 'all',
    executionMode: 'sequential',
    interOpNumThreads: 1,
    ...(intraOpThreads ? { intraOpNumThreads: intraOpThreads } : {}),
  });
}
