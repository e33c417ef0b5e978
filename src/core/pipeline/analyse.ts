/**
 * The measurement pipeline, as a list of stages (each in stages/, each with a typed input and
 * output record):
 *
 *   calibrate → locate specimen(s) → texture → classify → refine boundary → measure → compare → quality → assemble
 *
 * With several specimens in the frame (both mating halves), the texture maps are computed once and
 * each specimen goes through locate → classify → refine → measure; the result holds one record per
 * specimen and the top-level blocks are specimen A's (specimens.ts).
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
import { inResultOrder, type MeasureResult, type ResultBand } from './result.js';
import { assembleBand, assembleResult, assembleScale, assembleSpecimen, reportWidths, storedGeometry } from './stages/assemble.js';
import { calibrate } from './stages/calibrate.js';
import { compareWithCriticalDistance } from './stages/compare.js';
import { locateSpecimen, type SpecimenLocation } from './stages/locateSpecimen.js';
import { measureWidths, minWidthPxFor, type StoredGeometry } from './stages/measure.js';
import { findRimBoundary } from './stages/band.js';
import { manualBoundary, type RimBoundary } from './stages/refineBoundary.js';
import { textureWindow, type TextureWindow } from './stages/texture.js';
import { bandUncertainty, MANUAL_RANGE_NOTE, methodVariations } from './stages/uncertainty.js';
import type { Classification } from './stages/classify.js';
import type { TextureMaps } from './stages/texture.js';
import type { InputInfo, MeasureParams, ProgressFn } from './types.js';
import { mergeWarnings, warn, type Warning } from '../warnings.js';
import { judgeQuality } from './stages/quality.js';
import { FractozoneError } from '../errors.js';
import type { LoadedModel } from '../learn/predict.js';
import { modelResult, segmentWithModel, type ModelSegmentation } from '../learn/segment.js';
import type { Scale } from '../calibrate/index.js';
import type { BandProfile } from '../measure/index.js';
import { listSpecimens } from '../segment/index.js';
import { specimenId, specimenRecord, withSpecimens } from './specimens.js';

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
  const located: Located = seg ? { locations: [seg.location], several: false, warnings: [] } : locateAll(frame, calibration.scale, p.nRays, p.sectionDiameterUm);
  const location = located.locations[0];
  T.lap('specimen', 'texture', 0.25);
  const windowUm = p.windowUm ?? (seg ? seg.windowUm : null);
  const window0 = textureWindow({ frame, scale: calibration.scale, location, windowUm, features: p.features });
  const umPerPx = { x: calibration.scale.umPerPxX, y: calibration.scale.umPerPxY };
  const scale = assembleScale(decoded, calibration, p);
  const measureSpecimen = (loc: SpecimenLocation, first: boolean): MeasuredSpecimen => {
    const own = [...loc.warnings];
    let boundary: RimBoundary;
    let window: TextureWindow = window0;
    let auto: { texture: TextureMaps; classification: Classification } | null = null;
    if (first && p.boundaryPolygon) {
      boundary = manualBoundary(p.boundaryPolygon);
      T.lap('texture', 'band width', 0.8);
    } else if (seg) {
      own.push(...seg.classification.warnings, ...seg.warnings);
      boundary = seg.boundary;
    } else {
      // texture → classify → refine, with a finer second pass for narrow bands (stages/band.ts)
      const found = findRimBoundary({ frame, scale: calibration.scale, location: loc, window: window0, features: p.features, nRays: p.nRays, allowSecondPass: windowUm === null });
      own.push(...found.warnings);
      boundary = found.boundary;
      window = found.window;
      auto = { texture: found.texture, classification: found.classification };
      if (first) T.lap('texture+boundary', 'band width', 0.85);
    }
    const geometry = storedGeometry(loc, boundary, calibration.marks);
    const measured = measureWidths({ geometry, umPerPx, imageSize: frame.fullSize, minWidthPx: minWidthPxFor(boundary.source, window.windowPxFull), params: p });
    own.push(...measured.warnings);
    const band = assembleBand(boundary, geometry, measured.profile ? reportWidths(measured.profile, umPerPx) : null, p.nRays);
    // uncertainty of this specimen's mean width (stages/uncertainty.ts)
    const workPxUm = calibration.scale.umPerPx * frame.lengthScale;
    const uncertainty = band.detected
      ? bandUncertainty({
          band, scale, params: p,
          origin: boundary.source === 'manual' ? { kind: 'manual' } : { kind: seg ? 'model' : 'auto', workPxUm },
          variations: auto
            ? methodVariations({ frame, scale: calibration.scale, location: loc, window, ...auto, marks: calibration.marks, params: p }, band.widthUm?.mean ?? NaN)
            : { none: boundary.source === 'manual' ? MANUAL_RANGE_NOTE : 'segmented with a pixel classifier: the method variations are those of the fixed rules' },
        })
      : undefined;
    if (uncertainty) band.uncertainty = uncertainty;
    if (first) T.lap('measure+uncertainty', 'compare', 0.9);
    return { location: loc, boundary, geometry, profile: measured.profile, band, warnings: own, window };
  };
  const all = located.locations.map((loc, i) => measureSpecimen(loc, i === 0));
  const a = all[0];
  const window = a.window;
  const warnings = [...calibration.warnings, ...a.warnings];
  const tcd = compareWithCriticalDistance({ params: p, width: a.band.detected ? a.band.widthUm : null, uncertainty: a.band.uncertainty ?? null });
  const judged = judgeQuality({ warnings: mergeWarnings(warnings, tcd.warnings), band: a.band, scale });
  let result = assembleResult({
    input, decoded, params: p, calibration, frame, location, window, boundarySource: a.boundary.source, geometry: a.geometry, scale, band: a.band,
    criticalDistance: tcd, warnings: judged.warnings, quality: judged.quality, timingsMs: T.timings,
    ...(seg && options.model ? { model: modelResult(options.model, seg) } : {}),
  });
  if (located.several) {
    const records = all.map((m, i) => specimenRecord(specimenId(i), i === 0 ? result.specimen : assembleSpecimen(frame, m.location, calibration, m.geometry), m.band, m.warnings, scale));
    result = inResultOrder(withSpecimens(result, records, located.warnings));
  }
  T.lap('measure', 'overlay', 0.95);
  const overlay = overlayFor(decoded.raster, result, a.profile, calibration.bar);
  T.lap('overlay', 'done', 1);
  return { result, overlay };
}

/** One specimen through the boundary and measure stages. */
interface MeasuredSpecimen {
  location: SpecimenLocation;
  boundary: RimBoundary;
  geometry: StoredGeometry;
  profile: BandProfile | null;
  band: ResultBand;
  /** Warnings of its outline, classification and measurement. */
  warnings: Warning[];
  /** The texture window its boundary was found with (a finer one after a second pass). */
  window: TextureWindow;
}

