import { describe, expect, it } from 'vitest';
import { parseLengthUm } from '../../src/core/units/units.js';
import { FractozoneError } from '../../src/core/errors.js';

describe('parseLengthUm', () => {
  it.each([
    ['4um', 4],
    ['4 µm', 4],
    ['4μm', 4],
    ['0.5mm', 500],
    ['350nm', 0.35],
    ['1e-3mm', 1],
  ])('%s → %d µm', (t, v) => {
    expect(parseLengthUm(t)).toBeCloseTo(v, 12);
  });
  it.each(['4', 'abc', '-3um', '0um', '4 furlongs', 'NaNum', ''])('refuses %j with a usage error', (t) => {
    expect(() => parseLengthUm(t)).toThrow(FractozoneError);
    try {
      parseLengthUm(t);
    } catch (e) {
      expect((e as FractozoneError).kind).toBe('usage');
    }
  });
});
