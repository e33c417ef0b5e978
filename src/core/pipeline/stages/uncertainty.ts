/**
 * Stage 6b, uncertainty: the three intervals of the band's mean width (result.ts `BandUncertainty`).
 *
 * - Measurement interval (measure/uncertainty.ts): placement of the boundary and of the outer edge
 *   (random part from the residual profile with its correlation length, systematic part below) and
 *   the scale.
 * - Circumferential interval: the existing interval of the mean of w(θ) (`widthUm.ci95`).
 * - Parameter range: the mean re-measured with the method varied, on the stored working copy —
 *   texture window ×0.7 and ×1.4 (features, classification, refinement again), each feature left
 *   out in turn (classification and refinement again, the other maps reused), and the boundary
 *   level at either end of its tolerance (refinement only; segment/refine.ts `level`: the
 *   log-variance and the standard-deviation midpoints whose mean is the level used; for a tone
 *   boundary 40 % and 60 % of the brightness step, `BOX_LEVEL_TOLERANCE`). The range is
 *   [min, max] over the variations and the mean itself.
 *
 * Systematic parts (standard uncertainties common to every ray):
 * - automatic boundary: √(({@link BOUNDARY_FLOOR_WORK_PX} working px)² + h²), h = half the spread of
 *   the mean between the two level ends (an image whose boundary is a soft blend has a larger h);
 *   the floor is the residual bias of the step fit measured on two independent generators
 *   (segment/stepLevel.ts, `stepLevel`: within ≈ 0.3 working px), taken as its standard uncertainty;
 * - a boundary drawn by a person: {@link MANUAL_BOUNDARY_SD_PX} full-resolution px (assumption);
 * - outer edge: {@link OUTER_FLOOR_PX} full-resolution px (sub-pixel edge on the lightly smoothed
 *   intensity; assumption, see DEVELOPERS.md).
 */
import { toneOnly, windowPxFromUm } from '../../texture/index.js';
import { BOX_LEVEL_TOLERANCE } from '../../segment/stepLevel.js';
import { localisationTerm, measurementInterval, scaleRelativeSd, type LocalisationTerm } from '../../measure/uncertainty.js';
import type { BoxPx } from '../../image/geometry.js';
import type { Scale } from '../../calibrate/index.js';
import type { WorkingFrame } from '../frame.js';
import { round } from '../precision.js';
import type { BandUncertainty, LocalisationBudget, ParameterVariation, ResultBand, ResultScale } from '../result.js';
import type { MeasureParams } from '../types.js';
import { classifyTexture, type Classification } from './classify.js';
import type { SpecimenLocation } from './locateSpecimen.js';
import { measureWidths, minWidthPxFor } from './measure.js';
import { refineRimBoundary } from './refineBoundary.js';
import { computeTexture, REGION_MARGIN_PX, specimenBox, type FeatureMap, type TextureMaps, type TextureWindow } from './texture.js';
import { createRaster, type GrayRaster } from '../../image/raster.js';
import { storedGeometry } from './assemble.js';
import { oncePerRaster } from '../../segment/memo.js';

/** Why a boundary given by a person has no parameter range. */
export const MANUAL_RANGE_NOTE = 'a boundary given by a person: no method to vary';

/** Systematic placement uncertainty of an automatic boundary, working-copy px (see the module note). */
export const BOUNDARY_FLOOR_WORK_PX = 0.3;
/** Systematic placement uncertainty of a drawn boundary, full-resolution px (assumption). */
export const MANUAL_BOUNDARY_SD_PX = 1;
/** Systematic placement uncertainty of the outer edge, full-resolution px (assumption). */
export const OUTER_FLOOR_PX = 0.3;

/** What the method variations are run on (the automatic branch's stage outputs). */
export interface VariationInput {
  frame: WorkingFrame;
  scale: Scale;
  location: SpecimenLocation;
  window: TextureWindow;
  texture: TextureMaps;
  classification: Classification;
  marks: readonly BoxPx[];
  params: MeasureParams;
}

