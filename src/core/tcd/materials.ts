/**
 * Material sheets: named materials with fracture toughness, inherent strength and optional
 * strain-rate laws, every value with its unit and its source. Text in, validated data out (reading
 * the file is the shell's job).
 *
 * JSON format `fractozone.materials/1`:
 * ```json
 * {"schema": "fractozone.materials/1",
 *  "materials": [{
 *    "name": "ZX-17 (invented)", "invented": true, "note": "optional text",
 *    "fractureToughness": {"value": 60, "unit": "MPa*sqrt(m)", "sd": 3, "source": "..."},
 *    "inherentStrength":  {"value": 900, "unit": "MPa", "interval": [850, 950], "source": "..."},
 *    "dynamic": {
 *      "L":      {"law": "power", "A": 1400, "unit": "um", "B": -0.05, "rateUnit": "1/s", "source": "..."},
 *      "sigma0": {"law": "table", "unit": "MPa", "rateUnit": "1/s", "points": [[0.001, 900], [1000, 1050]], "source": "..."}
 *    }}]}
 * ```
 * `sd` (normal scatter) and `interval` (uniform scatter) are optional and exclusive. Units: toughness
 * MPa*sqrt(m) (also MPa√m, MPa·√m, MPa m^0.5) or ksi*sqrt(in); stress MPa, GPa, Pa, ksi, psi;
 * dynamic L unit um/µm, mm, m; rateUnit 1/s only.
 *
 * CSV format (static values only), one row per value, header
 * `name,property,value,unit,sd,source[,invented]`, property `fractureToughness` or
 * `inherentStrength`; fields with commas in double quotes; `#` lines are comments.
 */
import { FractozoneError } from '../errors.js';
import type { RateLaw, RateLawScatter } from './dynamic.js';
import { toEngineUnit, unitFactor } from './quantities.js';

/** Schema tag of the JSON material sheet. */
export const MATERIAL_SCHEMA = 'fractozone.materials/1';

/** A material value in engine units (MPa·√m or MPa) with optional scatter and its source. */
export interface MaterialValue {
  value: number;
  sd?: number;
  interval?: [number, number];
  /** Unit as written in the sheet. */
  unitWritten: string;
  source: string;
}

/** A strain-rate law from a sheet (values in µm for L, MPa for σ_0; rates in 1/s). */
export type SheetRateLaw = RateLaw & { source: string };

/** A validated material. */
export interface Material {
  name: string;
  invented: boolean;
  note?: string;
  /** MPa·√m. */
  fractureToughness: MaterialValue;
  /** MPa. */
  inherentStrength: MaterialValue;
  dynamic?: { L?: SheetRateLaw; sigma0?: SheetRateLaw };
}

type Obj = Record<string, unknown>;

function bad(fileName: string, where: string, msg: string): never {
  throw new FractozoneError('BAD_MATERIAL', `${fileName}: ${where}: ${msg}`);
}

function posNum(v: unknown, file: string, where: string, allowZero = false): number {
  if (typeof v !== 'number' || !Number.isFinite(v)) bad(file, where, `must be a number, got ${JSON.stringify(v) ?? 'nothing'}`);
  if (v < 0 || (!allowZero && v === 0)) bad(file, where, `must be ${allowZero ? 'non-negative' : 'positive'}, got ${v}`);
  return v;
}

function str(v: unknown, file: string, where: string): string {
  if (typeof v !== 'string' || v.trim() === '') bad(file, where, 'is missing');
  return v.trim();
}

