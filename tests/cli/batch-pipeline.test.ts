// The batch runner with the real measurement pipeline (no test processor): small rendered
// fractographs (invented test data), a damaged file and a non-image.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import Papa from 'papaparse';
import { beforeAll, describe, expect, it } from 'vitest';
import { encodeGrayRaster } from '../../src/core/encode/index.js';
import { renderFractograph } from '../../src/core/render/index.js';
import { requireBuild, runCli, tempDir, write } from './batch-helpers.js';

describe('batch with the measurement pipeline', () => {
  let out: string;
  let run: ReturnType<typeof runCli>;
  beforeAll(() => {
    requireBuild();
    const d = tempDir('pipe-in');
    const opts = { widthPx: 420, heightPx: 340, umPerPx: 15, specimen: { diameterUm: 4500 }, rim: { widthUm: 600, transitionUm: 30 }, blurSigmaPx: 0.8, noiseSigma: 0.01 };
    for (const seed of [5, 6]) {
      const { raster } = renderFractograph({ ...opts, seed });
      write(join(d, `rendered-${seed}.png`), encodeGrayRaster(raster, { format: 'png', bitDepth: 8, umPerPx: 15, umPerPxY: 15 }));
    }
    const good = readFileSync(join(d, 'rendered-5.png'));
    write(join(d, 'damaged.png'), new Uint8Array(good.subarray(0, Math.floor(good.length / 3))));
    write(join(d, 'words.png'), 'plain text pretending to be a picture\n');
    out = join(tempDir('pipe-out'), 'OUT');
    run = runCli(['batch', d, '--out', out, '--jobs', '2', '--json', '--rays', '90', '--bootstrap', '200'], { FRACTOZONE_BATCH_PROCESSOR: '' });
  });

  it('measures the rendered images and records the refused files', () => {
    expect(run.code, run.stderr).toBe(1);
    const rows = Papa.parse<Record<string, string>>(readFileSync(join(out, 'results.csv'), 'utf8'), { header: true, skipEmptyLines: true }).data;
    const by = Object.fromEntries(rows.map((r) => [r.file, r]));
    expect(by['damaged.png'].status).toBe('error');
    expect(by['damaged.png'].error_code).not.toBe('');
    expect(by['words.png'].status).toBe('error');
    expect(by['words.png'].error_code).toBe('NOT_AN_IMAGE');
    for (const f of ['rendered-5.png', 'rendered-6.png']) {
      expect(['ok', 'no-band']).toContain(by[f].status);
      const rec = JSON.parse(readFileSync(join(out, 'results', `${f}.json`), 'utf8'));
      expect(rec.schema).toBe('fractozone.result/2');
      expect(rec.input.file).toBe(f);
      expect(Number(by[f].um_per_px)).toBe(rec.scale.umPerPx);
      if (by[f].status === 'ok') expect(Number(by[f].width_mean_um)).toBe(rec.band.widthUm.mean);
    }
  });
});
