/**
 * The measurement pipeline, as a list of stages (each in stages/, each with a typed input and
 * output record):
 *
 *   calibrate → locate specimen → texture → classify → refine boundary → measure → compare → quality → assemble
 *
 * plus the overlay picture. The working copy and its mapping to full-resolution pixels live in one
 * WorkingFrame (frame.ts); numbers are rounded to their stored precision at assembly (precision.ts).
 *
 * Pure and deterministic (no file system, no DOM): the CLI, the batch workers and the browser
 * Web Worker all call `analyseImage` / `analyseDecoded` with the same MeasureParams, so the same
 * image and parameters give the same numbers everywhere. `remeasure` (remeasure.ts) re-runs the
 * measure and compare stages on a previous result (what the app calls on every edit).
 */
import { decodeImage, type DecodedImage } from '../decode/index.js';
import type { RgbaImage } from '../draw/index.js';
import { WorkingFrame } from './frame.js';
import { overlayFor } from './overlay.js';
import { validateParams } from './params.js';
import { round } from './precision.js';
import type { MeasureResult } from './result.js';
import { assembleBand, assembleResult, assembleScale, reportWidths, storedGeometry } from './stages/assemble.js';
import { calibrate } from './stages/calibrate.js';
import { classifyTexture } from './stages/classify.js';
import { compareWithCriticalDistance } from './stages/compare.js';
import { locateSpecimen } from './stages/locateSpecimen.js';
import { measureWidths, minWidthPxFor } from './stages/measure.js';
import { manualBoundary, refineRimBoundary, type RimBoundary } from './stages/refineBoundary.js';
import { computeTexture, textureWindow } from './stages/texture.js';
import type { InputInfo, MeasureParams, ProgressFn } from './types.js';
import { mergeWarnings } from '../warnings.js';
import { judgeQuality } from './stages/quality.js';
import { FractozoneError } from '../errors.js';
import type { LoadedModel } from '../learn/predict.js';
import { modelResult, segmentWithModel, type ModelSegmentation } from '../learn/segment.js';

/** What the shells get back besides the result: the overlay picture. */
export interface Analysis {
  result: MeasureResult;
  overlay: RgbaImage;
}

/** What the shells may pass beside the parameters. */
export interface AnalyseOptions {
  /** A pixel classifier to segment with (learn/); `params.modelSha256` must name its file's SHA-256. */
  model?: LoadedModel;
}

/** The model branch when a model is given (the parameters and the model must agree). */
function modelBranch(p: MeasureParams, options: AnalyseOptions, run: (m: LoadedModel) => ModelSegmentation): ModelSegmentation | null {
  const m = options.model;
  if (!m && p.modelSha256 === undefined) return null;
  if (!m || m.sha256 !== p.modelSha256) throw new FractozoneError('BAD_PARAMETER', 'the parameters name a model (modelSha256) that was not passed with them, or another one');
  return run(m);
}

/** Wall-clock time per stage (diagnostics only) and the progress callback. */
function stageTimer(onProgress?: ProgressFn): { lap: (stage: string, next: string, fraction: number) => void; timings: Record<string, number> } {
  const timings: Record<string, number> = {};
  let t = performance.now();
  return {
    timings,
    lap(stage, next, fraction) {
      const n = performance.now();
      timings[stage] = round(n - t, 1);
      t = n;
      onProgress?.(next, fraction);
    },
  };
}

/**
 * Run the whole pipeline on a decoded image.
 *
 * @param decoded - output of decodeImage
 * @param input - file name (as the user gave it) and SHA-256 of the bytes (computed by the shell)
 * @param params - the measurement parameters (validated here)
 * @param onProgress - called with the next stage name and the fraction done
 * @param options - a pixel classifier to segment with instead of the fixed rules
 * @returns the result (schema fractozone.result/2) and the overlay picture
 * @throws FractozoneError when the scale cannot be set, no specimen is found, or a parameter is bad
 */
