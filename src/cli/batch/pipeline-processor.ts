/** The default batch processor: the measurement pipeline of src/core/pipeline, imported statically. */
import { analyseImage, encodeOverlayPng } from '../../core/pipeline/index.js';
import { FractozoneError } from '../../core/errors.js';
import { readModelFile } from '../model.js';
import type { ImageProcessor } from './processor.js';
import { thumbnailFromPixels } from './thumb.js';
import { nodeDeflate } from '../nodeZlib.js';

export function createProcessor(): ImageProcessor {
  return async (bytes, input, params) => {
    const model = input.model ? readModelFile(input.model.path) : undefined;
    if (model && model.sha256 !== input.model?.sha256) throw new FractozoneError('BAD_MODEL', `model file "${input.model?.path}" changed while the batch ran`);
    const { result, overlay } = await analyseImage(bytes, { file: input.file, sha256: input.sha256 }, params, undefined, { model });
    return {
      result,
      overlayPng: overlay ? encodeOverlayPng(overlay, nodeDeflate) : null,
      thumbnailPng: overlay ? thumbnailFromPixels(overlay.width, overlay.height, overlay.data, 4) : null,
    };
  };
}