/**
 * Rays of the variation runs: each variation is compared with a baseline run on the same rays, so
 * only the shift counts; a third of the usual 360 keeps the stage cheap.
 */
export const VARIATION_RAYS = 120;

const pct = (f: number): string => `${Math.round(100 * f)} %`;

/** The boundary was classified on tone features only (stages/band.ts took the tone cue). */
const toneCue = (v: VariationInput): boolean => toneOnly(v.texture.maps.map((m) => m.name));

/** Mean width of the band measured on a refined boundary of one variation ({@link VARIATION_RAYS} rays), or null. */
function variationMean(v: VariationInput, classification: Classification, window: TextureWindow, level: 'mean' | 'log' | 'std', rays = VARIATION_RAYS): number | null {
  const full = rays !== VARIATION_RAYS;
  // classified on tone features (stages/band.ts took the tone cue): refined on brightness, as the measurement was
  const cue = toneCue(v) ? 'tone' : 'texture';
  const boundary = refineRimBoundary({ frame: v.frame, location: v.location, classification, window, nRays: full ? v.params.nRays : rays, exactRays: full ? undefined : rays, level, cue });
  if (!boundary.polygon) return null;
  const geometry = storedGeometry(v.location, boundary, v.marks);
  const m = measureWidths({
    geometry,
    umPerPx: { x: v.scale.umPerPxX, y: v.scale.umPerPxY },
    imageSize: v.frame.fullSize,
    minWidthPx: minWidthPxFor('auto', window.windowPxFull),
    params: { ...v.params, nRays: full ? v.params.nRays : rays, bootstrap: 0 },
  });
  const s = m.profile?.stats;
  return s && s.n > 0 && Number.isFinite(s.mean) ? s.mean : null;
}

/** Working px per feature px of the variations' classifications (maps averaged in BIN × BIN blocks). */
export const BIN = 3;

/** Average of each k × k block (the last partial rows/columns dropped): a map at feature scale k. */
export function binned(r: GrayRaster, k: number): GrayRaster {
  const w = Math.floor(r.width / k);
  const h = Math.floor(r.height / k);
  const out = createRaster(w, h);
  const d = r.data;
  const W = r.width;
  const inv = 1 / (k * k);
  if (k === 3) {
    binned3(d, W, w, h, inv, out.data);
    return out;
  }
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      let sum = 0;
      for (let j = 0; j < k; j++) {
        const row = (k * y + j) * W + k * x;
        for (let i = 0; i < k; i++) sum += d[row + i];
      }
      out.data[y * w + x] = sum * inv;
    }
  }
  return out;
}

/**
 * {@link binned} for k = 3, the same sums in the same order (0, then the block's rows top to bottom,
 * each left to right): 1200 × 900 px 6.7 → 2–3 ms against the general loop (load 7).
 */
function binned3(d: Float32Array, W: number, w: number, h: number, inv: number, out: Float32Array): void {
  for (let y = 0; y < h; y++) {
    const r0 = 3 * y * W;
    const r1 = r0 + W;
    const r2 = r1 + W;
    for (let x = 0, c = 0; x < w; x++, c += 3) {
      const sum = 0 + d[r0 + c] + d[r0 + c + 1] + d[r0 + c + 2] + d[r1 + c] + d[r1 + c + 1] + d[r1 + c + 2] + d[r2 + c] + d[r2 + c + 1] + d[r2 + c + 2];
      out[y * w + x] = sum * inv;
    }
  }
}

/** {@link binned} at {@link BIN}, once per map (the baseline and the feature left out share the maps; segment/memo.ts). */
function binnedOnce(r: GrayRaster): GrayRaster {
  return oncePerRaster(BINNED, r, String(BIN), () => binned(r, BIN));
}
const BINNED = new WeakMap<GrayRaster, Map<string, GrayRaster>>();

