/**
 * The tone cue (pipeline/stages/band.ts `withToneCue`, texture/localDarkness.ts): under a light from
 * high above (a ring light) the core's shading texture fades while the core turns darker than the
 * smooth rim. Scenes of our renderer with the light's elevation raised from the set's 40° to 75–85°
 * (not in the scene set; scratch renders measured on 2026-12-03): texture alone gave plain −4.6 %,
 * V flank −12.6 %, one-sided defocus +98.5 %; with the tone cue −0.8 %, −1.8 %, −1.0 %. Bounds of
 * the real-scenes issue: a single element within 2 %, combinations within 4 %. The guards: the
 * scene set (light ≤ 40°, SEM) and the independent generator's images keep the texture boundary
 * (both tables byte-identical), among them the two cases the rule was tightened on.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { MeasureResult } from '../../../src/core/pipeline/index.js';
import { measureBytes, measureScene } from '../../helpers/measureScene.js';
import { splitFisher } from '../../../src/core/pipeline/stages/band.js';
import { createMask, createRaster } from '../../../src/core/image/raster.js';
import { DARKNESS_FLOOR, localDarkness } from '../../../src/core/texture/index.js';

const EXT = join(__dirname, '../../fixtures/external/scenes');

/** A scene of the set, with the light's elevation replaced when given. */
const scene = (name: string, elevationDeg?: number) =>
  measureScene(name, elevationDeg === undefined ? undefined : (o) => ({ ...o, light: { ...(o.light ?? {}), elevationDeg } }));

const codes = (r: MeasureResult): string[] => r.warnings.map((w) => w.code);
const errPct = (r: MeasureResult, truthUm: number): number => (100 * (r.band.widthUm!.mean - truthUm)) / truthUm;
/** The 95 % measurement interval holds the true mean width. */
const intervalCovers = (r: MeasureResult, truthUm: number): boolean => {
  const [lo, hi] = r.band.uncertainty!.measurementCi95Um;
  return lo <= truthUm && truthUm <= hi;
};

describe('local darkness and the split Fisher ratio', () => {
  it('localDarkness is 1 / the window mean, floored for black', () => {
    const r = createRaster(9, 9, new Float32Array(81).fill(0.5));
    expect(Array.from(new Set(localDarkness(r, 3).data))).toEqual([2]);
    expect(localDarkness(createRaster(9, 9), 3).data[40]).toBeCloseTo(1 / DARKNESS_FLOOR, 6);
  });

  it('splitFisher: (μ₁ − μ₂)² / (σ₁² + σ₂²) between a core disc and the rest, the transition left out', () => {
    const n = 80;
    const spec = createMask(n, n);
    spec.data.fill(1);
    const core = createMask(n, n);
    const v = createRaster(n, n);
    for (let y = 0; y < n; y++) {
      for (let x = 0; x < n; x++) {
        const inCore = (x - 40) ** 2 + (y - 40) ** 2 <= 20 ** 2;
        core.data[y * n + x] = inCore ? 1 : 0;
        // core 1 ± 0.1, rest 0 ± 0.1 (checkerboard): variances 0.01 each → Fisher 1 / 0.02 = 50
        v.data[y * n + x] = (inCore ? 1 : 0) + ((x + y) % 2 ? 0.1 : -0.1);
      }
    }
    expect(splitFisher(v, spec, core, 2)).toBeCloseTo(50, 0);
    // the split of the wrong feature (the same everywhere but the checkerboard): 0
    const flat = createRaster(n, n, v.data.map((q) => (q > 0.5 ? q - 1 : q)));
    expect(splitFisher(flat, spec, core, 2)).toBeLessThan(0.01);
  });
});

describe('band width under a light from high above', () => {
  it('plain at 85°: the boundary follows the brightness step, within 2 % (texture alone −4.6 %), verdict check', async () => {
    const { r, truthUm } = await scene('plain', 85);
    expect(codes(r)).toContain('TONE_BOUNDARY_USED');
    expect(Math.abs(errPct(r, truthUm))).toBeLessThanOrEqual(2);
    expect(r.quality.verdict).toBe('check');
    // the level's tolerance on the brightness step (segment/stepLevel.ts BOX_LEVEL_TOLERANCE): the two
    // ends bracket the mean and spread it (before: both ends were the midpoint, h = 0, and the
    // measurement interval of the V flank shallow at 85° missed its truth)
    const u = r.band.uncertainty!;
    const ends = u.variations.filter((v) => v.name.startsWith('boundary level')).map((v) => v.meanUm!);
    expect(u.variations.map((v) => v.name)).toEqual(expect.arrayContaining(['boundary level: 40 % of the brightness step', 'boundary level: 60 % of the brightness step']));
    const mean = r.band.widthUm!.mean;
    expect(ends[0]).toBeLessThan(mean);
    expect(ends[1]).toBeGreaterThan(mean);
    expect((ends[1] - ends[0]) / mean).toBeGreaterThan(0.02);
    expect(intervalCovers(r, truthUm)).toBe(true);
  });

  it('V flank at 85°: within 4 % (texture alone −12.6 %)', async () => {
    const { r, truthUm } = await scene('flank-v-bright', 85);
    expect(codes(r)).toContain('TONE_BOUNDARY_USED');
    expect(Math.abs(errPct(r, truthUm))).toBeLessThanOrEqual(4);
  });

  it('one-sided defocus at 75°: within 4 % (texture alone +98.5 %: the blurred core read as rim)', async () => {
    const { r, truthUm } = await scene('defocus', 75);
    expect(codes(r)).toContain('TONE_BOUNDARY_USED');
    expect(Math.abs(errPct(r, truthUm))).toBeLessThanOrEqual(4);
  });
});

