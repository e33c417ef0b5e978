/**
 * The `measure` options, shared by `measure` and `batch` (where they are the defaults for every
 * image). Parsing only: turns option strings into a validated MeasureParams.
 */
import { readFileSync } from 'node:fs';
import type { Command } from 'commander';
import {
  DEFAULT_FEATURES,
  defaultParams,
  FEATURE_NAMES,
  FractozoneError,
  parseFeatureList,
  parseLengthUm,
  parseQuantity,
  validateParams,
  type MeasureParams,
  type PointPx,
} from '../core/index.js';
import { loadMaterial, parseStrainRate } from './commands/criticalDistance.js';

export interface MeasureCliOptions {
  pixelSize?: string;
  pixelSizeY?: string;
  barLength?: string;
  twoPoint?: string;
  metadata?: boolean;
  window?: string;
  sectionDiameter?: string;
  features?: string;
  rays?: string;
  exclude?: string[];
  dropOutliers?: boolean;
  outlierK?: string;
  bootstrap?: string;
  seed?: string;
  boundary?: string;
  maxPixels?: string;
  material?: string;
  toughness?: string;
  toughnessSd?: string;
  strength?: string;
  strengthSd?: string;
  strainRate?: string;
  reference?: string;
  tolerance?: string;
  verdictBasis?: string;
  pixelSizeTolerance?: string;
  model?: string;
}

const collect = (v: string, prev: string[] = []): string[] => [...prev, v];

export function addMeasureOptions(cmd: Command): Command {
  return cmd
    .option('--pixel-size <length>', 'pixel size with unit, e.g. 4um, 0.004mm, 350nm')
    .option('--pixel-size-y <length>', 'vertical pixel size if pixels are not square')
    .option('--bar-length <length>', 'real length of the burned-in scale bar, e.g. 500um (bar found automatically)')
    .option('--two-point <x0,y0,x1,y1,length>', 'two image points (px) and their real distance, e.g. 100,900,600,900,2mm')
    .option('--no-metadata', 'ignore the pixel size in TIFF/PNG metadata')
    .option('--section-diameter <length>', 'net-section diameter at the notch root from the specimen drawing, e.g. 5mm: guides the outline and cross-checks the scale (warning above 3 %)')
    .option('--window <length>', 'texture window side, e.g. 40um (default: automatic from the specimen size)')
    .option('--features <list>', `roughness features to combine, comma-separated (default ${DEFAULT_FEATURES.join(',')}; known: ${FEATURE_NAMES.join(', ')})`)
    .option('--rays <n>', 'number of rays around the circumference', '360')
    .option('--exclude <from-to>', 'exclude an angular sector in degrees, e.g. 80-110 (repeatable; 350-10 wraps)', collect, [])
    .option('--drop-outliers', 'leave MAD-flagged rays out of the statistics (they stay flagged in the profile)')
    .option('--outlier-k <k>', 'outlier threshold k in |w − median| > k·1.4826·MAD', '3.5')
    .option('--bootstrap <n>', 'bootstrap resamples for the interval of the median (blocks of correlated rays)', '2000')
    .option('--seed <n>', 'random seed (bootstrap, Monte Carlo)', '1')
    .option('--boundary <file.json>', 'boundary polygon (JSON [{x,y},…] in px) to measure instead of the automatic one')
    .option('--max-pixels <n>', 'refuse images larger than this many pixels', '100000000')
    .option('--material <file:name>', 'material sheet and material name, e.g. samples/materials.json:"FZ-7 (invented alloy)"')
    .option('--toughness <K>', 'fracture toughness K_c, e.g. 48 (MPa·√m) or 44ksi*sqrt(in); overrides the material sheet')
    .option('--toughness-sd <K>', 'standard deviation of K_c (same unit)')
    .option('--strength <sigma0>', 'inherent strength σ0, e.g. 1150 (MPa) or 167ksi; overrides the material sheet')
    .option('--strength-sd <sigma0>', 'standard deviation of σ0 (same unit)')
    .option('--strain-rate <1/s>', 'strain rate of the test in 1/s (selects L(ε̇) for dynamic materials)')
    .option('--reference <L|L/2|2L>', 'what the band width is compared with', 'L')
    .option('--tolerance <percent>', 'agreement band ±X % around the reference (20 % is common practice)', '20')
    .option('--verdict-basis <basis>', 'width interval the comparison with L uses: measurement (this specimen), circumferential, or measurement+method', 'measurement')
    .option('--pixel-size-tolerance <percent>', 'tolerance of a typed or metadata pixel size, half-width of its 95 % interval in % (default 0.5)')
    .option('--model <file.json>', 'segment with a pixel classifier made by `fractozone teach` (fractozone.model/1) instead of the fixed rules');
}

