// A bright scale-bar plate that touches or overlaps the specimen (rendered, invented test data):
// the plate is painted out before the outline is found and the rays ending on it are not measured.
import { describe, expect, it } from 'vitest';
import { renderFractograph } from '../../../src/core/render/index.js';
import { encodeGrayRaster } from '../../../src/core/encode/index.js';
import { analyseImage, defaultParams, remeasure } from '../../../src/core/pipeline/index.js';

async function run(barX0: number) {
  const { raster, truth } = renderFractograph({
    seed: 3,
    widthPx: 1200,
    heightPx: 900,
    umPerPx: 5,
    specimen: { diameterUm: 4000, centrePx: { x: 600, y: 450 } }, // right edge at x = 1000
    rim: { widthUm: 250 },
    scaleBar: { lengthUm: 500, positionPx: { x0: barX0, y0: 440 }, polarity: 'dark', plate: true, thicknessPx: 8 },
  });
  const bytes = encodeGrayRaster(raster, { format: 'png' });
  const p = defaultParams();
  p.scale.barLengthUm = 500;
  const { result } = await analyseImage(bytes, { file: 'plate.png', sha256: 'x' }, p);
  const trueMean = truth.band.meanWidthUm;
  if (trueMean === null) throw new Error('the rendered image has no band');
  return { result, trueMean };
}

describe('scale marks next to the specimen', () => {
  it('a plate touching the outline does not bend it; rays ending on it are invalid and warned about', async () => {
    const { result, trueMean } = await run(1002); // the plate starts ≈ 6 px left of the bar, on the edge
    expect(result.scale.source).toBe('scale-bar');
    expect(result.specimen.scaleMarksPx?.length).toBeGreaterThan(0);
    // without painting the plate out: radius +1.7 %, circle residual 19 px, band +3 % (measured)
    expect(Math.abs(result.specimen.radiusUm - 2000) / 2000).toBeLessThan(0.005);
    // contour points in the mark boxes are left out of the fits: as round as without the plate
    expect(result.specimen.circle.rmsResidualPx).toBeLessThan(1);
    const atMark = result.band.profile.filter((q) => q.reason === 'outer-edge-at-scale-mark');
    expect(atMark.length).toBeGreaterThan(0);
    expect(atMark.length).toBeLessThan(20);
    for (const q of atMark) expect(q.valid).toBe(false);
    // the rays point right (θ ≈ 0°)
    for (const q of atMark) expect(Math.min(q.angleDeg, 360 - q.angleDeg)).toBeLessThan(10);
    expect(result.warnings.some((w) => w.code === 'SCALE_MARK_ON_OUTLINE' && /scale bar or its plate touches/.test(w.message))).toBe(true);
    const mean = result.band.widthUm!.mean;
    expect(Math.abs(mean - trueMean) / trueMean).toBeLessThan(0.02);
    // an edited boundary keeps the same rays out
    const again = remeasure(result, { boundaryPolygon: result.band.boundary!.polygon });
    expect(again.band.profile.filter((q) => q.reason === 'outer-edge-at-scale-mark').length).toBe(atMark.length);
  });

  it('a plate drawn over the specimen edge: the cut-out part is neither fitted nor measured', async () => {
    const { result, trueMean } = await run(960); // the plate covers x ≈ 949…1072 around θ = 0°
    expect(Math.abs(result.specimen.radiusUm - 2000) / 2000).toBeLessThan(0.005);
    expect(result.specimen.circle.rmsResidualPx).toBeLessThan(1);
    expect(result.band.profile.filter((q) => q.reason === 'outer-edge-at-scale-mark').length).toBeGreaterThan(0);
    expect(Math.abs(result.band.widthUm!.mean - trueMean) / trueMean).toBeLessThan(0.02);
  });

  it('a plate clear of the specimen changes nothing', async () => {
    const { result, trueMean } = await run(1060);
    expect(result.band.profile.some((q) => q.reason === 'outer-edge-at-scale-mark')).toBe(false);
    expect(result.warnings.some((w) => w.code === 'SCALE_MARK_ON_OUTLINE')).toBe(false);
    expect(Math.abs(result.band.widthUm!.mean - trueMean) / trueMean).toBeLessThan(0.02);
  });
});
