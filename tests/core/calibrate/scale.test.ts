import { describe, expect, it } from 'vitest';
import {
  chooseScale,
  lengthUmBetween,
  scaleFromBar,
  scaleFromMetadata,
  scaleFromPixelSize,
  scaleFromTwoPoints,
  type ScaleBar,
} from '../../../src/core/calibrate/index.js';
import { FractozoneError } from '../../../src/core/errors.js';

const bar = (lengthPx: number, orientation: 'horizontal' | 'vertical' = 'horizontal'): ScaleBar => ({
  x0: 10,
  y0: 20,
  x1: 10 + lengthPx - 1,
  y1: 20,
  lengthPx,
  thicknessPx: 4,
  orientation,
  polarity: 'light',
  confidence: 0.9,
});

function codeOf(fn: () => unknown): string | undefined {
  try {
    fn();
  } catch (e) {
    if (e instanceof FractozoneError) return e.code;
    return 'OTHER';
  }
  return undefined;
}

describe('scaleFromPixelSize', () => {
  it('takes numbers and length texts', () => {
    expect(scaleFromPixelSize(4).umPerPx).toBe(4);
    expect(scaleFromPixelSize('0.5mm').umPerPxX).toBe(500);
    expect(scaleFromPixelSize('350nm').umPerPxY).toBeCloseTo(0.35, 12);
    const s = scaleFromPixelSize(2, 8);
    expect([s.umPerPxX, s.umPerPxY, s.umPerPx]).toEqual([2, 8, 4]); // √(2·8) = 4
    expect(s.source).toBe('typed');
    expect(s.detail).toMatch(/µm\/px/);
  });
  it('refuses zero, negative, NaN and unit-less text', () => {
    expect(codeOf(() => scaleFromPixelSize(0))).toBe('BAD_SCALE');
    expect(codeOf(() => scaleFromPixelSize(-1))).toBe('BAD_SCALE');
    expect(codeOf(() => scaleFromPixelSize(NaN))).toBe('BAD_SCALE');
    expect(codeOf(() => scaleFromPixelSize(Infinity))).toBe('BAD_SCALE');
    expect(codeOf(() => scaleFromPixelSize('4'))).toBe('BAD_PARAMETER');
    expect(codeOf(() => scaleFromPixelSize('abc'))).toBe('BAD_PARAMETER');
  });
});

describe('scaleFromTwoPoints', () => {
  it('3-4-5 triangle: 5 px apart, 100 µm → 20 µm/px', () => {
    const s = scaleFromTwoPoints({ x: 0, y: 0 }, { x: 3, y: 4 }, 100);
    expect(s.umPerPxX).toBeCloseTo(20, 12);
    expect(s.umPerPxY).toBeCloseTo(20, 12);
    expect(s.twoPoint?.distancePx).toBeCloseTo(5, 12);
    expect(s.source).toBe('two-point');
  });
  it('non-square pixels: aspect 2 doubles the y pitch', () => {
    // Δx = 6, Δy = 4 rows of pixels twice as tall → 6² + 8² = 10² x-pixels
    const s = scaleFromTwoPoints({ x: 1, y: 1 }, { x: 7, y: 5 }, 50, { aspect: 2 });
    expect(s.umPerPxX).toBeCloseTo(5, 12);
    expect(s.umPerPxY).toBeCloseTo(10, 12);
    expect(lengthUmBetween({ x: 1, y: 1 }, { x: 7, y: 5 }, s)).toBeCloseTo(50, 10);
  });
  it('refuses coincident points, bad distances and non-finite points', () => {
    expect(codeOf(() => scaleFromTwoPoints({ x: 2, y: 2 }, { x: 2, y: 2 }, 10))).toBe('BAD_SCALE');
    expect(codeOf(() => scaleFromTwoPoints({ x: 0, y: 0 }, { x: 2, y: 2 }, 0))).toBe('BAD_SCALE');
    expect(codeOf(() => scaleFromTwoPoints({ x: 0, y: 0 }, { x: 2, y: 2 }, -5))).toBe('BAD_SCALE');
    expect(codeOf(() => scaleFromTwoPoints({ x: 0, y: 0 }, { x: 2, y: 2 }, NaN))).toBe('BAD_SCALE');
    expect(codeOf(() => scaleFromTwoPoints({ x: NaN, y: 0 }, { x: 2, y: 2 }, 5))).toBe('BAD_SCALE');
    expect(codeOf(() => scaleFromTwoPoints({ x: 0, y: 0 }, { x: 2, y: 2 }, 5, { aspect: 0 }))).toBe('BAD_SCALE');
  });
});

