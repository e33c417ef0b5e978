/**
 * The overlay picture of a result: the image with the outer edge, the boundary, every 10th ray,
 * the detected scale bar and a label (report/overlay.ts draws it).
 */
import type { ScaleBar } from '../calibrate/index.js';
import type { RgbaImage } from '../draw/index.js';
import type { GrayRaster } from '../image/raster.js';
import type { BandProfile } from '../measure/index.js';
import { renderOverlay } from '../report/overlay.js';
import type { MeasureResult } from './result.js';

/**
 * Draws the overlay of a result on its image.
 * @param raster the full-resolution image
 * @param result the assembled result
 * @param band the band profile (for the ray flags), or null
 * @param bar the detected scale bar, boxed when it set the scale
 */
export function overlayFor(raster: GrayRaster, result: MeasureResult, band: BandProfile | null, bar: ScaleBar | null): RgbaImage {
  const w = result.band.widthUm;
  const label = [
    `${result.input.file}`,
    result.band.detected && w
      ? `band width mean ${w.mean.toFixed(1)} µm, 95% CI ${w.ci95[0].toFixed(1)}-${w.ci95[1].toFixed(1)} µm`
      : `no smooth rim band: ${result.band.reason ?? 'not detected'}`,
    result.band.detected && w ? `median ${w.median.toFixed(1)} µm, sd ${w.sd.toFixed(1)} µm, n = ${w.n} rays` : '',
    `pixel ${result.scale.umPerPx.toPrecision(4)} µm (${result.scale.source})`,
  ];
  if (result.comparison) label.push(`w/${result.comparison.reference} = ${result.comparison.ratio.toFixed(2)}: ${result.comparison.verdict}`);
  return renderOverlay({
    raster,
    umPerPx: result.scale.umPerPx,
    center: result.specimen.center,
    outer: result.specimen.outline,
    boundary: result.band.boundary?.polygon ?? null,
    rays: band
      ? band.rays.map((r) => ({ angleDeg: r.thetaDeg, outerRadiusPx: r.outerRadiusPx, boundaryRadiusPx: r.boundaryRadiusPx, valid: r.valid, outlier: r.outlier }))
      : [],
    scaleBar: bar && result.scale.source === 'scale-bar' ? bar : null,
    label: label.filter(Boolean),
  });
}
