/**
 * The document model of the web app: one `Doc` per open image, and the `Series` the open images
 * belong to (its material and analysis settings apply to every image that does not override them).
 * Plain immutable data (no React, no Konva, no worker): every edit replaces fields, so undo/redo can
 * keep the previous values. Coordinates are image pixels (pixel centres at integer x, y; x right,
 * y down); lengths a user types are in µm.
 */
import { DEFAULT_FEATURES, type FeatureName, type Material, type MeasureResult, type MetadataScale, type PointPx, type ScaleBar } from '../../core/index.js';
import { emptyHistory, type History } from './history.js';

/** What the image file is (never edited). */
export interface ImageInfo {
  name: string;
  sha256: string;
  widthPx: number;
  heightPx: number;
  format: string;
  bitDepth: number;
  metadataScale: MetadataScale | null;
  metadataNote: string | null;
}

/** The scale the user chose for an image. Exactly one is active and it is always shown. */
export type ScaleChoice =
  | { source: 'none' }
  | { source: 'metadata' }
  | { source: 'typed'; umPerPx: number }
  | { source: 'two-point'; p0: PointPx; p1: PointPx; distanceUm: number }
  | { source: 'scale-bar'; barLengthUm: number };

/** Analysis settings (series defaults, or one image's own). */
export interface AnalysisSettings {
  /** Texture window side, µm; null = automatic (core's rule). */
  windowUm: number | null;
  features: FeatureName[];
  nRays: number;
  dropOutliers: boolean;
  outlierK: number;
  bootstrap: number;
  seed: number;
}

/** A typed value with its optional standard deviation (engine units). */
export interface TypedValue {
  value: number;
  sd: number | null;
}

/** Material inputs: a material sheet (one material chosen) and/or typed values that override it. */
export interface MaterialForm {
  sheet: { file: string; materials: Material[]; chosen: string } | null;
  /** K_c, MPa·√m. */
  toughness: TypedValue | null;
  /** σ0, MPa. */
  strength: TypedValue | null;
  /** Typed strain-rate law L = A·ε̇^B (A in µm, ε̇ in 1/s; either may still be missing); replaces the sheet's L law. */
  rateLaw: { A: number | null; B: number | null } | null;
  reference: 'L' | 'L/2' | '2L';
  tolerancePct: number;
}

/** Label classes of teach mode (the values of a label image): 1 outside the fracture surface, 2 rim band, 3 core. */
export type LabelClass = 1 | 2 | 3;

/** One brush stroke of teach mode: a polyline painted with a disc of `radiusPx` (image px). */
export interface LabelStroke {
  cls: LabelClass;
  radiusPx: number;
  points: PointPx[];
}

/** A pixel model the series is measured with: its name (file or where it was taught), file SHA-256 and file text (the engine holds it loaded; sessions carry the text). */
export interface ModelInUse {
  name: string;
  sha256: string;
  text: string;
}

/** The result of a full run ("Find boundary"), the base every later result is recomputed from. */
export interface Analysis {
  /** Identity of this run (results computed from it carry it in their key). */
  id: number;
  result: MeasureResult;
}

/** A message about one image, shown beside what it concerns. */
export interface Message {
  area: MessageArea;
  level: 'error' | 'warning' | 'info';
  text: string;
}
export type MessageArea = 'image' | 'scale' | 'analysis' | 'edit' | 'material' | 'save' | 'session' | 'texture' | 'teach';