function num(text: string | undefined, what: string, integer = false): number | undefined {
  if (text === undefined) return undefined;
  const v = Number(text);
  if (text.trim() === '' || !Number.isFinite(v) || (integer && !Number.isInteger(v))) {
    throw new FractozoneError('BAD_PARAMETER', `${what} "${text}" is not ${integer ? 'an integer' : 'a number'}`);
  }
  return v;
}

/** "80-110" → [80, 110]; negative starts allowed as "-20-20"? Use "340-20" instead (wraps). */
export function parseSector(text: string): [number, number] {
  const m = /^\s*(\d+(?:\.\d+)?)\s*(?:-|\.\.|:)\s*(\d+(?:\.\d+)?)\s*$/.exec(text);
  if (!m) throw new FractozoneError('BAD_PARAMETER', `exclusion sector "${text}" must look like 80-110 (degrees; 350-10 wraps)`);
  const a = Number(m[1]);
  const b = Number(m[2]);
  if (a > 360 || b > 360) throw new FractozoneError('BAD_PARAMETER', `exclusion sector "${text}": angles must be 0..360 degrees`);
  return [a, b];
}

export function parseTwoPoint(text: string): { p0: PointPx; p1: PointPx; distanceUm: number } {
  const parts = text.split(',').map((s) => s.trim());
  if (parts.length !== 5) {
    throw new FractozoneError('BAD_PARAMETER', `--two-point "${text}" must be x0,y0,x1,y1,length (e.g. 100,900,600,900,2mm)`);
  }
  const [x0, y0, x1, y1] = parts.slice(0, 4).map((s, i) => num(s, `--two-point coordinate ${i + 1}`) as number);
  return { p0: { x: x0, y: y0 }, p1: { x: x1, y: y1 }, distanceUm: parseLengthUm(parts[4], '--two-point length') };
}

export function readBoundaryFile(path: string): PointPx[] {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch {
    throw new FractozoneError('BAD_BOUNDARY', `cannot read boundary file "${path}"`);
  }
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch (e) {
    throw new FractozoneError('BAD_BOUNDARY', `boundary file "${path}" is not valid JSON: ${(e as Error).message}`);
  }
  // Accept a bare array, {polygon:[…]}, or a result JSON's band.boundary.polygon.
  const obj = data as { polygon?: unknown; band?: { boundary?: { polygon?: unknown } } };
  const arr = Array.isArray(data) ? data : (obj?.polygon ?? obj?.band?.boundary?.polygon);
  if (!Array.isArray(arr)) {
    throw new FractozoneError('BAD_BOUNDARY', `boundary file "${path}" must hold an array of {x, y} points (px), or {"polygon": [...]}`);
  }
  return arr.map((q: unknown, i: number) => {
    const p = Array.isArray(q) ? { x: q[0], y: q[1] } : (q as PointPx);
    if (!p || typeof p.x !== 'number' || typeof p.y !== 'number' || !Number.isFinite(p.x) || !Number.isFinite(p.y)) {
      throw new FractozoneError('BAD_BOUNDARY', `boundary file "${path}": point ${i} is not {x, y} with finite numbers`);
    }
    return { x: p.x, y: p.y };
  });
}

