/**
 * Synthetic fractograph renderer: an end-on view of the fracture surface of a round,
 * circumferentially notched bar, with a known truth (outline, band boundary, band width by angle,
 * scale bar). Pure and deterministic (seeded); everything physical is in µm so a different pixel
 * size shows the same surface.
 *
 * Image formation: a height field h(X, Y) in µm on the specimen plane (fractal gradient noise,
 * cellular dimples, radial ridges in the core; fine relief, striations and an outward slope in the
 * band), shaded with a Lambertian directional light plus ambient (Lambert 1760; e.g. Foley, van Dam
 * et al., Computer Graphics: Principles and Practice, ch. 16), times a zone albedo; then cracks,
 * vignetting, optional SEM edge glow, Gaussian blur, Gaussian noise and a burned-in scale bar.
 */
import { polylineCoverage } from '../draw/coverage.js';
import { createRaster, type GrayRaster } from '../image/raster.js';
import { TOOL_NAME, TOOL_VERSION } from '../version.js';
import { gaussianBlurInPlace } from './blur.js';
import { buildGeometry, inverseMap, lutAt, outlineEllipsePx, type Geometry } from './geometry.js';
import { cellF1, fbm, gradientNoise, makeNoiseTable } from './noise.js';
import { resolveRenderOptions, type RenderOptions, type ResolvedRenderOptions } from './options.js';
import { createRng } from './rng.js';
import { burnScaleBar, labelScaleFor, layoutScaleBar, type ScaleBarTruth } from './scalebar.js';

/** Ground truth of a rendered image (JSON-serialisable; null marks "not defined"). */
export interface RenderTruth {
  readonly schema: 'fractozone.truth/1';
  readonly generator: string;
  readonly invented: true;
  readonly seed: number;
  readonly options: ResolvedRenderOptions;
  readonly widthPx: number;
  readonly heightPx: number;
  readonly umPerPxX: number;
  readonly umPerPxY: number;
  /** specimen centre, px (may lie outside the frame) */
  readonly centre: { readonly x: number; readonly y: number };
  readonly angleConvention: string;
  readonly outline: {
    readonly kind: 'circle' | 'ellipse';
    /** circle radius in px (circle only) */
    readonly radiusPx: number | null;
    /** semi-axes in px, a along angleDeg (ellipse; for a circle a = b = radius) */
    readonly semiAxesPx: { readonly a: number; readonly b: number };
    readonly angleDeg: number;
    readonly diameterUm: number;
    /** outline wobble present: then the radii by angle are the exact outline, the ellipse the mean shape */
    readonly wobble: boolean;
  };
  /** true when the frame cuts the specimen on at least one of the 360 rays */
  readonly frameCut: boolean;
  readonly frameCutByAngle: boolean[];
  /** outline radius along the ray at image angle θ = 0..359°, px (geometric, also beyond the frame) */
  readonly outerRadiusPxByAngle: number[];
  /** rim/core boundary radius (50 % blend), px; null where the band is absent */
  readonly boundaryRadiusPxByAngle: (number | null)[];
  readonly band: {
    readonly present: boolean;
    /** mean of widthUmByAngle over the angles where it is defined (null if none) */
    readonly meanWidthUm: number | null;
    readonly meanWidthPx: number | null;
    readonly minWidthUm: number | null;
    readonly maxWidthUm: number | null;
    /** number of the 360 angles where the width is defined */
    readonly definedAngles: number;
    /** band width along the ray in the image plane, µm; null where the band is absent or the frame cuts the ray */
    readonly widthUmByAngle: (number | null)[];
    readonly widthPxByAngle: (number | null)[];
    /** the same width on the specimen plane (differs from the image-plane width only for tilted views) */
    readonly surfaceWidthUmByAngle: (number | null)[];
    /** true where the band is absent (a sector with no band, or no rim at all) */
    readonly absentByAngle: boolean[];
    readonly nullMeans: string;
  };
  readonly scaleBar: ScaleBarTruth | null;
}

