/**
 * Scene elements of the renderer: each one is present in the pixels, deterministic, validated, and
 * leaves the truth of the fracture surface unchanged (the truth outline is the notch root).
 * Small canvases (400 × 300 px at 25 µm/px) keep this fast.
 */
import { decode as decodePng } from 'fast-png';
import { describe, expect, it } from 'vitest';
import { decodeImage } from '../../../src/core/decode/index.js';
import { encodeRender, renderFractograph, type RenderOptions } from '../../../src/core/render/index.js';
import { boxMean, boxSharpness, bytesOf, ring, surfaceTruth, thrown, TINY } from './sceneHelpers.js';

const plain = renderFractograph(TINY);
const C = plain.truth.centre; // (199.5, 149.5); fracture surface radius 100 px, band 16 px

describe('notch flank', () => {
  const v = renderFractograph({ ...TINY, flank: { kind: 'V', diameterRatio: 1.3 } });
  const u = renderFractograph({ ...TINY, flank: { kind: 'U', diameterRatio: 1.3 } });

  it('fills the annulus from the notch root (100 px) out to the bar (130 px); the background starts beyond it', () => {
    expect(ring(plain.raster, C, 105, 125).mean).toBeLessThan(0.12); // dark background without a flank
    for (const r of [v, u]) {
      expect(ring(r.raster, C, 105, 125).mean).toBeGreaterThan(0.25);
      expect(ring(r.raster, C, 134, 145).mean).toBeLessThan(0.12);
    }
    expect(Math.abs(ring(v.raster, C, 105, 125).mean - ring(u.raster, C, 105, 125).mean)).toBeGreaterThan(0.01);
  });

  it('a V cone is lit on the side facing the light, a U wall facing the viewer evenly', () => {
    const light = { light: { azimuthDeg: 180, elevationDeg: 35 } };
    const vl = renderFractograph({ ...TINY, ...light, flank: { kind: 'V', diameterRatio: 1.3, inclineDeg: 50 } });
    const ul = renderFractograph({ ...TINY, ...light, flank: { kind: 'U', diameterRatio: 1.3, rootRadiusUm: 100, defocusPx: 0 } });
    const side = (r: typeof vl, a: number, b: number): number => ring(r.raster, C, 110, 126, a, b).mean;
    // V: outward normal tilted 50° — toward the light on the left (150–210°), away from it on the right (330–360°)
    expect(side(vl, 150, 210) / side(vl, 330, 360)).toBeGreaterThan(2);
    // U: the flat wall's shading hardly depends on the side
    const ratio = side(ul, 150, 210) / side(ul, 330, 360);
    expect(ratio).toBeGreaterThan(0.85);
    expect(ratio).toBeLessThan(1.15);
  });

  it('albedo makes the flank brighter or darker than the band', () => {
    const bright = renderFractograph({ ...TINY, flank: { kind: 'U', albedo: 2 } });
    const dark = renderFractograph({ ...TINY, flank: { kind: 'U', albedo: 0.5 } });
    const band = ring(plain.raster, C, 88, 97).mean;
    expect(ring(bright.raster, C, 110, 125).mean).toBeGreaterThan(1.3 * band);
    expect(ring(dark.raster, C, 110, 125).mean).toBeLessThan(0.8 * band);
  });

  it('turning marks: concentric ripples (radial variance ≫ tangential) and depth of field blurs them', () => {
    // 10 µm/px, 2 mm specimen: root at 100 px, bar at 130 px, marks every 6 px
    const opts: RenderOptions = { ...TINY, umPerPx: 10, widthPx: 400, heightPx: 400, specimen: { diameterUm: 2000 }, flank: { kind: 'U', rootRadiusUm: 50, markSpacingUm: 60, markDepthUm: 4, roughnessUm: 0 } };
    const sharp = renderFractograph({ ...opts, flank: { ...opts.flank, defocusPx: 0 } });
    const blurred = renderFractograph({ ...opts, flank: { ...opts.flank, defocusPx: 3 } });
    const c = sharp.truth.centre;
    // along the +x ray (radial direction) the marks alternate; along a short arc at fixed radius they do not
    const row = Math.round(c.y);
    const radial: number[] = [];
    for (let x = Math.round(c.x) + 106; x < Math.round(c.x) + 128; x++) radial.push(sharp.raster.data[row * 400 + x]);
    const col = Math.round(c.x) + 117;
    const tangential: number[] = [];
    for (let y = row - 11; y <= row + 11; y++) tangential.push(sharp.raster.data[y * 400 + col]);
    const variance = (a: number[]): number => a.reduce((s, v) => s + v * v, 0) / a.length - (a.reduce((s, v) => s + v, 0) / a.length) ** 2;
    expect(variance(radial)).toBeGreaterThan(4 * variance(tangential));
    const x0 = Math.round(c.x) + 106;
    expect(boxSharpness(blurred.raster, x0, row - 5, x0 + 22, row + 5)).toBeLessThan(0.5 * boxSharpness(sharp.raster, x0, row - 5, x0 + 22, row + 5));
  });

  it('does not move the fracture surface: truth outline and widths unchanged; the bar is in the scene truth', () => {
    expect(surfaceTruth(v.truth)).toEqual(surfaceTruth(plain.truth));
    expect(surfaceTruth(u.truth)).toEqual(surfaceTruth(plain.truth));
    expect(v.truth.scene!.flank).toEqual({ kind: 'V', barDiameterUm: 6500, barRadiusPx: 130 });
    expect(plain.truth.scene).toBeUndefined();
  });
});

