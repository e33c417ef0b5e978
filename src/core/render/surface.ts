/**
 * Pass 1 of the renderer: for every pixel of a specimen's columns, the specimen-plane position, the
 * signed distance to the outline, the rim/core blend and the height field of the fracture surface (µm):
 * fractal gradient noise, cellular dimples and radial ridges in the core; fine relief, striations and
 * an outward slope (shear-lip-like) in the band.
 */
import type { Canvas, SpecimenLayer, Tables } from './canvas.js';
import type { Geometry } from './geometry.js';
import { cellF1, fbm, gradientNoise, type NoiseTable } from './noise.js';
import type { CoreOptions, ResolvedRenderOptions, RimOptions } from './options.js';

/** Constants of the height field of one specimen (all derived from the options, per render). */
interface SurfaceParams {
  readonly core: CoreOptions;
  readonly rim: RimOptions | false;
  readonly pxUm: number;
  readonly T: number;
  readonly cl: number;
  readonly cMin: number;
  readonly dl: number;
  readonly dl2: number;
  readonly smallDimples: boolean;
  readonly dimplesOn: boolean;
  readonly ridgeRing: number;
  readonly ridgeLen: number;
  readonly R0: number;
  readonly rl: number;
  readonly rMin: number;
  readonly striRing: number;
  readonly striOn: boolean;
  readonly slope: number;
}

function surfaceParams(o: ResolvedRenderOptions, g: Geometry): SurfaceParams {
  const rim = o.rim;
  const pxUm = Math.sqrt(o.umPerPx * o.umPerPxY);
  const minUm = 1.5 * pxUm; // drop relief finer than 1.5 px (would only alias)
  const core = o.core;
  const cl = 1 / core.reliefScaleUm;
  const rl = rim ? 1 / rim.reliefScaleUm : 0;
  return {
    core,
    rim,
    pxUm,
    T: rim ? Math.max(rim.transitionUm, 1e-6) : 1,
    cl,
    cMin: minUm * cl,
    dl: 1 / core.dimpleSizeUm,
    dl2: 1 / (core.dimpleSizeUm * 0.33),
    smallDimples: core.dimpleSizeUm * 0.33 > 2 * pxUm,
    dimplesOn: core.dimpleSizeUm > 2 * pxUm && core.dimpleDepthUm > 0,
    ridgeRing: g.R0 / core.ridgeSpacingUm,
    ridgeLen: 1 / (g.R0 * 0.6),
    R0: g.R0,
    rl,
    rMin: minUm * rl,
    striRing: rim ? g.R0 / rim.striationSpacingUm : 0,
    striOn: rim ? rim.striations > 0 && rim.striationSpacingUm > 2 * pxUm : false,
    slope: rim ? Math.tan((rim.slopeDeg * Math.PI) / 180) : 0,
  };
}

/** Core relief at specimen point (X, Y), radius r, µm. */
function coreHeight(p: SurfaceParams, t: Tables, X: number, Y: number, r: number): number {
  const core = p.core;
  let hc = core.reliefUm * fbm(t.core, X * p.cl, Y * p.cl, core.octaves, 0.55, p.cMin);
  if (p.dimplesOn) {
    const f1 = cellF1(t.dimple, X * p.dl, Y * p.dl);
    hc += core.dimpleDepthUm * (f1 * f1 - 0.3);
    if (p.smallDimples) {
      const f2 = cellF1(t.dimple, X * p.dl2 + 31.7, Y * p.dl2 - 11.3);
      hc += 0.45 * core.dimpleDepthUm * (f2 * f2 - 0.3);
    }
  }
  if (core.ridgeUm > 0) {
    const ca = X / (r + 1e-9);
    const sa = Y / (r + 1e-9);
    const rr = p.ridgeRing + r * p.ridgeLen;
    const rn = gradientNoise(t.ridge, ca * rr, sa * rr) + 0.5 * gradientNoise(t.ridge, ca * rr * 2.1 + 5.3, sa * rr * 2.1);
    // ridges fade out toward the centre (where the rays would converge into a star)
    let fade = (r / p.R0 - 0.15) / 0.5;
    fade = fade < 0 ? 0 : fade > 1 ? 1 : fade;
    hc += core.ridgeUm * rn * fade * fade * (3 - 2 * fade);
  }
  return hc;
}