/** Result of {@link renderFractograph}. */
export interface RenderResult {
  readonly raster: GrayRaster;
  readonly truth: RenderTruth;
}

const r4 = (v: number): number => Math.round(v * 1e4) / 1e4;

interface Crack {
  points: { x: number; y: number }[];
  widthPx: number;
  depth: number;
}

function makeCracks(o: ResolvedRenderOptions, g: Geometry, seed: number): Crack[] {
  const rng = createRng(seed);
  const inv = inverseMap(g);
  const out: Crack[] = [];
  const pxUm = Math.min(o.umPerPx, o.umPerPxY);
  const stepUm = Math.max(6, 3 * pxUm);
  for (let k = 0; k < o.core.cracks; k++) {
    const a0 = rng.next() * 2 * Math.PI;
    const r0 = g.R0 * rng.range(0.05, 0.45);
    let X = r0 * Math.cos(a0);
    let Y = r0 * Math.sin(a0);
    // mostly radial, sometimes tangential
    let dir = a0 + (rng.next() < 0.7 ? 0 : Math.PI / 2) + rng.range(-0.4, 0.4);
    const lenUm = g.R0 * rng.range(0.15, 0.45);
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
    if (pts.length >= 3) out.push({ points: pts, widthPx: Math.max(1, o.core.crackWidthUm / pxUm), depth: rng.range(0.45, 0.7) });
  }
  return out;
}

/**
 * Render a synthetic fractograph with its exact truth.
 *
 * @param options see {@link RenderOptions}; all optional. Lengths in µm, pixel sizes in µm/px,
 *   angles in degrees (0° = +x, counter-clockwise on screen).
 * @returns `raster`: Float32 gray 0..1 (quantise to 8 or 16 bits yourself); `truth`: schema
 *   "fractozone.truth/1", computed along the 360 rays from the same geometry tables the pixels use.
 * @throws FractozoneError BAD_PARAMETER for out-of-range options.
 */
