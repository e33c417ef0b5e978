/**
 * The outline stage finds the fracture surface's own edge (the notch root), not the silhouette of the
 * part, and says so when it cannot (issue "real scenes"). Scenes from our renderer's named set
 * (src/core/render/scenes.ts) and from the independent Python generator
 * (scripts/fixtures/make_external_scenes.py, tests/fixtures/external/scenes/), each with its truth.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { encodeRender, findScene, renderFractograph } from '../../../src/core/render/index.js';
import { analyseDecoded, analyseImage, defaultParams, type MeasureResult } from '../../../src/core/pipeline/index.js';
import { decodeImage } from '../../../src/core/decode/index.js';

const EXT = join(__dirname, '../../fixtures/external/scenes');

async function renderedScene(name: string, extra: (p: ReturnType<typeof defaultParams>) => void = () => {}): Promise<{ r: MeasureResult; radiusPx: number; meanUm: number }> {
  const c = findScene(name)!;
  const out = renderFractograph(c.options);
  const bytes = encodeRender(out, { format: c.format, bitDepth: c.bitDepth ?? 8, jpegQuality: c.jpegQuality ?? 92 });
  const p = defaultParams();
  p.scale.pixelSizeUm = out.truth.umPerPxX;
  p.bootstrap = 100;
  extra(p);
  const { result } = await analyseImage(bytes, { file: `${name}.${c.format}`, sha256: 'test' }, p);
  const t = out.truth;
  return { r: result, radiusPx: (t.outline.semiAxesPx.a + t.outline.semiAxesPx.b) / 2, meanUm: t.band.meanWidthUm! };
}

async function externalScene(file: string): Promise<{ r: MeasureResult; radiusPx: number; meanUm: number }> {
  const truth = JSON.parse(readFileSync(join(EXT, file.replace(/\.\w+$/, '.truth.json')), 'utf8'));
  const p = defaultParams();
  p.scale.pixelSizeUm = truth.umPerPx;
  p.bootstrap = 100;
  const { result } = await analyseImage(new Uint8Array(readFileSync(join(EXT, file))), { file, sha256: 'test' }, p);
  const w: number[] = truth.band.widthUmByAngle.filter((v: number | null) => v !== null);
  return { r: result, radiusPx: (truth.outline.semiMajorPx + truth.outline.semiMinorPx) / 2, meanUm: w.reduce((a, b) => a + b, 0) / w.length };
}

/** One of the invented samples (samples/), measured at its true pixel size. */
async function sampleImage(file: string): Promise<{ r: MeasureResult; meanUm: number }> {
  const dir = join(__dirname, '../../../samples');
  const truth = JSON.parse(readFileSync(join(dir, file.replace(/\.\w+$/, '.truth.json')), 'utf8'));
  const p = defaultParams();
  p.scale.pixelSizeUm = truth.umPerPxX;
  p.bootstrap = 100;
  const { result } = await analyseImage(new Uint8Array(readFileSync(join(dir, file))), { file, sha256: 'test' }, p);
  return { r: result, meanUm: truth.band.meanWidthUm };
}

function errPct(got: number, want: number): number {
  return (100 * (got - want)) / want;
}

describe('outline on the notch root with a visible notch flank', () => {
  for (const name of ['flank-v-bright', 'flank-u-dark']) {
    it(`${name} (our renderer): outline within 1 % of the notch root, band within 2 %, the bar edge reported and rejected`, async () => {
      const { r, radiusPx, meanUm } = await renderedScene(name);
      expect(Math.abs(errPct(r.specimen.radiusPx, radiusPx))).toBeLessThan(1);
      expect(r.band.detected).toBe(true);
      expect(Math.abs(errPct(r.band.widthUm!.mean, meanUm))).toBeLessThan(2);
      const es = r.specimen.edgeSearch!;
      expect(es.outlineFromSilhouette).toBe(false);
      const chosen = es.candidates.filter((c) => c.role === 'chosen');
      expect(chosen).toHaveLength(1);
      // the bar edge (flank outer edge) is among the candidates, larger than the chosen edge, not chosen
      expect(es.candidates.some((c) => c.role !== 'chosen' && c.diameterUm > chosen[0].diameterUm * 1.1)).toBe(true);
      expect(r.warnings.map((w) => w.code)).not.toContain('OUTLINE_FROM_SILHOUETTE');
    });
  }

  it('v_flank_lamp.png (independent generator): outline within 1 %, band within 2 %', async () => {
    const { r, radiusPx, meanUm } = await externalScene('v_flank_lamp.png');
    expect(Math.abs(errPct(r.specimen.radiusPx, radiusPx))).toBeLessThan(1);
    expect(Math.abs(errPct(r.band.widthUm!.mean, meanUm))).toBeLessThan(2);
  });
});