describe('holders, backgrounds and the cast shadow', () => {
  it('putty: mottled mid-grey with relief; paper: bright; clamp: knurled jaws beside the bar, dark gap above and below', () => {
    const putty = renderFractograph({ ...TINY, background: 'putty' });
    const paper = renderFractograph({ ...TINY, background: 'paper' });
    const clamp = renderFractograph({ ...TINY, background: 'clamp', holder: { clampAxisDeg: 0 } });
    const bgPlain = ring(plain.raster, C, 115, 140);
    const p = ring(putty.raster, C, 115, 140);
    expect(p.mean).toBeGreaterThan(0.3);
    expect(p.mean).toBeLessThan(0.6);
    expect(p.variance).toBeGreaterThan(4 * bgPlain.variance);
    expect(ring(paper.raster, C, 115, 140).mean).toBeGreaterThan(0.7);
    expect(boxMean(clamp.raster, 0, 100, 80, 200)).toBeGreaterThan(0.2); // left jaw (beyond x = 99.5)
    expect(boxMean(clamp.raster, 320, 100, 399, 200)).toBeGreaterThan(0.2); // right jaw
    expect(boxMean(clamp.raster, 170, 0, 230, 30)).toBeLessThan(0.1); // gap above the bar
    for (const r of [putty, paper, clamp]) expect(surfaceTruth(r.truth)).toEqual(surfaceTruth(plain.truth));
  });

  it('the shadow falls on the side away from the light, not on the lit side', () => {
    const o: RenderOptions = { ...TINY, background: 'bright', light: { azimuthDeg: 180, elevationDeg: 40 } };
    const lit = renderFractograph(o);
    const shadowed = renderFractograph({ ...o, shadow: { lengthUm: 2000, softnessUm: 100, strength: 0.6 } });
    expect(shadowed.truth.options.shadow!.azimuthDeg).toBe(0); // default: opposite the light
    const right = (r: typeof lit): number => ring(r.raster, C, 105, 140, 0, 20).mean;
    const left = (r: typeof lit): number => ring(r.raster, C, 105, 140, 170, 190).mean;
    expect(right(shadowed)).toBeLessThan(0.6 * right(lit));
    expect(left(shadowed)).toBeCloseTo(left(lit), 2);
    expect(surfaceTruth(shadowed.truth)).toEqual(surfaceTruth(plain.truth));
  });
});

describe('SEM look', () => {
  const sem = renderFractograph({ ...TINY, sem: { stripHeightPx: 30, lineNoise: 0.03 }, semEdge: 0.6, scaleBar: { lengthUm: 1000 } });

  it('data strip along the bottom with light text and the scale bar inside it; the specimen is centred in the area above', () => {
    expect(sem.truth.scene!.dataStripPx).toEqual({ x0: 0, y0: 270, x1: 399, y1: 299 });
    expect(sem.truth.scene!.imageAreaPx.y1).toBe(269);
    let bright = 0;
    for (let x = 0; x < 200; x++) for (let y = 272; y < 300; y++) if (sem.raster.data[y * 400 + x] > 0.8) bright++;
    expect(bright).toBeGreaterThan(30); // text
    expect(boxMean(sem.raster, 0, 272, 399, 299)).toBeLessThan(0.25);
    const bar = sem.truth.scaleBar!;
    expect(bar.y0).toBeGreaterThanOrEqual(270);
    expect(bar.plateBox).toBeNull();
    expect(sem.truth.centre).toEqual({ x: 199.5, y: 134.5 });
    expect(sem.truth.band.widthUmByAngle).toEqual(plain.truth.band.widthUmByAngle);
  });

  it('scan-line noise: whole rows shift together', () => {
    const rowMeans = (r: typeof sem): number[] => Array.from({ length: 60 }, (_, y) => boxMean(r.raster, 0, y, 60, y));
    const sd = (a: number[]): number => Math.sqrt(a.reduce((s, v) => s + v * v, 0) / a.length - (a.reduce((s, v) => s + v, 0) / a.length) ** 2);
    expect(sd(rowMeans(sem))).toBeGreaterThan(0.02);
    expect(sd(rowMeans(plain))).toBeLessThan(0.01);
  });
});

