/** Loads opencv-wasm in Node (synchronous: the package reads its .wasm with fs). */
import { createRequire } from 'node:module';
import { hasCv, setCv } from '../core/cv.js';

export function loadCvNode(): void {
  if (hasCv()) return;
  const require = createRequire(import.meta.url);
  const { cv } = require('opencv-wasm') as { cv: unknown };
  setCv(cv);
}
