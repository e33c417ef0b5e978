/**
 * Accuracy on rendered fractographs (src/core/render, invented specimens with exact truth).
 * Targets from the task: ≤ 2 % on the clean image, ≤ 4 % on noisy / blurred / vignetted / tilted /
 * slanted-rim / equal-brightness images. Truth = truth.band.meanWidthUm (mean over defined angles).
 */
import { describe, expect, it } from 'vitest';
import { renderFractograph, type RenderOptions } from '../../../src/core/render/index.js';
import { runStages } from '../../helpers/stages.js';

const UM = 9;
const W = 15;
function run(o: RenderOptions) {
  const { raster, truth } = renderFractograph({ widthPx: 900, heightPx: 675, umPerPx: UM, seed: 11, ...o });
  const r = runStages(raster, UM, { windowPx: W, features: ['localStd'], bootstrap: 200 });
  return { res: { rimCore: r.classification.rimCore, band: r.band }, truth };
}
const relErr = (a: number, b: number) => Math.abs(a / b - 1);

describe('the segmentation and measurement stages on rendered fractographs (one feature: local std)', () => {
  it('clean round specimen: mean width within 2 %, CI covers the truth', () => {
    const { res, truth } = run({});
    expect(res.rimCore.detected).toBe(true);
    const m = res.band!.stats.mean;
    expect(relErr(m, truth.band.meanWidthUm!)).toBeLessThan(0.02);
    const [lo, hi] = res.band!.stats.ci95Mean;
    expect(lo).toBeLessThan(truth.band.meanWidthUm!);
    expect(hi).toBeGreaterThan(truth.band.meanWidthUm!);
    expect(res.band!.stats.nEff).toBeLessThan(res.band!.stats.n);
  });

  const hard: [string, RenderOptions][] = [
    ['noisy', { noiseSigma: 0.04 }],
    ['blurred', { blurSigmaPx: 1.5 }],
    ['vignetted', { vignetting: 0.5 }],
    ['tilted (elliptic)', { specimen: { tiltDeg: 30, tiltAxisDeg: 20 } }],
    ['slanted rim', { rim: { slopeDeg: 35 } }],
    ['equal mean brightness', { equalMeanBrightness: true }],
  ];
  for (const [name, o] of hard) {
    it(`${name}: mean width within 4 %`, () => {
      const { res, truth } = run(o);
      expect(res.rimCore.detected).toBe(true);
      expect(relErr(res.band!.stats.mean, truth.band.meanWidthUm!)).toBeLessThan(0.04);
    });
  }

  it('band absent on a sector: those rays are invalid (band-absent), the mean is within 4 %', () => {
    const { res, truth } = run({ rim: { absentSectors: [{ fromDeg: 60, toDeg: 120 }] } });
    expect(res.rimCore.detected).toBe(true);
    const absentRays = res.band!.rays.filter((r, i) => truth.band.absentByAngle[i]);
    const flagged = absentRays.filter((r) => !r.valid && (r.reason === 'band-absent' || r.reason === 'no-boundary'));
    expect(flagged.length).toBeGreaterThan(0.8 * absentRays.length);
    expect(relErr(res.band!.stats.mean, truth.band.meanWidthUm!)).toBeLessThan(0.04);
  });

  it('SEM-like bright edge with noise: detected (possibly with a warning), within 4 %', () => {
    const { res, truth } = run({ semEdge: 0.8, noiseSigma: 0.03 });
    expect(res.rimCore.detected).toBe(true);
    expect(relErr(res.band!.stats.mean, truth.band.meanWidthUm!)).toBeLessThan(0.04);
  });

  it('no rim → detected false, no width', () => {
    const { res } = run({ rim: false });
    expect(res.rimCore.detected).toBe(false);
    expect(res.rimCore.reason).toBeTruthy();
    expect(res.band).toBeNull();
  });

  it('frame-cut specimen: rays at the frame are invalid, the others accurate', () => {
    const { res, truth } = run({ specimen: { centrePx: { x: 230, y: 337 } } });
    expect(truth.frameCut).toBe(true);
    const rays = res.band!.rays;
    let cutInvalid = 0;
    let cut = 0;
    rays.forEach((r, i) => {
      if (truth.frameCutByAngle[i]) {
        cut++;
        if (!r.valid && r.reason === 'outer-edge-at-frame') cutInvalid++;
      }
    });
    expect(cut).toBeGreaterThan(10);
    // rays from the fitted centre and the truth centre differ slightly: allow 2 rays at the ends
    expect(cutInvalid).toBeGreaterThanOrEqual(cut - 4);
    expect(relErr(res.band!.stats.mean, truth.band.meanWidthUm!)).toBeLessThan(0.04);
  });
});