/**
 * Classification of binned maps (feature scale {@link BIN}): a coarse seed for the refinement on 1/BIN² of the pixels.
 * The per-feature scores are shared between the runs on the same maps (the same numbers, computed once).
 */
function classifyBinned(v: VariationInput, maps: readonly FeatureMap[], brightness: GrayRaster, window: TextureWindow): Classification {
  const texture: TextureMaps = { window, maps: maps.map((m) => ({ name: m.name, raster: binnedOnce(m.raster) })), brightness: binnedOnce(brightness) };
  return classifyTexture({ location: v.location, texture, featureScale: BIN, shareScores: true });
}

/**
 * The method variations of the parameter range (see the module note), in a fixed order. The
 * window and feature variations classify on BIN × BIN-binned feature maps (1/9 of the pixels;
 * the classification only seeds the refinement, which runs on the working copy as always), and
 * each reports the mean plus its shift from a baseline classified the same way, so the binning
 * itself moves nothing; they use {@link VARIATION_RAYS} rays. The level variations refine the
 * classification of the measurement itself on its own rays (their spread h enters the measurement
 * interval, so it is taken at full resolution; the measurement is their middle level).
 */
export function methodVariations(v: VariationInput, meanUm: number): ParameterVariation[] {
  const out: ParameterVariation[] = [];
  const base = variationMean(v, classifyBinned(v, v.texture.maps, v.texture.brightness, v.window), v.window, 'mean');
  const shifted = (name: string, cls: Classification, window: TextureWindow): ParameterVariation => {
    const m = base !== null && cls.rimCore.detected ? variationMean(v, cls, window, 'mean') : null;
    return { name, meanUm: m === null || base === null ? null : meanUm + (m - base) };
  };
  for (const f of [0.7, 1.4]) {
    const windowUm = v.window.windowUm * f;
    const window: TextureWindow = {
      windowUm,
      windowPxWork: windowPxFromUm(windowUm, v.scale.umPerPx * v.frame.lengthScale),
      windowPxFull: windowPxFromUm(windowUm, v.scale.umPerPx),
    };
    // the features the boundary was classified on (the tone cue's when stages/band.ts took it)
    const texture = computeTexture({ frame: v.frame, window, features: v.texture.maps.map((m) => m.name), region: specimenBox(v.location, REGION_MARGIN_PX) });
    out.push(shifted(`window ×${f}`, classifyBinned(v, texture.maps, texture.brightness, window), window));
  }
  if (v.texture.maps.length > 1) {
    for (const left of v.texture.maps) {
      const maps = v.texture.maps.filter((m) => m !== left);
      out.push(shifted(`without ${left.name}`, classifyBinned(v, maps, v.texture.brightness, v.window), v.window));
    }
  }
  // the level ends enter the measurement interval (h): refined on the measurement's own rays
  const rays = Math.max(v.params.nRays, 360);
  const [low, high] = toneCue(v)
    ? [`${pct(0.5 - BOX_LEVEL_TOLERANCE)} of the brightness step`, `${pct(0.5 + BOX_LEVEL_TOLERANCE)} of the brightness step`]
    : ['log-variance midpoint', 'standard-deviation midpoint'];
  out.push({ name: `boundary level: ${low}`, meanUm: variationMean(v, v.classification, v.window, 'log', rays) });
  out.push({ name: `boundary level: ${high}`, meanUm: variationMean(v, v.classification, v.window, 'std', rays) });
  return out;
}

/** How the boundary was found, for its systematic part. */
export type BoundaryOrigin = { kind: 'auto'; workPxUm: number } | { kind: 'manual' } | { kind: 'model'; workPxUm: number };

/** Input of {@link bandUncertainty}. */
export interface UncertaintyInput {
  band: ResultBand;
  scale: Pick<ResultScale, 'source' | 'umPerPx' | 'detectedBar'>;
  params: Pick<MeasureParams, 'scale'>;
  origin: BoundaryOrigin;
  /** The method variations, or null with the reason they were not run. */
  variations: ParameterVariation[] | { none: string };
}

