/**
 * Messages between the UI thread and the engine worker. Every request carries an `id`; the worker
 * answers once with `{ id, ok, value | error }` and may send `{ type: 'progress', id, stage, fraction }`
 * before. Results are core's `MeasureResult`; everything is structured-clone data (typed arrays
 * are transferred).
 */
import type { FeatureName, MeasureParams, MeasureResult, MetadataScale, ModelTraining, PointPx, ScaleBar, ScaleParams } from '../../core/index.js';
import type { LabelStroke } from '../state/document.js';

/** An opened image as the UI needs it. */
export interface OpenedImage {
  docId: string;
  name: string;
  sha256: string;
  format: string;
  widthPx: number;
  heightPx: number;
  bitDepth: number;
  channels: number;
  pageCount: number;
  /** Pixel size from the file's metadata (TIFF resolution, PNG pHYs), or null. */
  metadataScale: MetadataScale | null;
  /** Why the metadata gave no scale, when it says so. */
  metadataNote: string | null;
  /** 8-bit RGBA preview at full resolution (gray replicated). */
  rgba: Uint8ClampedArray;
}

/** A texture map for display: values scaled to 0..255 between the map's min and max. */
export interface TextureMap {
  width: number;
  height: number;
  values: Uint8Array;
  windowPx: number;
  min: number;
  max: number;
}

/** Outcome of a recompute: the result (and why the material was left out, if it was), or a full run is needed. */
export type RecomputeReply = { kind: 'result'; result: MeasureResult; materialError: string | null } | { kind: 'full-run'; reason: string };

/** A pixel model the engine holds (taught from strokes or read from a file). */
export interface ModelInfo {
  /** The model file's text (fractozone.model/1) and the SHA-256 of its UTF-8 bytes. */
  text: string;
  sha256: string;
  training: ModelTraining;
  /** Feature windows, µm. */
  windowsUm: number[];
  /** Time the engine took, ms. */
  ms: number;
}

/** The class map of one image (1 outside, 2 rim band, 3 core per working-copy pixel). */
export interface ClassMapView {
  width: number;
  height: number;
  values: Uint8Array;
  /** Grid spacing the forest was evaluated at, working px. */
  stride: number;
  ms: number;
}

/** One image to teach from: its strokes and the scale it is measured with. */
export interface TeachInput {
  docId: string;
  scale: ScaleParams;
  strokes: LabelStroke[];
}

export type EngineRequest =
  | { type: 'init' }
  | { type: 'open'; docId: string; name: string; bytes: ArrayBuffer }
  | { type: 'close'; docId: string }
  | { type: 'detectBar'; docId: string }
  | { type: 'analyse'; docId: string; params: MeasureParams }
  | { type: 'recompute'; base: MeasureResult; params: MeasureParams; outline: PointPx[] | null }
  | { type: 'texture'; docId: string; feature: FeatureName; windowPx: number }
  | { type: 'overlay'; docId: string; result: MeasureResult }
  | { type: 'teach'; images: TeachInput[] }
  | { type: 'loadModel'; bytes: ArrayBuffer }
  | { type: 'classMap'; docId: string; scale: ScaleParams; sha256: string }
  /** Makes an image ready for teach mode ahead of the strokes (working copy, feature tables, the class-map grid's features; `windowsUm` null: the image's default windows). */
  | { type: 'prepareTeach'; docId: string; scale: ScaleParams; windowsUm: number[] | null };

export interface EngineReplies {
  init: { selfTestPassed: boolean };
  open: OpenedImage;
  close: null;
  detectBar: ScaleBar | null;
  analyse: MeasureResult;
  recompute: RecomputeReply;
  texture: TextureMap;
  /** PNG bytes of the overlay drawn from the result. */
  overlay: Uint8Array;
  teach: ModelInfo;
  loadModel: ModelInfo;
  classMap: ClassMapView;
  prepareTeach: { ms: number };
}

export type RequestType = EngineRequest['type'];
export type RequestOf<K extends RequestType> = Extract<EngineRequest, { type: K }>;
export type RequestMessage = { id: number } & EngineRequest;

export type ResponseMessage =
  | { type: 'progress'; id: number; stage: string; fraction: number }
  | { type: 'reply'; id: number; ok: true; value: EngineReplies[RequestType] }
  | { type: 'reply'; id: number; ok: false; error: { code: string; message: string } };
