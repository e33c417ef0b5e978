/**
 * The ground truth of a rendered image, computed along 360 rays from the same geometry tables the
 * pixels use. The truth outline is the fracture surface's own outer edge (the notch root); scene
 * elements around it (flank, holder, objects) never change it.
 */
import { TOOL_NAME, TOOL_VERSION } from '../version.js';
import { lutAt, outlineEllipsePx, type Geometry } from './geometry.js';
import type { ResolvedRenderOptions } from './options.js';
import type { ScaleBarTruth } from './scalebar.js';
import type { SceneTruth } from './sceneTruth.js';

/** Outline of a specimen in the image. */
export interface OutlineTruth {
  readonly kind: 'circle' | 'ellipse';
  /** circle radius in px (circle only) */
  readonly radiusPx: number | null;
  /** semi-axes in px, a along angleDeg (ellipse; for a circle a = b = radius) */
  readonly semiAxesPx: { readonly a: number; readonly b: number };
  readonly angleDeg: number;
  readonly diameterUm: number;
  /** outline wobble present: then the radii by angle are the exact outline, the ellipse the mean shape */
  readonly wobble: boolean;
}

/** The band of a specimen along the 360 rays. */
export interface BandTruth {
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
}

/** Everything the truth says about one specimen (fracture surface) in the frame. */
export interface SpecimenRays {
  /** specimen centre, px (may lie outside the frame) */
  readonly centre: { readonly x: number; readonly y: number };
  readonly outline: OutlineTruth;
  /** true when the frame cuts the specimen on at least one of the 360 rays */
  readonly frameCut: boolean;
  readonly frameCutByAngle: boolean[];
  /** outline radius along the ray at image angle θ = 0..359°, px (geometric, also beyond the frame) */
  readonly outerRadiusPxByAngle: number[];
  /** rim/core boundary radius (50 % blend), px; null where the band is absent */
  readonly boundaryRadiusPxByAngle: (number | null)[];
  readonly band: BandTruth;
}

/** One of the two mating halves in a frame (`specimens` of the truth). */
export interface SpecimenTruth extends SpecimenRays {
  /** 'A' (first half, left) or 'B' (its mate, right) */
  readonly id: 'A' | 'B';
  readonly description: string;
  /** the mirror image of the first half (the mating fracture surface) */
  readonly mirrored: boolean;
  /** rotation of this half about its centre, degrees (counter-clockwise on screen) */
  readonly rotationDeg: number;
}

/** Ground truth of a rendered image (JSON-serialisable; null marks "not defined"). */
export interface RenderTruth extends SpecimenRays {
  readonly schema: 'fractozone.truth/1';
  readonly generator: string;
  readonly invented: true;
  readonly seed: number;
  readonly options: ResolvedRenderOptions;
  readonly widthPx: number;
  readonly heightPx: number;
  readonly umPerPxX: number;
  readonly umPerPxY: number;
  readonly angleConvention: string;
  readonly scaleBar: ScaleBarTruth | null;
  /**
   * Both mating halves (only when the image shows two): one record per half, A (left) and B (right,
   * mirrored). The top-level centre, outline, rays and band then repeat specimens[0] (A), so a reader
   * that knows one specimen per image still reads a correct truth, of half A.
   */
  readonly specimens?: SpecimenTruth[];
  /** what else the frame shows (only when a scene element is present) */
  readonly scene?: SceneTruth;
}

const r4 = (v: number): number => Math.round(v * 1e4) / 1e4;

/** Where the image area ends (the frame, or the top of an SEM data strip), px. */
export interface ImageArea {
  readonly width: number;
  readonly height: number;
}

/** Distance from (cx, cy) to the frame edge (pixel edges −0.5 … W − 0.5) along (ux, uy). */
function distanceToFrame(cx: number, cy: number, ux: number, uy: number, a: ImageArea): number {
  let tMax = Infinity;
  if (ux > 1e-12) tMax = Math.min(tMax, (a.width - 0.5 - cx) / ux);
  if (ux < -1e-12) tMax = Math.min(tMax, (-0.5 - cx) / ux);
  if (uy > 1e-12) tMax = Math.min(tMax, (a.height - 0.5 - cy) / uy);
  if (uy < -1e-12) tMax = Math.min(tMax, (-0.5 - cy) / uy);
  return tMax;
}

interface RayTables {
  outer: number[];
  boundary: (number | null)[];
  widthUm: (number | null)[];
  widthPx: (number | null)[];
  surf: (number | null)[];
  absent: boolean[];
  cut: boolean[];
}

