/**
 * recompute: a new scale, a hand-corrected outline or other parameters applied to the result of a
 * full run give the same result as a full run with those inputs (the reference here is our own
 * full pipeline run again, so this checks consistency between the two paths, not accuracy).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { renderFractograph } from '../../../src/core/render/index.js';
import { encodeGrayRaster } from '../../../src/core/encode/index.js';
import { analyseImage, defaultParams, type MeasureParams, type MeasureResult } from '../../../src/core/pipeline/index.js';
import { OUTLINE_CORRECTED, fullRunReason, recompute, scaleFor } from '../../../src/core/pipeline/recompute.js';
import { expectSameResult } from '../../helpers/sameResult.js';

let bytes: Uint8Array;
let barLengthUm: number;

async function full(p: MeasureParams): Promise<MeasureResult> {
  return (await analyseImage(bytes, { file: 'invented-recompute.png', sha256: 'test' }, p)).result;
}

function params(patch: Partial<MeasureParams>): MeasureParams {
  const p = defaultParams();
  p.bootstrap = 300;
  return { ...p, ...patch };
}

function outcome(base: MeasureResult, p: MeasureParams, outline: { x: number; y: number }[] | null = null): MeasureResult {
  const o = recompute(base, p, outline);
  if (o.kind !== 'result') throw new Error(`expected a result, got a full run: ${o.reason}`);
  return o.result;
}

/** Equal apart from wall-clock diagnostics, with the rounded fields compared to relative 1e-5. */
function expectSame(got: MeasureResult, want: MeasureResult): void {
  expectSameResult(got, want);
}

beforeAll(() => {
  const { raster, truth } = renderFractograph({ seed: 7, widthPx: 1000, heightPx: 760, umPerPx: 8.5, noiseSigma: 0.01 });
  bytes = encodeGrayRaster(raster, { format: 'png', bitDepth: 8 });
  barLengthUm = truth.options.scaleBar?.lengthUm ?? 1000;
});

describe('recompute from the stored geometry', () => {
  it('a typed pixel size 5 → 10 µm/px gives the full run at 10 µm/px (widths doubled)', async () => {
    const base = await full(params({ scale: { useMetadata: true, pixelSizeUm: 5 } }));
    const want = await full(params({ scale: { useMetadata: true, pixelSizeUm: 10 } }));
    const got = outcome(base, params({ scale: { useMetadata: true, pixelSizeUm: 10 } }));
    expectSame(got, want);
    expect(got.band.widthUm!.mean).toBeCloseTo(2 * base.band.widthUm!.mean, 2);
  });

  it('another scale-bar length and a switch from the bar to a typed size give the full runs', async () => {
    const base = await full(params({ scale: { useMetadata: true, barLengthUm } }));
    expect(base.scale.source).toBe('scale-bar');
    const longer = params({ scale: { useMetadata: true, barLengthUm: 2 * barLengthUm } });
    expectSame(outcome(base, longer), await full(longer));
    const typed = params({ scale: { useMetadata: true, pixelSizeUm: 4 } });
    expectSame(outcome(base, typed), await full(typed));
  });

  it('an edited boundary at a new scale gives the full run with that boundary', async () => {
    const base = await full(params({ scale: { useMetadata: true, pixelSizeUm: 5 } }));
    const c = base.specimen.center;
    // pull the boundary 10 % towards the centre
    const edited = base.band.boundary!.polygon.map((q) => ({ x: c.x + 0.9 * (q.x - c.x), y: c.y + 0.9 * (q.y - c.y) }));
    const p = params({ scale: { useMetadata: true, pixelSizeUm: 7 }, boundaryPolygon: edited, exclude: [[80, 100]] });
    const got = outcome(base, p);
    const want = await full(p);
    // a run on a given boundary has no texture stage; the recomputed result keeps the separability
    // of the automatic classification of this image
    expect(want.band.separability).toBeNull();
    expect(got.band.separability).toEqual(base.band.separability);
    expectSame({ ...got, band: { ...got.band, separability: null } }, want);
  });

  it('unchanged parameters give the base back', async () => {
    const p = params({ scale: { useMetadata: true, pixelSizeUm: 5 } });
    const base = await full(p);
    expectSame(outcome(base, p), base);
  });

  it('says when only a full run gives the right numbers', async () => {
    const base = await full(params({ scale: { useMetadata: true, pixelSizeUm: 5 } }));
    expect(fullRunReason(base, params({ scale: { useMetadata: true, pixelSizeUm: 9 } }))).toBeNull();
    expect(fullRunReason(base, params({ scale: { useMetadata: true, pixelSizeUm: 5 }, nRays: 180 }))).toBeNull();
    expect(fullRunReason(base, params({ scale: { useMetadata: true, pixelSizeUm: 5 }, nRays: 720 }))).toMatch(/rays/);
    expect(fullRunReason(base, params({ scale: { useMetadata: true, pixelSizeUm: 5 }, features: ['localStd'] }))).toMatch(/features/);
    expect(fullRunReason(base, params({ scale: { useMetadata: true, pixelSizeUm: 5 }, windowUm: 200 }))).toMatch(/window/);
    // a typed window: the same µm at another scale is another number of pixels
    const typedWindow = await full(params({ scale: { useMetadata: true, pixelSizeUm: 5 }, windowUm: 100 }));
    expect(fullRunReason(typedWindow, params({ scale: { useMetadata: true, pixelSizeUm: 10 }, windowUm: 100 }))).toMatch(/pixels/);
    // … which does not matter for a boundary drawn by hand
    expect(fullRunReason(typedWindow, params({ scale: { useMetadata: true, pixelSizeUm: 10 }, windowUm: 100, boundaryPolygon: typedWindow.band.boundary!.polygon }))).toBeNull();
  });

  it('a scale that cannot be set is refused with BAD_SCALE', async () => {
    const base = await full(params({ scale: { useMetadata: true, pixelSizeUm: 5 } }));
    expect(() => scaleFor(base, { useMetadata: false })).toThrow(/length is unknown/);
  });

  it('a translated outline moves the centre and keeps the radius; the band follows', async () => {
    const base = await full(params({ scale: { useMetadata: true, pixelSizeUm: 5 } }));
    const p = params({ scale: { useMetadata: true, pixelSizeUm: 5 } });
    const once = outcome(base, p, base.specimen.outline);
    const shifted = outcome(base, p, base.specimen.outline.map((q) => ({ x: q.x + 6, y: q.y })));
    expect(shifted.specimen.center.x - once.specimen.center.x).toBeCloseTo(6, 2);
    expect(shifted.specimen.center.y).toBeCloseTo(once.specimen.center.y, 2);
    expect(shifted.specimen.radiusUm).toBeCloseTo(once.specimen.radiusUm, 1);
    expect(shifted.warnings).toContain(OUTLINE_CORRECTED);
    // moving the outer edge 6 px right and keeping the boundary widens the band at 0° by ≈ 30 µm
    const w0 = (r: MeasureResult) => r.band.profile.find((q) => q.angleDeg === 0)!.widthUm!;
    expect(w0(shifted) - w0(once)).toBeGreaterThan(20);
    expect(w0(shifted) - w0(once)).toBeLessThan(40);
  });
});
