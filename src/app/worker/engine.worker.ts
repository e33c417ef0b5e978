/**
 * The engine worker: loads OpenCV, holds the decoded images, and runs every computation (decode,
 * scale-bar detection, texture maps, the full measurement, recomputation from a stored result,
 * overlay pictures). The UI thread never runs OpenCV or the pipeline. Core is imported statically:
 * the worker runs the same code as the command line.
 */
/// <reference lib="webworker" />
import { analyseDecoded, computeFeature, decodeImage, detectScaleBar, encodeOverlayPng, isFractozoneError, recompute, resultOverlay, setCv, type DecodedImage, type GrayRaster, type MeasureParams, type MeasureResult, type PointPx } from '../../core/index.js';
import { classMap, loadModel, MAX_GRID_POINTS, parseModel, predictProbabilities, prepareImage, serialiseModel, teachModel, type LoadedModel, type PixelModel, type PreparedImage, type ScaleParams } from '../../core/index.js';
import { fitEllipseToPoints } from '../../core/segment/fit.js';
import { rasteriseStrokes } from '../state/labels.js';
import { asOpenCv, loadCvInWorker } from './loadCv.js';
import type { ClassMapView, EngineReplies, ModelInfo, RecomputeReply, RequestMessage, RequestOf, RequestType, ResponseMessage, TextureMap } from './protocol.js';

const scope = self as unknown as DedicatedWorkerGlobalScope;

function post(msg: ResponseMessage, transfer: Transferable[] = []): void {
  scope.postMessage(msg, transfer);
}

/** A refusal with a stable code, as core's errors carry. */
class EngineError extends Error {
  constructor(
    readonly code: string,
    message: string,
  ) {
    super(message);
  }
}

interface OpenImage {
  name: string;
  sha256: string;
  decoded: DecodedImage;
}
const images = new Map<string, OpenImage>();

/** Pixel models by the SHA-256 of their file text (taught here or read from a file). */
const models = new Map<string, LoadedModel>();

/**
 * Each image made ready for teaching and class maps (core learn/prepared.ts), for the scale it was
 * made with: working copy, centre, feature tables and the features of the class-map grid are made
 * once per image (and window set), so a stroke costs the labelled pixels' features, the forest and
 * its evaluation on the grid.
 */
const prepared = new Map<string, { key: string; image: PreparedImage }>();

/** Forest evaluations of the preview (a coarser grid than `measure` uses, interpolated between). */
const PREVIEW_GRID_POINTS = Math.round(MAX_GRID_POINTS / 4);

let cvPromise: Promise<void> | null = null;
function ensureCv(id: number): Promise<void> {
  if (!cvPromise) {
    cvPromise = loadCvInWorker((stage, fraction) => post({ type: 'progress', id, stage, fraction })).then(({ cv }) => setCv(asOpenCv(cv)));
    cvPromise.catch(() => {
      cvPromise = null;
    });
  }
  return cvPromise;
}

/** OpenCV self-test through core: the ellipse fit of 24 points on a circle of radius 10 px gives 10. */
function selfTest(): boolean {
  const pts: PointPx[] = Array.from({ length: 24 }, (_, i) => ({ x: 50 + 10 * Math.cos((i * Math.PI) / 12), y: 40 + 10 * Math.sin((i * Math.PI) / 12) }));
  const e = fitEllipseToPoints(pts);
  return e !== null && Math.abs(e.semiMajorPx - 10) < 1e-3 && Math.abs(e.semiMinorPx - 10) < 1e-3 && Math.abs(e.cx - 50) < 1e-3;
}

async function sha256Hex(bytes: Uint8Array): Promise<string> {
  const d = await crypto.subtle.digest('SHA-256', bytes.slice().buffer);
  return [...new Uint8Array(d)].map((b) => b.toString(16).padStart(2, '0')).join('');
}

function previewRgba(r: GrayRaster): Uint8ClampedArray {
  const out = new Uint8ClampedArray(r.width * r.height * 4);
  const d = r.data;
  for (let i = 0; i < d.length; i++) {
    const v = d[i] * 255;
    out[4 * i] = out[4 * i + 1] = out[4 * i + 2] = v;
    out[4 * i + 3] = 255;
  }
  return out;
}