describe('glints, colour, defocus', () => {
  it('glints: bright highlights on the lit side of a slanted rim only', () => {
    const o: RenderOptions = { ...TINY, rim: { ...(TINY.rim as object), slopeDeg: 30 }, light: { azimuthDeg: 135, elevationDeg: 40 } };
    const dull = renderFractograph(o);
    const shiny = renderFractograph({ ...o, glints: { strength: 1.5 } });
    const maxIn = (r: typeof dull, a: number, b: number): number => {
      let m = 0;
      for (let y = 0; y < 300; y++) {
        for (let x = 0; x < 400; x++) {
          const rho = Math.hypot(x - C.x, y - C.y);
          const deg = ((Math.atan2(-(y - C.y), x - C.x) * 180) / Math.PI + 360) % 360;
          if (rho > 88 && rho < 98 && deg >= a && deg <= b) m = Math.max(m, r.raster.data[y * 400 + x]);
        }
      }
      return m;
    };
    expect(maxIn(shiny, 110, 160)).toBeGreaterThan(maxIn(dull, 110, 160) + 0.3);
    expect(maxIn(shiny, 290, 340)).toBeLessThan(maxIn(dull, 290, 340) + 0.05);
    expect(surfaceTruth(shiny.truth)).toEqual(surfaceTruth(dull.truth));
  });

  it('colour: RGB output with a tinted band; the gray raster is its Rec. 709 luma', () => {
    const c = renderFractograph({ ...TINY, colour: {} });
    expect(plain.rgb).toBeNull();
    const rgb = c.rgb!;
    expect(rgb.data.length).toBe(3 * 400 * 300);
    const ratio = (r0: number, r1: number): number => {
      let sr = 0;
      let sb = 0;
      for (let y = 0; y < 300; y++) {
        for (let x = 0; x < 400; x++) {
          const rho = Math.hypot(x - C.x, y - C.y);
          if (rho < r0 || rho > r1) continue;
          sr += rgb.data[3 * (y * 400 + x)];
          sb += rgb.data[3 * (y * 400 + x) + 2];
        }
      }
      return sr / sb;
    };
    expect(ratio(88, 97) / ratio(0, 70)).toBeGreaterThan(1.3); // default tints: band 1.1/0.74, core 0.98/1.03
    const i = 150 * 400 + 290;
    // ITU-R BT.709-6 luma weights
    expect(c.raster.data[i]).toBeCloseTo(0.2126 * rgb.data[3 * i] + 0.7152 * rgb.data[3 * i + 1] + 0.0722 * rgb.data[3 * i + 2], 6);
    expect(surfaceTruth(c.truth)).toEqual(surfaceTruth(plain.truth));
  });

  it('colour output decodes as RGB (PNG 8-bit, TIFF 16-bit, JPEG); a 16-bit colour PNG is refused', () => {
    const c = renderFractograph({ ...TINY, colour: { noiseSigma: 0.02 } });
    const png = encodeRender(c, { format: 'png', umPerPx: 25 });
    const p = decodePng(png);
    expect(p.channels).toBe(3);
    expect(p.depth).toBe(8);
    const d = decodeImage(png);
    expect(d.colorType).toBe('rgb');
    const i = 150 * 400 + 290;
    expect(Math.abs(d.raster.data[i] - c.raster.data[i])).toBeLessThan(1.5 / 255);
    const tif = decodeImage(encodeRender(c, { format: 'tiff', bitDepth: 16 }));
    expect([tif.channels, tif.bitDepth]).toEqual([3, 16]);
    expect(Math.abs(tif.raster.data[i] - c.raster.data[i])).toBeLessThan(1e-4);
    const jpg = decodeImage(encodeRender(c, { format: 'jpeg', jpegQuality: 95 }));
    expect(jpg.channels).toBe(3);
    const e = thrown(() => encodeRender(c, { format: 'png', bitDepth: 16 }));
    expect(e.code).toBe('BAD_PARAMETER');
    expect(e.message).toMatch(/8-bit PNG only/);
  });

  it('colour noise is independent per channel', () => {
    const spread = (o: RenderOptions): number => {
      const r = renderFractograph(o).rgb!.data;
      let s = 0;
      for (let k = 0; k < r.length; k += 3) s += (r[k] - r[k + 1]) ** 2;
      return s / (r.length / 3);
    };
    const flat = { ...TINY, colour: { rimTint: [1, 1, 1], coreTint: [1, 1, 1] } } as RenderOptions;
    expect(spread({ ...flat, colour: { ...flat.colour, noiseSigma: 0.04 } })).toBeGreaterThan(2 * 0.04 ** 2 * 0.8);
    expect(spread(flat)).toBeLessThan(1e-8);
  });

  it('one-sided defocus: sharp before the plane of focus, blurred beyond it', () => {
    const d = renderFractograph({ ...TINY, defocus: { maxSigmaPx: 4, directionDeg: 0, focusAt: 0.4 } });
    const left = (r: typeof d): number => boxSharpness(r.raster, 110, 120, 150, 180);
    const right = (r: typeof d): number => boxSharpness(r.raster, 250, 120, 290, 180);
    expect(left(d)).toBeCloseTo(left(plain), 6);
    expect(right(d)).toBeLessThan(0.3 * right(plain));
    expect(surfaceTruth(d.truth)).toEqual(surfaceTruth(plain.truth));
  });
});

