/**
 * Stage 5, refine the boundary: the classified core outline is moved along each ray to the step
 * between the rim and core intensity variance (segment/refine.ts `refineBoundary`), on the working
 * copy, and mapped to full-resolution px. A boundary given by a person skips stages 3 to 5.
 */
import type { PointPx } from '../../image/geometry.js';
import { createRaster, type GrayRaster } from '../../image/raster.js';
import { oncePerRaster } from '../../segment/memo.js';
import { refineBoundary, type Separability } from '../../segment/index.js';
import type { WorkingFrame } from '../frame.js';
import type { BoundarySource } from '../result.js';
import type { Classification } from './classify.js';
import type { SpecimenLocation } from './locateSpecimen.js';
import { windowMean, type TextureWindow } from './texture.js';

/** The rim/core boundary the band is measured to. */
export interface RimBoundary {
  source: BoundarySource;
  /** Polygon in full-resolution px; null when no band was found. */
  polygon: PointPx[] | null;
  detected: boolean;
  /** Why no band was found (detected = false). */
  reason?: string;
  /** Separability of the two textures (null for a manual boundary). */
  separability: Separability | null;
}

/** Input of {@link refineRimBoundary}. */
export interface RefineInput {
  frame: WorkingFrame;
  location: SpecimenLocation;
  classification: Classification;
  window: TextureWindow;
  /** Rays of the measurement; the boundary is refined on at least 360. */
  nRays: number;
  /** The working copy to refine on, when not frame.work (e.g. with glints suppressed). */
  source?: GrayRaster;
  /** Pixels of `source` whose texture is unknown (glints), left out of the refinement's profiles. */
  missing?: Uint8Array | null;
  /** Where the step level sits in its tolerance (segment/refine.ts; default 'mean'). */
  level?: 'mean' | 'log' | 'std';
  /** Refine on exactly this many rays (the parameter range's quick runs); default max(nRays, 360). */
  exactRays?: number;
  /**
   * 'tone': the classification read brightness (texture/localDarkness.ts), so the boundary is put
   * where the window's mean brightness crosses the midpoint of the rim's and the core's levels
   * (segment/refine.ts method 'box' on 1 − mean: linear in the area fraction, so the midpoint is
   * crossed on a straight boundary itself); default 'texture' (the step of the arc variance).
   */
  cue?: 'texture' | 'tone';
}

/** Refines the classified boundary, or reports why there is none. */
export function refineRimBoundary(input: RefineInput): RimBoundary {
  const { frame, location, classification } = input;
  const rc = classification.rimCore;
  if (!rc.detected || !rc.boundary) {
    return { source: 'auto', polygon: null, detected: false, reason: rc.reason ?? 'no smooth rim band was found', separability: rc.separability };
  }
  const refined = refineBoundary(input.source ?? frame.work, location.outer.map((q) => frame.toWork(q)), rc.boundary, location.centerWork, {
    windowPx: input.window.windowPxWork,
    nRays: input.exactRays ?? Math.max(input.nRays, 360),
    level: input.level,
    missing: input.missing,
    ...(input.cue === 'tone' ? { method: 'box' as const, energy: lightDeficit(input.source ?? frame.work, input.window.windowPxWork) } : {}),
  });
  return { source: 'auto', polygon: refined.polygon.map((q) => frame.toFull(q)), detected: true, separability: rc.separability };
}

/**
 * 1 − the window's mean brightness (texture.ts `windowMean`, shared with the classification):
 * higher in the darker core, linear in the area fraction; once per working copy and window (the
 * measurement and its variations share it).
 */
function lightDeficit(r: GrayRaster, windowPx: number): GrayRaster {
  return oncePerRaster(DEFICIT, r, String(windowPx), () => {
    const m = windowMean(r, windowPx).data;
    const d = new Float32Array(m.length);
    for (let i = 0; i < d.length; i++) d[i] = 1 - m[i];
    return createRaster(r.width, r.height, d);
  });
}
const DEFICIT = new WeakMap<GrayRaster, Map<string, GrayRaster>>();

/** A boundary drawn or given by a person (px), taken as it is. */
export function manualBoundary(polygon: readonly PointPx[]): RimBoundary {
  return { source: 'manual', polygon: polygon.map((q) => ({ x: q.x, y: q.y })), detected: true, separability: null };
}
