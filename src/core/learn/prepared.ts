/**
 * One image made ready for the pixel classifier, kept by a caller that works on the same image
 * again and again (the app's engine worker: every stroke teaches a model and shows its class map).
 * What does not depend on the labels or the model is made once: the scale and the working copy
 * (pipeline stage 1 and the working frame), the radiality centre (learn/features.ts
 * `featureCentre`), a feature sampler per window set (summed-area tables, median brightness,
 * entropy bins) and, per window set and grid size, the feature vectors of every point of the grid
 * the class map is evaluated on. Teaching ({@link teachModel} with `prepared`) takes the training
 * pixels' features from the sampler; the class map ({@link predictProbabilities} with `grid`) only
 * runs the forest. The numbers are the same as without it: the sampler gives the same values in
 * any order, and the grid is the one `predictProbabilities` would evaluate.
 */
import type { DecodedImage } from '../decode/types.js';
import type { PointPx } from '../image/geometry.js';
import { WorkingFrame } from '../pipeline/frame.js';
import { calibrate } from '../pipeline/stages/calibrate.js';
import type { ScaleParams } from '../pipeline/types.js';
import { defaultWindowUm } from '../texture/window.js';
import { featureCentre, featureSampler, type FeatureSampler } from './features.js';
import { gridFeatures, type GridFeatures } from './predict.js';

/** An image ready for teaching and class maps (see the module comment). */
export interface PreparedImage {
  frame: WorkingFrame;
  /** Pixel size of the full image and of the working copy, µm per px. */
  umPerPx: number;
  umPerWorkPx: number;
  /** Centre the radiality feature is measured from, working px. */
  centre: PointPx;
  /** The windows teaching takes when none are given and this image is the first (µm). */
  defaultWindowsUm: number[];
  /** Feature sampler for a window set ({@link windowsKey}), made on first use. */
  sampler(windowsUm: readonly number[]): FeatureSampler;
  /** Features of every point of the class-map grid for a window set and grid size, made on first use. */
  grid(windowsUm: readonly number[], maxGridPoints: number): GridFeatures;
}

/** Key of a window set. */
export function windowsKey(windowsUm: readonly number[]): string {
  return windowsUm.map((w) => String(w)).join(',');
}

/** Default feature windows of an image: ½, 1 and 2 × its default texture window, µm to 0.1. */
export function defaultFeatureWindows(frame: WorkingFrame, umPerPx: number): number[] {
  const base = defaultWindowUm({ umPerPx, imageWidthPx: frame.full.width, imageHeightPx: frame.full.height, scaleFactor: frame.factor });
  return [0.5, 1, 2].map((k) => Math.round(base * k * 10) / 10);
}

/**
 * Prepares an image: scale (as `measure` sets it), working copy, radiality centre; samplers and grid
 * features follow on demand and are kept.
 *
 * @throws FractozoneError BAD_SCALE when the scale cannot be set from `scale`
 */
export function prepareImage(decoded: DecodedImage, scale: ScaleParams): PreparedImage {
  const calibration = calibrate({ decoded, scale });
  const frame = new WorkingFrame(decoded.raster, calibration.marks);
  const umPerPx = calibration.scale.umPerPx;
  const umPerWorkPx = umPerPx * frame.lengthScale;
  const centre = featureCentre(frame);
  const samplers = new Map<string, FeatureSampler>();
  const grids = new Map<string, GridFeatures>();
  const sampler = (windowsUm: readonly number[]): FeatureSampler => {
    const k = windowsKey(windowsUm);
    let s = samplers.get(k);
    if (!s) {
      s = featureSampler(frame.work, umPerWorkPx, windowsUm, centre);
      samplers.set(k, s);
    }
    return s;
  };
  return {
    frame,
    umPerPx,
    umPerWorkPx,
    centre,
    defaultWindowsUm: defaultFeatureWindows(frame, umPerPx),
    sampler,
    grid(windowsUm, maxGridPoints) {
      const k = `${windowsKey(windowsUm)}/${maxGridPoints}`;
      let g = grids.get(k);
      if (!g) {
        g = gridFeatures(frame.work.width, frame.work.height, sampler(windowsUm), maxGridPoints);
        grids.set(k, g);
      }
      return g;
    },
  };
}