/** The specimens located: A first; `several` when the image holds two or more. */
interface Located {
  locations: SpecimenLocation[];
  several: boolean;
  /** SEVERAL_SPECIMENS / SPECIMEN_SKIPPED. */
  warnings: Warning[];
}

const ordinal = (i: number): string => `${i + 1}${i === 0 ? 'st' : i === 1 ? 'nd' : i === 2 ? 'rd' : 'th'}`;

/**
 * Locate every specimen: one (the usual case: the component at the image centre, exactly as
 * before several were looked for), or each of the specimens `listSpecimens` finds, in reading
 * order; a specimen that cannot be outlined is skipped with a warning.
 */
function locateAll(frame: WorkingFrame, scale: Scale, nRays: number, sectionDiameterUm: number | undefined): Located {
  const targets = listSpecimens(frame.work);
  if (targets.length < 2) return { locations: [locateSpecimen({ frame, scale, nRays, ...(sectionDiameterUm ? { sectionDiameterUm } : {}) })], several: false, warnings: [] };
  const locations: SpecimenLocation[] = [];
  const warnings: Warning[] = [];
  let firstError: unknown = null;
  targets.forEach((target, i) => {
    try {
      locations.push(locateSpecimen({ frame, scale, nRays, target, ...(sectionDiameterUm ? { sectionDiameterUm } : {}) }));
    } catch (e) {
      if (!(e instanceof FractozoneError)) throw e;
      firstError ??= e;
      warnings.push(warn('SPECIMEN_SKIPPED', `the ${ordinal(i)} of ${targets.length} specimens in reading order could not be outlined and is not measured (${e.message})`));
    }
  });
  if (!locations.length) throw firstError;
  if (locations.length > 2) warnings.unshift(warn('SEVERAL_SPECIMENS', `${locations.length} specimens were found in the frame: each is measured (specimens A–${specimenId(locations.length - 1)}), the halves are not compared`));
  return { locations, several: true, warnings };
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