/** One open image: what it is, its inputs (with history) and its current result. */
export interface Doc {
  id: string;
  image: ImageInfo;
  /** The detected scale bar: undefined = not looked for yet, null = none found. */
  bar: ScaleBar | null | undefined;
  // inputs (edited through actions, with history)
  scale: ScaleChoice;
  /** This image's own settings, or null for the series settings. */
  settings: AnalysisSettings | null;
  /** This image's own material inputs, or null for the series material. */
  material: MaterialForm | null;
  strainRatePerS: number | null;
  /** Excluded angular sectors, degrees [from, to] (project convention, wrap allowed). */
  exclude: [number, number][];
  /** Boundary corrected by hand (px), or null for the automatic one of the base run. */
  boundary: PointPx[] | null;
  /** Outer edge corrected by hand (px), or null for the one of the base run. */
  outline: PointPx[] | null;
  /** Net-section diameter from the specimen drawing, µm (typed in mm), or null when not known. */
  sectionDiameterUm: number | null;
  /** Teach-mode strokes painted on this image (oldest first; a later stroke paints over an earlier one). */
  labels: LabelStroke[];
  /** The last full run. */
  base: Analysis | null;
  // derived from the inputs by the engine (no history)
  result: MeasureResult | null;
  /** The inputs `result` belongs to (see results.ts); the result is current only when they match. */
  resultKey: string | null;
  /** Inputs for which only a full run gives numbers, and why. */
  fullRun: { key: string; reason: string } | null;
  /** Inputs the engine refused, and why (e.g. no scale). */
  refused: { key: string; message: string } | null;
  /** Why the material was left out of the result, when it was. */
  materialError: string | null;
  busy: 'analysing' | null;
  messages: Message[];
  history: History<DocPatch>;
}

/** Fields an edit may change. */
export type DocPatch = Partial<Omit<Doc, 'id' | 'image' | 'history'>>;

/** Series-level inputs: material and analysis settings for every image that does not override them. */
export interface Series {
  material: MaterialForm;
  settings: AnalysisSettings;
  /** The pixel model every image is measured with, or null for the fixed rules. */
  model: ModelInUse | null;
  history: History<SeriesPatch>;
}
export type SeriesPatch = Partial<Omit<Series, 'history'>>;

/** Analysis settings equal to core's defaultParams (automatic window, 360 rays, seed 1). */
export function defaultSettings(): AnalysisSettings {
  return { windowUm: null, features: [...DEFAULT_FEATURES], nRays: 360, dropOutliers: false, outlierK: 3.5, bootstrap: 2000, seed: 1 };
}

/** No material (no comparison until one is given), reference L, tolerance 20 %. */
export function emptyMaterial(): MaterialForm {
  return { sheet: null, toughness: null, strength: null, rateLaw: null, reference: 'L', tolerancePct: 20 };
}

export function newSeries(): Series {
  return { material: emptyMaterial(), settings: defaultSettings(), model: null, history: emptyHistory() };
}

/** A new document for an opened image; the file's metadata scale is the initial scale when it has one. */
export function newDoc(id: string, image: ImageInfo): Doc {
  return {
    id,
    image,
    bar: undefined,
    scale: image.metadataScale ? { source: 'metadata' } : { source: 'none' },
    settings: null,
    material: null,
    strainRatePerS: null,
    exclude: [],
    boundary: null,
    outline: null,
    sectionDiameterUm: null,
    labels: [],
    base: null,
    result: null,
    resultKey: null,
    fullRun: null,
    refused: null,
    materialError: null,
    busy: null,
    messages: [],
    history: emptyHistory(),
  };
}

/** The settings an image uses. */
export function settingsOf(doc: Doc, series: Series): AnalysisSettings {
  return doc.settings ?? series.settings;
}

/** The material inputs an image uses. */
export function materialOf(doc: Doc, series: Series): MaterialForm {
  return doc.material ?? series.material;
}

/** The boundary in use (px): the corrected one, else the automatic one of the base run. */
export function boundaryOf(doc: Doc): PointPx[] | null {
  return doc.boundary ?? doc.base?.result.band.boundary?.polygon ?? null;
}

/** The outer edge in use (px): the corrected one, else the one of the base run. */
export function outlineOf(doc: Doc): PointPx[] | null {
  return doc.outline ?? doc.base?.result.specimen.outline ?? null;
}

/** One closed edge the outline search considered (core's result, `specimen.edgeSearch.candidates`). */
export type EdgeCandidate = NonNullable<MeasureResult['specimen']['edgeSearch']>['candidates'][number];

/** The closed edges the base run chose its outline from (none when it did not search). */
export function edgeCandidatesOf(doc: Doc): EdgeCandidate[] {
  return doc.base?.result.specimen.edgeSearch?.candidates ?? [];
}

/** The centre of the rays (px): of the current result, else of the base run. */
export function centreOf(doc: Doc): PointPx | null {
  return (doc.result ?? doc.base?.result)?.specimen.center ?? null;
}
