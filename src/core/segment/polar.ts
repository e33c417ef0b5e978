/**
 * Cues for the fracture-edge search (fractureEdge.ts), computed once on the working copy, and their
 * sampling on an elliptic polar grid around a centre.
 *
 * Cues (each a raster of the working copy):
 * - `intensity`: the image smoothed with a Gaussian of σ = 1 px (edges of brightness: the notch root
 *   against a brighter or darker flank, the bar edge against the background);
 * - `roughness`: ln(local standard deviation / (local mean + 0.05)) of the smoothed image in a square
 *   window (the fracture relief against smooth machined or out-of-focus surfaces);
 * - `detailGx`, `detailGy`: Sobel derivatives of a band-pass image (Gaussian σ 0.7 px minus σ 2 px),
 *   the orientation of fine texture: machining (turning) marks are concentric, so their gradients point
 *   along the radius, while fracture relief is isotropic.
 * Filters are OpenCV's (GaussianBlur, blur, Sobel); the per-pixel combinations are plain loops.
 */
import { getCv, type Mat } from '../cv.js';
import type { GrayRaster } from '../image/raster.js';
import type { PointPx } from '../image/geometry.js';
import { rasterToMat } from './cvutil.js';
import { gaussian1 } from './smooth.js';

/** The cue rasters (working px, same size as the working copy). */
export interface EdgeCues {
  width: number;
  height: number;
  intensity: Float32Array;
  roughness: Float32Array;
  detailGx: Float32Array;
  detailGy: Float32Array;
  /** Side of the roughness window, px. */
  windowPx: number;
}

/**
 * Computes the cues.
 * @param r - working copy (gray 0..1)
 * @param windowPx - roughness window side, px (odd ≥ 3)
 */
export function edgeCues(r: GrayRaster, windowPx: number): EdgeCues {
  const cv = getCv();
  const w = Math.max(3, Math.round(windowPx) | 1);
  const src = rasterToMat(r);
  const mats: Mat[] = [src];
  const mk = (): Mat => {
    const m = new cv.Mat();
    mats.push(m);
    return m;
  };
  try {
    const anchor = new cv.Point(-1, -1);
    // σ = 1: shared with the silhouette's edge band (smooth.ts)
    const g1 = new cv.Mat(r.height, r.width, cv.CV_32F);
    mats.push(g1);
    (g1.data32F as Float32Array).set(gaussian1(r));
    const g07 = mk();
    cv.GaussianBlur(src, g07, new cv.Size(0, 0), 0.7, 0.7, cv.BORDER_REFLECT_101);
    const g2 = mk();
    cv.GaussianBlur(src, g2, new cv.Size(0, 0), 2, 2, cv.BORDER_REFLECT_101);
    const detail = mk();
    cv.subtract(g07, g2, detail);
    const gx = mk();
    const gy = mk();
    cv.Sobel(detail, gx, cv.CV_32F, 1, 0, 3, 1, 0, cv.BORDER_REFLECT_101);
    cv.Sobel(detail, gy, cv.CV_32F, 0, 1, 3, 1, 0, cv.BORDER_REFLECT_101);
    const sq = mk();
    cv.multiply(g1, g1, sq);
    const mean = mk();
    const meanSq = mk();
    cv.blur(g1, mean, new cv.Size(w, w), anchor, cv.BORDER_REFLECT_101);
    cv.blur(sq, meanSq, new cv.Size(w, w), anchor, cv.BORDER_REFLECT_101);
    const rough = logRoughness(mean.data32F as Float32Array, meanSq.data32F as Float32Array);
    return {
      width: r.width,
      height: r.height,
      intensity: Float32Array.from(g1.data32F),
      roughness: rough,
      detailGx: Float32Array.from(gx.data32F),
      detailGy: Float32Array.from(gy.data32F),
      windowPx: w,
    };
  } finally {
    for (const m of mats) m.delete();
  }
}

/**
 * ln((local std + 1e-4) / (local mean + 0.05)) per pixel. A loop of its own (issue 16: per-pixel
 * loops inside a long function are optimised late, DEVELOPERS.md "Performance notes").
 */
function logRoughness(m: Float32Array, m2: Float32Array): Float32Array {
  const rough = new Float32Array(m.length);
  for (let i = 0; i < m.length; i++) {
    const v = Math.max(0, m2[i] - m[i] * m[i]);
    rough[i] = Math.log((Math.sqrt(v) + 1e-4) / (m[i] + 0.05));
  }
  return rough;
}

/** An elliptic polar frame: centre, axis ratio (minor/major ≤ 1) and major-axis angle. */
export interface PolarShape {
  center: PointPx;
  /** b/a of the ellipse family (1 = circles). */
  ratio: number;
  /** Direction of the major axis, degrees (image x right, y down). */
  angleDeg: number;
}

/** The point at polar coordinates (θ index of nTheta, radius r along the major-axis scale). */
export function polarPoint(shape: PolarShape, theta: number, r: number): PointPx {
  return polarAt(shape, polarRay(shape, theta), r);
}

/** The trigonometry of one ray of the polar frame (the angle θ and the major-axis angle). */
export interface PolarRay {
  cosT: number;
  sinT: number;
  ca: number;
  sa: number;
}

/** Cosines and sines of one ray, computed once for all its radii (annulus.ts reads many). */
export function polarRay(shape: PolarShape, theta: number): PolarRay {
  const a = (shape.angleDeg * Math.PI) / 180;
  return { cosT: Math.cos(theta), sinT: Math.sin(theta), ca: Math.cos(a), sa: Math.sin(a) };
}