describe('both halves', () => {
  const H: RenderOptions = { ...TINY, widthPx: 600, heightPx: 300, umPerPx: 30 };

  it('one truth record per half: A left, B right and mirrored; the top level repeats A', () => {
    const { truth } = renderFractograph({ ...H, halves: { gapUm: 1200, rotationDeg: 15 } });
    const [a, b] = truth.specimens!;
    expect([a.id, b.id, a.mirrored, b.mirrored, b.rotationDeg]).toEqual(['A', 'B', false, true, 15]);
    expect(a.centre.x).toBeLessThan(300);
    expect(b.centre.x).toBeGreaterThan(300);
    expect(b.centre.x - a.centre.x).toBeCloseTo((2 * 2500 + 1200) / 30, 6);
    expect(truth.centre).toEqual(a.centre);
    expect(truth.band).toEqual(a.band);
    expect(Math.abs(b.band.meanWidthUm! - a.band.meanWidthUm!) / a.band.meanWidthUm!).toBeLessThan(0.03);
    expect(b.band.widthUmByAngle).not.toEqual(a.band.widthUmByAngle);
  });

  it('the mate is the mirror image: without differences and rotation, w_B(θ) = w_A(180° − θ)', () => {
    const { raster, truth } = renderFractograph({ ...H, halves: { rotationDeg: 0, differencePct: 0 } });
    const [a, b] = truth.specimens!;
    for (let d = 0; d < 360; d += 7) expect(b.band.widthUmByAngle[d]!).toBeCloseTo(a.band.widthUmByAngle[(540 - d) % 360]!, 2);
    // both specimens are in the picture
    for (const s of [a, b]) expect(ring(raster, s.centre, 0, 60).mean).toBeGreaterThan(0.25);
  });
});

describe('steel rule and specimen label', () => {
  it('rule along the top: graduations every 0.5 mm (20 px at 25 µm/px), recorded in the truth', () => {
    const r = renderFractograph({ ...TINY, rule: { side: 'top', visibleUm: 600, angleDeg: 0, graduationUm: 500 } });
    const rule = r.truth.scene!.objects[0];
    expect(rule.kind).toBe('rule');
    expect(rule.graduationPx).toBeCloseTo(20, 6);
    expect(boxMean(r.raster, 0, 0, 399, 3)).toBeGreaterThan(0.45);
    // row 18 (6 px inside the graduated edge at y = 23.5) crosses every mark: count dark runs
    let runs = 0;
    for (let x = 1; x < 400; x++) if (r.raster.data[18 * 400 + x] < 0.3 && r.raster.data[18 * 400 + x - 1] >= 0.3) runs++;
    expect(runs).toBeGreaterThanOrEqual(18);
    expect(runs).toBeLessThanOrEqual(21);
    expect(surfaceTruth(r.truth)).toEqual(surfaceTruth(plain.truth));
  });

  it('label: a bright paper rectangle with dark printed text where the truth says', () => {
    const r = renderFractograph({ ...TINY, label: { corner: 'tl', text: 'AB', angleDeg: 0, letterUm: 50 } });
    const lab = r.truth.scene!.objects[0];
    expect(lab.kind).toBe('label');
    expect(lab.text).toBe('AB');
    const xs = lab.polygonPx.map((p) => p.x);
    const ys = lab.polygonPx.map((p) => p.y);
    const [x0, x1, y0, y1] = [Math.ceil(Math.min(...xs)), Math.floor(Math.max(...xs)), Math.ceil(Math.min(...ys)), Math.floor(Math.max(...ys))];
    expect(x1 - x0).toBeGreaterThan(30);
    expect(boxMean(r.raster, x0 + 1, y0 + 1, x0 + 6, y1 - 1)).toBeGreaterThan(0.75); // paper margin
    let ink = 0;
    for (let y = y0; y <= y1; y++) for (let x = x0; x <= x1; x++) if (r.raster.data[y * 400 + x] < 0.35) ink++;
    expect(ink).toBeGreaterThan(20);
    expect(surfaceTruth(r.truth)).toEqual(surfaceTruth(plain.truth));
  });
});