function parseValue(o: unknown, dim: 'toughness' | 'stress', file: string, where: string): MaterialValue {
  if (typeof o !== 'object' || o === null || Array.isArray(o)) bad(file, where, 'is missing (an object with value, unit and source)');
  const v = o as Obj;
  if (v.value === undefined) bad(file, `${where}.value`, 'is missing');
  const raw = posNum(v.value, file, `${where}.value`);
  if (v.unit === undefined || v.unit === '') bad(file, `${where}.unit`, 'is missing');
  const unit = str(v.unit, file, `${where}.unit`);
  const f = unitFactor(unit, dim);
  if (f === undefined) bad(file, `${where}.unit`, `unknown unit "${unit}" (use ${dim === 'toughness' ? 'MPa*sqrt(m) or ksi*sqrt(in)' : 'MPa, GPa, Pa, ksi or psi'})`);
  if (v.source === undefined || v.source === '') bad(file, `${where}.source`, 'is missing; every value needs its source');
  const source = str(v.source, file, `${where}.source`);
  const out: MaterialValue = { value: raw * f, unitWritten: unit, source };
  if (v.sd !== undefined && v.sd !== null && v.sd !== '') out.sd = posNum(v.sd, file, `${where}.sd`, true) * f;
  if (v.interval !== undefined) {
    if (out.sd !== undefined) bad(file, where, 'give either sd or interval, not both');
    const iv = v.interval;
    if (!Array.isArray(iv) || iv.length !== 2) bad(file, `${where}.interval`, 'must be [low, high]');
    const lo = posNum(iv[0], file, `${where}.interval[0]`) * f;
    const hi = posNum(iv[1], file, `${where}.interval[1]`) * f;
    if (!(lo <= out.value && out.value <= hi)) bad(file, `${where}.interval`, 'must contain the value');
    out.interval = [lo, hi];
  }
  return out;
}

/** Optional scatter of a power law: `sdA` (unit of A), `sdB`, or `relSd` (fraction of the value). */
function rateLawScatter(v: Obj, f: number, file: string, where: string): RateLawScatter | null {
  const has = (k: string): boolean => v[k] !== undefined && v[k] !== null;
  if (!has('sdA') && !has('sdB') && !has('relSd')) return null;
  if (has('relSd') && (has('sdA') || has('sdB'))) bad(file, where, 'give either relSd or sdA/sdB, not both');
  const out: RateLawScatter = {};
  if (has('relSd')) out.relSd = posNum(v.relSd, file, `${where}.relSd`, true);
  if (has('sdA')) out.sdA = posNum(v.sdA, file, `${where}.sdA`, true) * f;
  if (has('sdB')) out.sdB = posNum(v.sdB, file, `${where}.sdB`, true);
  return out;
}

function parseRateLaw(o: unknown, dim: 'distance' | 'stress', file: string, where: string): SheetRateLaw {
  if (typeof o !== 'object' || o === null) bad(file, where, 'must be an object');
  const v = o as Obj;
  const unit = str(v.unit, file, `${where}.unit`);
  let f = unitFactor(unit, dim);
  if (f === undefined) bad(file, `${where}.unit`, `unknown unit "${unit}" (use ${dim === 'distance' ? 'um, mm or m' : 'MPa, GPa or ksi'})`);
  if (dim === 'distance') f *= 1e6; // engine unit for L laws: µm
  const rateUnit = str(v.rateUnit, file, `${where}.rateUnit`).replace(/\s+/g, '');
  if (!['1/s', 's^-1', '/s', 's-1'].includes(rateUnit)) bad(file, `${where}.rateUnit`, `unknown unit "${rateUnit}" (use 1/s)`);
  const source = str(v.source, file, `${where}.source`);
  if (v.law === 'power') {
    const A = posNum(v.A, file, `${where}.A`) * f;
    if (typeof v.B !== 'number' || !Number.isFinite(v.B)) bad(file, `${where}.B`, `must be a number, got ${JSON.stringify(v.B) ?? 'nothing'}`);
    const scatter = rateLawScatter(v, f as number, file, where);
    return { law: 'power', A, B: v.B, ...(scatter ? { scatter } : {}), source };
  }
  if (v.law === 'table') {
    if (!Array.isArray(v.points) || v.points.length < 2) bad(file, `${where}.points`, 'must list at least 2 [rate, value] pairs');
    const points = (v.points as unknown[]).map((p, i) => {
      if (!Array.isArray(p) || p.length !== 2) bad(file, `${where}.points[${i}]`, 'must be [rate, value]');
      return { rate: posNum(p[0], file, `${where}.points[${i}][0]`), value: posNum(p[1], file, `${where}.points[${i}][1]`) * (f as number) };
    });
    for (let i = 1; i < points.length; i++) {
      if (!(points[i].rate > points[i - 1].rate)) bad(file, `${where}.points[${i}]`, 'strain rates must increase strictly');
    }
    return { law: 'table', points, source };
  }
  bad(file, `${where}.law`, `must be "power" or "table", got ${JSON.stringify(v.law) ?? 'nothing'}`);
}