/** The point at radius r on a ray: the same operations as {@link polarPoint}. */
export function polarAt(shape: PolarShape, ray: PolarRay, r: number): PointPx {
  const u = r * ray.cosT;
  const v = r * shape.ratio * ray.sinT;
  return { x: shape.center.x + u * ray.ca - v * ray.sa, y: shape.center.y + u * ray.sa + v * ray.ca };
}

/** Cues sampled on an (nTheta × nR) polar grid; row = angle, column = radius step. */
export interface PolarCues {
  nTheta: number;
  nR: number;
  /** Radius step, px (major-axis scale). */
  dr: number;
  intensity: Float32Array;
  roughness: Float32Array;
  /** Share of the fine-texture gradient energy along the local radius direction, per sample (0..1 weights: gr², g²). */
  gradRadial2: Float32Array;
  grad2: Float32Array;
  /** 1 where the sample lies inside the image. */
  inside: Uint8Array;
}

/** Bilinear sample of a w × h raster at (x, y) (0 ≤ x ≤ w − 1, 0 ≤ y ≤ h − 1). */
export function bilinear(d: Float32Array, w: number, h: number, x: number, y: number): number {
  const x0 = Math.floor(x);
  const y0 = Math.floor(y);
  const fx = x - x0;
  const fy = y - y0;
  const x1 = Math.min(w - 1, x0 + 1);
  const y1 = Math.min(h - 1, y0 + 1);
  const i00 = y0 * w + x0;
  return (d[i00] * (1 - fx) + d[y0 * w + x1] * fx) * (1 - fy) + (d[y1 * w + x0] * (1 - fx) + d[y1 * w + x1] * fx) * fy;
}

/**
 * Samples the cues on the polar grid of `shape` (bilinear), radii 0..rMax in steps `dr`.
 * @param cues - see {@link edgeCues}
 */
export function samplePolar(cues: EdgeCues, shape: PolarShape, nTheta: number, rMax: number, dr: number): PolarCues {
  const nR = Math.max(2, Math.floor(rMax / dr) + 1);
  const n = nTheta * nR;
  const out: PolarCues = {
    nTheta,
    nR,
    dr,
    intensity: new Float32Array(n),
    roughness: new Float32Array(n),
    gradRadial2: new Float32Array(n),
    grad2: new Float32Array(n),
    inside: new Uint8Array(n),
  };
  const { width: W, height: H } = cues;
  const a = (shape.angleDeg * Math.PI) / 180;
  const ca = Math.cos(a);
  const sa = Math.sin(a);
  for (let t = 0; t < nTheta; t++) {
    const th = (2 * Math.PI * t) / nTheta;
    const ux = Math.cos(th);
    const vy = shape.ratio * Math.sin(th);
    const dx = ux * ca - vy * sa;
    const dy = ux * sa + vy * ca;
    // the outward normal of the ellipse family at this angle (radius direction for texture orientation)
    let nx = (Math.cos(th) * ca) / 1 - (Math.sin(th) / Math.max(shape.ratio, 1e-3)) * sa;
    let ny = (Math.cos(th) * sa) / 1 + (Math.sin(th) / Math.max(shape.ratio, 1e-3)) * ca;
    const nn = Math.hypot(nx, ny) || 1;
    nx /= nn;
    ny /= nn;
    for (let j = 0; j < nR; j++) {
      const r = j * dr;
      const x = shape.center.x + r * dx;
      const y = shape.center.y + r * dy;
      const k = t * nR + j;
      if (x < 0 || y < 0 || x > W - 1 || y > H - 1) continue;
      out.inside[k] = 1;
      sampleAt(cues, W, H, x, y, nx, ny, out, k);
    }
  }
  return out;
}

/**
 * The four cues at (x, y) into sample k: `bilinear` of each, with the cell and the weights found
 * once (the same expression per cue, so the same values; issue 16: four separate calls per sample).
 */
function sampleAt(cues: EdgeCues, W: number, H: number, x: number, y: number, nx: number, ny: number, out: PolarCues, k: number): void {
  const x0 = Math.floor(x);
  const y0 = Math.floor(y);
  const fx = x - x0;
  const fy = y - y0;
  const x1 = Math.min(W - 1, x0 + 1);
  const y1 = Math.min(H - 1, y0 + 1);
  const i00 = y0 * W + x0;
  const i01 = y0 * W + x1;
  const i10 = y1 * W + x0;
  const i11 = y1 * W + x1;
  const ex = 1 - fx;
  const ey = 1 - fy;
  const I = cues.intensity;
  const R = cues.roughness;
  const Gx = cues.detailGx;
  const Gy = cues.detailGy;
  out.intensity[k] = (I[i00] * ex + I[i01] * fx) * ey + (I[i10] * ex + I[i11] * fx) * fy;
  out.roughness[k] = (R[i00] * ex + R[i01] * fx) * ey + (R[i10] * ex + R[i11] * fx) * fy;
  const gx = (Gx[i00] * ex + Gx[i01] * fx) * ey + (Gx[i10] * ex + Gx[i11] * fx) * fy;
  const gy = (Gy[i00] * ex + Gy[i01] * fx) * ey + (Gy[i10] * ex + Gy[i11] * fx) * fy;
  const gr = gx * nx + gy * ny;
  out.gradRadial2[k] = gr * gr;
  out.grad2[k] = gx * gx + gy * gy;
}
