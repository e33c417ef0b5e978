/**
 * Runs the real pipeline stages (src/core/pipeline/stages) on a raster with a typed pixel size:
 * locate specimen → texture (given features, or given maps) → classify → refine boundary (or the
 * classified boundary as it is) → measure. For tests of the segmentation and measurement on
 * synthetic images, without decoding or a scale bar.
 */
import { scaleFromPixelSize } from '../../src/core/calibrate/index.js';
import type { GrayRaster } from '../../src/core/image/raster.js';
import type { BandProfile } from '../../src/core/measure/index.js';
import { WorkingFrame } from '../../src/core/pipeline/frame.js';
import {
  classifyTexture,
  computeTexture,
  locateSpecimen,
  measureWidths,
  minWidthPxFor,
  refineRimBoundary,
  storedGeometry,
  type Classification,
  type FeatureMap,
  type RimBoundary,
  type SpecimenLocation,
  type TextureWindow,
} from '../../src/core/pipeline/stages/index.js';
import { boxMean, type FeatureName } from '../../src/core/texture/index.js';

export interface StageRunOptions {
  /** Texture window, px of the working copy (= full resolution up to 1200 px on the long side). */
  windowPx: number;
  /** Features computed by the texture stage (default localStd), unless `maps` are given. */
  features?: FeatureName[];
  /** Feature maps on the working copy, in place of the texture stage's. */
  maps?: FeatureMap[];
  bootstrap?: number;
  /** false → measure the classified boundary without the refinement stage (default true). */
  refine?: boolean;
}

export interface StageRun {
  frame: WorkingFrame;
  location: SpecimenLocation;
  classification: Classification;
  boundary: RimBoundary;
  /** Null when no band was found. */
  band: BandProfile | null;
}

/** See the module comment; `umPerPx` is the typed pixel size, µm/px. */
export function runStages(raster: GrayRaster, umPerPx: number, o: StageRunOptions): StageRun {
  const scale = scaleFromPixelSize(umPerPx);
  const frame = new WorkingFrame(raster, []);
  const location = locateSpecimen({ frame, scale, nRays: 360 });
  const window: TextureWindow = { windowUm: o.windowPx * umPerPx * frame.lengthScale, windowPxWork: o.windowPx, windowPxFull: Math.round(o.windowPx * frame.lengthScale) | 1 };
  const texture = o.maps
    ? { window, maps: o.maps, brightness: boxMean(frame.work, o.windowPx) }
    : computeTexture({ frame, window, features: o.features ?? ['localStd'] });
  const classification = classifyTexture({ location, texture });
  const rc = classification.rimCore;
  const boundary: RimBoundary =
    o.refine === false && rc.detected && rc.boundary
      ? { source: 'auto', polygon: rc.boundary.map((q) => frame.toFull(q)), detected: true, separability: rc.separability }
      : refineRimBoundary({ frame, location, classification, window, nRays: 360 });
  const measured = measureWidths({
    geometry: storedGeometry(location, boundary, []),
    umPerPx: { x: umPerPx, y: umPerPx },
    imageSize: frame.fullSize,
    minWidthPx: minWidthPxFor('auto', window.windowPxFull),
    params: { nRays: 360, exclude: [], outlierK: 3.5, dropOutliers: false, seed: 1, bootstrap: o.bootstrap ?? 200 },
  });
  return { frame, location, classification, boundary, band: measured.profile };
}
