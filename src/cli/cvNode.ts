/** Loads opencv-wasm in Node (synchronous: the package reads its .wasm with fs). */
import { createRequire } from 'node:module';
import { hasCv, setCv, type OpenCv } from '../core/index.js';

/** Loads the runtime once and hands it to core; the package exports `{ cv }` (opencv.js 4.3). */
export function loadCvNode(): void {
  if (hasCv()) return;
  const require = createRequire(import.meta.url);
  const { cv } = require('opencv-wasm') as { cv: OpenCv };
  setCv(cv);
}
