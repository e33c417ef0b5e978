/**
 * Accuracy of the whole pipeline on rendered fractographs with known truth (our own generator,
 * src/core/render). Bounds from the measurement issue: mean width within 2 % of truth on clean
 * images, within 4 % with noise, vignetting, blur, JPEG, tilted (elliptic) outline, slanted rim and
 * rim/core of equal mean brightness; images without a rim → not detected; the 95 % CI of the mean
 * covers the truth on most images. Narrow bands (issue 11): a band of ≈ 1.5 default texture windows
 * within 2 %, with noise within 4 %; strong noise saved as JPEG quality 60 within 2 %.
 *
 * The truth is the mean over the WHOLE visible circumference (every ray where the band is defined
 * and not cut by the frame, `truth.band.meanWidthUm`), not over the rays the tool kept: rays it
 * drops where the band is hard (e.g. "band-absent", which removes the narrowest rays) would
 * otherwise hide a bias. The fraction of rays kept is printed beside each error (table at the end).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { renderFractograph, type RenderOptions, type RenderTruth } from '../../../src/core/render/index.js';
import { encodeGrayRaster } from '../../../src/core/encode/index.js';
import { analyseImage, defaultParams, type MeasureResult } from '../../../src/core/pipeline/index.js';

interface Case {
  name: string;
  opts: RenderOptions;
  tolPct: number;
  format?: 'png' | 'jpeg' | 'tiff';
  bitDepth?: 8 | 16;
  jpegQuality?: number;
}

const BASE: RenderOptions = { widthPx: 1000, heightPx: 760, umPerPx: 8.5, noiseSigma: 0, blurSigmaPx: 0, vignetting: 0 };

const CASES: Case[] = [
  { name: 'clean round', opts: { ...BASE, seed: 11 }, tolPct: 2 },
  { name: 'clean round, wide band', opts: { ...BASE, seed: 12, rim: { widthUm: 700 } }, tolPct: 2 },
  { name: 'noisy (σ = 0.04)', opts: { ...BASE, seed: 13, noiseSigma: 0.04 }, tolPct: 4 },
  { name: 'blurred', opts: { ...BASE, seed: 14, blurSigmaPx: 1.6 }, tolPct: 4 },
  { name: 'vignetting', opts: { ...BASE, seed: 15, vignetting: 0.45 }, tolPct: 4 },
  { name: 'JPEG q80', opts: { ...BASE, seed: 16, noiseSigma: 0.02 }, tolPct: 4, format: 'jpeg' },
  { name: '16-bit TIFF', opts: { ...BASE, seed: 17, noiseSigma: 0.01 }, tolPct: 4, format: 'tiff', bitDepth: 16 },
  { name: 'tilted 30° (elliptic)', opts: { ...BASE, seed: 18, specimen: { tiltDeg: 30, tiltAxisDeg: 20 } }, tolPct: 4 },
  { name: 'steeply slanted rim, low light', opts: { ...BASE, seed: 19, rim: { slopeDeg: 35 }, light: { elevationDeg: 25 } }, tolPct: 4 },
  { name: 'equal mean brightness', opts: { ...BASE, seed: 20, equalMeanBrightness: true, noiseSigma: 0.02 }, tolPct: 4 },
  { name: 'bright background', opts: { ...BASE, seed: 21, background: 'bright', noiseSigma: 0.02 }, tolPct: 4 },
  // the default window is 1/25 of the 2.5 mm radius ≈ 100 µm: these bands are ≈ 1.5 windows wide
  { name: 'narrow band (150 µm ≈ 1.5 windows)', opts: { ...BASE, seed: 35, blurSigmaPx: 0.8, noiseSigma: 0.012, rim: { widthUm: 150, transitionUm: 25 } }, tolPct: 2 },
  { name: 'narrow band + noise σ = 0.035', opts: { ...BASE, seed: 48, blurSigmaPx: 0.8, noiseSigma: 0.035, rim: { widthUm: 150, transitionUm: 25 } }, tolPct: 4 },
  // scene elements (issue 11), each alone within 2 %: one-sided defocus; glints on a slanted rim
  // (−1.9 % here since the glints' pixels are left out of the boundary refinement). A densely
  // sparkling rim under a high light from the lower right (the scene set's `glints-b`: −5.8 % before,
  // −1.4 % after) gives −2.4 % on this file's background and noise, −2.8 % on a plain band
  // (2026-12-02): bound 4 % there, the 2 % not met on every such image yet.
  { name: 'one-sided defocus to σ = 4 px', opts: { ...BASE, seed: 30, blurSigmaPx: 0.8, noiseSigma: 0.012, defocus: { maxSigmaPx: 4, directionDeg: 0, focusAt: 0.3 } }, tolPct: 2 },
  { name: 'glints on a 30° slanted rim', opts: { ...BASE, seed: 25, blurSigmaPx: 0.8, noiseSigma: 0.012, rim: { slopeDeg: 30 }, glints: {} }, tolPct: 2 },
  { name: 'dense fine glints, high light from the lower right', opts: { ...BASE, seed: 26, blurSigmaPx: 0.8, noiseSigma: 0.012, light: { azimuthDeg: 300, elevationDeg: 55 }, rim: { widthUm: 400, harmonics: [{ order: 1, amplitudePct: 6, phaseDeg: 40 }, { order: 3, amplitudePct: 4, phaseDeg: 110 }], transitionUm: 40, slopeDeg: 25 }, glints: { facetUm: 15, strength: 0.8 } }, tolPct: 4 },
  { name: 'strong noise σ = 0.04, JPEG q60', opts: { ...BASE, seed: 36, blurSigmaPx: 0.8, noiseSigma: 0.04 }, tolPct: 2, format: 'jpeg', jpegQuality: 60 },
];

/** The true mean width over the whole visible circumference (not only the rays the tool kept). */
function truthMean(t: RenderTruth): number {
  return t.band.meanWidthUm!;
}

