/**
 * The overlay picture of a result: the image with the outer edge, the boundary, every 10th ray,
 * the detected scale bar and a label (report/overlay.ts draws it).
 */
import type { ScaleBar } from '../calibrate/index.js';
import type { RgbaImage } from '../draw/index.js';
import type { GrayRaster } from '../image/raster.js';
import type { BandProfile } from '../measure/index.js';
import { renderOverlay } from '../report/overlay.js';
import { formatValue, specimenLines, summarise, type ResultSummary } from '../report/summary.js';
import { otherSpecimens } from '../report/overlay.js';
import type { MeasureResult } from './result.js';

/**
 * Draws the overlay of a result on its image.
 * @param raster the full-resolution image
 * @param result the assembled result
 * @param band the band profile (for the ray flags), or null
 * @param bar the detected scale bar, boxed when it set the scale
 */
export function overlayFor(raster: GrayRaster, result: MeasureResult, band: BandProfile | null, bar: ScaleBar | null): RgbaImage {
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
    label: overlayLabel(summarise(result), result),
    ...otherSpecimens(result),
  });
}

/** The label lines (the overlay font has no en dash: intervals use a hyphen). */
export function overlayLabel(s: ResultSummary, result?: MeasureResult): string[] {
  const f1 = (v: number | null): string => formatValue(v, 1);
  const b = s.band;
  const label = [
    s.file,
    `quality: ${s.quality.verdict}${s.quality.reasons.length ? ` (${s.quality.reasons.map((w) => w.code).join(', ')})` : ''}`,
    // name each interval as every other view does, the measurement interval (this specimen's
    // uncertainty, the one the verdict uses) first, then the circumferential one
    b.detected ? `band width mean ${f1(b.mean.value)} µm` : `no smooth rim band: ${b.reason}`,
    b.detected && b.uncertainty && b.uncertainty.measurement.lo !== null
      ? `95% measurement interval ${f1(b.uncertainty.measurement.lo)}-${f1(b.uncertainty.measurement.hi)} µm`
      : '',
    b.detected ? `95% circumferential interval ${f1(b.ci95.lo)}-${f1(b.ci95.hi)} µm` : '',
    b.detected ? `median ${f1(b.median.value)} µm, sd ${f1(b.sd.value)} µm, n = ${b.n} rays` : '',
    `pixel ${(s.scale.umPerPx.value ?? NaN).toPrecision(4)} µm (${s.scale.source})`,
  ];
  label.push(...(result ? specimenLines(result) : []));
  if (s.comparison) label.push(`w/${s.comparison.reference} = ${formatValue(s.comparison.ratio.value, 2)}: ${s.comparison.verdict}`);
  return label.filter(Boolean);
}
