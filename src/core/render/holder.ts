/**
 * What lies around the specimen: the plain mottled background, or a holder with its own relief shaded
 * by the scene light (Lambert + ambient, as the fracture surface):
 * - putty (modelling clay): lumpy fractal relief (gradient-noise fBm, Perlin 2002) with small pits,
 *   mottled mid-grey albedo, a faint sheen;
 * - clamp: two jaws closing along `clampAxisDeg` and touching the bar; their faces carry a diamond
 *   knurl (two crossed sets of V grooves at ±30° to the axis, pyramids between them), metallic gloss;
 *   the gap between the jaws is dark;
 * - paper: bright, mottled (formation) with fine fibres (anisotropic noise in a few random directions).
 * Everything in µm on the background plane, sampled at the pixel size.
 */
import type { Rng } from '../random.js';
import { plainBackgroundLevel } from './composite.js';
import type { PlacedSpecimen } from './layout.js';
import { cellF1, fbm, gradientNoise, makeNoiseTable, type NoiseTable } from './noise.js';
import type { ResolvedRenderOptions } from './options.js';
import type { HolderOptions } from './sceneOptions.js';
import { sceneLight, vignette } from './shading.js';

/** The plain mottled background of {@link compositePlain}, as a plane (with vignetting). */
export function plainBackground(o: ResolvedRenderOptions, tBg: NoiseTable): Float32Array {
  const W = o.widthPx;
  const H = o.heightPx;
  const bg = new Float32Array(W * H);
  const vg = vignette(o);
  const level = plainBackgroundLevel(o);
  const bgl = 1 / 300;
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const d2 = ((x - vg.cx) * (x - vg.cx) + (y - vg.cy) * (y - vg.cy)) * vg.iDiag2;
      bg[y * W + x] = (level + o.backgroundNoise * gradientNoise(tBg, x * o.umPerPx * bgl, y * o.umPerPxY * bgl) * 1.5) * (1 - vg.strength * d2);
    }
  }
  return bg;
}

/** Per-pixel relief (µm) and albedo of a holder. */
interface HolderField {
  readonly height: Float32Array;
  readonly albedo: Float32Array;
  /** gloss (Blinn–Phong, exponent 20) */
  readonly gloss: number;
}

function puttyField(o: ResolvedRenderOptions, h: HolderOptions, t: NoiseTable, t2: NoiseTable): HolderField {
  const W = o.widthPx;
  const H = o.heightPx;
  const height = new Float32Array(W * H);
  const albedo = new Float32Array(W * H);
  const il = 1 / h.mottleScaleUm;
  const pits = 1 / 90; // pits and grains about 90 µm apart
  const minW = (1.5 * Math.min(o.umPerPx, o.umPerPxY)) / h.mottleScaleUm;
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const X = x * o.umPerPx;
      const Y = y * o.umPerPxY;
      const f1 = cellF1(t2, X * pits, Y * pits);
      const pit = f1 < 0.18 ? (0.18 - f1) / 0.18 : 0;
      height[y * W + x] = h.reliefUm * fbm(t, X * il, Y * il, 4, 0.42, minW) - 0.05 * h.reliefUm * pit * pit;
      albedo[y * W + x] = h.level * (1 + h.mottle * 1.6 * gradientNoise(t2, X * il * 0.7 + 17.3, Y * il * 0.7 - 5.1));
    }
  }
  return { height, albedo, gloss: 0.12 };
}

function paperField(o: ResolvedRenderOptions, h: HolderOptions, t: NoiseTable, rng: Rng): HolderField {
  const W = o.widthPx;
  const H = o.heightPx;
  const height = new Float32Array(W * H);
  const albedo = new Float32Array(W * H);
  const il = 1 / h.mottleScaleUm;
  const dirs = [0, 1, 2, 3].map(() => rng.uniform(0, Math.PI));
  const fibreLen = 1 / 400;
  const fibreWid = 1 / 25;
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const X = x * o.umPerPx;
      const Y = y * o.umPerPxY;
      let fib = 0;
      for (let k = 0; k < dirs.length; k++) {
        const c = Math.cos(dirs[k]);
        const s = Math.sin(dirs[k]);
        fib += gradientNoise(t, (c * X + s * Y) * fibreLen + 37 * k, (-s * X + c * Y) * fibreWid + 11 * k);
      }
      height[y * W + x] = h.reliefUm * fib;
      albedo[y * W + x] = h.level * (1 + h.mottle * 1.5 * fbm(t, X * il + 91.7, Y * il - 33.1, 4, 0.5, 0) + 0.02 * fib);
    }
  }
  return { height, albedo, gloss: 0 };
}

