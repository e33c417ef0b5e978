/**
 * Scale model: how many micrometres one pixel spans, and where that figure came from.
 *
 * Pixels may be non-square: `umPerPxX` is the pixel pitch along image x (columns), `umPerPxY` along
 * image y (rows). `umPerPx = √(umPerPxX · umPerPxY)` is the geometric mean, i.e. the side of a square
 * pixel of the same area; it equals both pitches when pixels are square and is what single-number
 * consumers (e.g. radial band widths) use. Consumers that measure along arbitrary directions on
 * non-square pixels should use {@link lengthUmBetween} instead.
 */
import { FractozoneError } from '../errors.js';
import { parseLengthUm } from '../units/units.js';
import type { PointPx } from '../image/geometry.js';
import type { ScaleBar } from './scaleBar.js';

/** Scale information read from file metadata (TIFF resolution tags, PNG pHYs chunk). */
export interface MetadataScaleLike {
  umPerPxX: number;
  umPerPxY: number;
  source: 'tiff-resolution' | 'png-phys';
  note?: string;
}

/** Where a scale came from. */
export type ScaleSource = 'typed' | 'two-point' | 'metadata' | 'scale-bar';


/** Two points a known distance apart, as used by {@link scaleFromTwoPoints}. */
export interface TwoPointInput {
  p0: PointPx;
  p1: PointPx;
  /** Real distance between the two points, µm. */
  distanceUm: number;
  /** Pixel aspect umPerPxY / umPerPxX (1 = square pixels, the default). */
  aspect?: number;
}

/** The scale of an image. */
export interface Scale {
  /** Pixel pitch along x (columns), µm/px. */
  umPerPxX: number;
  /** Pixel pitch along y (rows), µm/px. */
  umPerPxY: number;
  /** √(umPerPxX·umPerPxY), µm/px: the side of the equal-area square pixel. */
  umPerPx: number;
  source: ScaleSource;
  /** Human-readable origin, e.g. "scale bar 500 µm = 125.0 px". */
  detail: string;
  /** The detected bar, when source is 'scale-bar'. */
  bar?: ScaleBar;
  /** The two points, when source is 'two-point'. */
  twoPoint?: { p0: PointPx; p1: PointPx; distanceUm: number; distancePx: number; aspect: number };
}

function checkPositive(v: number, what: string): void {
  if (typeof v !== 'number' || !Number.isFinite(v) || v <= 0) {
    throw new FractozoneError('BAD_SCALE', `${what} must be a positive finite number, got ${String(v)}`);
  }
}

function fmt(v: number): string {
  return Number(v.toPrecision(6)).toString();
}

function makeScale(x: number, y: number, source: ScaleSource, detail: string): Scale {
  return { umPerPxX: x, umPerPxY: y, umPerPx: Math.sqrt(x * y), source, detail };
}

/**
 * Scale from a typed pixel size.
 * @param umPerPx pixel size along x: a number in µm/px, or a length text such as "4um", "0.5mm", "350nm" (per pixel).
 * @param umPerPxY pixel size along y (same forms); defaults to `umPerPx` (square pixels).
 * @returns a Scale with source 'typed'.
 * @throws FractozoneError BAD_SCALE / BAD_PARAMETER for zero, negative, NaN or unit-less text.
 */
export function scaleFromPixelSize(umPerPx: number | string, umPerPxY?: number | string): Scale {
  const toUm = (v: number | string, what: string): number => {
    if (typeof v === 'string') return parseLengthUm(v, what);
    checkPositive(v, what);
    return v;
  };
  const x = toUm(umPerPx, 'pixel size');
  const y = umPerPxY === undefined ? x : toUm(umPerPxY, 'pixel size along y');
  const detail = x === y ? `typed pixel size ${fmt(x)} µm/px` : `typed pixel size ${fmt(x)} × ${fmt(y)} µm/px (x × y)`;
  return makeScale(x, y, 'typed', detail);
}

/**
 * Scale from two points a known distance apart (e.g. two graduations of a stage micrometer).
 *
 * With a pixel aspect a = umPerPxY/umPerPxX, the distance in x-pixel units is
 * d = √(Δx² + (a·Δy)²), so umPerPxX = distanceUm / d and umPerPxY = a·umPerPxX.
 * @param p0 first point, px (image coordinates).
 * @param p1 second point, px.
 * @param distanceUm real distance between them, µm (> 0).
 * @param opts.aspect pixel aspect umPerPxY/umPerPxX (default 1, square pixels).
 * @returns a Scale with source 'two-point'.
 * @throws FractozoneError BAD_SCALE for coincident points, non-finite coordinates or a non-positive distance.
 */
export function scaleFromTwoPoints(p0: PointPx, p1: PointPx, distanceUm: number, opts: { aspect?: number } = {}): Scale {
  for (const [p, n] of [
    [p0, 'first point'],
    [p1, 'second point'],
  ] as const) {
    if (!p || !Number.isFinite(p.x) || !Number.isFinite(p.y)) {
      throw new FractozoneError('BAD_SCALE', `the ${n} of the two-point scale has no finite x, y coordinates`);
    }
  }
  checkPositive(distanceUm, 'the two-point distance (µm)');
  const aspect = opts.aspect ?? 1;
  checkPositive(aspect, 'the pixel aspect (y/x)');
  const dx = p1.x - p0.x;
  const dy = (p1.y - p0.y) * aspect;
  const d = Math.hypot(dx, dy);
  if (!(d >= 1e-6)) {
    throw new FractozoneError('BAD_SCALE', 'the two points of the two-point scale coincide; pick two points apart');
  }
  const x = distanceUm / d;
  const s = makeScale(x, x * aspect, 'two-point', `two points ${fmt(distanceUm)} µm apart = ${d.toFixed(1)} px`);
  s.twoPoint = { p0: { ...p0 }, p1: { ...p1 }, distanceUm, distancePx: d, aspect };
  return s;
}