/** Band relief (fine relief + striations) at (X, Y), radius r, µm; without the slope. */
function rimRelief(p: SurfaceParams, rim: RimOptions, tRim: NoiseTable, X: number, Y: number, r: number): number {
  let hr = rim.reliefUm * fbm(tRim, X * p.rl, Y * p.rl, 3, 0.5, p.rMin);
  if (p.striOn) {
    const ca = X / (r + 1e-9);
    const sa = Y / (r + 1e-9);
    const rr = p.striRing + r * p.ridgeLen * 0.5;
    hr += 3 * rim.reliefUm * rim.striations * gradientNoise(tRim, ca * rr + 100.5, sa * rr - 40.25);
  }
  return hr;
}

/**
 * Pass 1 over the columns of one specimen: writes `edge`, `blend` and `height` of the canvas
 * (height × −1 for a mating half). Pixels more than 1.5 px outside the outline keep blend = height = 0.
 */
export function surfacePass(c: Canvas, s: SpecimenLayer, t: Tables, o: ResolvedRenderOptions): void {
  const g = s.g;
  const p = surfaceParams(o, g);
  const { W, H, edge, blend, height } = c;
  const { A, B, C, D, cx, cy, outerLut, widthLut } = g;
  const rim = p.rim;
  const T = p.T;
  const TWO_PI = 2 * Math.PI;
  const lutScale = 7200 / TWO_PI;
  const sign = g.heightSign;
  for (let y = 0; y < H; y++) {
    const dy = y - cy;
    for (let x = s.x0; x < s.x1; x++) {
      const i = y * W + x;
      const dx = x - cx;
      const X = A * dx + B * dy;
      const Y = C * dx + D * dy;
      const r = Math.sqrt(X * X + Y * Y);
      let al = Math.atan2(Y, X);
      if (al < 0) al += TWO_PI;
      let f = al * lutScale;
      if (f >= 7200) f -= 7200;
      const li = f | 0;
      const lt = f - li;
      const R = outerLut[li] + lt * (outerLut[li + 1] - outerLut[li]);
      const dpx = Math.sqrt(dx * dx + dy * dy);
      const k = dpx > 1e-9 ? r / dpx : p.pxUm; // µm on the specimen per px along this ray
      const e = (R - r) / k;
      edge[i] = e;
      if (e < -1.5) continue;
      let m = 0;
      let rb = R;
      if (rim) {
        const w = widthLut[li] + lt * (widthLut[li + 1] - widthLut[li]);
        if (w > 1e-6) {
          rb = R - w;
          let q = 0.5 + (r - rb) / T;
          q = q < 0 ? 0 : q > 1 ? 1 : q;
          m = q * q * (3 - 2 * q);
        }
      }
      blend[i] = m;
      let h = 0;
      if (m < 1) h += (1 - m) * coreHeight(p, t, X, Y, r);
      if (m > 0 && rim) {
        h += m * rimRelief(p, rim, t.rim, X, Y, r);
        const over = r - rb + T / 2;
        if (over > 0) h -= p.slope * over;
      }
      height[i] = sign === 1 ? h : -h;
    }
  }
}

/**
 * Height of the fracture surface at its outer edge (the notch root) along specimen angle index
 * (li, lt), µm, without the fine relief: where the notch flank starts.
 */
export function edgeHeight(o: ResolvedRenderOptions, g: Geometry, li: number, lt: number): number {
  const rim = o.rim;
  if (!rim) return 0;
  const w = g.widthLut[li] + lt * (g.widthLut[li + 1] - g.widthLut[li]);
  if (!(w > 1e-6)) return 0;
  const T = Math.max(rim.transitionUm, 1e-6);
  const h = -Math.tan((rim.slopeDeg * Math.PI) / 180) * (w + T / 2);
  return g.heightSign === 1 ? h : -h;
}
