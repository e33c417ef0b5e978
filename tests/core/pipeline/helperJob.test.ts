/**
 * The parameter range's window variations run by a helper (pipeline/helperJob.ts): the job is
 * plain data that survives a structured clone (what a worker thread receives), and a result made
 * with a helper — or with a helper that gives nothing back — equals the one computed on one thread,
 * to the last digit. The real thread of the CLI is tested in tests/cli/measure.test.ts.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { renderFractograph } from '../../../src/core/render/index.js';
import { encodeGrayRaster } from '../../../src/core/encode/index.js';
import { createRaster } from '../../../src/core/image/raster.js';
import { analyseImage, defaultParams, runWindowVariationJob, WorkingFrame, type MeasureResult, type VariationHelper, type WindowVariationJob } from '../../../src/core/pipeline/index.js';

/** Everything but the timings (wall-clock, diagnostics only). */
function comparable(r: MeasureResult): string {
  return JSON.stringify({ ...r, diagnostics: { ...r.diagnostics, timingsMs: null } });
}

let bytes: Uint8Array;
const params = defaultParams();

async function measure(helper?: VariationHelper): Promise<MeasureResult> {
  return (await analyseImage(bytes, { file: 'helper.png', sha256: 'test' }, params, undefined, helper ? { helper } : {})).result;
}

beforeAll(() => {
  // larger than the working copy (1200 px), so the frame's mapping is not the identity
  const { raster, truth } = renderFractograph({ seed: 11, widthPx: 1500, heightPx: 1120, umPerPx: 6 });
  bytes = encodeGrayRaster(raster, { format: 'png', bitDepth: 8 });
  params.scale.pixelSizeUm = truth.umPerPxX;
});

describe('window variations on a helper', () => {
  it('a frame made again from its parts maps and reads the working copy like the frame', () => {
    const f = new WorkingFrame(createRaster(1500, 1130), [{ x: 10, y: 1000, w: 300, h: 60 }]);
    const g = WorkingFrame.fromParts(structuredClone(f.parts()));
    expect(g).toBeInstanceOf(WorkingFrame);
    expect(g.fullSize).toEqual(f.fullSize);
    expect([g.sx, g.sy, g.lengthScale, g.factor]).toEqual([f.sx, f.sy, f.lengthScale, f.factor]);
    expect(g.toFull({ x: 3.25, y: 700.5 })).toEqual(f.toFull({ x: 3.25, y: 700.5 }));
    expect(g.toWork({ x: 1499, y: 2 })).toEqual(f.toWork({ x: 1499, y: 2 }));
    expect(g.work.data).toEqual(f.work.data);
    expect(g.workMarks).toEqual(f.workMarks);
  });

  it('gives the same result as one thread, with the helper answering or not', async () => {
    const alone = await measure();
    const u = alone.band.uncertainty!;
    expect(u.variations.slice(0, 2).map((v) => v.name)).toEqual(['window ×0.7', 'window ×1.4']);
    expect(u.variations.every((v) => v.meanUm !== null)).toBe(true);

    const jobs: WindowVariationJob[] = [];
    const answered: (number | null)[][] = [];
    const helper: VariationHelper = {
      start(job) {
        // what a worker receives: a structured clone (no class instances, no shared objects)
        const copy = structuredClone(job);
        jobs.push(copy);
        return () => {
          const means = runWindowVariationJob(copy);
          answered.push(means);
          return means;
        };
      },
    };
    const helped = await measure(helper);
    expect(jobs).toHaveLength(1);
    expect(jobs[0].frame.work.width).toBeLessThanOrEqual(1200);
    expect(answered[0].every((m) => typeof m === 'number')).toBe(true);
    expect(comparable(helped)).toBe(comparable(alone));

    // a helper that gives nothing back: the pipeline computes the variations itself
    const silent = await measure({ start: () => () => null });
    expect(comparable(silent)).toBe(comparable(alone));
  }, 120_000);
});
