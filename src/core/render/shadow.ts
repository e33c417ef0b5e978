/**
 * Soft shadow of the bar on the background: a cylinder standing on the background plane and lit from
 * azimuth φ casts the bar outline swept along φ + 180° over the shadow length (a capsule); the
 * penumbra widens linearly with the distance from the bar (a light source of finite size), here from
 * `softnessUm` at the bar to twice that at the far end. Smoothstep across the penumbra (common practice,
 * no source).
 */
import type { PlacedSpecimen } from './layout.js';
import type { ResolvedRenderOptions } from './options.js';

/** Multiply the background plane by the shadows of every specimen's bar. */
export function applyShadow(bg: Float32Array, o: ResolvedRenderOptions, specimens: readonly PlacedSpecimen[]): void {
  const s = o.shadow;
  if (!s || s.strength <= 0) return;
  const W = o.widthPx;
  const H = o.heightPx;
  const a = (s.azimuthDeg * Math.PI) / 180;
  const pxUm = Math.sqrt(o.umPerPx * o.umPerPxY);
  const ux = Math.cos(a);
  const uy = -Math.sin(a);
  const len = s.lengthUm / pxUm;
  const soft = Math.max(0.5, s.softnessUm / pxUm);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      let lit = 1;
      for (const sp of specimens) {
        const px = x - sp.g.cx;
        const py = y - sp.g.cy;
        const along = px * ux + py * uy;
        const t = len > 0 ? Math.max(0, Math.min(1, along / len)) : 0;
        const qx = px - t * len * ux;
        const qy = py - t * len * uy;
        const d = Math.sqrt(qx * qx + qy * qy) - sp.barRadiusPx;
        const w = soft * (1 + t);
        let f = (d + w) / (2 * w);
        f = f < 0 ? 0 : f > 1 ? 1 : f;
        // the lit side of the bar gets no shadow: fade in across the tangent line (along = 0)
        let g = (along + soft) / (2 * soft);
        g = g < 0 ? 0 : g > 1 ? 1 : g;
        const shade = 1 - s.strength * (1 - f * f * (3 - 2 * f)) * g * g * (3 - 2 * g);
        if (shade < lit) lit = shade;
      }
      bg[y * W + x] *= lit;
    }
  }
}