export function analyseDecoded(decoded: DecodedImage, input: InputInfo, params: MeasureParams, onProgress?: ProgressFn, options: AnalyseOptions = {}): Analysis {
  const p = validateParams(structuredClone(params));
  const T = stageTimer(onProgress);
  onProgress?.('scale bar', 0.05);
  const calibration = calibrate({ decoded, scale: p.scale });
  T.lap('scale', 'specimen outline', 0.12);
  const frame = new WorkingFrame(decoded.raster, calibration.marks);
  const seg = modelBranch(p, options, (loaded) => segmentWithModel({ frame, scale: calibration.scale, loaded, nRays: p.nRays }));
  const location = seg ? seg.location : locateSpecimen({ frame, scale: calibration.scale, nRays: p.nRays, sectionDiameterUm: p.sectionDiameterUm });
  T.lap('specimen', 'texture', 0.25);
  const windowUm = p.windowUm ?? (seg ? seg.windowUm : null);
  const window = textureWindow({ frame, scale: calibration.scale, location, windowUm, features: p.features });
  const warnings = [...calibration.warnings, ...location.warnings];
  let boundary: RimBoundary;
  if (p.boundaryPolygon) {
    boundary = manualBoundary(p.boundaryPolygon);
    T.lap('texture', 'band width', 0.8);
  } else if (seg) {
    warnings.push(...seg.classification.warnings, ...seg.warnings);
    boundary = seg.boundary;
  } else {
    const texture = computeTexture({ frame, window, features: p.features });
    T.lap('texture', 'rim/core boundary', 0.55);
    const classification = classifyTexture({ location, texture });
    warnings.push(...classification.warnings);
    boundary = refineRimBoundary({ frame, location, classification, window, nRays: p.nRays });
    T.lap('boundary', 'band width', 0.85);
  }
  const geometry = storedGeometry(location, boundary, calibration.marks);
  const measured = measureWidths({
    geometry,
    umPerPx: { x: calibration.scale.umPerPxX, y: calibration.scale.umPerPxY },
    imageSize: frame.fullSize,
    minWidthPx: minWidthPxFor(boundary.source, window.windowPxFull),
    params: p,
  });
  warnings.push(...measured.warnings);
  const band = assembleBand(boundary, geometry, measured.profile ? reportWidths(measured.profile, { x: calibration.scale.umPerPxX, y: calibration.scale.umPerPxY }) : null, p.nRays);
  const tcd = compareWithCriticalDistance({ params: p, width: band.detected ? band.widthUm : null });
  const scale = assembleScale(decoded, calibration, p);
  const judged = judgeQuality({ warnings: mergeWarnings(warnings, tcd.warnings), band, scale });
  const result = assembleResult({
    input, decoded, params: p, calibration, frame, location, window, boundarySource: boundary.source, geometry, scale, band,
    criticalDistance: tcd, warnings: judged.warnings, quality: judged.quality, timingsMs: T.timings,
    ...(seg && options.model ? { model: modelResult(options.model, seg) } : {}),
  });
  T.lap('measure', 'overlay', 0.95);
  const overlay = overlayFor(decoded.raster, result, measured.profile, calibration.bar);
  T.lap('overlay', 'done', 1);
  return { result, overlay };
}

/**
 * Decode and analyse an image (see analyseDecoded).
 *
 * @param bytes - the file's bytes
 * @param input - file name and SHA-256 (hex) of `bytes`
 * @param params - measurement parameters
 */
export async function analyseImage(bytes: Uint8Array, input: InputInfo, params: MeasureParams, onProgress?: ProgressFn, options: AnalyseOptions = {}): Promise<Analysis> {
  onProgress?.('decode', 0);
  const t0 = performance.now();
  const decoded = decodeImage(bytes, { maxPixels: params.maxPixels });
  const tDecode = performance.now() - t0;
  const a = analyseDecoded(decoded, input, params, onProgress, options);
  a.result.diagnostics.timingsMs = { decode: round(tDecode, 1), ...a.result.diagnostics.timingsMs };
  return a;
}

// Also importable from here, where they lived before the pipeline was split into stages.
export { remeasure } from './remeasure.js';
export type { MeasureResult } from './result.js';