/**
 * Scale from file metadata (resolution tags).
 * @param m metadata scale, µm/px along x and y.
 * @returns a Scale with source 'metadata'.
 * @throws FractozoneError BAD_SCALE when either pitch is not a positive finite number.
 */
export function scaleFromMetadata(m: MetadataScaleLike): Scale {
  checkPositive(m?.umPerPxX, 'the metadata pixel size along x');
  checkPositive(m?.umPerPxY, 'the metadata pixel size along y');
  const what = m.source === 'tiff-resolution' ? 'TIFF resolution tags' : 'PNG pHYs chunk';
  const size = m.umPerPxX === m.umPerPxY ? `${fmt(m.umPerPxX)} µm/px` : `${fmt(m.umPerPxX)} × ${fmt(m.umPerPxY)} µm/px (x × y)`;
  return makeScale(m.umPerPxX, m.umPerPxY, 'metadata', `${what}: ${size}${m.note ? ` (${m.note})` : ''}`);
}

/**
 * Scale from a detected (or user-placed) scale bar and its printed length.
 *
 * A horizontal bar calibrates x, a vertical bar calibrates y. The other axis is taken equal (square
 * pixels) unless `aspect` (umPerPxY/umPerPxX, e.g. from metadata) says otherwise.
 * @param bar the bar; `lengthPx` is its edge-to-edge length in px.
 * @param barLengthUm the length printed on the bar, µm.
 * @param aspect pixel aspect umPerPxY/umPerPxX (default 1).
 * @returns a Scale with source 'scale-bar'.
 * @throws FractozoneError BAD_SCALE for a non-positive length or bar length.
 */
export function scaleFromBar(bar: ScaleBar, barLengthUm: number, aspect = 1): Scale {
  checkPositive(barLengthUm, 'the scale-bar length (µm)');
  checkPositive(bar?.lengthPx, 'the scale-bar length in pixels');
  checkPositive(aspect, 'the pixel aspect (y/x)');
  const per = barLengthUm / bar.lengthPx;
  const x = bar.orientation === 'vertical' ? per / aspect : per;
  const y = bar.orientation === 'vertical' ? per : per * aspect;
  const s = makeScale(x, y, 'scale-bar', `scale bar ${fmt(barLengthUm)} µm = ${bar.lengthPx.toFixed(1)} px (${bar.orientation})`);
  s.bar = bar;
  return s;
}

/** Inputs to {@link chooseScale}; any may be missing. */
export interface ScaleChoiceInput {
  /** Typed pixel size: µm/px number or text like "4um"; or {x, y} for non-square pixels. */
  typed?: number | string | { x: number | string; y: number | string };
  twoPoint?: TwoPointInput;
  /** Printed length of the scale bar, µm; the detected `bar` is only used when this is given. */
  barLengthUm?: number;
  bar?: ScaleBar | null;
  metadata?: MetadataScaleLike | null;
}

/**
 * Pick the scale of an image from what is available. Precedence (first available wins):
 * typed pixel size > two points > scale bar (only when its printed length is given) > file metadata.
 * An explicit user statement beats anything read from the image. When the scale comes from a bar and
 * metadata is also present, the metadata's pixel aspect (Y/X) is carried over; otherwise pixels are
 * assumed square.
 * @returns the chosen Scale.
 * @throws FractozoneError BAD_SCALE when nothing gives a scale (or a bar was found but no bar length
 * was given), with a message that says what to supply.
 */
export function chooseScale(input: ScaleChoiceInput): Scale {
  const { typed, twoPoint, barLengthUm, bar, metadata } = input;
  if (typed !== undefined) {
    if (typeof typed === 'object') return scaleFromPixelSize(typed.x, typed.y);
    return scaleFromPixelSize(typed);
  }
  if (twoPoint) return scaleFromTwoPoints(twoPoint.p0, twoPoint.p1, twoPoint.distanceUm, { aspect: twoPoint.aspect });
  if (barLengthUm !== undefined) {
    if (!bar) {
      if (metadata) return scaleFromMetadata(metadata);
      throw new FractozoneError(
        'BAD_SCALE',
        'a scale-bar length was given but no scale bar was found in the image; give the pixel size or two points instead',
      );
    }
    const aspect = metadata ? metadata.umPerPxY / metadata.umPerPxX : 1;
    return scaleFromBar(bar, barLengthUm, aspect);
  }
  if (metadata) return scaleFromMetadata(metadata);
  if (bar) {
    throw new FractozoneError(
      'BAD_SCALE',
      `a scale bar of ${bar.lengthPx.toFixed(1)} px was found but its length is unknown; give the printed bar length (e.g. 500um)`,
    );
  }
  throw new FractozoneError(
    'BAD_SCALE',
    'the image has no scale: give the pixel size (e.g. 4um), two points a known distance apart, or the scale-bar length',
  );
}

/**
 * Physical distance between two image points, honouring non-square pixels:
 * √((Δx·umPerPxX)² + (Δy·umPerPxY)²).
 * @param p0 first point, px. @param p1 second point, px. @param scale the image scale.
 * @returns distance in µm.
 */
export function lengthUmBetween(p0: PointPx, p1: PointPx, scale: Pick<Scale, 'umPerPxX' | 'umPerPxY'>): number {
  return Math.hypot((p1.x - p0.x) * scale.umPerPxX, (p1.y - p0.y) * scale.umPerPxY);
}
