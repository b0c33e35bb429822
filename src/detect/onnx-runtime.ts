/**
 * The one door to onnxruntime-node. Every module that needs the runtime imports it from here, never from the package
 * directly, so the privacy switch below runs before the native library starts.
 */
import './runtime-telemetry.js';
import { InferenceSession } from 'onnxruntime-node';

export { InferenceSession, Tensor } from 'onnxruntime-node';

/**
 * A CPU session for our small models (the detector, the digit reader): sequential execution, one inter-op thread,
 * full graph optimisation, and `intraOpThreads` threads inside an operator (onnxruntime's own choice when undefined).
 */
export function createCpuSession(bytes: Uint8Array, intraOpThreads?: number): Promise<InferenceSession> {
  return InferenceSession.create(bytes, {
    executionProviders: ['cpu'],
    graphOptimizationLevel: 'all',
    executionMode: 'sequential',
    interOpNumThreads: 1,
    ...(intraOpThreads ? { intraOpNumThreads: intraOpThreads } : {}),
  });
}
