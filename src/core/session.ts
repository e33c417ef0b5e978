/**
 * Session files (`fractozone.session/2`): what is needed to take up the work on one image again —
 * the image's SHA-256, the complete measurement parameters (an edited boundary travels in
 * `params.boundaryPolygon`; a pixel model in `params.modelSha256` with the model file itself in
 * `model`), a hand-corrected outline, and whether the image had been measured. Reopening checks the
 * hashes and validates every field into typed values; measuring the image again with these
 * parameters (and the model) gives the same numbers (the pipeline is deterministic).
 */
import { FractozoneError, isFractozoneError } from './errors.js';
import { parseModel } from './learn/model.js';
import { defaultParams, validateParams } from './pipeline/params.js';
import type { PointPx } from './image/geometry.js';
import type { MaterialParams, MeasureParams, ScaleParams } from './pipeline/types.js';
import type { QuantityInput } from './tcd/resolve.js';
import type { Material, MaterialValue, SheetRateLaw } from './tcd/materials.js';
import { isFeatureName, type FeatureName } from './texture/registry.js';
import { TOOL_NAME, TOOL_VERSION } from './version.js';

export const SESSION_SCHEMA = 'fractozone.session/2';

/** A session: one image and the inputs of its measurement. */
export interface Session {
  schema: typeof SESSION_SCHEMA;
  tool: { name: string; version: string };
  image: { file: string; sha256: string; widthPx: number; heightPx: number };
  /** Complete measurement parameters (validated). */
  params: MeasureParams;
  /** Outer edge corrected by hand (px), or null for the one the measurement finds. */
  outline: PointPx[] | null;
  /** True when the image had been measured (reopening measures it again). */
  measured: boolean;
  /**
   * The pixel model `params.modelSha256` names: its name as the app shows it, the SHA-256 of its file
   * (= `params.modelSha256`) and the file's text byte for byte (fractozone.model/1), so that the
   * session measures the same without the model file beside it. Absent without a model.
   */
  model?: SessionModel;
}

/** A pixel model carried in a session file. */
export interface SessionModel {
  name: string;
  sha256: string;
  text: string;
}

/** A new session record for an image (tool name and version filled in). */
export function makeSession(image: Session['image'], params: MeasureParams, outline: PointPx[] | null, measured: boolean, model?: SessionModel): Session {
  if ((params.modelSha256 ?? null) !== (model?.sha256 ?? null)) throw new FractozoneError('BAD_PARAMETER', 'a session needs the model its parameters name (modelSha256), and no other');
  const s: Session = { schema: SESSION_SCHEMA, tool: { name: TOOL_NAME, version: TOOL_VERSION }, image: { ...image }, params: structuredClone(params), outline: outline ? outline.map((p) => ({ x: p.x, y: p.y })) : null, measured };
  if (model) s.model = { name: model.name, sha256: model.sha256, text: model.text };
  return s;
}

/** Session file text (2-space JSON, trailing newline). */
export function sessionText(s: Session): string {
  return JSON.stringify(s, null, 2) + '\n';
}

type Obj = Record<string, unknown>;

function bad(message: string): never {
  throw new FractozoneError('BAD_PARAMETER', `session file: ${message}`);
}

function obj(v: unknown, where: string): Obj {
  if (typeof v !== 'object' || v === null || Array.isArray(v)) bad(`${where} must be an object`);
  return v as Obj;
}

function num(v: unknown, where: string): number {
  if (typeof v !== 'number' || !Number.isFinite(v)) bad(`${where} must be a number`);
  return v;
}

function positive(v: unknown, where: string): number {
  const n = num(v, where);
  if (n <= 0) bad(`${where} must be positive`);
  return n;
}

function text(v: unknown, where: string): string {
  if (typeof v !== 'string') bad(`${where} must be text`);
  return v;
}

function optional<T>(v: unknown, read: (x: unknown) => T): T | undefined {
  return v === undefined ? undefined : read(v);
}

function points(v: unknown, where: string): PointPx[] {
  if (!Array.isArray(v)) bad(`${where} must be a list of {x, y}`);
  return v.map((p, i) => {
    const o = obj(p, `${where}[${i}]`);
    return { x: num(o.x, `${where}[${i}].x`), y: num(o.y, `${where}[${i}].y`) };
  });
}

function pair(v: unknown, where: string): [number, number] {
  if (!Array.isArray(v) || v.length !== 2) bad(`${where} must be [low, high]`);
  return [num(v[0], `${where}[0]`), num(v[1], `${where}[1]`)];
}

