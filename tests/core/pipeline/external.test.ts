/**
 * Outside cross-check of the whole pipeline (decode → automatic scale-bar detection → outline →
 * texture → rim/core boundary → band width) on synthetic fractographs made by an INDEPENDENT
 * generator: scripts/fixtures/make_external_fractographs.py, written in Python with numpy,
 * scipy.ndimage, Pillow (JPEG/PNG, ImageDraw default font for the labels) and tifffile (16-bit
 * TIFF). It models the fracture surface of a round notched bar from the physics (smooth slanted
 * rim lit from one side, rough core with multi-scale noise, cracks and radial streaks, affine tilt)
 * and shares no code with our renderer in src/core/render. Images and truth JSON live in
 * tests/fixtures/external/ (regenerate: /usr/bin/python3 scripts/fixtures/make_external_fractographs.py).
 *
 * Bounds (from the measurement issue, same as accuracy.test.ts): detected scale bar length within
 * 1.5 px of the burned-in bar; mean band width within 4 % of the truth mean over the rays the tool
 * marked valid; the image without a smooth rim → band not detected.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { analyseImage, defaultParams, type MeasureResult } from '../../../src/core/pipeline/index.js';

const DIR = fileURLToPath(new URL('../../fixtures/external/', import.meta.url));

interface Truth {
  file: string;
  description: string;
  umPerPx: number;
  band: { present: boolean; widthUmByAngle: (number | null)[]; meanWidthUm: number | null };
  scaleBar: { x0: number; x1: number; row: number; lengthPx: number; lengthUm: number };
}

const NAMES = ['round_dark', 'bright_background', 'tilted', 'equal_mean', 'varying_rim'];

function loadTruth(name: string): Truth {
  return JSON.parse(readFileSync(`${DIR}${name}.truth.json`, 'utf8')) as Truth;
}

async function run(name: string): Promise<{ r: MeasureResult; t: Truth }> {
  const t = loadTruth(name);
  const bytes = new Uint8Array(readFileSync(`${DIR}${t.file}`));
  const p = defaultParams();
  p.scale.barLengthUm = t.scaleBar.lengthUm; // scale from OUR automatic scale-bar detection
  p.bootstrap = 200;
  const { result } = await analyseImage(bytes, { file: t.file, sha256: 'test' }, p);
  return { r: result, t };
}

/** Mean of the true per-angle width over the rays the tool marked valid. */
function truthMeanOverValid(t: Truth, r: MeasureResult): number {
  const vals: number[] = [];
  for (const ray of r.band.profile) {
    if (!ray.valid) continue;
    const w = t.band.widthUmByAngle[((Math.round(ray.angleDeg) % 360) + 360) % 360];
    if (w !== null && w !== undefined) vals.push(w);
  }
  return vals.reduce((a, b) => a + b, 0) / vals.length;
}

function checkWidth(r: MeasureResult, t: Truth): void {
  expect(r.band.detected, r.band.reason).toBe(true);
  const w = r.band.widthUm!;
  expect(w.n).toBeGreaterThan(180);
  const truthUm = truthMeanOverValid(t, r);
  const errPct = (100 * Math.abs(w.mean - truthUm)) / truthUm;
  expect(errPct, `measured ${w.mean} µm vs truth ${truthUm.toFixed(2)} µm`).toBeLessThanOrEqual(4);
}

function checkBar(r: MeasureResult, t: Truth): void {
  const bar = r.scale.detectedBar;
  expect(bar, 'scale bar found').not.toBeNull();
  expect(r.scale.source).toBe('scale-bar');
  expect(Math.abs(bar!.lengthPx - t.scaleBar.lengthPx), `bar ${bar!.lengthPx} px vs truth ${t.scaleBar.lengthPx} px`).toBeLessThanOrEqual(1.5);
}

describe('pipeline on independent synthetic fractographs (Python generator)', () => {
  for (const name of NAMES) {
    it(`${name}: scale bar within 1.5 px, mean width within 4 % of truth`, async () => {
      const { r, t } = await run(name);
      checkBar(r, t);
      checkWidth(r, t);
    });
  }

  it('noisy_vignetted: scale bar within 1.5 px', async () => {
    const { r, t } = await run('noisy_vignetted');
    checkBar(r, t);
  });

  // Noise σ 0.04 + blur σ 1.2 px + vignetting on a 44 px wide band: the hardest case here. With the
  // first boundary level (std midpoint only) it measured +4.2 % (boundary 1.8 px into the core);
  // the level is now the mean of the log and std midpoints (see refineBoundary).
  it('noisy_vignetted: mean width within 4 % of truth', async () => {
    const { r, t } = await run('noisy_vignetted');
    checkWidth(r, t);
  });

  it('no_rim: scale bar within 1.5 px, band not detected', async () => {
    const { r, t } = await run('no_rim');
    checkBar(r, t);
    expect(t.band.present).toBe(false);
    expect(r.band.detected).toBe(false);
    expect(r.band.widthUm).toBeNull();
  });
});