function rayTables(o: ResolvedRenderOptions, g: Geometry, area: ImageArea): RayTables {
  const t: RayTables = { outer: [], boundary: [], widthUm: [], widthPx: [], surf: [], absent: [], cut: [] };
  const inFrame = g.cx >= -0.5 && g.cx <= area.width - 0.5 && g.cy >= -0.5 && g.cy <= area.height - 0.5;
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
    const isCut = !inFrame || oPx + 1 > distanceToFrame(g.cx, g.cy, ux, uy, area);
    t.outer.push(r4(oPx));
    t.cut.push(isCut);
    const isAbsent = !(w > 1e-6); // same threshold as the pixel loop
    t.absent.push(isAbsent);
    const bPx = (R - w) / k;
    t.boundary.push(isAbsent ? null : r4(bPx));
    if (isAbsent || isCut) {
      t.widthUm.push(null);
      t.widthPx.push(null);
      t.surf.push(null);
      continue;
    }
    const imgUmPerPx = Math.hypot(ux * o.umPerPx, uy * o.umPerPxY);
    t.widthPx.push(r4(oPx - bPx));
    t.widthUm.push(r4((oPx - bPx) * imgUmPerPx));
    t.surf.push(r4(w));
  }
  return t;
}

/** Truth of one specimen along the 360 rays (px and µm, rounded to 1e-4). */
export function specimenRays(o: ResolvedRenderOptions, g: Geometry, area: ImageArea): SpecimenRays {
  const t = rayTables(o, g, area);
  const defined = t.widthUm.filter((v): v is number => v !== null);
  const definedPx = t.widthPx.filter((v): v is number => v !== null);
  const mean = (a: number[]): number | null => (a.length ? r4(a.reduce((s, v) => s + v, 0) / a.length) : null);
  const ell = outlineEllipsePx(g);
  const isCircle = Math.abs(ell.a - ell.b) < 1e-9 * ell.a;
  return {
    centre: { x: g.cx, y: g.cy },
    outline: {
      kind: isCircle ? 'circle' : 'ellipse',
      radiusPx: isCircle ? r4(ell.a) : null,
      semiAxesPx: { a: r4(ell.a), b: r4(ell.b) },
      angleDeg: isCircle ? 0 : r4(ell.angleDeg),
      diameterUm: o.specimen.diameterUm,
      wobble: o.specimen.wobble.length > 0,
    },
    frameCut: t.cut.some((c) => c),
    frameCutByAngle: t.cut,
    outerRadiusPxByAngle: t.outer,
    boundaryRadiusPxByAngle: t.boundary,
    band: {
      present: g.bandPresent && t.absent.some((a) => !a),
      meanWidthUm: mean(defined),
      meanWidthPx: mean(definedPx),
      minWidthUm: defined.length ? Math.min(...defined) : null,
      maxWidthUm: defined.length ? Math.max(...defined) : null,
      definedAngles: defined.length,
      widthUmByAngle: t.widthUm,
      widthPxByAngle: t.widthPx,
      surfaceWidthUmByAngle: t.surf,
      absentByAngle: t.absent,
      nullMeans: 'null = band absent at this angle (absentByAngle true) or the frame cuts the specimen on this ray (frameCutByAngle true: outer edge less than 1 px inside the frame)',
    },
  };
}

/**
 * Assemble the truth: the first specimen's rays at the top level (the single-specimen format), the
 * halves in `specimens` and the scene in `scene` when present.
 */
export function assembleTruth(o: ResolvedRenderOptions, rays: readonly SpecimenTruth[], bar: ScaleBarTruth | null, scene: SceneTruth | null): RenderTruth {
  const first = rays[0];
  const truth: RenderTruth = {
    schema: 'fractozone.truth/1',
    generator: `${TOOL_NAME} ${TOOL_VERSION} renderFractograph`,
    invented: true,
    seed: o.seed,
    options: o,
    widthPx: o.widthPx,
    heightPx: o.heightPx,
    umPerPxX: o.umPerPx,
    umPerPxY: o.umPerPxY,
    centre: first.centre,
    angleConvention: 'degrees; 0° = +x (3 o’clock); counter-clockwise on screen; ray direction (cos θ, −sin θ) in image coordinates (x right, y down); pixel centres at integer (x, y)',
    outline: first.outline,
    frameCut: first.frameCut,
    frameCutByAngle: first.frameCutByAngle,
    outerRadiusPxByAngle: first.outerRadiusPxByAngle,
    boundaryRadiusPxByAngle: first.boundaryRadiusPxByAngle,
    band: first.band,
    scaleBar: bar,
  };
  return {
    ...truth,
    ...(rays.length > 1 ? { specimens: [...rays] } : {}),
    ...(scene ? { scene } : {}),
  };
}