function scaleParams(v: unknown): ScaleParams {
  const o = obj(v, 'params.scale');
  const out: ScaleParams = {};
  if (o.useMetadata !== undefined) out.useMetadata = o.useMetadata === true;
  const px = optional(o.pixelSizeUm, (x) => positive(x, 'params.scale.pixelSizeUm'));
  if (px !== undefined) out.pixelSizeUm = px;
  const py = optional(o.pixelSizeYUm, (x) => positive(x, 'params.scale.pixelSizeYUm'));
  if (py !== undefined) out.pixelSizeYUm = py;
  const bar = optional(o.barLengthUm, (x) => positive(x, 'params.scale.barLengthUm'));
  if (bar !== undefined) out.barLengthUm = bar;
  const tol = optional(o.pixelSizeTolerancePct, (x) => num(x, 'params.scale.pixelSizeTolerancePct'));
  if (tol !== undefined) out.pixelSizeTolerancePct = tol;
  if (o.twoPoint !== undefined) {
    const t = obj(o.twoPoint, 'params.scale.twoPoint');
    const [p0, p1] = points([t.p0, t.p1], 'params.scale.twoPoint points');
    out.twoPoint = { p0, p1, distanceUm: positive(t.distanceUm, 'params.scale.twoPoint.distanceUm') };
  }
  return out;
}

function quantity(v: unknown, where: string): QuantityInput {
  const o = obj(v, where);
  const q: QuantityInput = { value: positive(o.value, `${where}.value`) };
  if (o.sd !== undefined) q.sd = num(o.sd, `${where}.sd`);
  if (o.interval !== undefined) q.interval = pair(o.interval, `${where}.interval`);
  if (o.source !== undefined) q.source = text(o.source, `${where}.source`);
  return q;
}

function materialValue(v: unknown, where: string): MaterialValue {
  const o = obj(v, where);
  const m: MaterialValue = { value: positive(o.value, `${where}.value`), unitWritten: text(o.unitWritten, `${where}.unitWritten`), source: text(o.source, `${where}.source`) };
  if (o.sd !== undefined) m.sd = num(o.sd, `${where}.sd`);
  if (o.interval !== undefined) m.interval = pair(o.interval, `${where}.interval`);
  return m;
}

function rateLaw(v: unknown, where: string): SheetRateLaw {
  const o = obj(v, where);
  const source = text(o.source, `${where}.source`);
  if (o.law === 'power') return { law: 'power', A: positive(o.A, `${where}.A`), B: num(o.B, `${where}.B`), source };
  if (o.law === 'table' && Array.isArray(o.points) && o.points.length >= 2) {
    const pts = o.points.map((p, i) => {
      const q = obj(p, `${where}.points[${i}]`);
      return { rate: positive(q.rate, `${where}.points[${i}].rate`), value: positive(q.value, `${where}.points[${i}].value`) };
    });
    return { law: 'table', points: pts, source };
  }
  bad(`${where} must be a power law (A, B) or a table of at least 2 points`);
}

function material(v: unknown): Material {
  const o = obj(v, 'params.material.material');
  const m: Material = {
    name: text(o.name, 'params.material.material.name'),
    invented: o.invented === true,
    fractureToughness: materialValue(o.fractureToughness, 'params.material.material.fractureToughness'),
    inherentStrength: materialValue(o.inherentStrength, 'params.material.material.inherentStrength'),
  };
  if (typeof o.note === 'string') m.note = o.note;
  if (o.dynamic !== undefined) {
    const d = obj(o.dynamic, 'params.material.material.dynamic');
    m.dynamic = {};
    if (d.L !== undefined) m.dynamic.L = rateLaw(d.L, 'params.material.material.dynamic.L');
    if (d.sigma0 !== undefined) m.dynamic.sigma0 = rateLaw(d.sigma0, 'params.material.material.dynamic.sigma0');
  }
  return m;
}

function materialParams(v: unknown): MaterialParams | null {
  if (v === null || v === undefined) return null;
  const o = obj(v, 'params.material');
  const out: MaterialParams = {};
  if (o.material !== undefined) out.material = material(o.material);
  if (o.toughness !== undefined) out.toughness = quantity(o.toughness, 'params.material.toughness');
  if (o.strength !== undefined) out.strength = quantity(o.strength, 'params.material.strength');
  return out;
}

function feature(v: unknown, where: string): FeatureName {
  const name = text(v, where);
  if (!isFeatureName(name)) bad(`${where} is not a roughness feature this version knows ("${name}")`);
  return name;
}

function integer(v: unknown, where: string): number {
  const n = num(v, where);
  if (!Number.isInteger(n)) bad(`${where} must be a whole number`);
  return n;
}

