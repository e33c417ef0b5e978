/**
 * Stages 3 to 5 together (texture → classify → refine boundary), with a second pass at a finer
 * window when the first one cannot resolve the band: a band of only 1–3 texture windows, or with
 * noise, mixes rim and core in nearly every window of the default size, so the two classes do not
 * separate (reported "not detected") or the boundary is placed coarsely. The second pass runs only
 * then (no cost on ordinary images) and is taken only when it finds a separable band that is
 * indeed narrow for the first window; otherwise the first pass stands as it was.
 */
import type { Scale } from '../../calibrate/index.js';
import type { GrayRaster } from '../../image/raster.js';
import { suppressGlints } from '../../segment/index.js';
import { oncePerRaster } from '../../segment/memo.js';
import { removeScanLines, type ScanLineRemoval } from '../../segment/scanLines.js';
import { buildRayIndex, castRay } from '../../measure/geometry.js';
import { medianOf } from '../../measure/statistics.js';
import type { FeatureName } from '../../texture/index.js';
import { warn, type Warning } from '../../warnings.js';
import type { WorkingFrame } from '../frame.js';
import { classifyTexture, type Classification } from './classify.js';
import type { SpecimenLocation } from './locateSpecimen.js';
import { refineRimBoundary, type RimBoundary } from './refineBoundary.js';
import { computeTexture, REGION_MARGIN_PX, specimenBox, textureWindow, type TextureMaps, type TextureWindow } from './texture.js';

/** Input of {@link findRimBoundary}. */
export interface BandInput {
  frame: WorkingFrame;
  scale: Scale;
  location: SpecimenLocation;
  /** The first pass's window (given by the user or the default rule). */
  window: TextureWindow;
  features: readonly FeatureName[];
  nRays: number;
  /** False when the user gave the window: then it is used alone (default true). */
  allowSecondPass?: boolean;
}

/** Output of {@link findRimBoundary}. */
export interface BandFinding {
  boundary: RimBoundary;
  /** The window of the pass whose boundary is used. */
  window: TextureWindow;
  /** Warnings of the classification (of the pass used) and of the choice of pass. */
  warnings: Warning[];
  /** 1 or 2. */
  pass: 1 | 2;
  /** Texture maps and classification of the pass used (for the parameter range, stages/uncertainty.ts). */
  texture: TextureMaps;
  classification: Classification;
}

/** A first-pass band narrower than this many windows (median over the rays) is looked at again. */
export const NARROW_BAND_WINDOWS = 2;
/** The second pass's window as a fraction of the first (our choice: 40–60 µm against the default ~100 µm resolved the rendered 1.2–1.5-window bands). */
export const SECOND_PASS_WINDOW_FRACTION = 0.5;
/** The second pass's band must be narrower than this many first-pass windows to be taken. */
const SECOND_PASS_MAX_WINDOWS = 2.5;

/** One pass: texture, classification and refined boundary at one window, on `source` (the working copy, glints suppressed). */
function pass(input: BandInput, window: TextureWindow, source: GrayRaster, missing: Uint8Array | null): { boundary: RimBoundary; warnings: Warning[]; texture: TextureMaps; classification: Classification } {
  const texture = computeTexture({ frame: input.frame, window, features: input.features, source, region: specimenBox(input.location, REGION_MARGIN_PX) });
  const classification = classifyTexture({ location: input.location, texture });
  const boundary = refineRimBoundary({ frame: input.frame, location: input.location, classification, window, nRays: input.nRays, source, missing });
  return { boundary, warnings: classification.warnings, texture, classification };
}

/** Median band width (full-resolution px) over 360 rays, or null. */
export function medianBandWidthPx(outer: readonly { x: number; y: number }[], boundary: readonly { x: number; y: number }[], center: { x: number; y: number }): number | null {
  const oIdx = buildRayIndex(outer, center);
  const bIdx = buildRayIndex(boundary, center);
  const w: number[] = [];
  for (let k = 0; k < 360; k++) {
    const ho = castRay(oIdx, k);
    const hb = castRay(bIdx, k);
    if (ho.length && hb.length) w.push(ho[ho.length - 1] - hb[hb.length - 1]);
  }
  return w.length ? medianOf(w) : null;
}