export function renderFractograph(options: RenderOptions = {}): RenderResult {
  const o = resolveRenderOptions(options);
  const W = o.widthPx;
  const H = o.heightPx;
  const g = buildGeometry(o);
  const master = createRng(o.seed);
  const tCore = makeNoiseTable(master.fork('core'));
  const tDimple = makeNoiseTable(master.fork('dimple'));
  const tRidge = makeNoiseTable(master.fork('ridge'));
  const tRim = makeNoiseTable(master.fork('rim'));
  const tBg = makeNoiseTable(master.fork('background'));
  const crackSeed = master.fork('cracks').int(2 ** 31);
  const noiseRng = master.fork('noise');

  const n = W * H;
  const height = new Float32Array(n);
  const blend = new Float32Array(n); // rim weight m (0 core … 1 rim)
  const edge = new Float32Array(n); // signed distance to the outline in px (+ inside)
  const out = new Float32Array(n);

  const { A, B, C, D, cx, cy } = g;
  const outerLut = g.outerLut;
  const widthLut = g.widthLut;
  const rim = o.rim;
  const T = rim ? Math.max(rim.transitionUm, 1e-6) : 1;
  const pxUm = Math.sqrt(o.umPerPx * o.umPerPxY);
  const minUm = 1.5 * pxUm; // drop relief finer than 1.5 px (would only alias)
  const core = o.core;
  const cl = 1 / core.reliefScaleUm;
  const cMin = minUm * cl;
  const dl = 1 / core.dimpleSizeUm;
  const dl2 = 1 / (core.dimpleSizeUm * 0.33);
  const smallDimples = core.dimpleSizeUm * 0.33 > 2 * pxUm;
  const dimplesOn = core.dimpleSizeUm > 2 * pxUm && core.dimpleDepthUm > 0;
  const ridgeRing = g.R0 / core.ridgeSpacingUm;
  const ridgeLen = 1 / (g.R0 * 0.6);
  const rl = rim ? 1 / rim.reliefScaleUm : 0;
  const rMin = minUm * rl;
  const striRing = rim ? g.R0 / rim.striationSpacingUm : 0;
  const striOn = rim ? rim.striations > 0 && rim.striationSpacingUm > 2 * pxUm : false;
  const slope = rim ? Math.tan((rim.slopeDeg * Math.PI) / 180) : 0;
  const TWO_PI = 2 * Math.PI;
  const lutScale = 7200 / TWO_PI;

  // Pass 1: geometry, zone blend and height field
  for (let y = 0; y < H; y++) {
    const dy = y - cy;
    for (let x = 0; x < W; x++) {
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
      const k = dpx > 1e-9 ? r / dpx : pxUm; // µm on the specimen per px along this ray
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
      if (m < 1) {
        let hc = core.reliefUm * fbm(tCore, X * cl, Y * cl, core.octaves, 0.55, cMin);
        if (dimplesOn) {
          const f1 = cellF1(tDimple, X * dl, Y * dl);
          hc += core.dimpleDepthUm * (f1 * f1 - 0.3);
          if (smallDimples) {
            const f2 = cellF1(tDimple, X * dl2 + 31.7, Y * dl2 - 11.3);
            hc += 0.45 * core.dimpleDepthUm * (f2 * f2 - 0.3);
          }
        }
        if (core.ridgeUm > 0) {
          const ca = X / (r + 1e-9);
          const sa = Y / (r + 1e-9);
          const rr = ridgeRing + r * ridgeLen;
          const rn = gradientNoise(tRidge, ca * rr, sa * rr) + 0.5 * gradientNoise(tRidge, ca * rr * 2.1 + 5.3, sa * rr * 2.1);
          // ridges fade out toward the centre (where the rays would converge into a star)
          let fade = (r / g.R0 - 0.15) / 0.5;
          fade = fade < 0 ? 0 : fade > 1 ? 1 : fade;
          hc += core.ridgeUm * rn * fade * fade * (3 - 2 * fade);
        }
        h += (1 - m) * hc;
      }
      if (m > 0 && rim) {
        let hr = rim.reliefUm * fbm(tRim, X * rl, Y * rl, 3, 0.5, rMin);
        if (striOn) {
          const ca = X / (r + 1e-9);
          const sa = Y / (r + 1e-9);
          const rr = striRing + r * ridgeLen * 0.5;
          hr += 3 * rim.reliefUm * rim.striations * gradientNoise(tRim, ca * rr + 100.5, sa * rr - 40.25);
        }
        h += m * hr;
        const over = r - rb + T / 2;
        if (over > 0) h -= slope * over;
      }
      height[i] = h;
    }
  }

  const hx = (W - 1) / 2;
  const hy = (H - 1) / 2;
  const iDiag2 = 1 / (hx * hx + hy * hy);
  const vig = o.vignetting;
  const glowPx = Math.max(1.5, 25 / pxUm);
  const semEdge = o.semEdge * 0.5;

  // Pass 2: shading (Lambert + ambient) with a zone albedo
  const az = (o.light.azimuthDeg * Math.PI) / 180;
  const el = (o.light.elevationDeg * Math.PI) / 180;
  const lx = Math.cos(el) * Math.cos(az);
  const ly = -Math.cos(el) * Math.sin(az); // screen y down
  const lz = Math.sin(el);
  const amb = o.light.ambient;
  const diff = (1 - amb) / lz; // a flat surface shades to 1
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
      let v = (baseCore + m * (baseRim - baseCore)) * (amb + diff * nl);
      if (semEdge > 0) v += semEdge * Math.exp(-Math.max(0, edge[i]) / glowPx);
      const d2 = ((x - hx) * (x - hx) + (y - hy) * (y - hy)) * iDiag2;
      out[i] = v * (1 - vig * d2);
    }
  }

  // Cracks: dark, thin, jagged curves in the core
  for (const c of makeCracks(o, g, crackSeed)) {
    const cov = polylineCoverage(W, H, c.points, c.widthPx, false);
    for (let yy = 0; yy < cov.height; yy++) {
      for (let xx = 0; xx < cov.width; xx++) {
        const v = cov.data[yy * cov.width + xx];
        if (v <= 0) continue;
        const i = (cov.y0 + yy) * W + cov.x0 + xx;
        out[i] *= 1 - c.depth * v * (1 - blend[i]);
      }
    }
  }

  // Equal mean brightness: per-zone gains over the fully covered specimen pixels
  let gRim = 1;
  let gCore = 1;
  if (o.equalMeanBrightness && rim) {
    let sR = 0;
    let nR = 0;
    let sC = 0;
    let nC = 0;
    for (let i = 0; i < n; i++) {
      if (edge[i] < 0.5) continue;
      if (blend[i] >= 0.5) {
        sR += out[i];
        nR++;
      } else {
        sC += out[i];
        nC++;
      }
    }
    if (nR > 0 && nC > 0) {
      const target = (sR + sC) / (nR + nC);
      gRim = target / (sR / nR);
      gCore = target / (sC / nC);
    }
  }

  // Composite with the background
  const bright = o.background === 'bright';
  const bgLevel = bright ? 0.82 : 0.07;
  const bgl = 1 / 300; // background mottling wavelength 300 µm
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const i = y * W + x;
      const e = edge[i];
      const cov = e <= -0.5 ? 0 : e >= 0.5 ? 1 : e + 0.5;
      const d2 = ((x - hx) * (x - hx) + (y - hy) * (y - hy)) * iDiag2;
      let bg = 0;
      if (cov < 1) {
        bg = (bgLevel + o.backgroundNoise * gradientNoise(tBg, x * o.umPerPx * bgl, y * o.umPerPxY * bgl) * 1.5) * (1 - vig * d2);
      }
      let s = 0;
      if (cov > 0) {
        const m = blend[i];
        s = out[i] * (gCore + m * (gRim - gCore));
      }
      out[i] = cov * s + (1 - cov) * bg;
    }
  }

  if (o.blurSigmaPx > 0) gaussianBlurInPlace(out, W, H, o.blurSigmaPx);

  if (o.noiseSigma > 0 || o.noiseSignal > 0) {
    const s2 = o.noiseSigma * o.noiseSigma;
    const k2 = o.noiseSignal * o.noiseSignal;
    for (let i = 0; i < n; i++) {
      const v = out[i];
      out[i] = v + Math.sqrt(s2 + k2 * (v > 0 ? v : 0)) * noiseRng.normal();
    }
  }
  for (let i = 0; i < n; i++) {
    const v = out[i];
    out[i] = v < 0 ? 0 : v > 1 ? 1 : v;
  }

  const raster = createRaster(W, H, out);
  let bar: ScaleBarTruth | null = null;
  if (o.scaleBar) {
    bar = layoutScaleBar(o.scaleBar, W, H, o.umPerPx);
    burnScaleBar(raster, bar, labelScaleFor(o.scaleBar, W, H));
  }
  return { raster, truth: computeTruth(o, g, bar) };
}