/** The parameters of a session, every field checked; missing fields take the defaults. */
function measureParams(v: unknown): MeasureParams {
  const o = obj(v, 'params');
  const d = defaultParams();
  const p: MeasureParams = {
    scale: o.scale === undefined ? d.scale : scaleParams(o.scale),
    windowUm: o.windowUm === undefined || o.windowUm === null ? null : positive(o.windowUm, 'params.windowUm'),
    features: o.features === undefined ? d.features : (Array.isArray(o.features) ? o.features : bad('params.features must be a list')).map((f, i) => feature(f, `params.features[${i}]`)),
    nRays: o.nRays === undefined ? d.nRays : integer(o.nRays, 'params.nRays'),
    exclude: o.exclude === undefined ? d.exclude : (Array.isArray(o.exclude) ? o.exclude : bad('params.exclude must be a list')).map((s, i) => pair(s, `params.exclude[${i}]`)),
    dropOutliers: o.dropOutliers === true,
    outlierK: o.outlierK === undefined ? d.outlierK : positive(o.outlierK, 'params.outlierK'),
    bootstrap: o.bootstrap === undefined ? d.bootstrap : integer(o.bootstrap, 'params.bootstrap'),
    seed: o.seed === undefined ? d.seed : integer(o.seed, 'params.seed'),
    ...(o.sectionDiameterUm === undefined || o.sectionDiameterUm === null ? {} : { sectionDiameterUm: positive(o.sectionDiameterUm, 'params.sectionDiameterUm') }),
    boundaryPolygon: o.boundaryPolygon === undefined || o.boundaryPolygon === null ? null : points(o.boundaryPolygon, 'params.boundaryPolygon'),
    maxPixels: o.maxPixels === undefined ? d.maxPixels : positive(o.maxPixels, 'params.maxPixels'),
    material: materialParams(o.material),
    strainRatePerS: o.strainRatePerS === undefined || o.strainRatePerS === null ? null : positive(o.strainRatePerS, 'params.strainRatePerS'),
    reference: o.reference === 'L/2' || o.reference === '2L' ? o.reference : o.reference === undefined || o.reference === 'L' ? 'L' : bad('params.reference must be L, L/2 or 2L'),
    tolerancePct: o.tolerancePct === undefined ? d.tolerancePct : positive(o.tolerancePct, 'params.tolerancePct'),
    ...(o.verdictBasis === undefined ? (d.verdictBasis === undefined ? {} : { verdictBasis: d.verdictBasis }) : { verdictBasis: o.verdictBasis as MeasureParams['verdictBasis'] }),
    ...(o.modelSha256 === undefined || o.modelSha256 === null ? {} : { modelSha256: sha256Text(o.modelSha256, 'params.modelSha256') }),
  };
  return validateParams(p);
}

function sha256Text(v: unknown, where: string): string {
  const t = text(v, where);
  if (!/^[0-9a-f]{64}$/.test(t)) bad(`${where} must be a SHA-256 (64 lower-case hex digits)`);
  return t;
}

/** The model of a session: present exactly when the parameters name one, with that SHA-256, and a model file that reads. */
function sessionModel(v: unknown, params: MeasureParams): SessionModel | undefined {
  if (v === undefined || v === null) {
    if (params.modelSha256 !== undefined) bad('the parameters name a pixel model (params.modelSha256) but the file does not hold it (model)');
    return undefined;
  }
  const o = obj(v, 'model');
  const m: SessionModel = { name: text(o.name, 'model.name'), sha256: sha256Text(o.sha256, 'model.sha256'), text: text(o.text, 'model.text') };
  if (params.modelSha256 !== m.sha256) bad(`model.sha256 (${m.sha256.slice(0, 12)}…) is not the model the parameters name (${params.modelSha256 === undefined ? 'none' : `${params.modelSha256.slice(0, 12)}…`})`);
  try {
    parseModel(m.text);
  } catch (e) {
    if (!isFractozoneError(e)) throw e;
    bad(`model.text: ${e.message}`);
  }
  return m;
}

/**
 * Reads a session file for an open image.
 *
 * @param textIn - the file's text
 * @param image - SHA-256 (hex) of the open image's bytes
 * @returns the validated session
 * @throws FractozoneError BAD_PARAMETER with one sentence: not a session, another image, or the
 *   field that is wrong
 */
export function parseSession(textIn: string, image: { sha256: string }): Session {
  let raw: unknown;
  try {
    raw = JSON.parse(textIn);
  } catch {
    bad('this is not a session file (not valid JSON)');
  }
  const o = obj(raw, 'the file');
  if (o.schema !== SESSION_SCHEMA) bad(`this is not a ${SESSION_SCHEMA} file (schema ${JSON.stringify(o.schema) ?? 'missing'})`);
  const img = obj(o.image, 'image');
  const file = text(img.file, 'image.file');
  if (img.sha256 !== image.sha256) bad(`it belongs to another image (${file}, SHA-256 ${String(img.sha256).slice(0, 12)}…); open that image and reopen the session there`);
  const tool = obj(o.tool, 'tool');
  const params = measureParams(o.params);
  const model = sessionModel(o.model, params);
  return {
    schema: SESSION_SCHEMA,
    tool: { name: text(tool.name, 'tool.name'), version: text(tool.version, 'tool.version') },
    image: { file, sha256: image.sha256, widthPx: positive(img.widthPx, 'image.widthPx'), heightPx: positive(img.heightPx, 'image.heightPx') },
    params,
    outline: o.outline === null || o.outline === undefined ? null : points(o.outline, 'outline'),
    measured: o.measured === true,
    ...(model ? { model } : {}),
  };
}
