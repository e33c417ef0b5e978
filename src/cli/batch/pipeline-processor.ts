/** The default batch processor: the measurement pipeline of src/core/pipeline, imported statically. */
import { analyseImage, encodeOverlayPng } from '../../core/pipeline/index.js';
import type { ImageProcessor } from './processor.js';
import { thumbnailFromPixels } from './thumb.js';

export function createProcessor(): ImageProcessor {
  return async (bytes, input, params) => {
    const { result, overlay } = await analyseImage(bytes, input, params);
    return {
      result,
      overlayPng: overlay ? encodeOverlayPng(overlay) : null,
      thumbnailPng: overlay ? thumbnailFromPixels(overlay.width, overlay.height, overlay.data, 4) : null,
    };
  };
}