describe('SEM flank under heavy noise', () => {
  it('sem-strip-noise-flank: a partial rim/core boundary inside the root edge stops the walk there (not the bar edge): outline within 1 %, band within 4 %, flagged ambiguous', async () => {
    const { r, radiusPx, meanUm } = await renderedScene('sem-strip-noise-flank');
    expect(Math.abs(errPct(r.specimen.radiusPx, radiusPx))).toBeLessThan(1);
    expect(r.band.detected).toBe(true);
    expect(Math.abs(errPct(r.band.widthUm!.mean, meanUm))).toBeLessThan(4);
    expect(r.specimen.edgeSearch!.rule).toBe('first-edge-outside-partial-core-edge');
    expect(r.warnings.map((w) => w.code)).toContain('OUTLINE_AMBIGUOUS');
  });
});

describe('SEM scan lines and edge glow', () => {
  it('sem-strip-noise: scan lines removed before the texture, band within 4 % (was −9.9 %)', async () => {
    const { r, meanUm } = await renderedScene('sem-strip-noise');
    expect(r.warnings.map((w) => w.code)).toContain('SCAN_LINES_REMOVED');
    expect(r.band.detected).toBe(true);
    expect(Math.abs(errPct(r.band.widthUm!.mean, meanUm))).toBeLessThan(4);
  });

  it('sem: the band is detected despite the edge glow (was not detected), within 4 %, outline within 0.5 %', async () => {
    const { r, radiusPx, meanUm } = await renderedScene('sem');
    expect(r.band.detected).toBe(true);
    expect(Math.abs(errPct(r.specimen.radiusPx, radiusPx))).toBeLessThan(0.5);
    expect(Math.abs(errPct(r.band.widthUm!.mean, meanUm))).toBeLessThan(4);
  });
});

describe('tidy pictures keep the silhouette outline', () => {
  it('plain: the chosen edge follows the silhouette, which stays the outline', async () => {
    const { r, radiusPx } = await renderedScene('plain');
    expect(r.specimen.edgeSearch!.outlineFromSilhouette).toBe(true);
    expect(Math.abs(errPct(r.specimen.radiusPx, radiusPx))).toBeLessThan(0.5);
    expect(r.quality.verdict).toBe('ok');
  });

  it('a clean round silhouette with an order-2 wobble (invented sample fz7-U-r1e-3) keeps its own ellipse as the search grid: outline = silhouette, band within 1.5 %', async () => {
    const { r, meanUm } = await sampleImage('fz7-U-r1e-3.jpg');
    // with the round grid the chosen ring strayed 10 px out on one arc: +2.0 %, outline from that ring
    expect(r.specimen.edgeSearch!.outlineFromSilhouette).toBe(true);
    expect(Math.abs(errPct(r.band.widthUm!.mean, meanUm))).toBeLessThan(1.5);
  });

  it('a chosen edge that runs on a clean silhouette on half the rays and is bent off it elsewhere (dark halo; invented sample fz7-V-r1e-3) leaves the silhouette as the outline: band within 1.5 %', async () => {
    const { r, meanUm } = await sampleImage('fz7-V-r1e-3.png');
    // with the bent edge as the outline: +4.5 % and verdict ok
    expect(r.specimen.edgeSearch!.outlineFromSilhouette).toBe(true);
    expect(Math.abs(errPct(r.band.widthUm!.mean, meanUm))).toBeLessThan(1.5);
  });
});

describe('section diameter: prior and cross-check of the scale', () => {
  it('the right diameter gives no warning; one 8 % off warns SECTION_DIAMETER_MISMATCH', async () => {
    const ok = await renderedScene('flank-v-bright', (p) => (p.sectionDiameterUm = 5000));
    expect(ok.r.warnings.map((w) => w.code)).not.toContain('SECTION_DIAMETER_MISMATCH');
    expect(ok.r.params.sectionDiameterUm).toBe(5000);
    const off = await renderedScene('flank-v-bright', (p) => (p.sectionDiameterUm = 5400));
    expect(off.r.warnings.map((w) => w.code)).toContain('SECTION_DIAMETER_MISMATCH');
    expect(off.r.quality.verdict).not.toBe('ok');
  });

  it('a diameter that matches no edge warns SECTION_DIAMETER_NOT_FOUND', async () => {
    const { r } = await renderedScene('plain', (p) => (p.sectionDiameterUm = 9000));
    expect(r.warnings.map((w) => w.code)).toContain('SECTION_DIAMETER_NOT_FOUND');
  });
});

