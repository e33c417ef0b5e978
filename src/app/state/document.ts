/**
 * The document model of the web app: one `Doc` per opened image. Plain data only (no React, no
 * Konva, no worker); every edit is a patch on a Doc so undo/redo can keep inverse deltas.
 * Coordinates are image pixels (pixel centres at integer x, y; x right, y down).
 */
import type { ScaleBarInfo } from '../worker/protocol.js';
import type { PointPx } from '../../core/pipeline/types.js';

/** Specimen outline as an ellipse, px; `angleDeg` follows the project convention (CCW on screen). */
export interface Outline {
  cx: number;
  cy: number;
  rx: number;
  ry: number;
  angleDeg: number;
}

/** The detected bar as the worker reports it (see worker/protocol.ts). */
export type BarInfo = ScaleBarInfo;

/** The active scale source. Only one is active at a time and it is always shown. */
export type ScaleChoice =
  | { source: 'none' }
  | { source: 'metadata'; umPerPx: number }
  | { source: 'typed'; umPerPx: number }
  | { source: 'two-point'; p0: PointPx; p1: PointPx; distanceUm: number }
  | { source: 'scale-bar'; bar: BarInfo | null; barLengthUm: number };

export interface MaterialForm {
  name: string;
  /** A material record read from a material sheet (passed whole to the engine), or null. */
  sheet: import('../../core/tcd/materials.js').Material | null;
  toughnessMPaSqrtM: number | null;
  toughnessSdMPaSqrtM: number | null;
  strengthMPa: number | null;
  strengthSdMPa: number | null;
  strainRatePerS: number | null;
  /** Power law L(ε̇) = A·ε̇^B (µm) — optional dynamic law; both null = static values. */
  rateLawA: number | null;
  rateLawB: number | null;
  reference: 'L' | 'L/2' | '2L';
  tolerancePct: number;
}

export interface AnalysisSettings {
  /** Texture window side, µm; null = automatic. */
  windowUm: number | null;
  features: string[];
  nRays: number;
  dropOutliers: boolean;
  outlierK: number;
  bootstrap: number;
  seed: number;
}

export interface Doc {
  id: string;
  name: string;
  sha256: string;
  widthPx: number;
  heightPx: number;
  format: string;
  bitDepth: number;
  metadataUmPerPx: number | null;
  scale: ScaleChoice;
  settings: AnalysisSettings;
  material: MaterialForm;
  /** Outline from the automatic analysis (polygon, px) and its ellipse form for editing. */
  outerPolygon: PointPx[] | null;
  outline: Outline | null;
  /** True once the user moved the outline (then it is sent as an override on re-measure). */
  outlineEdited: boolean;
  /** Boundary between rim and core (polygon, px); null before analysis. */
  boundary: PointPx[] | null;
  /** True once the boundary was edited by hand (sent as `boundaryPolygon`). */
  boundaryEdited: boolean;
  /** Excluded angular sectors, degrees [from, to] (project convention, wrap allowed). */
  exclude: [number, number][];
  /** Latest result (schema fractozone.result/1) from the engine, and whether it is up to date. */
  result: Record<string, unknown> | null;
  resultStale: boolean;
  status: 'opened' | 'analysing' | 'analysed' | 'error';
  error: string | null;
}

/** Analysis settings equal to core's defaultParams (automatic window, 360 rays, seed 1). */
export function defaultSettings(): AnalysisSettings {
  return {
    windowUm: null,
    features: ['localStd', 'localEntropy', 'gradientEnergy'],
    nRays: 360,
    dropOutliers: false,
    outlierK: 3.5,
    bootstrap: 2000,
    seed: 1,
  };
}

/** Empty material form (no comparison until K_c and σ0 are typed), reference L, tolerance 20 %. */
export function defaultMaterial(): MaterialForm {
  return {
    name: '',
    sheet: null,
    toughnessMPaSqrtM: null,
    toughnessSdMPaSqrtM: null,
    strengthMPa: null,
    strengthSdMPa: null,
    strainRatePerS: null,
    rateLawA: null,
    rateLawB: null,
    reference: 'L',
    tolerancePct: 20,
  };
}

/** A new document for an opened image; the metadata scale (µm/px) is the initial scale when present. */
export function newDoc(init: {
  id: string;
  name: string;
  sha256: string;
  widthPx: number;
  heightPx: number;
  format?: string;
  bitDepth?: number;
  metadataUmPerPx?: number | null;
}): Doc {
  const meta = init.metadataUmPerPx ?? null;
  return {
    id: init.id,
    name: init.name,
    sha256: init.sha256,
    widthPx: init.widthPx,
    heightPx: init.heightPx,
    format: init.format ?? 'unknown',
    bitDepth: init.bitDepth ?? 8,
    metadataUmPerPx: meta,
    scale: meta ? { source: 'metadata', umPerPx: meta } : { source: 'none' },
    settings: defaultSettings(),
    material: defaultMaterial(),
    outerPolygon: null,
    outline: null,
    outlineEdited: false,
    boundary: null,
    boundaryEdited: false,
    exclude: [],
    result: null,
    resultStale: false,
    status: 'opened',
    error: null,
  };
}

/** µm per pixel of the active scale, when the app knows it (the scale-bar length needs the bar). */
export function umPerPxOf(doc: Doc): number | null {
  const s = doc.scale;
  switch (s.source) {
    case 'none':
      return null;
    case 'metadata':
    case 'typed':
      return s.umPerPx;
    case 'two-point': {
      const d = Math.hypot(s.p1.x - s.p0.x, s.p1.y - s.p0.y);
      return d > 0 ? s.distanceUm / d : null;
    }
    case 'scale-bar':
      return s.bar && s.bar.lengthPx > 0 ? s.barLengthUm / s.bar.lengthPx : null;
  }
}

/** Plain words for the active scale source, always shown in the UI. */
export function describeScale(doc: Doc): string {
  const u = umPerPxOf(doc);
  const v = u === null ? '' : ` — ${fmtNum(u)} µm/px`;
  switch (doc.scale.source) {
    case 'none':
      return 'no scale set (lengths in px only)';
    case 'metadata':
      return `from file metadata${v}`;
    case 'typed':
      return `typed pixel size${v}`;
    case 'two-point':
      return `two points, ${fmtNum(doc.scale.distanceUm)} µm apart${v}`;
    case 'scale-bar':
      return `scale bar of ${fmtNum(doc.scale.barLengthUm)} µm${doc.scale.bar ? '' : ' (bar not found yet)'}${v}`;
  }
}

/** Number with 4 significant digits, plain notation. */
export function fmtNum(v: number, digits = 4): string {
  if (!Number.isFinite(v)) return '—';
  return Number(v.toPrecision(digits)).toString();
}
