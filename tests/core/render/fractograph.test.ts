import { describe, expect, it } from 'vitest';
import { isFractozoneError } from '../../../src/core/errors.js';
import { renderFractograph, type RenderOptions } from '../../../src/core/render/index.js';
import { byAngle, localVariance, zoneStats } from './helpers.js';

// Small, fast scene: 400×300 px at 20 µm/px, 5 mm specimen → radius 125 px, band 600 µm = 30 px.
const SMALL: RenderOptions = {
  seed: 7,
  widthPx: 400,
  heightPx: 300,
  umPerPx: 20,
  rim: { widthUm: 600, harmonics: [{ order: 2, amplitudePct: 10, phaseDeg: 40 }], transitionUm: 60 },
  core: { reliefScaleUm: 800, dimpleSizeUm: 140, ridgeSpacingUm: 300, crackWidthUm: 30 },
  scaleBar: { lengthUm: 1000, corner: 'br' },
};

describe('renderFractograph', () => {
  it('is deterministic: same seed → same pixels, other seed → other pixels', () => {
    const a = renderFractograph(SMALL);
    const b = renderFractograph(SMALL);
    const c = renderFractograph({ ...SMALL, seed: 8 });
    expect(Buffer.from(a.raster.data.buffer).equals(Buffer.from(b.raster.data.buffer))).toBe(true);
    expect(JSON.stringify(a.truth)).toBe(JSON.stringify(b.truth));
    expect(Buffer.from(a.raster.data.buffer).equals(Buffer.from(c.raster.data.buffer))).toBe(false);
  });

  it('truth width follows the options formula w(θ) = W̄·(1 + a·cos(kθ − φ)) for an untilted round view', () => {
    const { truth } = renderFractograph(SMALL);
    expect(truth.schema).toBe('fractozone.truth/1');
    expect(truth.outline.kind).toBe('circle');
    expect(truth.outline.radiusPx).toBeCloseTo(2500 / 20, 6);
    for (const deg of [0, 37, 90, 181, 300]) {
      const th = (deg * Math.PI) / 180;
      const expected = 600 * (1 + 0.1 * Math.cos(2 * th - (40 * Math.PI) / 180));
      expect(truth.band.widthUmByAngle[deg]!).toBeCloseTo(expected, 1);
      expect(truth.outerRadiusPxByAngle[deg] - truth.boundaryRadiusPxByAngle[deg]!).toBeCloseTo(expected / 20, 2);
    }
    const defined = truth.band.widthUmByAngle.filter((v): v is number => v !== null);
    expect(defined.length).toBe(360);
    expect(truth.band.meanWidthUm!).toBeCloseTo(defined.reduce((s, v) => s + v, 0) / 360, 3);
    expect(truth.band.meanWidthUm!).toBeCloseTo(600, 0); // the cosine averages out over 360°
    expect(truth.frameCut).toBe(false);
    // JSON round trip keeps everything (no NaN, no undefined)
    expect(JSON.parse(JSON.stringify(truth))).toEqual(truth);
  });

  it('rim is smooth, core rough (local variance ratio) and the specimen stands out from the dark background', () => {
    const { raster, truth } = renderFractograph({ ...SMALL, noiseSigma: 0.004 });
    const s = zoneStats(raster, truth, 4);
    expect(s.rim.n).toBeGreaterThan(500);
    expect(s.core.n).toBeGreaterThan(2000);
    expect(s.core.localVar / s.rim.localVar).toBeGreaterThan(4);
    expect(s.bg.mean).toBeLessThan(0.15);
    expect(s.core.mean).toBeGreaterThan(s.bg.mean + 0.15);
    expect(s.rim.mean).toBeGreaterThan(s.bg.mean + 0.15);
  });

  it('equalMeanBrightness: rim and core means within 1 %', () => {
    const { raster, truth } = renderFractograph({ ...SMALL, equalMeanBrightness: true, rimBrightness: 0.5 });
    const s = zoneStats(raster, truth, 2, 1);
    expect(Math.abs(s.rim.mean - s.core.mean) / s.core.mean).toBeLessThan(0.01);
    // and without it the rim is brighter by roughly the asked amount
    const u = renderFractograph({ ...SMALL, rimBrightness: 0.5, vignetting: 0 });
    const su = zoneStats(u.raster, u.truth, 2, 1);
    expect(su.rim.mean / su.core.mean).toBeGreaterThan(1.2);
  });

  it('bright background option', () => {
    const { raster, truth } = renderFractograph({ ...SMALL, background: 'bright' });
    const s = zoneStats(raster, truth, 4);
    expect(s.bg.mean).toBeGreaterThan(0.6);
  });

  it('tilted view: ellipse with semi-minor = R·cos(tilt) along the foreshortened direction', () => {
    const tilt = 30;
    const { raster, truth } = renderFractograph({ ...SMALL, scaleBar: null, noiseSigma: 0, blurSigmaPx: 0, vignetting: 0, specimen: { tiltDeg: tilt, tiltAxisDeg: 0 } });
    const R = 2500 / 20;
    expect(truth.outline.kind).toBe('ellipse');
    expect(truth.outline.semiAxesPx.a).toBeCloseTo(R, 6);
    expect(truth.outline.semiAxesPx.b).toBeCloseTo(R * Math.cos((tilt * Math.PI) / 180), 3);
    expect(truth.outline.angleDeg).toBeCloseTo(0, 6);
    expect(truth.outerRadiusPxByAngle[0]).toBeCloseTo(R, 3);
    expect(truth.outerRadiusPxByAngle[90]).toBeCloseTo(R * Math.cos((tilt * Math.PI) / 180), 3);
    // the image agrees: walking up from the centre, the specimen ends near R·cos(tilt)
    const cx = Math.round(truth.centre.x);
    let y = Math.round(truth.centre.y);
    const start = y;
    while (y > 0 && raster.data[y * raster.width + cx] > 0.2) y--;
    expect(Math.abs(start - y - R * Math.cos((tilt * Math.PI) / 180))).toBeLessThan(2);
    // projected band width is shortened at 90° but the surface width is not
    const w90 = truth.band.widthUmByAngle[90]!;
    const s90 = truth.band.surfaceWidthUmByAngle[90]!;
    expect(w90 / s90).toBeCloseTo(Math.cos((tilt * Math.PI) / 180), 3);
  });

  it('tilt axis rotates the ellipse', () => {
    const { truth } = renderFractograph({ ...SMALL, specimen: { tiltDeg: 40, tiltAxisDeg: 60 } });
    expect(truth.outline.angleDeg).toBeCloseTo(60, 4);
    expect(truth.outerRadiusPxByAngle[150]).toBeCloseTo(125 * Math.cos((40 * Math.PI) / 180), 3);
  });

  it('scale bar: drawn exactly on the truth columns and rows, length = round(L / px size)', () => {
    const { raster, truth } = renderFractograph({ ...SMALL, scaleBar: { lengthUm: 1000, corner: 'bl', polarity: 'light', thicknessPx: 5 } });
    const b = truth.scaleBar!;
    expect(b.lengthPx).toBe(Math.round(1000 / 20));
    expect(b.x1 - b.x0 + 1).toBe(b.lengthPx);
    expect(b.y1 - b.y0 + 1).toBe(5);
    const W = raster.width;
    for (let y = b.y0; y <= b.y1; y++) {
      for (let x = b.x0; x <= b.x1; x++) expect(raster.data[y * W + x]).toBeCloseTo(b.barValue, 6);
      expect(raster.data[y * W + b.x0 - 1]).toBeCloseTo(b.plateValue!, 6);
      expect(raster.data[y * W + b.x1 + 1]).toBeCloseTo(b.plateValue!, 6);
    }
    expect(raster.data[(b.y0 - 1) * W + b.x0]).not.toBeCloseTo(b.barValue, 2);
    expect(b.label).toBe('1 mm');
    expect(b.labelBox!.y1).toBeLessThan(b.y0);
    expect(b.x0).toBeLessThan(raster.width / 2); // bottom-left corner
    expect(b.y).toBe((b.y0 + b.y1) / 2);
  });

  it('dark bar without plate, explicit position', () => {
    const { raster, truth } = renderFractograph({ ...SMALL, background: 'bright', scaleBar: { lengthUm: 500, positionPx: { x0: 20, y0: 40 }, polarity: 'dark', plate: false, label: '' } });
    const b = truth.scaleBar!;
    expect([b.x0, b.y0, b.x1]).toEqual([20, 40, 20 + 25 - 1]);
    expect(b.plateBox).toBeNull();
    expect(b.labelBox).toBeNull();
    expect(raster.data[40 * 400 + 20]).toBeCloseTo(0.04, 6);
    expect(raster.data[40 * 400 + 19]).toBeGreaterThan(0.3);
  });

  it('no scale bar when scaleBar is null', () => {
    expect(renderFractograph({ ...SMALL, scaleBar: null }).truth.scaleBar).toBeNull();
  });

  it('frame-cut specimen is flagged per angle and its widths are null there', () => {
    const { truth } = renderFractograph({ ...SMALL, specimen: { centrePx: { x: 90, y: 150 } } });
    expect(truth.frameCut).toBe(true);
    expect(truth.frameCutByAngle[180]).toBe(true);
    expect(truth.band.widthUmByAngle[180]).toBeNull();
    expect(truth.frameCutByAngle[0]).toBe(false);
    expect(truth.band.widthUmByAngle[0]).not.toBeNull();
    expect(truth.band.definedAngles).toBeLessThan(360);
  });

  it('absent sector: no band there (truth null, core texture up to the edge)', () => {
    const o: RenderOptions = { ...SMALL, noiseSigma: 0.004, rim: { widthUm: 600, harmonics: [], absentSectors: [{ fromDeg: 60, toDeg: 120 }] } };
    const { raster, truth } = renderFractograph(o);
    expect(truth.band.absentByAngle[90]).toBe(true);
    expect(truth.band.widthUmByAngle[90]).toBeNull();
    expect(truth.boundaryRadiusPxByAngle[90]).toBeNull();
    expect(truth.band.widthUmByAngle[0]).toBeCloseTo(600, 3);
    expect(truth.band.definedAngles).toBe(360 - 61);
    // near the edge at 90° the texture is rough (core); at 270° (band) it is smooth
    const lv = (deg: number): number => {
      const rho = truth.outerRadiusPxByAngle[deg] - 10;
      let s = 0;
      for (let d = -8; d <= 8; d++) {
        const th = ((deg + d) * Math.PI) / 180;
        s += localVariance(raster, Math.round(truth.centre.x + rho * Math.cos(th)), Math.round(truth.centre.y - rho * Math.sin(th)));
      }
      return s / 17;
    };
    expect(lv(90) / lv(270)).toBeGreaterThan(3);
  });

  it('no rim: band absent everywhere', () => {
    const { truth } = renderFractograph({ ...SMALL, rim: false });
    expect(truth.band.present).toBe(false);
    expect(truth.band.meanWidthUm).toBeNull();
    expect(truth.band.widthUmByAngle.every((v) => v === null)).toBe(true);
  });

  it('same physical surface at another pixel size: truth in µm unchanged', () => {
    const a = renderFractograph({ ...SMALL, rim: { widthUm: 600, harmonics: [] } }).truth;
    const b = renderFractograph({ ...SMALL, widthPx: 800, heightPx: 600, umPerPx: 10, rim: { widthUm: 600, harmonics: [] } }).truth;
    expect(b.band.meanWidthUm!).toBeCloseTo(a.band.meanWidthUm!, 3);
    expect(b.band.meanWidthPx!).toBeCloseTo(2 * a.band.meanWidthPx!, 3);
  });

  it('wobble changes the outline radius by the given harmonic', () => {
    const { truth } = renderFractograph({ ...SMALL, specimen: { wobble: [{ order: 3, amplitudePct: 2, phaseDeg: 0 }] } });
    expect(truth.outerRadiusPxByAngle[0]).toBeCloseTo(125 * 1.02, 2);
    expect(truth.outerRadiusPxByAngle[60]).toBeCloseTo(125 * 0.98, 2);
    expect(truth.outline.wobble).toBe(true);
  });

  it('refuses bad options with BAD_PARAMETER', () => {
    const bad: RenderOptions[] = [
      { widthPx: 0 },
      { umPerPx: -1 },
      { specimen: { tiltDeg: 89 } },
      { rim: { widthUm: 1e9 } },
      { scaleBar: { lengthUm: 1e7 } },
      { scaleBar: { corner: 'xx' as never } },
      { background: 'grey' as never },
    ];
    for (const o of bad) {
      let err: unknown;
      try {
        renderFractograph({ ...SMALL, ...o });
      } catch (e) {
        err = e;
      }
      expect(isFractozoneError(err), JSON.stringify(o)).toBe(true);
      expect((err as { code: string }).code).toBe('BAD_PARAMETER');
    }
  });
});

describe('truth helpers', () => {
  it('byAngle interpolates and propagates null', () => {
    const t = new Array<number | null>(360).fill(1);
    t[10] = 3;
    t[20] = null;
    expect(byAngle(t, 9.5)).toBe(2);
    expect(Number.isNaN(byAngle(t, 19.5))).toBe(true);
  });
});