describe('specimen in a holder: the edge is found on circles when the silhouette is merged with the holder or a shadow', () => {
  for (const name of ['holder-putty-b', 'holder-clamp']) {
    it(`${name} (our renderer): outline within 1 % of the notch root, band within 2 %, no silhouette fallback`, async () => {
      const { r, radiusPx, meanUm } = await renderedScene(name);
      expect(Math.abs(errPct(r.specimen.radiusPx, radiusPx))).toBeLessThan(1);
      expect(r.band.detected).toBe(true);
      expect(Math.abs(errPct(r.band.widthUm!.mean, meanUm))).toBeLessThan(2);
      expect(r.specimen.edgeSearch!.rule).toMatch(/\(circles/);
      expect(r.warnings.map((w) => w.code)).not.toContain('OUTLINE_FROM_SILHOUETTE');
    });
  }

  for (const file of ['putty.jpg', 'clamp.png']) {
    it(`${file} (independent generator): outline within 1 %, band within 2 %`, async () => {
      const { r, radiusPx, meanUm } = await externalScene(file);
      expect(Math.abs(errPct(r.specimen.radiusPx, radiusPx))).toBeLessThan(1);
      expect(Math.abs(errPct(r.band.widthUm!.mean, meanUm))).toBeLessThan(2);
      expect(r.warnings.map((w) => w.code)).not.toContain('OUTLINE_FROM_SILHOUETTE');
    });
  }
});

describe('a shadow against one side of the root', () => {
  it('shadow_left.jpg (independent generator): the edge found twice (a rounder twin inside a shadow-bent ring) re-centres the search; the edge found again around the circle through both is round and clear on every ray: outline within 0.5 %, band within 2 % (was −3.3 %, flagged OUTLINE_AMBIGUOUS)', async () => {
    const { r, radiusPx, meanUm } = await externalScene('shadow_left.jpg');
    const es = r.specimen.edgeSearch!;
    expect(es.rule).toContain('circles around the edge found twice');
    const chosen = es.candidates.find((c) => c.role === 'chosen')!;
    // the twin alone covered 59 % of the rays and sat up to 6 px inside the root on the lit side
    expect(chosen.coverage).toBeGreaterThanOrEqual(0.9);
    expect(chosen.roundnessPx).toBeLessThan(1);
    // the search centre is the specimen's, not the shadow-pulled vote (5.5 px off)
    const truth = JSON.parse(readFileSync(join(EXT, 'shadow_left.truth.json'), 'utf8'));
    expect(Math.hypot(chosen.center.x - truth.center.x, chosen.center.y - truth.center.y)).toBeLessThan(1);
    expect(Math.abs(errPct(r.specimen.radiusPx, radiusPx))).toBeLessThan(0.5);
    expect(Math.abs(errPct(r.band.widthUm!.mean, meanUm))).toBeLessThan(2);
    expect(r.band.widthUm!.ci95[0]).toBeLessThanOrEqual(meanUm);
    expect(r.band.widthUm!.ci95[1]).toBeGreaterThanOrEqual(meanUm);
  });

  // The centre vote moves by a few px when the picture is shifted by one: on main, 9 of 15 shifts of up
  // to 3 px gave −2.8 … −3.3 % (five of them with verdict OK). Shifted right by 1 px the inner trace is
  // chosen directly (a core edge inside it) and the outer one runs on the root on the lit side; shifted
  // down by 2 px the twin rule fires as on the original. Both are re-centred.
  it.each([[1, 0], [0, 2]])('shadow_left.jpg shifted by (%i, %i) px: re-centred as well, band within 2 %', (dx, dy) => {
    const truth = JSON.parse(readFileSync(join(EXT, 'shadow_left.truth.json'), 'utf8'));
    const d = decodeImage(new Uint8Array(readFileSync(join(EXT, 'shadow_left.jpg'))));
    const { width: W, height: H, data } = d.raster;
    const moved = new (data.constructor as new (n: number) => typeof data)(data.length);
    for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) moved[y * W + x] = data[Math.min(H - 1, Math.max(0, y - dy)) * W + Math.min(W - 1, Math.max(0, x - dx))];
    const p = defaultParams();
    p.scale.pixelSizeUm = truth.umPerPx;
    p.bootstrap = 0;
    const { result: r } = analyseDecoded({ ...d, raster: { ...d.raster, data: moved } }, { file: 'shadow_left.jpg', sha256: 'test' }, p);
    expect(r.specimen.edgeSearch!.rule).toContain('circles around the edge found twice');
    expect(Math.abs(errPct(r.specimen.radiusPx, 255))).toBeLessThan(0.5);
    expect(Math.abs(errPct(r.band.widthUm!.mean, truth.band.meanWidthUm))).toBeLessThan(2);
  });
});
