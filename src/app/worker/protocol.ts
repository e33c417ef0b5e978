/**
 * Messages between the UI thread and the engine worker. Every request carries an `id`; the worker
 * answers once with `{ id, ok, value | error }` and may send `{ type: 'progress', id, stage, fraction }`
 * before. Everything is structured-clone data (typed arrays are transferred).
 */
import type { MeasureParams, PointPx } from '../../core/pipeline/types.js';

export interface EngineCapabilities {
  decode: boolean;
  calibrate: boolean;
  texture: boolean;
  pipeline: boolean;
  render: boolean;
}

export interface ScaleBarInfo {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
  lengthPx: number;
  confidence: number;
  /** Length read from the label next to the bar, µm, when the detector provides it. */
  lengthUm?: number | null;
}

export interface OpenedImage {
  docId: string;
  name: string;
  sha256: string;
  format: string;
  widthPx: number;
  heightPx: number;
  bitDepth: number;
  channels: number;
  /** µm per pixel from file metadata, or null. */
  metadataUmPerPx: number | null;
  /** 8-bit RGBA preview at full resolution (gray replicated). */
  rgba: Uint8ClampedArray;
}

/** Geometry the app can edit and send back for a fast re-measure (pixel coordinates). */
export interface GeometryOverride {
  outerPolygon?: PointPx[];
  center?: PointPx;
}

export interface AnalysisGeometry {
  outerPolygon: PointPx[];
  boundaryPolygon: PointPx[];
  center: PointPx;
  umPerPx: number | null;
  scaleSource: string | null;
}

export interface AnalyseReply {
  result: Record<string, unknown>;
  geometry: AnalysisGeometry;
}

export type EngineRequest =
  | { type: 'status' }
  | { type: 'cvSelfTest' }
  | { type: 'open'; docId: string; name: string; bytes: ArrayBuffer; maxPixels?: number }
  | { type: 'close'; docId: string }
  | { type: 'detectBar'; docId: string }
  | { type: 'analyse'; docId: string; params: MeasureParams }
  | { type: 'remeasure'; docId: string; params: MeasureParams; geometry?: GeometryOverride }
  | { type: 'texture'; docId: string; feature: string; windowPx: number }
  | { type: 'renderSample'; seed?: number };

export interface EngineReplies {
  status: { cvReady: boolean; capabilities: EngineCapabilities };
  cvSelfTest: { output: number[]; cvVersion: string };
  open: OpenedImage;
  close: null;
  detectBar: ScaleBarInfo | null;
  analyse: AnalyseReply;
  remeasure: AnalyseReply;
  texture: { width: number; height: number; values: Uint8Array; min: number; max: number };
  renderSample: { name: string; bytes: ArrayBuffer; truth: unknown };
}

export type RequestMessage = { id: number } & EngineRequest;

export type ResponseMessage =
  | { type: 'progress'; id: number; stage: string; fraction: number }
  | { type: 'reply'; id: number; ok: true; value: unknown }
  | { type: 'reply'; id: number; ok: false; error: { code: string; message: string } };
