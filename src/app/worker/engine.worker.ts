/**
 * The engine worker: loads OpenCV, holds the opened images, and runs every computation (decode,
 * scale-bar detection, texture maps, analysis, re-measure). The UI thread never runs OpenCV or the
 * pipeline. Core modules are picked up at build time with `import.meta.glob`, so the app builds and
 * runs (with the missing parts reported as unavailable) while the engine is still being written.
 */
/// <reference lib="webworker" />
import { getCv, setCv, hasCv } from '../../core/cv.js';
import { loadCvInWorker } from './load-cv.js';
import type { AnalyseReply, EngineCapabilities, EngineRequest, OpenedImage, RequestMessage, ResponseMessage, ScaleBarInfo } from './protocol.js';
import type { GrayRaster } from '../../core/image/raster.js';
import type { MeasureParams, PointPx } from '../../core/pipeline/types.js';

// eslint-disable-next-line @typescript-eslint/no-explicit-any
type AnyMod = Record<string, any>;

const lazy = {
  decode: import.meta.glob('../../core/decode/index.ts'),
  calibrate: import.meta.glob('../../core/calibrate/index.ts'),
  texture: import.meta.glob('../../core/texture/index.ts'),
  pipeline: { ...import.meta.glob('../../core/pipeline/analyse.ts'), ...import.meta.glob('../../core/pipeline/index.ts') },
  render: import.meta.glob('../../core/render/index.ts'),
  encode: import.meta.glob('../../core/encode/index.ts'),
};
type Part = keyof typeof lazy;

async function part(name: Part): Promise<AnyMod | null> {
  const entries = Object.entries(lazy[name]);
  if (entries.length === 0) return null;
  // prefer the folder's index.ts (public API) over a single module
  const pick = entries.find(([k]) => k.endsWith('/index.ts')) ?? entries[0];
  return (await pick[1]()) as AnyMod;
}

function capabilities(): EngineCapabilities {
  return {
    decode: Object.keys(lazy.decode).length > 0,
    calibrate: Object.keys(lazy.calibrate).length > 0,
    texture: Object.keys(lazy.texture).length > 0,
    pipeline: Object.keys(lazy.pipeline).length > 0,
    render: Object.keys(lazy.render).length > 0 && Object.keys(lazy.encode).length > 0,
  };
}

const scope = self as unknown as DedicatedWorkerGlobalScope;

function post(msg: ResponseMessage, transfer: Transferable[] = []): void {
  scope.postMessage(msg, transfer);
}

class EngineError extends Error {
  constructor(
    readonly code: string,
    message: string,
  ) {
    super(message);
  }
}

interface DocEntry {
  name: string;
  bytes: Uint8Array;
  sha256: string;
  raster: GrayRaster;
  artifacts: AnyMod | null;
}
const docs = new Map<string, DocEntry>();

let cvPromise: Promise<void> | null = null;
function ensureCv(id: number): Promise<void> {
  if (!cvPromise) {
    cvPromise = loadCvInWorker((stage, fraction) => post({ type: 'progress', id, stage, fraction })).then(({ cv }) => {
      setCv(cv);
    });
    cvPromise.catch(() => {
      cvPromise = null;
    });
  }
  return cvPromise;
}

async function sha256Hex(bytes: Uint8Array): Promise<string> {
  const d = await crypto.subtle.digest('SHA-256', bytes.slice().buffer);
  return [...new Uint8Array(d)].map((b) => b.toString(16).padStart(2, '0')).join('');
}

/** Browser decode fallback (PNG/JPEG only, 8-bit luminance) while the core decoder is missing. */
async function decodeWithBrowser(bytes: Uint8Array): Promise<{ raster: GrayRaster; format: string }> {
  let bmp: ImageBitmap;
  try {
    bmp = await createImageBitmap(new Blob([bytes.slice().buffer]));
  } catch {
    throw new EngineError('NOT_AN_IMAGE', 'The file is not an image this browser can read.');
  }
  const c = new OffscreenCanvas(bmp.width, bmp.height);
  const g = c.getContext('2d');
  if (!g) throw new EngineError('PROCESSING_FAILED', 'No 2D canvas in this browser.');
  g.drawImage(bmp, 0, 0);
  const px = g.getImageData(0, 0, bmp.width, bmp.height).data;
  const data = new Float32Array(bmp.width * bmp.height);
  for (let i = 0; i < data.length; i++) {
    data[i] = (0.2126 * px[4 * i] + 0.7152 * px[4 * i + 1] + 0.0722 * px[4 * i + 2]) / 255;
  }
  return { raster: { width: bmp.width, height: bmp.height, data }, format: 'browser' };
}