function parseJsonSheet(text: string, file: string): Material[] {
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (e) {
    throw new FractozoneError('BAD_MATERIAL', `${file}: not valid JSON (${(e as Error).message})`);
  }
  if (typeof doc !== 'object' || doc === null) bad(file, 'document', 'must be an object');
  const d = doc as Obj;
  if (d.schema !== MATERIAL_SCHEMA) bad(file, 'schema', `must be "${MATERIAL_SCHEMA}", got ${JSON.stringify(d.schema) ?? 'nothing'}`);
  if (!Array.isArray(d.materials) || d.materials.length === 0) bad(file, 'materials', 'must be a non-empty list');
  const seen = new Set<string>();
  return d.materials.map((m: unknown, i: number) => {
    if (typeof m !== 'object' || m === null) bad(file, `materials[${i}]`, 'must be an object');
    const o = m as Obj;
    const name = str(o.name, file, `materials[${i}].name`);
    if (seen.has(name)) bad(file, `material "${name}"`, 'name appears twice');
    seen.add(name);
    const w = `material "${name}"`;
    const mat: Material = {
      name,
      invented: o.invented === true,
      fractureToughness: parseValue(o.fractureToughness, 'toughness', file, `${w} fractureToughness`),
      inherentStrength: parseValue(o.inherentStrength, 'stress', file, `${w} inherentStrength`),
    };
    if (typeof o.note === 'string') mat.note = o.note;
    if (o.dynamic !== undefined) {
      if (typeof o.dynamic !== 'object' || o.dynamic === null) bad(file, `${w} dynamic`, 'must be an object');
      const dy = o.dynamic as Obj;
      mat.dynamic = {};
      if (dy.L !== undefined) mat.dynamic.L = parseRateLaw(dy.L, 'distance', file, `${w} dynamic.L`);
      if (dy.sigma0 !== undefined) mat.dynamic.sigma0 = parseRateLaw(dy.sigma0, 'stress', file, `${w} dynamic.sigma0`);
    }
    return mat;
  });
}

/** Split one CSV line (RFC 4180 quoting, no line breaks inside fields). */
function csvCells(line: string): string[] {
  const out: string[] = [];
  let cur = '';
  let q = false;
  for (let i = 0; i < line.length; i++) {
    const c = line[i];
    if (q) {
      if (c === '"' && line[i + 1] === '"') {
        cur += '"';
        i++;
      } else if (c === '"') q = false;
      else cur += c;
    } else if (c === '"') q = true;
    else if (c === ',') {
      out.push(cur.trim());
      cur = '';
    } else cur += c;
  }
  out.push(cur.trim());
  return out;
}