function levelHalfSpread(vs: readonly ParameterVariation[]): number {
  const lv = vs.filter((x) => x.name.startsWith('boundary level')).map((x) => x.meanUm);
  return lv.length === 2 && lv[0] !== null && lv[1] !== null ? Math.abs(lv[0] - lv[1]) / 2 : 0;
}

function roundTerm(t: LocalisationTerm & { sharePct: number }): LocalisationBudget {
  return {
    sdUm: round(t.sdUm, 3),
    randomSdUm: round(t.randomSdUm, 3),
    systematicSdUm: round(t.systematicSdUm, 3),
    perRaySdUm: round(t.perRaySdUm, 3),
    correlationRays: round(t.correlationRays, 2),
    sharePct: round(t.sharePct, 1),
  };
}

function twoPointPx(p: UncertaintyInput['params']): number | null {
  const t = p.scale.twoPoint;
  return t ? Math.hypot(t.p1.x - t.p0.x, t.p1.y - t.p0.y) : null;
}

/** The band's uncertainty block, or undefined when no width was measured. */
export function bandUncertainty(u: UncertaintyInput): BandUncertainty | undefined {
  const w = u.band.widthUm;
  if (!u.band.detected || !w) return undefined;
  const rays = u.band.profile.filter((r) => r.valid && r.outerRadiusUm !== null && r.boundaryRadiusUm !== null);
  const vs = 'none' in u.variations ? null : u.variations;
  const umPx = u.scale.umPerPx;
  const sysB =
    u.origin.kind === 'manual' ? MANUAL_BOUNDARY_SD_PX * umPx : Math.hypot(BOUNDARY_FLOOR_WORK_PX * u.origin.workPxUm, vs ? levelHalfSpread(vs) : 0);
  const boundary = localisationTerm(rays.map((r) => r.boundaryRadiusUm as number), sysB);
  const outer = localisationTerm(rays.map((r) => r.outerRadiusUm as number), OUTER_FLOOR_PX * umPx);
  const scale = scaleRelativeSd({
    source: u.scale.source,
    barLengthPx: u.scale.detectedBar?.lengthPx ?? null,
    twoPointDistancePx: twoPointPx(u.params),
    pixelSizeTolerancePct: u.params.scale.pixelSizeTolerancePct ?? 0.5,
  });
  const mi = measurementInterval(w.mean, boundary, outer, scale);
  const means = vs ? vs.map((x) => x.meanUm).filter((x): x is number => x !== null) : [];
  const range: [number, number] | null = vs ? [round(Math.min(w.mean, ...means), 3), round(Math.max(w.mean, ...means), 3)] : null;
  const b = mi.budget;
  return {
    measurementCi95Um: [round(mi.ci95Um[0], 3), round(mi.ci95Um[1], 3)],
    circumferentialCi95Um: [w.ci95[0], w.ci95[1]],
    parameterRangeUm: range,
    parameterRangeNote: vs
      ? `mean over ${vs.length} method variations (window ×0.7 and ×1.4, each feature left out, boundary level at either end of its tolerance) and the mean itself${vs.some((x) => x.meanUm === null) ? '; variations that found no band are left out' : ''}`
      : (u.variations as { none: string }).none,
    variations: (vs ?? []).map((x) => ({ name: x.name, meanUm: x.meanUm === null ? null : round(x.meanUm, 3) })),
    budget: {
      boundary: roundTerm(b.boundary),
      outerEdge: roundTerm(b.outerEdge),
      scale: { sdUm: round(b.scale.sdUm, 3), relativeSdPct: round(b.scale.relativeSdPct, 3), sharePct: round(b.scale.sharePct, 1), detail: b.scale.detail },
      combinedSdUm: round(b.combinedSdUm, 3),
      coverageFactor: round(b.coverageFactor, 4),
    },
  };
}