function imageOf(docId: string): OpenImage {
  const d = images.get(docId);
  if (!d) throw new EngineError('PROCESSING_FAILED', 'That image is no longer open.');
  return d;
}

function textureMap(raster: GrayRaster, req: RequestOf<'texture'>): TextureMap {
  const w = Math.max(3, Math.round(req.windowPx));
  const windowPx = w % 2 === 1 ? w : w + 1;
  const map = computeFeature(req.feature, raster, windowPx);
  let min = Infinity;
  let max = -Infinity;
  for (const v of map.data) {
    if (Number.isFinite(v)) {
      if (v < min) min = v;
      if (v > max) max = v;
    }
  }
  const span = max > min ? max - min : 1;
  const values = new Uint8Array(map.data.length);
  for (let i = 0; i < values.length; i++) values[i] = Math.round(((map.data[i] - min) / span) * 255);
  return { width: map.width, height: map.height, values, windowPx, min, max };
}

/** Recompute; a material that cannot be applied is left out and its message returned beside the result. */
function recomputeWithMaterial(base: MeasureResult, params: MeasureParams, outline: PointPx[] | null): RecomputeReply {
  try {
    const o = recompute(base, params, outline);
    return o.kind === 'result' ? { ...o, materialError: null } : o;
  } catch (e) {
    if (!params.material || !isFractozoneError(e)) throw e;
    const o = recompute(base, { ...params, material: null }, outline);
    return o.kind === 'result' ? { ...o, materialError: e.message } : o;
  }
}

/** A model kept by its file's SHA-256, described for the UI. */
async function keepModel(model: PixelModel, text: string, t0: number, bytes = new TextEncoder().encode(text)): Promise<ModelInfo> {
  const sha256 = await sha256Hex(bytes);
  models.set(sha256, loadModel(model, sha256));
  return { text, sha256, training: model.training, windowsUm: model.windowsUm, ms: Math.round(performance.now() - t0) };
}

function preparedImage(docId: string, scale: ScaleParams): PreparedImage {
  const key = JSON.stringify(scale);
  const known = prepared.get(docId);
  if (known && known.key === key) return known.image;
  const image = prepareImage(imageOf(docId).decoded, scale);
  prepared.set(docId, { key, image });
  return image;
}

function modelOf(sha256: string): LoadedModel {
  const m = models.get(sha256);
  if (!m) throw new EngineError('BAD_MODEL', 'The pixel model is no longer loaded: open the model file again.');
  return m;
}

type Reply<K extends RequestType> = { value: EngineReplies[K]; transfer?: Transferable[] };
type Handlers = { [K in RequestType]: (msg: RequestOf<K> & { id: number }) => Promise<Reply<K>> };