/**
 * The rim/core boundary: the first pass at the given window; a second pass at
 * SECOND_PASS_WINDOW_FRACTION of it when the first found no band, or a band narrower than
 * NARROW_BAND_WINDOWS windows. The second pass is used when it detects a separable band (the
 * classification's own refusal rules) narrower than SECOND_PASS_MAX_WINDOWS first-pass windows, and,
 * when the first pass had found a band, with a higher Fisher ratio than the first; the
 * result then says so (`FINER_WINDOW_USED`) and reports the finer window.
 */
export function findRimBoundary(input: BandInput): BandFinding {
  // scan lines of an SEM image out first (once per working copy: both halves share it), then glints
  const lines = oncePerRaster(SCAN_LINES, input.frame.work, '', () => removeScanLines(input.frame.work));
  const glints = suppressGlints(lines.raster, input.location.specimen.mask);
  const source = glints.raster;
  const before: Warning[] = [];
  if (lines.removed) before.push(warn('SCAN_LINES_REMOVED', `scan-line noise was found (line offsets ${lines.ratio.toFixed(0)}× what texture alone gives, σ ${lines.offsetSigma.toFixed(3)} of full scale) and removed before the texture was measured`));
  if (glints.fraction > 0) before.push(warn('GLINTS_SUPPRESSED', `bright specks (glints) on ${(100 * glints.fraction).toFixed(1)} % of the specimen were replaced by their surroundings before the texture was measured`));
  const found = findOnSource(input, source, glints.mask);
  return { ...found, warnings: [...before, ...found.warnings] };
}

/** Scan-line removal per working copy (segment/memo.ts). */
const SCAN_LINES = new WeakMap<GrayRaster, Map<string, ScanLineRemoval>>();

function findOnSource(input: BandInput, source: GrayRaster, missing: Uint8Array | null): BandFinding {
  const first = pass(input, input.window, source, missing);
  if (input.allowSecondPass === false) return { ...first, window: input.window, pass: 1 };
  const W1 = input.window.windowPxFull;
  const width1 = first.boundary.detected && first.boundary.polygon ? medianBandWidthPx(input.location.outer, first.boundary.polygon, input.location.center) : null;
  const narrow = width1 !== null && width1 < NARROW_BAND_WINDOWS * W1;
  if (first.boundary.detected && !narrow) return { ...first, window: input.window, pass: 1 };
  const window2 = textureWindow({ frame: input.frame, scale: input.scale, location: input.location, windowUm: input.window.windowUm * SECOND_PASS_WINDOW_FRACTION, features: input.features });
  if (window2.windowPxWork >= input.window.windowPxWork) return { ...first, window: input.window, pass: 1 };
  const second = pass(input, window2, source, missing);
  const width2 = second.boundary.detected && second.boundary.polygon ? medianBandWidthPx(input.location.outer, second.boundary.polygon, input.location.center) : null;
  if (width2 === null || !(width2 < SECOND_PASS_MAX_WINDOWS * W1)) return { ...first, window: input.window, pass: 1 };
  // a band the first pass found stays unless the finer window separates rim and core better
  const f1 = first.boundary.separability?.fisher ?? 0;
  const f2 = second.boundary.separability?.fisher ?? 0;
  if (first.boundary.detected && !(f2 > f1)) return { ...first, window: input.window, pass: 1 };
  const why = first.boundary.detected
    ? `the band found (median ${(width1! / W1).toFixed(1)} windows of ${input.window.windowUm.toFixed(0)} µm) is narrow for the texture window`
    : `no band separated with the ${input.window.windowUm.toFixed(0)} µm texture window`;
  return {
    boundary: second.boundary,
    window: window2,
    texture: second.texture,
    classification: second.classification,
    warnings: [...second.warnings, warn('FINER_WINDOW_USED', `${why}: the band was found again with a ${window2.windowUm.toFixed(0)} µm window (${(width2 / window2.windowPxFull).toFixed(1)} of its windows wide)`)],
    pass: 2,
  };
}
