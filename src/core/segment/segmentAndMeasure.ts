/**
 * A small composed helper: specimen → rim/core → refined boundary and outer edge → band profile.
 * The lead's pipeline composes the same stages; each stage is callable alone.
 */
import type { GrayRaster } from '../image/raster.js';
import { type BandProfile, type MeasureParams, measureBand } from '../measure/band.js';
import { type Specimen, type SpecimenOptions, findSpecimen } from './specimen.js';
import { type RimCoreOptions, type RimCoreResult, classifyRimCore } from './rimCore.js';
import { type RefinedBoundary, refineBoundary, refineOuterEdge } from './refine.js';

/** Parameters of {@link segmentAndMeasure}. */
export interface SegmentAndMeasureParams extends Omit<MeasureParams, 'umPerPx' | 'imageSize'> {
  /** Texture window side, px at full resolution. */
  windowPx: number;
  specimen?: SpecimenOptions;
  rimCore?: Omit<RimCoreOptions, 'windowPx'>;
  /** Skip the sub-pixel refinement (for comparisons; default false). */
  noRefine?: boolean;
}

/** Result of {@link segmentAndMeasure}; `band` is null when no rim was detected. */
export interface SegmentAndMeasureResult {
  specimen: Specimen;
  rimCore: RimCoreResult;
  refined: RefinedBoundary | null;
  outerPolygon: import('../image/geometry.js').PointPx[];
  band: BandProfile | null;
  timingsMs: Record<string, number>;
}

/**
 * Segment and measure one image.
 *
 * @param raster - gray raster 0..1
 * @param umPerPx - pixel size, µm/px (or {x, y})
 * @param features - roughness feature rasters (full resolution or downsampled; see classifyRimCore)
 * @param params - window (px), measurement parameters, stage options
 */
export function segmentAndMeasure(
  raster: GrayRaster,
  umPerPx: MeasureParams['umPerPx'],
  features: readonly GrayRaster[],
  params: SegmentAndMeasureParams,
): SegmentAndMeasureResult {
  const timingsMs: Record<string, number> = {};
  let t = performance.now();
  const lap = (k: string): void => {
    const n = performance.now();
    timingsMs[k] = n - t;
    t = n;
  };
  const specimen = findSpecimen(raster, params.specimen);
  lap('specimen');
  const center = { x: specimen.circle.cx, y: specimen.circle.cy };
  const rimCore = classifyRimCore(specimen, features, { ...params.rimCore, windowPx: params.windowPx, center });
  lap('rimCore');
  const outer = refineOuterEdge(raster, specimen.contour, center, { nRays: params.nRays });
  lap('outerEdge');
  if (!rimCore.detected || !rimCore.boundary) {
    return { specimen, rimCore, refined: null, outerPolygon: outer.polygon, band: null, timingsMs };
  }
  const refined = params.noRefine ? null : refineBoundary(raster, specimen.contour, rimCore.boundary, center, { windowPx: params.windowPx, nRays: params.nRays });
  lap('refine');
  const band = measureBand({
    ...params,
    outer: outer.polygon,
    boundary: refined ? refined.polygon : rimCore.boundary,
    center,
    umPerPx,
    minWidthPx: params.minWidthPx ?? 0.75 * params.windowPx,
    imageSize: { width: raster.width, height: raster.height },
  });
  lap('measure');
  return { specimen, rimCore, refined, outerPolygon: outer.polygon, band, timingsMs };
}
