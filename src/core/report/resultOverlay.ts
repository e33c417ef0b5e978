/**
 * The overlay picture of a result, drawn from the result alone (outline, boundary, rays of the
 * profile, detected bar, the label core's overlay uses) over the image it was measured on — so a
 * recomputed or hand-corrected result gets the same picture a full run draws, at the full extent
 * of the image.
 */
import type { GrayRaster } from '../image/raster.js';
import type { RgbaImage } from '../draw/index.js';
import type { MeasureResult } from '../pipeline/result.js';
import { overlayLabel } from '../pipeline/overlay.js';
import { summarise } from './summary.js';
import { otherSpecimens, profileRaysPx, renderOverlay, type OverlayRay } from './overlay.js';

/** Rays of the profile in px: radii in µm divided by the pitch along each ray's direction. */
function raysPx(r: MeasureResult): OverlayRay[] {
  return profileRaysPx(r.band.profile, r.scale.umPerPxX, r.scale.umPerPxY);
}

/**
 * Draws the overlay of a result on its image.
 *
 * @param raster - the image the result was measured on (full resolution, gray 0..1)
 * @param r - the result
 * @param maxSidePx - long side of the picture (default 1600 px, as the pipeline's overlay)
 */
export function resultOverlay(raster: GrayRaster, r: MeasureResult, maxSidePx = 1600): RgbaImage {
  const bar = r.scale.detectedBar;
  return renderOverlay({
    raster,
    umPerPx: r.scale.umPerPx,
    center: r.specimen.center,
    outer: r.specimen.outline,
    boundary: r.band.boundary?.polygon ?? null,
    rays: raysPx(r),
    scaleBar: bar && r.scale.source === 'scale-bar' ? bar : null,
    label: overlayLabel(summarise(r), r),
    maxSidePx,
    ...otherSpecimens(r),
  });
}
