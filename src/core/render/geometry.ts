/**
 * Specimen geometry shared by the pixel loop and the truth, so the truth is exact for the image.
 *
 * Image pixel offsets (dx, dy) from the centre (x right, y down) map linearly to coordinates (X, Y)
 * on the specimen's own fracture plane, in µm (Y up): scale by the pixel size, flip y, rotate into
 * the tilt-axis frame, stretch the foreshortened direction by 1/cos(tilt), rotate back. The outline
 * radius R(α) and band width w(α) are functions of the specimen angle α = atan2(Y, X), tabulated
 * once (LUT, linear interpolation) and used identically by renderer and truth.
 */
import type { Harmonic, ResolvedRenderOptions } from './options.js';

/** LUT resolution: samples per full turn. */
export const LUT_SIZE = 7200;

export interface Geometry {
  readonly cx: number;
  readonly cy: number;
  /** (dx, dy) px → X = A·dx + B·dy, Y = C·dx + D·dy (µm on the specimen plane) */
  readonly A: number;
  readonly B: number;
  readonly C: number;
  readonly D: number;
  readonly R0: number;
  /** outline radius R(α), µm; LUT_SIZE + 1 entries (last = first) */
  readonly outerLut: Float64Array;
  /** band width w(α), µm; 0 where the band is absent */
  readonly widthLut: Float64Array;
  readonly bandPresent: boolean;
  readonly transitionUm: number;
}

function harmonicSum(hs: readonly Harmonic[], alphaRad: number): number {
  let s = 0;
  for (const h of hs) s += (h.amplitudePct / 100) * Math.cos(h.order * alphaRad - (h.phaseDeg * Math.PI) / 180);
  return s;
}

function norm360(d: number): number {
  const r = d % 360;
  return r < 0 ? r + 360 : r;
}

/** True when angle αDeg lies in the CCW sector from→to. */
export function inSector(alphaDeg: number, fromDeg: number, toDeg: number): boolean {
  const a = norm360(alphaDeg - fromDeg);
  const span = norm360(toDeg - fromDeg);
  return a <= span;
}

/** Build the geometry for resolved options. */
export function buildGeometry(o: ResolvedRenderOptions): Geometry {
  const cx = o.specimen.centrePx ? o.specimen.centrePx.x : (o.widthPx - 1) / 2;
  const cy = o.specimen.centrePx ? o.specimen.centrePx.y : (o.heightPx - 1) / 2;
  const phi = (o.specimen.tiltAxisDeg * Math.PI) / 180;
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  const ict = 1 / Math.cos((o.specimen.tiltDeg * Math.PI) / 180);
  const sx = o.umPerPx;
  const sy = o.umPerPxY;
  // u = dx·sx, v = −dy·sy; X = u(c² + s²/ct) + v(cs − cs/ct); Y = u(sc − sc/ct) + v(s² + c²/ct)
  const A = sx * (c * c + s * s * ict);
  const B = -sy * (c * s - c * s * ict);
  const C = sx * (s * c - s * c * ict);
  const D = -sy * (s * s + c * c * ict);
  const R0 = o.specimen.diameterUm / 2;
  const outerLut = new Float64Array(LUT_SIZE + 1);
  const widthLut = new Float64Array(LUT_SIZE + 1);
  const rim = o.rim;
  for (let i = 0; i <= LUT_SIZE; i++) {
    const a = (2 * Math.PI * (i % LUT_SIZE)) / LUT_SIZE;
    outerLut[i] = R0 * (1 + harmonicSum(o.specimen.wobble, a));
    if (rim) {
      const deg = (360 * (i % LUT_SIZE)) / LUT_SIZE;
      let w = rim.widthUm * (1 + harmonicSum(rim.harmonics, a));
      for (const q of rim.absentSectors) if (inSector(deg, q.fromDeg, q.toDeg)) w = 0;
      widthLut[i] = Math.max(0, Math.min(w, outerLut[i] * 0.98));
    }
  }
  return { cx, cy, A, B, C, D, R0, outerLut, widthLut, bandPresent: rim !== false && rim.widthUm > 0, transitionUm: rim ? rim.transitionUm : 0 };
}

/** Linear LUT interpolation at α in radians (any range). */
export function lutAt(lut: Float64Array, alphaRad: number): number {
  let f = (alphaRad / (2 * Math.PI)) * LUT_SIZE;
  f %= LUT_SIZE;
  if (f < 0) f += LUT_SIZE;
  const i = Math.floor(f);
  const t = f - i;
  return lut[i] + t * (lut[i + 1] - lut[i]);
}

/** Pixel-from-specimen matrix (inverse of A B; C D): specimen µm → pixel offsets. */
export function inverseMap(g: Geometry): { a: number; b: number; c: number; d: number } {
  const det = g.A * g.D - g.B * g.C;
  return { a: g.D / det, b: -g.B / det, c: -g.C / det, d: g.A / det };
}

/**
 * The projected outline of the (wobble-free) disc in pixels: semi-axes and orientation from the
 * eigen-decomposition of M·Mᵀ, M the specimen→pixel matrix (singular values of a 2×2 matrix).
 */
export function outlineEllipsePx(g: Geometry): { a: number; b: number; angleDeg: number } {
  const m = inverseMap(g);
  const s11 = m.a * m.a + m.b * m.b;
  const s12 = m.a * m.c + m.b * m.d;
  const s22 = m.c * m.c + m.d * m.d;
  const tr = s11 + s22;
  const disc = Math.sqrt(Math.max(0, ((s11 - s22) / 2) ** 2 + s12 * s12));
  const l1 = tr / 2 + disc;
  const l2 = Math.max(0, tr / 2 - disc);
  // eigenvector of l1 in pixel offsets (ex, ey), y down
  let ex = s12;
  let ey = l1 - s11;
  if (Math.abs(ex) + Math.abs(ey) < 1e-12) {
    ex = s11 >= s22 ? 1 : 0;
    ey = s11 >= s22 ? 0 : 1;
  }
  let ang = (Math.atan2(-ey, ex) * 180) / Math.PI;
  ang = ((ang % 180) + 180) % 180;
  return { a: g.R0 * Math.sqrt(l1), b: g.R0 * Math.sqrt(l2), angleDeg: ang };
}