const handlers: Handlers = {
  async init(msg) {
    await ensureCv(msg.id);
    return { value: { selfTestPassed: selfTest() } };
  },
  async open(msg) {
    post({ type: 'progress', id: msg.id, stage: 'reading image', fraction: 0.1 });
    const bytes = new Uint8Array(msg.bytes);
    if (bytes.length === 0) throw new EngineError('EMPTY_INPUT', 'The file is empty.');
    const sha256 = await sha256Hex(bytes);
    const decoded = decodeImage(bytes);
    images.set(msg.docId, { name: msg.name, sha256, decoded });
    const rgba = previewRgba(decoded.raster);
    const d = decoded;
    const value = { docId: msg.docId, name: msg.name, sha256, format: d.format, widthPx: d.widthPx, heightPx: d.heightPx, bitDepth: d.bitDepth, channels: d.channels, pageCount: d.pageCount, metadataScale: d.metadataScale, metadataNote: d.metadataNote ?? null, rgba };
    return { value, transfer: [rgba.buffer] };
  },
  async close(msg) {
    images.delete(msg.docId);
    prepared.delete(msg.docId);
    return { value: null };
  },
  async detectBar(msg) {
    const img = imageOf(msg.docId);
    await ensureCv(msg.id);
    post({ type: 'progress', id: msg.id, stage: 'looking for the scale bar', fraction: 0.3 });
    return { value: detectScaleBar(img.decoded.raster) };
  },
  async analyse(msg) {
    const img = imageOf(msg.docId);
    await ensureCv(msg.id);
    const progress = (stage: string, fraction: number) => post({ type: 'progress', id: msg.id, stage, fraction });
    const model = msg.params.modelSha256 !== undefined ? modelOf(msg.params.modelSha256) : undefined;
    return { value: analyseDecoded(img.decoded, { file: img.name, sha256: img.sha256 }, msg.params, progress, model ? { model } : {}).result };
  },
  async recompute(msg) {
    await ensureCv(msg.id);
    return { value: recomputeWithMaterial(msg.base, msg.params, msg.outline) };
  },
  async texture(msg) {
    const img = imageOf(msg.docId);
    await ensureCv(msg.id);
    post({ type: 'progress', id: msg.id, stage: 'computing the texture map', fraction: 0.2 });
    const value = textureMap(img.decoded.raster, msg);
    return { value, transfer: [value.values.buffer] };
  },
  async overlay(msg) {
    const png = encodeOverlayPng(resultOverlay(imageOf(msg.docId).decoded.raster, msg.result));
    return { value: png, transfer: [png.buffer] };
  },
  async teach(msg) {
    await ensureCv(msg.id);
    const t0 = performance.now();
    post({ type: 'progress', id: msg.id, stage: 'teaching the model', fraction: 0.3 });
    const teachImages = [];
    for (const it of msg.images) {
      const img = imageOf(it.docId);
      const data = rasteriseStrokes(it.strokes, img.decoded.widthPx, img.decoded.heightPx);
      // no label file here: the SHA-256 of the label values (one byte per pixel, row-major)
      const ready = preparedImage(it.docId, it.scale);
      teachImages.push({ decoded: img.decoded, labels: { width: img.decoded.widthPx, height: img.decoded.heightPx, data }, scale: it.scale, file: img.name, sha256: img.sha256, labelsSha256: await sha256Hex(data), prepared: ready });
    }
    const { model } = teachModel(teachImages);
    return { value: await keepModel(model, serialiseModel(model), t0) };
  },
  async loadModel(msg) {
    const t0 = performance.now();
    const bytes = new Uint8Array(msg.bytes);
    let text: string;
    try {
      text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
    } catch {
      throw new EngineError('BAD_MODEL', 'This is not a model file (not UTF-8 text).');
    }
    return { value: await keepModel(parseModel(text), text, t0, bytes) };
  },
  async classMap(msg) {
    await ensureCv(msg.id);
    const t0 = performance.now();
    const loaded = modelOf(msg.sha256);
    const ready = preparedImage(msg.docId, msg.scale);
    const { work } = ready.frame;
    const grid = ready.grid(loaded.model.windowsUm, PREVIEW_GRID_POINTS);
    const p = predictProbabilities(work, ready.umPerWorkPx, loaded, ready.centre, PREVIEW_GRID_POINTS, grid);
    const values = classMap(p);
    const value: ClassMapView = { width: p.width, height: p.height, values, stride: p.stride, ms: Math.round(performance.now() - t0) };
    return { value, transfer: [values.buffer] };
  },
  async prepareTeach(msg) {
    await ensureCv(msg.id);
    const t0 = performance.now();
    const ready = preparedImage(msg.docId, msg.scale);
    ready.grid(msg.windowsUm ?? ready.defaultWindowsUm, PREVIEW_GRID_POINTS);
    return { value: { ms: Math.round(performance.now() - t0) } };
  },
};

function dispatch<K extends RequestType>(msg: RequestOf<K> & { id: number }): Promise<Reply<K>> {
  const h = handlers[msg.type] as (m: RequestOf<K> & { id: number }) => Promise<Reply<K>>;
  return h(msg);
}

scope.onmessage = (ev: MessageEvent<RequestMessage>) => {
  const msg = ev.data;
  dispatch(msg).then(
    ({ value, transfer }) => post({ type: 'reply', id: msg.id, ok: true, value }, transfer ?? []),
    (e: unknown) => {
      const code = isFractozoneError(e) || e instanceof EngineError ? e.code : 'PROCESSING_FAILED';
      const message = e instanceof Error && e.message ? e.message : String(e);
      post({ type: 'reply', id: msg.id, ok: false, error: { code, message } });
    },
  );
};