describe('determinism and validation', () => {
  const ALL: RenderOptions = {
    ...TINY,
    widthPx: 240,
    heightPx: 180,
    umPerPx: 40,
    flank: { kind: 'V' },
    background: 'putty',
    shadow: {},
    glints: {},
    colour: { noiseSigma: 0.01 },
    defocus: { maxSigmaPx: 2 },
    rule: { side: 'left', visibleUm: 500 },
    sem: { stripHeightPx: 20, tiltContrast: 0.2 },
    noiseSigma: 0.01,
  };

  it('same seed → same bytes with every element on; another seed → other bytes', () => {
    const a = renderFractograph(ALL);
    const b = renderFractograph(ALL);
    const c = renderFractograph({ ...ALL, seed: 4 });
    expect(bytesOf(a.rgb!.data).equals(bytesOf(b.rgb!.data))).toBe(true);
    expect(bytesOf(a.raster.data).equals(bytesOf(b.raster.data))).toBe(true);
    expect(JSON.stringify(a.truth)).toBe(JSON.stringify(b.truth));
    expect(bytesOf(a.rgb!.data).equals(bytesOf(c.rgb!.data))).toBe(false);
    expect(a.truth.scene!.elements).toEqual(['flank:V', 'holder:putty', 'shadow', 'sem+strip', 'glints', 'colour', 'defocus', 'rule']);
  });

  it('an element draws from its own stream: adding the rule does not change the putty elsewhere', () => {
    const base: RenderOptions = { ...TINY, background: 'putty' };
    const a = renderFractograph(base);
    const b = renderFractograph({ ...base, rule: { side: 'left', visibleUm: 400 } });
    expect(boxMean(a.raster, 300, 0, 399, 60)).toBe(boxMean(b.raster, 300, 0, 399, 60));
  });

  it('bad values → BAD_PARAMETER naming the option', () => {
    const cases: [RenderOptions, RegExp][] = [
      [{ flank: { diameterRatio: 5 } }, /notch flank diameter ratio .* between 1.02 and 3/],
      [{ flank: { kind: 'W' as never } }, /notch flank kind must be V, U/],
      [{ flank: { inclineDeg: 85 } }, /notch flank inclination \(°\)/],
      [{ holder: { level: 0.5 } }, /holder options need background putty, clamp or paper/],
      [{ background: 'grass' as never }, /background must be dark, bright, putty, clamp, paper/],
      [{ background: 'putty', holder: { level: 2 } }, /putty brightness must be between 0 and 1/],
      [{ shadow: { strength: 2 } }, /shadow strength/],
      [{ colour: { rimTint: [1, 1] as never } }, /rim tint must be three numbers/],
      [{ colour: { noiseSigma: -1 } }, /colour noise sigma/],
      [{ defocus: { focusAt: 1 } }, /plane of focus/],
      [{ halves: { differencePct: 50 } }, /band difference between the halves/],
      [{ sem: { stripHeightPx: 200 } }, /SEM data strip height \(px\) must be between 0 and 100/],
      [{ glints: { sharpness: 0 } }, /glint sharpness/],
      [{ rule: { side: 'middle' as never } }, /rule side must be top, bottom, left, right/],
      [{ rule: { side: 'top', visibleUm: 3000 } }, /steel rule .* would cover the specimen/],
      [{ label: { letterUm: 400 } }, /specimen label/],
      [{ label: { text: '' } }, /label text must not be empty/],
      [{ flank: 'V' as never }, /notch flank options must be an object/],
    ];
    for (const [o, msg] of cases) {
      const e = thrown(() => renderFractograph({ ...TINY, ...o }));
      expect(e.code, JSON.stringify(o)).toBe('BAD_PARAMETER');
      expect(e.message, JSON.stringify(o)).toMatch(msg);
    }
  });
});
