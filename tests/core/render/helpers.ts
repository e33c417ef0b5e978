/** Test helpers for rendered images: zone masks from the truth, local variance. */
import type { GrayRaster } from '../../../src/core/image/raster.js';
import type { RenderTruth } from '../../../src/core/render/index.js';

/** Image angle (deg, 0..360, CCW on screen) and distance (px) of pixel (x, y) from the truth centre. */
export function polar(t: RenderTruth, x: number, y: number): { deg: number; rho: number } {
  const dx = x - t.centre.x;
  const dy = y - t.centre.y;
  let deg = (Math.atan2(-dy, dx) * 180) / Math.PI;
  if (deg < 0) deg += 360;
  return { deg, rho: Math.hypot(dx, dy) };
}

/** Linear interpolation of a per-degree table (nulls → NaN). */
export function byAngle(table: readonly (number | null)[], deg: number): number {
  const i = Math.floor(deg) % 360;
  const j = (i + 1) % 360;
  const f = deg - Math.floor(deg);
  const a = table[i];
  const b = table[j];
  if (a === null || b === null) return NaN;
  return a + f * (b - a);
}

/**
 * Classify pixels: 'rim' = between boundary + margin and outer − margin, 'core' = inside
 * boundary − margin, 'bg' = beyond outer + margin (margins in px).
 */
export function zone(t: RenderTruth, x: number, y: number, margin: number): 'rim' | 'core' | 'bg' | null {
  const { deg, rho } = polar(t, x, y);
  const o = byAngle(t.outerRadiusPxByAngle, deg);
  if (rho > o + margin) return 'bg';
  if (rho > o - margin) return null;
  const b = byAngle(t.boundaryRadiusPxByAngle, deg);
  if (Number.isNaN(b)) return rho < o - margin ? 'core' : null;
  if (rho > b + margin) return 'rim';
  if (rho < b - margin) return 'core';
  return null;
}

/** Variance of the 5×5 neighbourhood of (x, y). */
export function localVariance(r: GrayRaster, x: number, y: number): number {
  let s = 0;
  let s2 = 0;
  let n = 0;
  for (let j = -2; j <= 2; j++) {
    for (let i = -2; i <= 2; i++) {
      const v = r.data[(y + j) * r.width + x + i];
      s += v;
      s2 += v * v;
      n++;
    }
  }
  const m = s / n;
  return s2 / n - m * m;
}

/** Mean of pixel values and of local variances per zone (every `step`-th pixel). */
export function zoneStats(r: GrayRaster, t: RenderTruth, margin: number, step = 2): Record<'rim' | 'core' | 'bg', { mean: number; localVar: number; n: number }> {
  const acc = { rim: [0, 0, 0], core: [0, 0, 0], bg: [0, 0, 0] };
  for (let y = 3; y < r.height - 3; y += step) {
    for (let x = 3; x < r.width - 3; x += step) {
      const z = zone(t, x, y, margin);
      if (!z) continue;
      acc[z][0] += r.data[y * r.width + x];
      acc[z][1] += localVariance(r, x, y);
      acc[z][2]++;
    }
  }
  const f = (a: number[]) => ({ mean: a[0] / a[2], localVar: a[1] / a[2], n: a[2] });
  return { rim: f(acc.rim), core: f(acc.core), bg: f(acc.bg) };
}
