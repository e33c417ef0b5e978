import { describe, expect, it } from 'vitest';
import { parseCurveCsv } from '../../../src/core/tcd/index.js';

describe('parseCurveCsv', () => {
  it('reads distance_mm,stress_MPa with metadata comments', () => {
    const p = parseCurveCsv('# path from an invented FE model\n# analysis: elastoplastic\n# reference load: 10kN\ndistance_mm,stress_MPa\n0,300\n0.5,200\n1.0,150\n', 'a.csv');
    expect(p.r_m).toEqual([0, 0.5e-3, 1e-3]);
    expect(p.sigma_MPa).toEqual([300, 200, 150]);
    expect(p.analysis).toBe('elastoplastic');
    expect(p.referenceLoad).toEqual({ value: 10000, dimension: 'force', unit: 'N' });
    expect(p.curve.stressAt(0.25e-3)).toBeCloseTo(250, 12);
  });
  it('reads "r [um], sigma [GPa]" with semicolons and converts units', () => {
    const p = parseCurveCsv('r [um]; sigma [GPa]\n0; 0.3\n100; 0.2\n250; 0.1\n', 'b.csv');
    expect(p.r_m[2]).toBeCloseTo(250e-6, 15);
    expect(p.sigma_MPa).toEqual([300, 200, 100]);
    expect(p.analysis).toBe('linear-elastic');
    expect(p.analysisStated).toBe(false);
  });
  it('reads ksi and metres', () => {
    const p = parseCurveCsv('x (m),s (ksi)\n0,10\n0.001,5\n0.002,4\n', 'c.csv');
    expect(p.sigma_MPa[0]).toBeCloseTo(68.94757293168361, 10);
  });
  it('names the file and line of a non-numeric cell', () => {
    const text = 'distance_mm,stress_MPa\n0,300\n0.1,290\n0.2,280\n0.3,270\n0.4,260\n0.5,abc\n';
    expect(() => parseCurveCsv(text, 'curve.csv')).toThrow('curve.csv line 7: stress "abc" is not a number');
  });
  it.each([
    ['distance_mm,stress_MPa\n0,300\n,200\n1,100\n', 'a.csv line 3: distance is empty'],
    ['distance_mm,stress_MPa\n0,300\n1,NaN\n2,100\n', 'a.csv line 3: stress "NaN" is not a number'],
    ['distance_mm,stress_MPa\n0,300\n1,200\n1,100\n', 'a.csv line 4: distance 1 does not increase'],
    ['distance_mm,stress_MPa\n0,300\n1,200\n', 'needs at least 3 data points, found 2'],
    ['distance,stress_MPa\n0,300\n1,200\n2,1\n', 'a.csv line 1: distance column "distance" has no unit'],
    ['distance_furlong,stress_MPa\n0,300\n1,200\n2,1\n', 'unknown unit "furlong"'],
    ['distance_mm,stress_bar\n0,300\n1,200\n2,1\n', 'unknown unit "bar"'],
    ['distance_mm,stress_MPa\n0,300,1\n', 'a.csv line 2: expected 2 cells'],
    ['# analysis: magic\ndistance_mm,stress_MPa\n', 'a.csv line 1: analysis "magic"'],
    ['', 'no header line'],
  ])('refuses bad input %#', (text, msg) => {
    expect(() => parseCurveCsv(text, 'a.csv')).toThrow(msg);
  });
  it('refuses interpolation beyond the last point', () => {
    const p = parseCurveCsv('distance_mm,stress_MPa\n0,300\n1,200\n2,100\n', 'a.csv');
    expect(() => p.curve.stressAt(2.5e-3)).toThrow(/beyond the last point/);
  });
});
