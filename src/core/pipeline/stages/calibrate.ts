/**
 * Stage 1, calibrate: find the burned-in scale bar, choose the scale by the documented precedence
 * (typed pixel size > two points > scale bar with its length > file metadata, see calibrate/scale.ts)
 * and mark the bar, its plate and its label so that later stages leave them out.
 */
import { warn, type Warning } from '../../warnings.js';
import { chooseScale, detectScaleBar, type Scale, type ScaleBar } from '../../calibrate/index.js';
import type { DecodedImage } from '../../decode/index.js';
import { FractozoneError, isFractozoneError } from '../../errors.js';
import type { BoxPx } from '../../image/geometry.js';
import { scaleMarkBoxes } from '../../segment/marks.js';
import type { ScaleParams } from '../types.js';

/** Input of {@link calibrate}. */
export interface CalibrateInput {
  decoded: DecodedImage;
  scale: ScaleParams;
}

/** Output of {@link calibrate}. */
export interface Calibration {
  /** The detected scale bar (used or not), or null. */
  bar: ScaleBar | null;
  scale: Scale;
  /** Boxes of the bar, plate and label (full-resolution px), to be painted out; empty without a bar. */
  marks: BoxPx[];
  warnings: Warning[];
}

/**
 * Detects the scale bar and sets the scale.
 * @throws FractozoneError BAD_SCALE (usage) when no scale can be set from what was given, or
 *   (input) when a bar length was given but the image shows no bar and has no metadata scale
 */
export function calibrate(input: CalibrateInput): Calibration {
  const { decoded, scale: s } = input;
  const raster = decoded.raster;
  const warnings: Warning[] = [];
  const bar = detectScaleBar(raster);
  const metadata = s.useMetadata === false ? null : decoded.metadataScale;
  const typed = s.pixelSizeUm !== undefined ? (s.pixelSizeYUm !== undefined ? { x: s.pixelSizeUm, y: s.pixelSizeYUm } : s.pixelSizeUm) : undefined;
  if (s.barLengthUm !== undefined && !bar && typed === undefined && !s.twoPoint) {
    if (!metadata) {
      throw new FractozoneError(
        'BAD_SCALE',
        'a scale-bar length was given but no scale bar was found in the image; give the pixel size (e.g. --pixel-size 4um) or two points instead',
        'input',
      );
    }
    warnings.push(warn('SCALE_BAR_NOT_FOUND', 'a scale-bar length was given but no scale bar was found: the pixel size from the file metadata is used instead'));
  }
  let scale: Scale;
  try {
    scale = chooseScale({ typed, twoPoint: s.twoPoint, barLengthUm: s.barLengthUm, bar, metadata });
  } catch (e) {
    if (isFractozoneError(e) && e.code === 'BAD_SCALE') throw new FractozoneError('BAD_SCALE', e.message, 'usage');
    throw e;
  }
  const sx = scale.umPerPxX;
  const sy = scale.umPerPxY;
  if (Math.abs(sx - sy) / Math.max(sx, sy) > 1e-6) {
    warnings.push(warn('NON_SQUARE_PIXELS', `pixels are not square (${sx.toPrecision(4)} × ${sy.toPrecision(4)} µm): widths are converted per ray direction`));
  }
  const marks = bar ? scaleMarkBoxes(bar, raster.width, raster.height, raster) : [];
  return { bar, scale, marks, warnings };
}