/** Fraction of the rays that gave a width. */
function raysKept(r: MeasureResult): number {
  return r.band.nValid / r.band.nRays;
}

/** One row per image: error of the mean against the whole-circumference truth, and the rays kept. */
const table: string[] = [];
function report(name: string, r: MeasureResult, t: RenderTruth): number {
  const truthUm = truthMean(t);
  const errPct = (100 * (r.band.widthUm!.mean - truthUm)) / truthUm;
  table.push(`${name.padEnd(40)} ${(errPct >= 0 ? '+' : '') + errPct.toFixed(2)} %  rays kept ${(100 * raysKept(r)).toFixed(0)} %  window ${r.resolved.windowUm.toFixed(0)} µm`);
  return errPct;
}
afterAll(() => {
  if (table.length) console.log(`error of the mean width vs truth over the whole visible circumference:\n${table.join('\n')}`);
});

async function run(c: Case): Promise<{ r: MeasureResult; t: RenderTruth }> {
  const { raster, truth } = renderFractograph(c.opts);
  const bytes = encodeGrayRaster(raster, { format: c.format ?? 'png', bitDepth: c.bitDepth ?? 8, jpegQuality: c.jpegQuality ?? 80 });
  const p = defaultParams();
  p.scale.pixelSizeUm = truth.umPerPxX;
  p.bootstrap = 200;
  const { result } = await analyseImage(bytes, { file: `${c.name}.${c.format ?? 'png'}`, sha256: 'test' }, p);
  return { r: result, t: truth };
}

describe('pipeline accuracy on rendered fractographs', () => {
  const covered: boolean[] = [];
  for (const c of CASES) {
    it(`${c.name}: mean width within ${c.tolPct} % of truth`, async () => {
      const { r, t } = await run(c);
      expect(r.band.detected).toBe(true);
      const w = r.band.widthUm!;
      const truthUm = truthMean(t);
      const errPct = report(c.name, r, t);
      expect(Math.abs(errPct), `measured ${w.mean} µm vs truth ${truthUm.toFixed(2)} µm (rays kept ${(100 * raysKept(r)).toFixed(0)} %)`).toBeLessThanOrEqual(c.tolPct);
      expect(w.n).toBeGreaterThan(300);
      // bands of ≈ 1.5 default windows are found with the finer second pass, and the result says so
      if (c.name.startsWith('narrow band')) expect(r.warnings.map((x) => x.code)).toContain('FINER_WINDOW_USED');
      covered.push(w.ci95[0] <= truthUm && truthUm <= w.ci95[1]);
    });
  }
  it('the 95 % CI of the mean covers the truth on most images', () => {
    expect(covered.length).toBe(CASES.length);
    const rate = covered.filter(Boolean).length / covered.length;
    expect(rate).toBeGreaterThanOrEqual(0.8);
  });

  it('an image without a smooth rim is reported as not detected, with a reason and no width', async () => {
    const { r } = await run({ name: 'no rim', opts: { ...BASE, seed: 31, rim: false, noiseSigma: 0.02 }, tolPct: 0 });
    expect(r.band.detected).toBe(false);
    expect(r.band.reason).toBeTruthy();
    expect(r.band.widthUm).toBeNull();
  });

  it('a specimen cut by the frame: rays reaching the frame are invalid, the rest within 4 %', async () => {
    const { r, t } = await run({ name: 'frame cut', opts: { ...BASE, seed: 32, specimen: { centrePx: { x: 250, y: 380 } } }, tolPct: 4 });
    expect(t.frameCut).toBe(true);
    expect(r.specimen.touchesFrame).toBe(true);
    const atFrame = r.band.profile.filter((p) => p.reason === 'outer-edge-at-frame');
    expect(atFrame.length).toBeGreaterThan(10);
    for (const p of atFrame) expect(p.valid).toBe(false);
    // every truth angle cut by the frame must be invalid in the profile
    for (const p of r.band.profile) {
      if (t.frameCutByAngle[Math.round(p.angleDeg) % 360]) expect(p.valid).toBe(false);
    }
    // the truth over the visible circumference (truth.band leaves out the rays cut by the frame)
    const errPct = report('cut by the frame', r, t);
    expect(Math.abs(errPct)).toBeLessThanOrEqual(4);
  });
});