function parseCsvSheet(text: string, file: string): Material[] {
  const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/);
  let cols: string[] | undefined;
  const rows = new Map<string, { invented: boolean; props: Record<string, Obj>; line: number }>();
  for (let i = 0; i < lines.length; i++) {
    const raw = lines[i].trim();
    if (raw === '' || raw.startsWith('#')) continue;
    const cells = csvCells(raw);
    const where = `line ${i + 1}`;
    if (!cols) {
      cols = cells.map((c) => c.toLowerCase());
      for (const need of ['name', 'property', 'value', 'unit', 'source']) {
        if (!cols.includes(need)) bad(file, where, `header lacks the column "${need}" (expected name,property,value,unit,sd,source)`);
      }
      continue;
    }
    const get = (k: string): string => cells[(cols as string[]).indexOf(k)] ?? '';
    const name = get('name');
    if (name === '') bad(file, where, 'name is missing');
    const prop = get('property');
    if (prop !== 'fractureToughness' && prop !== 'inherentStrength') bad(file, `${where} material "${name}"`, `property must be fractureToughness or inherentStrength, got "${prop}"`);
    const num = (k: string, optional: boolean): number | undefined => {
      const s = get(k);
      if (s === '') {
        if (optional) return undefined;
        bad(file, `${where} material "${name}" ${prop}.${k}`, 'is missing');
      }
      const v = Number(s);
      if (!Number.isFinite(v) || !/^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/.test(s)) bad(file, `${where} material "${name}" ${prop}.${k}`, `"${s}" is not a number`);
      return v;
    };
    const entry = rows.get(name) ?? { invented: false, props: {}, line: i + 1 };
    if (entry.props[prop]) bad(file, `${where} material "${name}"`, `${prop} is given twice`);
    entry.props[prop] = { value: num('value', false), unit: get('unit'), sd: num('sd', true), source: get('source') };
    if (/^(true|yes|1)$/i.test(get('invented'))) entry.invented = true;
    rows.set(name, entry);
  }
  if (!cols) bad(file, 'document', 'is empty');
  if (rows.size === 0) bad(file, 'document', 'lists no materials');
  return [...rows.entries()].map(([name, e]) => ({
    name,
    invented: e.invented,
    fractureToughness: parseValue(e.props.fractureToughness, 'toughness', file, `material "${name}" fractureToughness`),
    inherentStrength: parseValue(e.props.inherentStrength, 'stress', file, `material "${name}" inherentStrength`),
  }));
}

/**
 * Parse and validate a material sheet (JSON when the text starts with `{`, CSV otherwise).
 * @param text file contents
 * @param fileName used in every message
 * @returns the materials in engine units (MPa·√m, MPa, µm, 1/s)
 * @throws FractozoneError BAD_MATERIAL naming the file, material and field (negative, zero, NaN,
 *   missing or unknown unit, missing source, ...)
 */
export function parseMaterialSheet(text: string, fileName: string): Material[] {
  if (text.trim() === '') throw new FractozoneError('BAD_MATERIAL', `${fileName}: the material sheet is empty`);
  return text.trimStart().startsWith('{') ? parseJsonSheet(text, fileName) : parseCsvSheet(text, fileName);
}

/**
 * Pick one material by exact name.
 * @throws FractozoneError BAD_MATERIAL listing the available names
 */
export function selectMaterial(materials: Material[], name: string, fileName: string): Material {
  const m = materials.find((x) => x.name === name);
  if (!m) throw new FractozoneError('BAD_MATERIAL', `${fileName}: no material named "${name}" (available: ${materials.map((x) => `"${x.name}"`).join(', ')})`);
  return m;
}

/**
 * Split a `FILE:NAME` reference at its last colon.
 * @throws FractozoneError BAD_PARAMETER when either part is empty
 */
export function splitMaterialRef(ref: string): { file: string; name: string } {
  const i = ref.lastIndexOf(':');
  if (i <= 0 || i === ref.length - 1) {
    throw new FractozoneError('BAD_PARAMETER', `material "${ref}" must be written FILE:NAME, e.g. materials.json:ZX-17 (invented)`);
  }
  return { file: ref.slice(0, i), name: ref.slice(i + 1) };
}

/** Convert a value to engine units (re-exported helper for shells). */
export { toEngineUnit };