/** Triangle wave 0 (groove) … 1 (crest) of period 1. */
function tri(v: number): number {
  const f = v - Math.floor(v);
  return 1 - 2 * Math.abs(f - 0.5);
}

function clampField(o: ResolvedRenderOptions, h: HolderOptions, t: NoiseTable, specimens: readonly PlacedSpecimen[]): HolderField {
  const W = o.widthPx;
  const H = o.heightPx;
  const height = new Float32Array(W * H);
  const albedo = new Float32Array(W * H);
  const a = (h.clampAxisDeg * Math.PI) / 180;
  const ax = Math.cos(a);
  const ay = -Math.sin(a);
  const c30 = Math.cos(Math.PI / 6);
  const s30 = Math.sin(Math.PI / 6);
  const ip = 1 / h.knurlPitchUm;
  const il = 1 / h.mottleScaleUm;
  const gap = 0.06 / Math.max(h.level, 1e-6);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const i = y * W + x;
      // the nearest specimen's centre; the jaws touch its bar
      let s = specimens[0];
      for (const q of specimens) if (Math.abs(x - q.g.cx) < Math.abs(x - s.g.cx)) s = q;
      const tAxis = (x - s.g.cx) * ax + (y - s.g.cy) * ay; // px along the closing axis
      const jaw = Math.abs(tAxis) - s.barRadiusPx; // > 0 on a jaw face
      const X = x * o.umPerPx;
      const Y = y * o.umPerPxY;
      const u = X * ax - Y * ay;
      const v = X * ay + Y * ax;
      // truncated pyramids (worn crests), with a little roughness
      const k = Math.min(0.7, Math.min(tri((u * c30 + v * s30) * ip), tri((u * c30 - v * s30) * ip))) + 0.04 * gradientNoise(t, X * ip * 6, Y * ip * 6);
      const cov = jaw >= 0.5 ? 1 : jaw <= -0.5 ? 0 : jaw + 0.5;
      height[i] = cov * h.reliefUm * k;
      const mott = 1 + h.mottle * 1.5 * gradientNoise(t, X * il, Y * il) + 0.08 * gradientNoise(t, X * ip * 2.3 + 7.1, Y * ip * 2.3);
      albedo[i] = h.level * (cov * mott + (1 - cov) * gap);
    }
  }
  return { height, albedo, gloss: 0.5 };
}

/** Shade a holder field with the scene light into a plane (with vignetting). */
function shadeField(o: ResolvedRenderOptions, f: HolderField): Float32Array {
  const W = o.widthPx;
  const H = o.heightPx;
  const out = new Float32Array(W * H);
  const L = sceneLight(o);
  const vg = vignette(o);
  const isx = 1 / (2 * o.umPerPx);
  const isy = 1 / (2 * o.umPerPxY);
  const hgt = f.height;
  for (let y = 0; y < H; y++) {
    const yu = y > 0 ? -W : 0;
    const yd = y < H - 1 ? W : 0;
    for (let x = 0; x < W; x++) {
      const i = y * W + x;
      const xl = x > 0 ? -1 : 0;
      const xr = x < W - 1 ? 1 : 0;
      const gx = (hgt[i + xr] - hgt[i + xl]) * isx * (2 / (xr - xl || 2));
      const gy = (hgt[i + yd] - hgt[i + yu]) * isy * (2 / ((yd - yu) / W || 2));
      const inv = 1 / Math.sqrt(gx * gx + gy * gy + 1);
      let nl = (-gx * L.lx - gy * L.ly + L.lz) * inv;
      if (nl < 0) nl = 0;
      const nh = (-gx * L.hx - gy * L.hy + L.hz) * inv;
      const spec = f.gloss > 0 && nh > 0 ? f.gloss * Math.pow(nh, 20) * f.albedo[i] : 0;
      const d2 = ((x - vg.cx) * (x - vg.cx) + (y - vg.cy) * (y - vg.cy)) * vg.iDiag2;
      out[i] = (f.albedo[i] * (L.amb + L.diff * nl) + spec) * (1 - vg.strength * d2);
    }
  }
  return out;
}

/** The background plane: a holder when `o.holder` is set, else the plain mottled background. */
export function backgroundPlane(o: ResolvedRenderOptions, tBg: NoiseTable, specimens: readonly PlacedSpecimen[], rng: Rng): Float32Array {
  const h = o.holder;
  if (!h) return plainBackground(o, tBg);
  const t = makeNoiseTable(rng);
  const t2 = makeNoiseTable(rng);
  if (o.background === 'putty') return shadeField(o, puttyField(o, h, t, t2));
  if (o.background === 'paper') return shadeField(o, paperField(o, h, t, rng));
  return shadeField(o, clampField(o, h, t, specimens));
}
