/** The default batch processor: the measurement pipeline of src/core/pipeline. */
import type { ImageProcessor } from './processor.js';
import { thumbnailFromPixels } from './thumb.js';
import type { MeasureParams } from '../../core/pipeline/types.js';

interface PipelineModule {
  analyseImage(
    bytes: Uint8Array,
    input: { file: string; sha256: string },
    params: MeasureParams,
  ): Promise<{ result: unknown; overlay: { width: number; height: number; data: Uint8ClampedArray } | null }>;
  encodeOverlayPng(overlay: { width: number; height: number; data: Uint8ClampedArray }): Uint8Array;
}

export async function createProcessor(): Promise<ImageProcessor> {
  // Loaded by URL so that this shell builds before the pipeline module exists.
  const url = new URL('../../core/pipeline/index.js', import.meta.url).href;
  let mod: PipelineModule;
  try {
    mod = (await import(url)) as PipelineModule;
  } catch (e) {
    throw new Error(`the measurement pipeline is not available in this build (${(e as Error).message})`);
  }
  return async (bytes, input, params) => {
    const { result, overlay } = await mod.analyseImage(bytes, input, params);
    return {
      result: result as Record<string, unknown>,
      overlayPng: overlay ? mod.encodeOverlayPng(overlay) : null,
      thumbnailPng: overlay ? thumbnailFromPixels(overlay.width, overlay.height, overlay.data, 4) : null,
    };
  };
}
