/**
 * The parameter range's window variations (stages/uncertainty.ts `windowVariationMean`) as a job
 * another thread can run beside the pipeline: they read only the working copy, the specimen's
 * location and the parameters, so they can start as soon as the specimen is located, while this
 * thread computes the measurement's own texture, classification and boundary.
 *
 * Core stays single-threaded and pure: a shell that has threads passes a {@link VariationHelper}
 * (the CLI's `measure`, cli/variationHelper.ts); the job is plain data, the helper runs
 * {@link runWindowVariationJob} — the same function on the same inputs, so the same numbers as
 * when the pipeline computes them itself (tests/core/pipeline/helperJob.test.ts). Without a
 * helper, or when it gives nothing back, the pipeline computes them itself.
 */
import type { BoxPx } from '../image/geometry.js';
import type { Scale } from '../calibrate/index.js';
import { WorkingFrame, type FrameParts } from './frame.js';
import type { SpecimenLocation } from './stages/locateSpecimen.js';
import type { TextureWindow } from './stages/texture.js';
import { windowVariationMean, type WindowVariationInput } from './stages/uncertainty.js';
import type { MeasureParams } from './types.js';

/** The window variations of one specimen as plain (structured-clonable) data. */
export interface WindowVariationJob {
  frame: FrameParts;
  scale: Scale;
  location: SpecimenLocation;
  window: TextureWindow;
  marks: BoxPx[];
  params: MeasureParams;
  factors: number[];
}

/**
 * Runs window variations elsewhere. `start` hands over a job and returns a function that waits for
 * its means (one per factor, in order; null where a variation found no band), or returns null when
 * the helper could not run it (then the pipeline computes them itself).
 */
export interface VariationHelper {
  start(job: WindowVariationJob): () => (number | null)[] | null;
}

/** The job for `factors` of these inputs (the frame without its full-resolution pixels, the location without its edge search). */
export function windowVariationJob(v: WindowVariationInput, factors: readonly number[]): WindowVariationJob {
  const { edgeSearch: _unused, ...location } = v.location;
  return { frame: v.frame.parts(), scale: v.scale, location, window: v.window, marks: [...v.marks], params: v.params, factors: [...factors] };
}

/** What a helper runs: {@link windowVariationMean} for each factor of the job. */
export function runWindowVariationJob(job: WindowVariationJob): (number | null)[] {
  const v: WindowVariationInput = { frame: WorkingFrame.fromParts(job.frame), scale: job.scale, location: job.location, window: job.window, marks: job.marks, params: job.params };
  return job.factors.map((f) => windowVariationMean(v, f));
}
