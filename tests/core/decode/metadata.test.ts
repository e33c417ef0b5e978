/**
 * Metadata pixel size rules (src/core/calibrate/metadata.ts). Unit conversions: 1 inch = 25.4 mm
 * exactly (international yard and pound agreement, 1959); TIFF tags per TIFF 6.0 section 8; PNG pHYs
 * per PNG spec 2nd ed. section 11.3.5.3. The list of "default" densities is common practice, no source.
 */
import { describe, expect, it } from 'vitest';
import { metadataScaleFromPng, metadataScaleFromTiff } from '../../../src/core/calibrate/metadata.js';

describe('metadataScaleFromTiff', () => {
  it('converts cm and inch densities to µm per pixel', () => {
    expect(metadataScaleFromTiff({ xResolution: 4000, yResolution: 4000, resolutionUnit: 3 }).scale).toEqual({
      umPerPxX: 2.5,
      umPerPxY: 2.5,
      source: 'tiff-resolution',
    });
    const s = metadataScaleFromTiff({ xResolution: 25400 / 3.2, yResolution: 25400 / 3.2, resolutionUnit: 2 }).scale!;
    expect(s.umPerPxX).toBeCloseTo(3.2, 12);
    // ResolutionUnit absent → inch (TIFF 6.0 default)
    expect(metadataScaleFromTiff({ xResolution: 5080, yResolution: 5080 }).scale!.umPerPxX).toBeCloseTo(5, 12);
  });

  it('carries non-square pixels', () => {
    const s = metadataScaleFromTiff({ xResolution: 1000, yResolution: 500, resolutionUnit: 3 }).scale!;
    expect([s.umPerPxX, s.umPerPxY]).toEqual([10, 20]);
  });

  it('treats screen/printer defaults, unit "none" and missing tags as no physical size, with a note', () => {
    for (const dpi of [72, 96, 150, 300, 600, 1200]) {
      const r = metadataScaleFromTiff({ xResolution: dpi, yResolution: dpi, resolutionUnit: 2 });
      expect(r.scale, `${dpi} dpi`).toBeNull();
      expect(r.note).toMatch(/default/);
    }
    // 72 and 96 dpi written in px/cm (rounded as software does)
    expect(metadataScaleFromTiff({ xResolution: 28.35, yResolution: 28.35, resolutionUnit: 3 }).scale).toBeNull();
    expect(metadataScaleFromTiff({ xResolution: 37.8, yResolution: 37.8, resolutionUnit: 3 }).scale).toBeNull();
    expect(metadataScaleFromTiff({ xResolution: 3000, yResolution: 3000, resolutionUnit: 1 }).scale).toBeNull();
    expect(metadataScaleFromTiff({}).scale).toBeNull();
    expect(metadataScaleFromTiff({ xResolution: 0, yResolution: 0, resolutionUnit: 3 }).scale).toBeNull();
    expect(metadataScaleFromTiff({ xResolution: Number.NaN, yResolution: 1, resolutionUnit: 3 }).scale).toBeNull();
  });

  it('a non-default dpi near a default but outside 0.5 % is physical', () => {
    expect(metadataScaleFromTiff({ xResolution: 76, yResolution: 76, resolutionUnit: 2 }).scale!.umPerPxX).toBeCloseTo(25400 / 76, 9); // 5.6 % off 72
    expect(metadataScaleFromTiff({ xResolution: 12000, yResolution: 12000, resolutionUnit: 2 }).scale!.umPerPxX).toBeCloseTo(25400 / 12000, 12);
  });

  it('refuses implausibly coarse pixels (> 1 mm) and notes sub-micrometre ones', () => {
    const coarse = metadataScaleFromTiff({ xResolution: 5, yResolution: 5, resolutionUnit: 3 }); // 2 mm
    expect(coarse.scale).toBeNull();
    expect(coarse.note).toMatch(/coarse/);
    const fine = metadataScaleFromTiff({ xResolution: 50000, yResolution: 50000, resolutionUnit: 3 }); // 0.2 µm
    expect(fine.scale!.umPerPxX).toBeCloseTo(0.2, 12);
    expect(fine.scale!.note).toMatch(/sub-micrometre/);
  });
});

describe('metadataScaleFromPng', () => {
  it('converts px/m to µm per pixel', () => {
    expect(metadataScaleFromPng({ x: 400000, y: 200000, unit: 1 }).scale).toEqual({ umPerPxX: 2.5, umPerPxY: 5, source: 'png-phys' });
  });
  it('2835 and 3780 px/m (72 / 96 dpi), unit 0 and no chunk → null with a note', () => {
    for (const v of [2835, 3780, 3779, 2834]) expect(metadataScaleFromPng({ x: v, y: v, unit: 1 }).scale, `${v}`).toBeNull();
    expect(metadataScaleFromPng({ x: 400000, y: 400000, unit: 0 }).scale).toBeNull();
    const r = metadataScaleFromPng(undefined);
    expect(r.scale).toBeNull();
    expect(r.note).toMatch(/pHYs/);
  });
});