function metadataUmPerPx(meta: unknown): number | null {
  if (meta == null) return null;
  if (typeof meta === 'number') return Number.isFinite(meta) && meta > 0 ? meta : null;
  if (typeof meta === 'object') {
    const m = meta as Record<string, unknown>;
    for (const k of ['umPerPx', 'umPerPxX', 'pixelSizeUm', 'pixelSizeXUm', 'xUmPerPx']) {
      const v = m[k];
      if (typeof v === 'number' && Number.isFinite(v) && v > 0) return v;
    }
  }
  return null;
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

function getDoc(docId: string): DocEntry {
  const d = docs.get(docId);
  if (!d) throw new EngineError('PROCESSING_FAILED', 'That image is no longer open.');
  return d;
}

async function requirePart(name: Part, what: string): Promise<AnyMod> {
  const m = await part(name);
  if (!m) throw new EngineError('PROCESSING_FAILED', `${what} is not available in this build yet.`);
  return m;
}

function asPoint(v: unknown): PointPx {
  const o = (v ?? {}) as Record<string, unknown>;
  return { x: Number(o.x), y: Number(o.y) };
}

/** Geometry from a result (schema fractozone.result/1): outer edge, boundary, centre, scale. */
function geometryOf(result: AnyMod): AnalyseReply['geometry'] {
  const spec = (result.specimen ?? {}) as AnyMod;
  const band = (result.band ?? {}) as AnyMod;
  const scale = (result.scale ?? {}) as AnyMod;
  return {
    outerPolygon: ((spec.outline ?? []) as unknown[]).map(asPoint),
    boundaryPolygon: ((band.boundary?.polygon ?? []) as unknown[]).map(asPoint),
    center: asPoint(spec.center),
    umPerPx: typeof scale.umPerPx === 'number' ? scale.umPerPx : null,
    scaleSource: typeof scale.source === 'string' ? scale.source : null,
  };
}

async function handle(msg: RequestMessage): Promise<{ value: unknown; transfer?: Transferable[] }> {
  const id = msg.id;
  switch (msg.type) {
    case 'status':
      return { value: { cvReady: hasCv(), capabilities: capabilities() } };
    case 'cvSelfTest': {
      await ensureCv(id);
      // eslint-disable-next-line @typescript-eslint/no-explicit-any
      const cv: any = getCv();
      const src = cv.matFromArray(3, 3, cv.CV_32FC1, [0, 0, 0, 0, 9, 0, 0, 0, 0]);
      const dst = new cv.Mat();
      try {
        cv.boxFilter(src, dst, -1, new cv.Size(3, 3), new cv.Point(-1, -1), true, cv.BORDER_CONSTANT);
        return { value: { output: Array.from(dst.data32F as Float32Array), cvVersion: String(cv.getBuildInformation?.().match(/Version control:\s*(\S+)/)?.[1] ?? '4.3') } };
      } finally {
        src.delete();
        dst.delete();
      }
    }
    case 'open': {
      post({ type: 'progress', id, stage: 'reading image', fraction: 0.1 });
      const bytes = new Uint8Array(msg.bytes);
      if (bytes.length === 0) throw new EngineError('EMPTY_INPUT', 'The file is empty.');
      const sha256 = await sha256Hex(bytes);
      const dec = await part('decode');
      let raster: GrayRaster;
      let info: Omit<OpenedImage, 'docId' | 'name' | 'sha256' | 'rgba'>;
      if (dec && typeof dec.decodeImage === 'function') {
        await ensureCv(id);
        const d = dec.decodeImage(bytes, { maxPixels: msg.maxPixels ?? 100_000_000 });
        raster = d.raster;
        info = { format: d.format, widthPx: d.widthPx, heightPx: d.heightPx, bitDepth: d.bitDepth, channels: d.channels, metadataUmPerPx: metadataUmPerPx(d.metadataScale) };
      } else {
        const d = await decodeWithBrowser(bytes);
        raster = d.raster;
        info = { format: d.format, widthPx: raster.width, heightPx: raster.height, bitDepth: 8, channels: 1, metadataUmPerPx: null };
      }
      docs.set(msg.docId, { name: msg.name, bytes, sha256, raster, artifacts: null });
      post({ type: 'progress', id, stage: 'image ready', fraction: 1 });
      const rgba = previewRgba(raster);
      const value: OpenedImage = { docId: msg.docId, name: msg.name, sha256, rgba, ...info };
      return { value, transfer: [rgba.buffer] };
    }
    case 'close':
      docs.delete(msg.docId);
      return { value: null };
    case 'detectBar': {
      const doc = getDoc(msg.docId);
      await ensureCv(id);
      const cal = await requirePart('calibrate', 'Scale-bar detection');
      post({ type: 'progress', id, stage: 'looking for the scale bar', fraction: 0.3 });
      const bar = cal.detectScaleBar(doc.raster) as ScaleBarInfo | null;
      return { value: bar ? { ...bar } : null };
    }
    case 'texture': {
      const doc = getDoc(msg.docId);
      await ensureCv(id);
      const tex = await requirePart('texture', 'The texture map');
      post({ type: 'progress', id, stage: `computing ${msg.feature}`, fraction: 0.2 });
      const w = Math.max(3, Math.round(msg.windowPx));
      const map = tex.computeFeature(msg.feature, doc.raster, w % 2 === 1 ? w : w + 1) as GrayRaster;
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
      return { value: { width: map.width, height: map.height, values, min, max }, transfer: [values.buffer] };
    }
    case 'renderSample': {
      const ren = await requirePart('render', 'The invented sample renderer');
      const enc = await requirePart('encode', 'The PNG encoder');
      post({ type: 'progress', id, stage: 'drawing the invented sample', fraction: 0.3 });
      const out = ren.renderFractograph({ seed: msg.seed ?? 1 });
      const bytes = enc.encodeGrayRaster(out.raster, { format: 'png', bitDepth: 8 }) as Uint8Array;
      const buf = bytes.slice().buffer;
      return { value: { name: 'invented-sample.png', bytes: buf, truth: out.truth }, transfer: [buf] };
    }
    case 'analyse': {
      const doc = getDoc(msg.docId);
      await ensureCv(id);
      const pipe = await requirePart('pipeline', 'Automatic analysis');
      post({ type: 'progress', id, stage: 'analysing', fraction: 0.05 });
      const out = await pipe.analyseImage(doc.bytes, { file: doc.name, sha256: doc.sha256 }, msg.params as MeasureParams, (stage: string, fraction: number) =>
        post({ type: 'progress', id, stage, fraction }),
      );
      doc.artifacts = out.result;
      return { value: { result: out.result, geometry: geometryOf(out.result) } satisfies AnalyseReply };
    }
    case 'remeasure': {
      const doc = getDoc(msg.docId);
      if (!doc.artifacts) throw new EngineError('PROCESSING_FAILED', 'Run the automatic analysis first.');
      const pipe = await requirePart('pipeline', 'Re-measure');
      // Re-measure always starts from the automatic analysis with the complete current parameters
      // (deterministic: the same edits give the same numbers). An edited outline replaces the stored one.
      let prev = doc.artifacts;
      if (msg.geometry?.outerPolygon || msg.geometry?.center) {
        prev = { ...prev, specimen: { ...prev.specimen, ...(msg.geometry.outerPolygon ? { outline: msg.geometry.outerPolygon } : {}), ...(msg.geometry.center ? { center: msg.geometry.center } : {}) } };
      }
      const result = pipe.remeasure(prev, msg.params as MeasureParams) as AnyMod;
      return { value: { result, geometry: geometryOf(result) } satisfies AnalyseReply };
    }
  }
}

scope.onmessage = (ev: MessageEvent<RequestMessage>) => {
  const msg = ev.data;
  handle(msg).then(
    ({ value, transfer }) => post({ type: 'reply', id: msg.id, ok: true, value }, transfer ?? []),
    (e: unknown) => {
      const err = e as { code?: unknown; message?: unknown };
      const code = typeof err?.code === 'string' ? err.code : 'PROCESSING_FAILED';
      const message = typeof err?.message === 'string' && err.message ? err.message : String(e);
      post({ type: 'reply', id: msg.id, ok: false, error: { code, message } });
    },
  );
};

export type { EngineRequest };
