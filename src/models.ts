import { fileURLToPath } from 'node:url';

/** The form-element detector shipped in models/ (resolved from src/ or dist/ alike). */
export const DEFAULT_MODEL_PATH = fileURLToPath(new URL('../models/form-elements.onnx', import.meta.url));
