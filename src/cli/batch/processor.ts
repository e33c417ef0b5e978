/**
 * The per-image processor a batch worker runs: bytes + input + parameters → result and an overlay
 * PNG. The default is the measurement pipeline (src/core/pipeline). A processor module exports
 * `createProcessor(): Promise<ImageProcessor> | ImageProcessor`; the environment variable
 * FRACTOZONE_BATCH_PROCESSOR (absolute path or file URL of such a module) replaces the default —
 * a hook for tests of the batch machinery, not a user feature.
 */
import { pathToFileURL } from 'node:url';
import type { MeasureParams, MeasureResult } from '../../core/pipeline/index.js';

export interface ProcessInput {
  /** Path relative to the input root (what the result records as input.file). */
  file: string;
  sha256: string;
  /** The pixel-classifier model file to segment with (`--model`, manifest column `model`) and its SHA-256. */
  model?: { path: string; sha256: string };
}

export interface ProcessOutput {
  result: MeasureResult;
  overlayPng: Uint8Array | null;
  /** Optional ready-made report thumbnail (PNG ≤ 320 px wide); the worker makes one otherwise. */
  thumbnailPng?: Uint8Array | null;
}

export type ImageProcessor = (bytes: Uint8Array, input: ProcessInput, params: MeasureParams) => Promise<ProcessOutput>;

/** Module URL of the processor the workers load. */
export function processorModuleUrl(): string {
  const env = process.env.FRACTOZONE_BATCH_PROCESSOR;
  if (env && env.trim() !== '') return env.startsWith('file:') ? env : pathToFileURL(env).href;
  return new URL('./pipeline-processor.js', import.meta.url).href;
}

/** Loads a processor module and returns its processor. */
export async function loadProcessor(url: string): Promise<ImageProcessor> {
  const mod = (await import(url)) as { createProcessor?: () => Promise<ImageProcessor> | ImageProcessor };
  if (typeof mod.createProcessor !== 'function') throw new Error(`processor module ${url} does not export createProcessor()`);
  return await mod.createProcessor();
}
