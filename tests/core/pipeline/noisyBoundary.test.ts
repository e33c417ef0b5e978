/**
 * The rim/core boundary under noise and weak core contrast (issue 11, real scenes): the step fit of
 * the boundary refinement on a profile pooled over neighbouring rays (segment/rayPool.ts). Before,
 * the single-ray fits' coreward tail made these bands too wide: the SEM scene of our set +3.5 %, the
 * independent generator's noisy JPEG +2.1 % (its 95 % CI missing the truth), its SEM image +1.7 %,
 * its noisy SEM image +3.1 %. Bounds of the issue: a single scene element within 2 %, combinations
 * within 4 %; the truth is the mean over the whole circumference.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { MeasureResult } from '../../../src/core/pipeline/index.js';
import { measureBytes, measureScene } from '../../helpers/measureScene.js';

const EXT = join(__dirname, '../../fixtures/external/scenes');

const ourScene = (name: string) => measureScene(name);

async function externalScene(file: string): Promise<{ r: MeasureResult; truthUm: number }> {
  const t = JSON.parse(readFileSync(join(EXT, file.replace(/\.\w+$/, '.truth.json')), 'utf8')) as { umPerPx: number; band: { meanWidthUm: number } };
  return { r: await measureBytes(new Uint8Array(readFileSync(join(EXT, file))), file, t.umPerPx), truthUm: t.band.meanWidthUm };
}

function check(r: MeasureResult, truthUm: number, tolPct: number, ciCovers: boolean): void {
  expect(r.band.detected).toBe(true);
  const w = r.band.widthUm!;
  const err = (100 * (w.mean - truthUm)) / truthUm;
  expect(Math.abs(err), `measured ${w.mean} µm vs truth ${truthUm} µm`).toBeLessThanOrEqual(tolPct);
  if (ciCovers) expect(w.ci95[0] <= truthUm && truthUm <= w.ci95[1], `CI ${w.ci95[0]}–${w.ci95[1]} µm vs truth ${truthUm} µm`).toBe(true);
}

describe('band width under noise and weak core contrast', () => {
  it('sem (our scene set: tilt contrast, edge glow, scan lines, signal noise): within 2 %, CI covers (was +3.5 %)', async () => {
    const { r, truthUm } = await ourScene('sem');
    check(r, truthUm, 2, true);
  });

  it('noisy.jpg (independent generator: high-ISO noise, JPEG q60): within 2 %, CI covers (was +2.1 %, CI missed)', async () => {
    const { r, truthUm } = await externalScene('noisy.jpg');
    check(r, truthUm, 2, true);
  });

  it('sem.tif (independent generator): within 2 %, CI covers (was +1.7 %)', async () => {
    const { r, truthUm } = await externalScene('sem.tif');
    check(r, truthUm, 2, true);
  });

  it('sem_noise.tif (independent generator, SEM + noise): within 4 % (was +3.1 %)', async () => {
    const { r, truthUm } = await externalScene('sem_noise.tif');
    check(r, truthUm, 4, false);
  });
});
