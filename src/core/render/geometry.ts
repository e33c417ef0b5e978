/**
 * Specimen geometry shared by the pixel loop and the truth, so the truth is exact for the image.
 *
 * Image pixel offsets (dx, dy) from the centre (x right, y down) map linearly to coordinates (X, Y)
 * on the specimen's own fracture plane, in µm (Y up): scale by the pixel size, flip y, rotate into
 * the tilt-axis frame, stretch the foreshortened direction by 1/cos(tilt), rotate back. The outline
 * radius R(α) and band width w(α) are functions of the specimen angle α = atan2(Y, X), tabulated
 * once (LUT, linear interpolation) and used identically by renderer and truth.
 *
 * A {@link Placement} puts a specimen elsewhere in the frame: its own centre, a mirror image (the
 * mating half of a broken bar) and a rotation about its centre, with small extra band-width terms.
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
  /** +1, or −1 for a mating half (its relief is the complement of the first half's) */
  readonly heightSign: 1 | -1;
}

/** Where and how a specimen sits in the frame (defaults: canvas centre, not mirrored, not rotated). */
export interface Placement {
  /** centre, px */
  readonly cx: number;
  readonly cy: number;
  /** mirror image (x → −x on the specimen plane) with the complementary relief */
  readonly mirror: boolean;
  /** rotation of the specimen about its centre, degrees (counter-clockwise on screen) */
  readonly rotationDeg: number;
  /** extra relative band-width terms (small differences between mating halves) */
  readonly widthHarmonics: readonly Harmonic[];
}

/** The placement of a single specimen: its given centre or the centre of the image area. */
export function defaultPlacement(o: ResolvedRenderOptions, areaHeightPx = o.heightPx): Placement {
  return {
    cx: o.specimen.centrePx ? o.specimen.centrePx.x : (o.widthPx - 1) / 2,
    cy: o.specimen.centrePx ? o.specimen.centrePx.y : (areaHeightPx - 1) / 2,
    mirror: false,
    rotationDeg: 0,
    widthHarmonics: [],
  };
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

/** Build the geometry for resolved options (placement: see {@link defaultPlacement}). */
export function buildGeometry(o: ResolvedRenderOptions, p: Placement = defaultPlacement(o)): Geometry {
  const { cx, cy } = p;
  const phi = (o.specimen.tiltAxisDeg * Math.PI) / 180;
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  const ict = 1 / Math.cos((o.specimen.tiltDeg * Math.PI) / 180);
  const sx = o.umPerPx;
  const sy = o.umPerPxY;
  // u = dx·sx, v = −dy·sy; X = u(c² + s²/ct) + v(cs − cs/ct); Y = u(sc − sc/ct) + v(s² + c²/ct)
  let A = sx * (c * c + s * s * ict);
  let B = -sy * (c * s - c * s * ict);
  let C = sx * (s * c - s * c * ict);
  let D = -sy * (s * s + c * c * ict);
  if (p.mirror || p.rotationDeg !== 0) [A, B, C, D] = mirrorRotate([A, B, C, D], p.mirror, p.rotationDeg);
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
      if (p.widthHarmonics.length > 0) w *= 1 + harmonicSum(p.widthHarmonics, a);
      for (const q of rim.absentSectors) if (inSector(deg, q.fromDeg, q.toDeg)) w = 0;
      widthLut[i] = Math.max(0, Math.min(w, outerLut[i] * 0.98));
    }
  }
  return {
    cx,
    cy,
    A,
    B,
    C,
    D,
    R0,
    outerLut,
    widthLut,
    bandPresent: rim !== false && rim.widthUm > 0,
    transitionUm: rim ? rim.transitionUm : 0,
    heightSign: p.mirror ? -1 : 1,
  };
}

/**
 * Compose the pixel→specimen matrix with a mirror (X → −X) and then a rotation of the specimen by
 * `rotationDeg` on screen: a specimen point at angle α then appears at α + rotation (mirrored first).
 * Rotating the picture by +θ means reading the specimen at −θ, hence Rot(−θ) on the specimen plane.
 */
function mirrorRotate(m: readonly [number, number, number, number], mirror: boolean, rotationDeg: number): [number, number, number, number] {
  let [A, B, C, D] = m;
  const t = (-rotationDeg * Math.PI) / 180;
  const ct = Math.cos(t);
  const st = Math.sin(t);
  [A, B, C, D] = [ct * A - st * C, ct * B - st * D, st * A + ct * C, st * B + ct * D];
  if (mirror) [A, B] = [-A, -B];
  return [A, B, C, D];
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
