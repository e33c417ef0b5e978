/** Helpers for the scene-element tests: a small typical scene, statistics over rings and boxes, error capture. */
import type { GrayRaster } from '../../../src/core/image/raster.js';
import type { RenderOptions, RenderTruth } from '../../../src/core/render/index.js';

/** 400 × 300 px at 25 µm/px: 5 mm specimen → radius 100 px, band 400 µm = 16 px; no noise, no vignetting. */
export const TINY: RenderOptions = {
  seed: 3,
  widthPx: 400,
  heightPx: 300,
  umPerPx: 25,
  rim: { widthUm: 400, harmonics: [{ order: 2, amplitudePct: 8, phaseDeg: 20 }], transitionUm: 50 },
  core: { reliefScaleUm: 800, dimpleSizeUm: 150, ridgeSpacingUm: 300, crackWidthUm: 40 },
  noiseSigma: 0,
  blurSigmaPx: 0,
  vignetting: 0,
  scaleBar: null,
};

/** Mean and variance of the pixels between radii r0 and r1 (px) from the truth centre, optionally in an angle sector (deg). */
export function ring(r: GrayRaster, centre: { x: number; y: number }, r0: number, r1: number, fromDeg = 0, toDeg = 360): { mean: number; variance: number; n: number } {
  let s = 0;
  let s2 = 0;
  let n = 0;
  for (let y = 0; y < r.height; y++) {
    for (let x = 0; x < r.width; x++) {
      const dx = x - centre.x;
      const dy = y - centre.y;
      const rho = Math.hypot(dx, dy);
      if (rho < r0 || rho > r1) continue;
      let deg = (Math.atan2(-dy, dx) * 180) / Math.PI;
      if (deg < 0) deg += 360;
      if (deg < fromDeg || deg > toDeg) continue;
      const v = r.data[y * r.width + x];
      s += v;
      s2 += v * v;
      n++;
    }
  }
  const mean = s / n;
  return { mean, variance: s2 / n - mean * mean, n };
}

/** Mean of a pixel box (inclusive). */
export function boxMean(r: GrayRaster, x0: number, y0: number, x1: number, y1: number): number {
  let s = 0;
  let n = 0;
  for (let y = y0; y <= y1; y++) {
    for (let x = x0; x <= x1; x++) {
      s += r.data[y * r.width + x];
      n++;
    }
  }
  return s / n;
}

/** Mean squared difference between horizontally neighbouring pixels in a box (a sharpness measure). */
export function boxSharpness(r: GrayRaster, x0: number, y0: number, x1: number, y1: number): number {
  let s = 0;
  let n = 0;
  for (let y = y0; y <= y1; y++) {
    for (let x = x0; x < x1; x++) {
      const d = r.data[y * r.width + x + 1] - r.data[y * r.width + x];
      s += d * d;
      n++;
    }
  }
  return s / n;
}

/** The parts of a truth that describe the fracture surface (must not change with scene elements around it). */
export function surfaceTruth(t: RenderTruth): unknown {
  return {
    centre: t.centre,
    outline: t.outline,
    frameCut: t.frameCut,
    outer: t.outerRadiusPxByAngle,
    boundary: t.boundaryRadiusPxByAngle,
    band: t.band,
  };
}

/** The error thrown by `f` (fails the test when nothing is thrown). */
export function thrown(f: () => unknown): { code?: string; message: string } {
  try {
    f();
  } catch (e) {
    return e as { code?: string; message: string };
  }
  throw new Error('expected an error, got none');
}

/** Bytes of a Float32Array (for byte-for-byte comparisons). */
export const bytesOf = (a: Float32Array): Buffer => Buffer.from(a.buffer, a.byteOffset, a.byteLength);