describe('scaleFromBar / scaleFromMetadata', () => {
  it('500 µm over 125 px → 4 µm/px, square pixels assumed', () => {
    const s = scaleFromBar(bar(125), 500);
    expect(s.umPerPxX).toBe(4);
    expect(s.umPerPxY).toBe(4);
    expect(s.detail).toBe('scale bar 500 µm = 125.0 px (horizontal)');
    expect(s.bar?.lengthPx).toBe(125);
  });
  it('a vertical bar calibrates y; aspect carries to x', () => {
    const s = scaleFromBar(bar(100, 'vertical'), 200, 2);
    expect(s.umPerPxY).toBe(2);
    expect(s.umPerPxX).toBe(1);
  });
  it('metadata keeps non-square pixels', () => {
    const s = scaleFromMetadata({ umPerPxX: 1.5, umPerPxY: 3, source: 'tiff-resolution' });
    expect(s.umPerPx).toBeCloseTo(Math.sqrt(4.5), 12);
    expect(s.detail).toMatch(/TIFF/);
    expect(codeOf(() => scaleFromMetadata({ umPerPxX: 0, umPerPxY: 3, source: 'png-phys' }))).toBe('BAD_SCALE');
  });
  it('refuses bad bar lengths', () => {
    expect(codeOf(() => scaleFromBar(bar(125), 0))).toBe('BAD_SCALE');
    expect(codeOf(() => scaleFromBar(bar(0), 100))).toBe('BAD_SCALE');
  });
});

describe('chooseScale precedence: typed > two-point > bar (with length) > metadata', () => {
  const meta = { umPerPxX: 7, umPerPxY: 7, source: 'png-phys' as const };
  const tp = { p0: { x: 0, y: 0 }, p1: { x: 10, y: 0 }, distanceUm: 30 };
  it('typed wins over everything', () => {
    expect(chooseScale({ typed: '2um', twoPoint: tp, bar: bar(100), barLengthUm: 500, metadata: meta }).source).toBe('typed');
    expect(chooseScale({ typed: { x: 1, y: 2 } }).umPerPxY).toBe(2);
  });
  it('two points next', () => {
    expect(chooseScale({ twoPoint: tp, bar: bar(100), barLengthUm: 500, metadata: meta }).umPerPx).toBe(3);
  });
  it('bar with a length beats metadata and takes its aspect', () => {
    const s = chooseScale({ bar: bar(100), barLengthUm: 500, metadata: { umPerPxX: 1, umPerPxY: 2, source: 'tiff-resolution' } });
    expect(s.source).toBe('scale-bar');
    expect(s.umPerPxX).toBe(5);
    expect(s.umPerPxY).toBe(10);
  });
  it('bar without length falls back to metadata', () => {
    expect(chooseScale({ bar: bar(100), metadata: meta }).source).toBe('metadata');
  });
  it('nothing usable → BAD_SCALE with a clear message', () => {
    expect(() => chooseScale({})).toThrow(/no scale/);
    expect(codeOf(() => chooseScale({}))).toBe('BAD_SCALE');
    expect(() => chooseScale({ bar: bar(100) })).toThrow(/length is unknown/);
    expect(() => chooseScale({ barLengthUm: 500, bar: null })).toThrow(/no scale bar was found/);
  });
});

describe('lengthUmBetween', () => {
  it('uses each axis pitch', () => {
    expect(lengthUmBetween({ x: 0, y: 0 }, { x: 3, y: 0 }, { umPerPxX: 2, umPerPxY: 5 })).toBe(6);
    expect(lengthUmBetween({ x: 0, y: 0 }, { x: 0, y: 3 }, { umPerPxX: 2, umPerPxY: 5 })).toBe(15);
    expect(lengthUmBetween({ x: 0, y: 0 }, { x: 3, y: 2 }, { umPerPxX: 4, umPerPxY: 8 })).toBe(20); // 12, 16 → 20
  });
});
