/**
 * Specular glints on the slanted rim: Blinn–Phong highlights (J. F. Blinn, "Models of light reflection
 * for computer synthesized pictures", SIGGRAPH 1977) of the rim's surface normal, where the normal is
 * that of the height field tilted by the small flat facet the point lies on (one facet per cell of a
 * Worley pattern, random tilt up to `facetTiltDeg`). A slanted rim under a directional light then shows
 * a glint crescent on the side facing the light, sparkling where facets catch it. The highlight is
 * neutral (added after the zone tint) and weighted by the rim blend.
 */
import type { Rng } from '../random.js';
import type { Canvas, SpecimenLayer } from './canvas.js';
import { cellNearest, makeNoiseTable } from './noise.js';
import type { ResolvedRenderOptions } from './options.js';
import { sceneLight, vignette } from './shading.js';

/** Add the glints of one specimen's rim to `c.spec` (allocated on first use). */
export function glintPass(c: Canvas, s: SpecimenLayer, o: ResolvedRenderOptions, rng: Rng): void {
  const gl = o.glints;
  if (!gl || gl.strength <= 0) return;
  const { W, H, edge, height, blend } = c;
  const spec = c.spec ?? (c.spec = new Float32Array(c.n));
  const table = makeNoiseTable(rng);
  const L = sceneLight(o);
  const vg = vignette(o);
  const g = s.g;
  const isx = 1 / (2 * o.umPerPx);
  const isy = 1 / (2 * o.umPerPxY);
  const fl = gl.facetUm > 0 ? 1 / gl.facetUm : 0;
  const maxTilt = Math.tan((gl.facetTiltDeg * Math.PI) / 180);
  for (let y = 1; y < H - 1; y++) {
    const dy = y - g.cy;
    for (let x = Math.max(1, s.x0); x < Math.min(W - 1, s.x1); x++) {
      const i = y * W + x;
      const m = blend[i];
      if (m <= 0 || edge[i] < -0.5) continue;
      let gx = (height[i + 1] - height[i - 1]) * isx;
      let gy = (height[i + W] - height[i - W]) * isy;
      if (fl > 0) {
        const dx = x - g.cx;
        const h = cellNearest(table, (g.A * dx + g.B * dy) * fl, (g.C * dx + g.D * dy) * fl);
        const tilt = maxTilt * table.jx[h];
        gx += tilt * table.gx[h];
        gy += tilt * table.gy[h];
      }
      const inv = 1 / Math.sqrt(gx * gx + gy * gy + 1);
      const nh = (-gx * L.hx - gy * L.hy + L.hz) * inv;
      if (nh <= 0) continue;
      const cov = edge[i] >= 0.5 ? 1 : edge[i] + 0.5;
      const d2 = ((x - vg.cx) * (x - vg.cx) + (y - vg.cy) * (y - vg.cy)) * vg.iDiag2;
      spec[i] += gl.strength * m * cov * Math.pow(nh, gl.sharpness) * (1 - vg.strength * d2);
    }
  }
}