function computeTruth(o: ResolvedRenderOptions, g: Geometry, bar: ScaleBarTruth | null): RenderTruth {
  const W = o.widthPx;
  const H = o.heightPx;
  const outer: number[] = [];
  const boundary: (number | null)[] = [];
  const widthUm: (number | null)[] = [];
  const widthPx: (number | null)[] = [];
  const surf: (number | null)[] = [];
  const absent: boolean[] = [];
  const cut: boolean[] = [];
  const inFrame = g.cx >= -0.5 && g.cx <= W - 0.5 && g.cy >= -0.5 && g.cy <= H - 0.5;
  for (let d = 0; d < 360; d++) {
    const th = (d * Math.PI) / 180;
    const ux = Math.cos(th);
    const uy = -Math.sin(th);
    const X1 = g.A * ux + g.B * uy;
    const Y1 = g.C * ux + g.D * uy;
    const k = Math.hypot(X1, Y1); // µm on the specimen per px along the ray
    const al = Math.atan2(Y1, X1);
    const R = lutAt(g.outerLut, al);
    const w = g.bandPresent ? lutAt(g.widthLut, al) : 0;
    const oPx = R / k;
    // distance from the centre to the frame edge along the ray (frame = pixel edges −0.5 … W − 0.5)
    let tMax = Infinity;
    if (ux > 1e-12) tMax = Math.min(tMax, (W - 0.5 - g.cx) / ux);
    if (ux < -1e-12) tMax = Math.min(tMax, (-0.5 - g.cx) / ux);
    if (uy > 1e-12) tMax = Math.min(tMax, (H - 0.5 - g.cy) / uy);
    if (uy < -1e-12) tMax = Math.min(tMax, (-0.5 - g.cy) / uy);
    const isCut = !inFrame || oPx + 1 > tMax;
    outer.push(r4(oPx));
    cut.push(isCut);
    const isAbsent = !(w > 1e-6); // same threshold as the pixel loop
    absent.push(isAbsent);
    if (isAbsent) {
      boundary.push(null);
      widthUm.push(null);
      widthPx.push(null);
      surf.push(null);
      continue;
    }
    const bPx = (R - w) / k;
    boundary.push(r4(bPx));
    if (isCut) {
      widthUm.push(null);
      widthPx.push(null);
      surf.push(null);
      continue;
    }
    const imgUmPerPx = Math.hypot(ux * o.umPerPx, uy * o.umPerPxY);
    widthPx.push(r4(oPx - bPx));
    widthUm.push(r4((oPx - bPx) * imgUmPerPx));
    surf.push(r4(w));
  }
  const defined = widthUm.filter((v): v is number => v !== null);
  const definedPx = widthPx.filter((v): v is number => v !== null);
  const mean = (a: number[]): number | null => (a.length ? r4(a.reduce((s, v) => s + v, 0) / a.length) : null);
  const ell = outlineEllipsePx(g);
  const isCircle = Math.abs(ell.a - ell.b) < 1e-9 * ell.a;
  return {
    schema: 'fractozone.truth/1',
    generator: `${TOOL_NAME} ${TOOL_VERSION} renderFractograph`,
    invented: true,
    seed: o.seed,
    options: o,
    widthPx: W,
    heightPx: H,
    umPerPxX: o.umPerPx,
    umPerPxY: o.umPerPxY,
    centre: { x: g.cx, y: g.cy },
    angleConvention: 'degrees; 0° = +x (3 o’clock); counter-clockwise on screen; ray direction (cos θ, −sin θ) in image coordinates (x right, y down); pixel centres at integer (x, y)',
    outline: {
      kind: isCircle ? 'circle' : 'ellipse',
      radiusPx: isCircle ? r4(ell.a) : null,
      semiAxesPx: { a: r4(ell.a), b: r4(ell.b) },
      angleDeg: isCircle ? 0 : r4(ell.angleDeg),
      diameterUm: o.specimen.diameterUm,
      wobble: o.specimen.wobble.length > 0,
    },
    frameCut: cut.some((c) => c),
    frameCutByAngle: cut,
    outerRadiusPxByAngle: outer,
    boundaryRadiusPxByAngle: boundary,
    band: {
      present: g.bandPresent && absent.some((a) => !a),
      meanWidthUm: mean(defined),
      meanWidthPx: mean(definedPx),
      minWidthUm: defined.length ? Math.min(...defined) : null,
      maxWidthUm: defined.length ? Math.max(...defined) : null,
      definedAngles: defined.length,
      widthUmByAngle: widthUm,
      widthPxByAngle: widthPx,
      surfaceWidthUmByAngle: surf,
      absentByAngle: absent,
      nullMeans: 'null = band absent at this angle (absentByAngle true) or the frame cuts the specimen on this ray (frameCutByAngle true: outer edge less than 1 px inside the frame)',
    },
    scaleBar: bar,
  };
}
