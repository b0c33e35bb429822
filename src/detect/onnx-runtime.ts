/**
 * The one door to onnxruntime-node. Every module that needs the runtime imports it from here, never from the package
 * directly, so the privacy switch below runs before the native library starts.
 */
import './runtime-telemetry.js';

export { InferenceSession, Tensor } from 'onnxruntime-node';