describe('the outer edge at a notch root lit from above (segment/outerEdge.ts grooveFloor)', () => {
  it('V flank shallow at 60°: the texture boundary, within 2 % (was −3.6 % with verdict OK: the edge 1.3 px inside the root), the measurement interval covers the truth', async () => {
    const { r, truthUm } = await scene('flank-v-shallow', 60);
    expect(codes(r)).not.toContain('TONE_BOUNDARY_USED');
    expect(Math.abs(errPct(r, truthUm))).toBeLessThanOrEqual(2);
    expect(intervalCovers(r, truthUm)).toBe(true);
  });
});

/** An image of the independent generator (scripts/fixtures/make_external_scenes.py) at its true pixel size, with its truth. */
async function external(file: string) {
  const t = JSON.parse(readFileSync(join(EXT, file.replace(/\.\w+$/, '.truth.json')), 'utf8')) as { umPerPx: number; band: { meanWidthUm: number }; outline: { semiMajorUm: number } };
  const r = await measureBytes(new Uint8Array(readFileSync(join(EXT, file))), file, t.umPerPx);
  return { r, truthUm: t.band.meanWidthUm, radiusUm: t.outline.semiMajorUm };
}

describe('a light from high above in the independent generator (its own shading model: relief shaded at its true amplitude)', () => {
  it('ring_high.jpg (85°, a steep relief): the texture holds, the tone is not taken, within 2 %', async () => {
    const { r, truthUm } = await external('ring_high.jpg');
    expect(codes(r)).not.toContain('TONE_BOUNDARY_USED');
    expect(Math.abs(errPct(r, truthUm))).toBeLessThanOrEqual(2);
  });

  it('ring_high_shallow.jpg (85°, a shallow relief: its shading nearly gone): the tone is taken, within 2 %, the measurement interval covers the truth', async () => {
    const { r, truthUm } = await external('ring_high_shallow.jpg');
    expect(codes(r)).toContain('TONE_BOUNDARY_USED');
    expect(Math.abs(errPct(r, truthUm))).toBeLessThanOrEqual(2);
    expect(intervalCovers(r, truthUm)).toBe(true);
  });

  it('ring_high_defocus.jpg (80°, shallow relief, one side out of focus): the texture failed and the brightness steps across its split: the tone, within 2 % (texture −4.4 %)', async () => {
    const { r, truthUm } = await external('ring_high_defocus.jpg');
    expect(codes(r)).toContain('TONE_BOUNDARY_USED');
    expect(Math.abs(errPct(r, truthUm))).toBeLessThanOrEqual(2);
  });

  it('ring_high_flank.jpg (80°, shallow relief, V flank): the outline on the notch root within 1 % (was on the rim/core boundary: "no band"), within 4 %', async () => {
    const { r, truthUm, radiusUm } = await external('ring_high_flank.jpg');
    expect(Math.abs((100 * (r.specimen.radiusUm - radiusUm)) / radiusUm)).toBeLessThan(1);
    expect(r.specimen.edgeSearch?.rule).toBe('first-edge-outside-partial-core-edge');
    expect(codes(r)).toContain('TONE_BOUNDARY_USED');
    expect(Math.abs(errPct(r, truthUm))).toBeLessThanOrEqual(4);
  });
});

describe('the texture boundary stays where the tone would be wrong', () => {
  it('sem-strip-noise-flank (SEM: brightness follows the electron yield; tone would give −31 %) keeps the texture', async () => {
    const { r, truthUm } = await scene('sem-strip-noise-flank');
    expect(codes(r)).not.toContain('TONE_BOUNDARY_USED');
    expect(Math.abs(errPct(r, truthUm))).toBeLessThanOrEqual(4);
  });

  it('defocus_one_side.jpg (independent generator: texture right, tone 1.2 points worse) keeps the texture', async () => {
    const { r, truthUm } = await external('defocus_one_side.jpg');
    expect(codes(r)).not.toContain('TONE_BOUNDARY_USED');
    expect(Math.abs(errPct(r, truthUm))).toBeLessThanOrEqual(2);
  });
});
