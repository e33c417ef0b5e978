/**
 * Pass 2 of the renderer: shade the fracture surface's height field with a Lambertian directional light
 * plus ambient (Lambert 1760; e.g. Foley, van Dam et al., Computer Graphics: Principles and Practice,
 * ch. 16) times a zone albedo, optionally mixed with the secondary-electron tilt contrast of an SEM
 * (yield ∝ sec of the local tilt), plus the SEM edge glow and vignetting.
 */
import type { Canvas } from './canvas.js';
import type { ResolvedRenderOptions } from './options.js';

/** Light direction (screen y down, z toward the viewer) and the Lambert constants. */
export interface Light {
  readonly lx: number;
  readonly ly: number;
  readonly lz: number;
  readonly amb: number;
  /** diffuse factor such that a flat surface shades to 1: (1 − ambient) / lz */
  readonly diff: number;
  /** Blinn–Phong half vector between the light and the viewer (0, 0, 1), unit length */
  readonly hx: number;
  readonly hy: number;
  readonly hz: number;
}

/** The scene light of resolved options. */
export function sceneLight(o: ResolvedRenderOptions): Light {
  const az = (o.light.azimuthDeg * Math.PI) / 180;
  const el = (o.light.elevationDeg * Math.PI) / 180;
  const lx = Math.cos(el) * Math.cos(az);
  const ly = -Math.cos(el) * Math.sin(az); // screen y down
  const lz = Math.sin(el);
  const amb = o.light.ambient;
  const hn = Math.hypot(lx, ly, lz + 1);
  return { lx, ly, lz, amb, diff: (1 - amb) / lz, hx: lx / hn, hy: ly / hn, hz: (lz + 1) / hn };
}

/** Vignetting: relative intensity at (x, y) is 1 − strength · (distance from the centre ÷ half diagonal)². */
export interface Vignette {
  readonly cx: number;
  readonly cy: number;
  readonly iDiag2: number;
  readonly strength: number;
}

export function vignette(o: ResolvedRenderOptions): Vignette {
  const cx = (o.widthPx - 1) / 2;
  const cy = (o.heightPx - 1) / 2;
  return { cx, cy, iDiag2: 1 / (cx * cx + cy * cy), strength: o.vignetting };
}

/**
 * Shade the fracture surface (pixels up to 1.5 px outside the outline) into `c.out`.
 * Gradients by central differences in µm/µm (one-sided at the frame).
 */
export function shadingPass(c: Canvas, o: ResolvedRenderOptions): void {
  const { W, H, edge, height, blend, out } = c;
  const L = sceneLight(o);
  const { lx, ly, lz, amb, diff } = L;
  const vg = vignette(o);
  const { iDiag2 } = vg;
  const hx = vg.cx;
  const hy = vg.cy;
  const vig = vg.strength;
  const pxUm = Math.sqrt(o.umPerPx * o.umPerPxY);
  const glowPx = Math.max(1.5, 25 / pxUm);
  const semEdge = o.semEdge * 0.5;
  const se = o.sem ? o.sem.tiltContrast : 0;
  const baseCore = 0.42;
  const baseRim = o.equalMeanBrightness ? baseCore : baseCore * (1 + o.rimBrightness);
  const isx = 1 / (2 * o.umPerPx);
  const isy = 1 / (2 * o.umPerPxY);
  for (let y = 0; y < H; y++) {
    const yu = y > 0 ? -W : 0;
    const yd = y < H - 1 ? W : 0;
    for (let x = 0; x < W; x++) {
      const i = y * W + x;
      if (edge[i] < -1.5) continue;
      const xl = x > 0 ? -1 : 0;
      const xr = x < W - 1 ? 1 : 0;
      const gx = (height[i + xr] - height[i + xl]) * isx * (2 / (xr - xl || 2));
      const gy = (height[i + yd] - height[i + yu]) * isy * (2 / ((yd - yu) / W || 2));
      // normal of z = h(x, y) with y down: (−∂h/∂x, −∂h/∂y, 1); height grows toward the viewer
      const inv = 1 / Math.sqrt(gx * gx + gy * gy + 1);
      let nl = (-gx * lx - gy * ly + lz) * inv;
      if (nl < 0) nl = 0;
      const m = blend[i];
      let v: number;
      if (se > 0) {
        const sec = 1 / inv; // secondary-electron yield relative to a flat surface
        v = (baseCore + m * (baseRim - baseCore)) * ((1 - se) * (amb + diff * nl) + se * (sec < 4 ? sec : 4));
      } else v = (baseCore + m * (baseRim - baseCore)) * (amb + diff * nl);
      if (semEdge > 0) v += semEdge * Math.exp(-Math.max(0, edge[i]) / glowPx);
      const d2 = ((x - hx) * (x - hx) + (y - hy) * (y - hy)) * iDiag2;
      out[i] = v * (1 - vig * d2);
    }
  }
}