/** --material / --toughness / --strength → the material block of the parameters (null if none). */
export function materialFromOptions(o: MeasureCliOptions): MeasureParams['material'] {
  if (!o.material && !o.toughness && !o.strength) {
    if (o.toughnessSd || o.strengthSd) throw new FractozoneError('BAD_PARAMETER', 'a standard deviation needs its value: give --toughness / --strength too');
    return null;
  }
  const out: NonNullable<MeasureParams['material']> = {};
  if (o.material) out.material = loadMaterial(o.material);
  if (o.toughness) {
    out.toughness = { value: parseQuantity(o.toughness, 'toughness', '--toughness'), source: 'command line' };
    if (o.toughnessSd) out.toughness.sd = parseQuantity(o.toughnessSd, 'toughness', '--toughness-sd');
  } else if (o.toughnessSd) throw new FractozoneError('BAD_PARAMETER', '--toughness-sd needs --toughness');
  if (o.strength) {
    out.strength = { value: parseQuantity(o.strength, 'stress', '--strength'), source: 'command line' };
    if (o.strengthSd) out.strength.sd = parseQuantity(o.strengthSd, 'stress', '--strength-sd');
  } else if (o.strengthSd) throw new FractozoneError('BAD_PARAMETER', '--strength-sd needs --strength');
  if (!out.material && (!out.toughness || !out.strength)) {
    throw new FractozoneError('BAD_PARAMETER', 'the critical distance needs both --toughness and --strength, or --material FILE:NAME');
  }
  return out;
}

/** Options → parameters (material resolution is done by the caller, which may read a sheet). */
export function paramsFromOptions(o: MeasureCliOptions, base: MeasureParams = defaultParams()): MeasureParams {
  const p: MeasureParams = structuredClone(base);
  if (o.pixelSize !== undefined) p.scale.pixelSizeUm = parseLengthUm(o.pixelSize, '--pixel-size');
  if (o.pixelSizeY !== undefined) p.scale.pixelSizeYUm = parseLengthUm(o.pixelSizeY, '--pixel-size-y');
  if (o.barLength !== undefined) p.scale.barLengthUm = parseLengthUm(o.barLength, '--bar-length');
  if (o.twoPoint !== undefined) p.scale.twoPoint = parseTwoPoint(o.twoPoint);
  if (o.metadata === false) p.scale.useMetadata = false;
  if (o.window !== undefined) p.windowUm = parseLengthUm(o.window, '--window');
  if (o.sectionDiameter !== undefined) p.sectionDiameterUm = parseLengthUm(o.sectionDiameter, '--section-diameter');
  if (o.features !== undefined) p.features = parseFeatureList(o.features);
  if (o.rays !== undefined) p.nRays = num(o.rays, '--rays', true) as number;
  if (o.exclude && o.exclude.length) p.exclude = o.exclude.flatMap((s) => s.split(',')).filter((s) => s.trim()).map(parseSector);
  if (o.dropOutliers) p.dropOutliers = true;
  if (o.outlierK !== undefined) p.outlierK = num(o.outlierK, '--outlier-k') as number;
  if (o.bootstrap !== undefined) p.bootstrap = num(o.bootstrap, '--bootstrap', true) as number;
  if (o.seed !== undefined) p.seed = num(o.seed, '--seed', true) as number;
  if (o.boundary !== undefined) p.boundaryPolygon = readBoundaryFile(o.boundary);
  if (o.maxPixels !== undefined) p.maxPixels = num(o.maxPixels, '--max-pixels') as number;
  if (o.strainRate !== undefined) p.strainRatePerS = parseStrainRate(o.strainRate);
  const mat = materialFromOptions(o);
  if (mat) p.material = mat;
  if (o.reference !== undefined) p.reference = o.reference as MeasureParams['reference'];
  if (o.tolerance !== undefined) p.tolerancePct = num(o.tolerance, '--tolerance') as number;
  if (o.verdictBasis !== undefined) p.verdictBasis = o.verdictBasis as MeasureParams['verdictBasis'];
  if (o.pixelSizeTolerance !== undefined) p.scale.pixelSizeTolerancePct = num(o.pixelSizeTolerance.replace(/\s*%$/, ''), '--pixel-size-tolerance') as number;
  return validateParams(p);
}
