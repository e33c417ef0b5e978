/** Macro-cracks of the core: dark, thin, jagged curves (seeded random walks, mostly radial). */
import { polylineCoverage } from '../draw/coverage.js';
import { createRng } from '../random.js';
import type { Canvas } from './canvas.js';
import { inverseMap, lutAt, type Geometry } from './geometry.js';
import type { ResolvedRenderOptions } from './options.js';

interface Crack {
  points: { x: number; y: number }[];
  widthPx: number;
  depth: number;
}

/** The cracks of one specimen (px); a mating half gets the mirror image of the same walks. */
function makeCracks(o: ResolvedRenderOptions, g: Geometry, seed: number): Crack[] {
  const rng = createRng(seed, 'sfc32');
  const inv = inverseMap(g);
  const out: Crack[] = [];
  const pxUm = Math.min(o.umPerPx, o.umPerPxY);
  const stepUm = Math.max(6, 3 * pxUm);
  for (let k = 0; k < o.core.cracks; k++) {
    const a0 = rng.nextFloat() * 2 * Math.PI;
    const r0 = g.R0 * rng.uniform(0.05, 0.45);
    let X = r0 * Math.cos(a0);
    let Y = r0 * Math.sin(a0);
    // mostly radial, sometimes tangential
    let dir = a0 + (rng.nextFloat() < 0.7 ? 0 : Math.PI / 2) + rng.uniform(-0.4, 0.4);
    const lenUm = g.R0 * rng.uniform(0.15, 0.45);
    const pts: { x: number; y: number }[] = [];
    for (let s = 0; s <= lenUm; s += stepUm) {
      const a = Math.atan2(Y, X);
      const r = Math.hypot(X, Y);
      const lim = lutAt(g.outerLut, a) - lutAt(g.widthLut, a) - g.transitionUm - 2 * o.core.crackWidthUm;
      if (r > lim) break;
      pts.push({ x: g.cx + inv.a * X + inv.b * Y, y: g.cy + inv.c * X + inv.d * Y });
      dir += rng.normal() * 0.35;
      X += stepUm * Math.cos(dir);
      Y += stepUm * Math.sin(dir);
    }
    if (pts.length >= 3) out.push({ points: pts, widthPx: Math.max(1, o.core.crackWidthUm / pxUm), depth: rng.uniform(0.45, 0.7) });
  }
  return out;
}

/** Darken the shaded core along the cracks of one specimen (not the band). */
export function applyCracks(c: Canvas, o: ResolvedRenderOptions, g: Geometry, seed: number): void {
  const { W, H, out, blend } = c;
  for (const k of makeCracks(o, g, seed)) {
    const cov = polylineCoverage(W, H, k.points, k.widthPx, false);
    for (let yy = 0; yy < cov.height; yy++) {
      for (let xx = 0; xx < cov.width; xx++) {
        const v = cov.data[yy * cov.width + xx];
        if (v <= 0) continue;
        const i = (cov.y0 + yy) * W + cov.x0 + xx;
        out[i] *= 1 - k.depth * v * (1 - blend[i]);
      }
    }
  }
}
