/**
 * Pixel size from image file metadata: TIFF XResolution / YResolution / ResolutionUnit (TIFF 6.0
 * specification, Adobe 1992, section 8 "Baseline Fields", tags 282, 283, 296) and the PNG pHYs chunk
 * (PNG specification, W3C Recommendation, 2nd ed. 2003, section 11.3.5.3).
 *
 * Rule for "physical or default" (documented in DOCS):
 * - TIFF ResolutionUnit 1 (none), a missing or non-positive resolution → no physical size.
 * - PNG pHYs unit 0 (aspect ratio only) → no physical size.
 * - Square pixels whose density, expressed in dots per inch, lies within 0.5 % of a common
 *   screen/printer/camera default (72, 96, 100, 120, 144, 150, 180, 200, 240, 300, 350, 360, 400,
 *   600, 720, 800, 1200, 2400 dpi; common practice, no source) are taken as a software default, not a
 *   microscope calibration → null with a note. This covers the PNG pHYs values 2835 and 3780 px/m
 *   (72 and 96 dpi) and the cm equivalents (28.35, 37.8 px/cm ...).
 * - Everything else is taken as a physical pixel size, non-square pixels included
 *   (umPerPxX ≠ umPerPxY). Pixels below 1 µm (SEM close-ups) are taken with a note; pixels above
 *   1 mm are refused as implausible for a fracture image (null with a note).
 */
import type { MetadataScale } from '../decode/types.js';

/** Result of a metadata look-up: the scale (or null) and, when there is one, a remark why. */
export interface MetadataScaleResult {
  scale: MetadataScale | null;
  note?: string;
}

/** TIFF resolution fields as stored (pixels per ResolutionUnit). */
export interface TiffResolutionFields {
  /** Tag 282, pixels per unit along x. */
  xResolution?: number;
  /** Tag 283, pixels per unit along y. */
  yResolution?: number;
  /** Tag 296: 1 = none, 2 = inch (the TIFF default when absent), 3 = centimetre. */
  resolutionUnit?: number;
}

/** PNG pHYs fields as stored. */
export interface PngPhysFields {
  /** Pixels per unit, x. */
  x: number;
  /** Pixels per unit, y. */
  y: number;
  /** 0 = unknown (aspect ratio only), 1 = metre. */
  unit: number;
}

/** Densities (dots per inch) written by software when nobody calibrated anything (common practice, no source). */
export const DEFAULT_DPI_VALUES: readonly number[] = Object.freeze([
  72, 96, 100, 120, 144, 150, 180, 200, 240, 300, 350, 360, 400, 600, 720, 800, 1200, 2400,
]);

const UM_PER_INCH = 25400;
const UM_PER_CM = 10000;
const UM_PER_M = 1e6;
const DEFAULT_TOLERANCE = 0.005;
const MAX_PLAUSIBLE_UM = 1000;

function defaultDpi(dpiX: number, dpiY: number): number | null {
  if (Math.abs(dpiX - dpiY) > DEFAULT_TOLERANCE * Math.max(dpiX, dpiY)) return null;
  for (const d of DEFAULT_DPI_VALUES) {
    if (Math.abs(dpiX - d) <= DEFAULT_TOLERANCE * d && Math.abs(dpiY - d) <= DEFAULT_TOLERANCE * d) return d;
  }
  return null;
}

function fromDensity(
  pxPerUnitX: number,
  pxPerUnitY: number,
  umPerUnit: number,
  unitName: string,
  source: MetadataScale['source'],
): MetadataScaleResult {
  if (!(pxPerUnitX > 0) || !(pxPerUnitY > 0) || !Number.isFinite(pxPerUnitX) || !Number.isFinite(pxPerUnitY)) {
    return { scale: null, note: `the file's resolution (${pxPerUnitX} × ${pxPerUnitY} px per ${unitName}) is not a positive number` };
  }
  const dflt = defaultDpi((pxPerUnitX * UM_PER_INCH) / umPerUnit, (pxPerUnitY * UM_PER_INCH) / umPerUnit);
  if (dflt !== null) {
    return {
      scale: null,
      note: `the file's resolution (${fmt(pxPerUnitX)} px per ${unitName}, ${dflt} dpi) is a screen or printer default, not a physical pixel size`,
    };
  }
  const umPerPxX = umPerUnit / pxPerUnitX;
  const umPerPxY = umPerUnit / pxPerUnitY;
  if (umPerPxX > MAX_PLAUSIBLE_UM || umPerPxY > MAX_PLAUSIBLE_UM) {
    return {
      scale: null,
      note: `the file's resolution implies a pixel of ${fmt(umPerPxX)} × ${fmt(umPerPxY)} µm, too coarse for a fracture image; ignored`,
    };
  }
  const scale: MetadataScale = { umPerPxX, umPerPxY, source };
  if (umPerPxX < 1 || umPerPxY < 1) scale.note = 'sub-micrometre pixel size from the file metadata';
  return { scale, note: scale.note };
}

function fmt(v: number): string {
  return Number(v.toPrecision(6)).toString();
}

/**
 * Pixel size from TIFF resolution tags.
 *
 * @param f - XResolution, YResolution (pixels per unit) and ResolutionUnit (1 none, 2 inch — the
 *   TIFF 6.0 default when the tag is absent, 3 cm), TIFF 6.0 specification section 8
 * @returns `{ scale }` with µm per pixel along x and y when the tags give a physical size, else
 *   `{ scale: null, note }` (no tags, unit "none", a screen/printer default such as 72 dpi)
 */
export function metadataScaleFromTiff(f: TiffResolutionFields): MetadataScaleResult {
  if (f.xResolution === undefined && f.yResolution === undefined) {
    return { scale: null, note: 'the file has no resolution tags' };
  }
  const unit = f.resolutionUnit ?? 2;
  if (unit === 1) return { scale: null, note: 'the file gives only a pixel aspect ratio (resolution unit "none")' };
  if (unit !== 2 && unit !== 3) return { scale: null, note: `the file's resolution unit ${unit} is not defined by TIFF 6.0` };
  const x = f.xResolution ?? f.yResolution ?? 0;
  const y = f.yResolution ?? f.xResolution ?? 0;
  return unit === 2
    ? fromDensity(x, y, UM_PER_INCH, 'inch', 'tiff-resolution')
    : fromDensity(x, y, UM_PER_CM, 'cm', 'tiff-resolution');
}

/**
 * Pixel size from a PNG pHYs chunk.
 *
 * @param phys - pixels per unit along x and y and the unit (1 = metre, 0 = aspect ratio only),
 *   PNG specification 2nd ed. section 11.3.5.3; `undefined` when the chunk is absent
 * @returns `{ scale }` in µm per pixel when physical, else `{ scale: null, note }` (no chunk, unit 0,
 *   2835 or 3780 px/m = 72 / 96 dpi screen defaults, ...)
 */
export function metadataScaleFromPng(phys: PngPhysFields | undefined): MetadataScaleResult {
  if (!phys) return { scale: null, note: 'the file has no pHYs chunk' };
  if (phys.unit !== 1) return { scale: null, note: 'the pHYs chunk gives only a pixel aspect ratio (unit unknown)' };
  return fromDensity(phys.x, phys.y, UM_PER_M, 'metre', 'png-phys');
}
