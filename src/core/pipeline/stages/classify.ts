/**
 * Stage 4, classify: smooth rim against rough core on the working copy (segment/rimCore.ts):
 * brightness-normalised (each feature's transform and gain power come from its definition in
 * texture/), winsorised z-scores of the features, Otsu's threshold, morphology, and
 * the topology of the problem (core = rough region around the centre, holes filled).
 */
import type { Warning } from '../../warnings.js';
import type { RimCoreResult } from '../../segment/index.js';
import { classifyRimCore } from '../../segment/index.js';
import { FEATURES } from '../../texture/index.js';
import type { SpecimenLocation } from './locateSpecimen.js';
import type { TextureMaps } from './texture.js';

/** Input of {@link classifyTexture}. */
export interface ClassifyInput {
  location: SpecimenLocation;
  texture: TextureMaps;
  /** Working px per feature-map px (default 1; 2 for maps binned 2 × 2). */
  featureScale?: number;
  /** Keep the per-feature scores for classifications of the same maps with a feature left out (segment/rimCore.ts `shareScores`). */
  shareScores?: boolean;
}

/** Output of {@link classifyTexture}: the rim/core split in working px. */
export interface Classification {
  rimCore: RimCoreResult;
  warnings: Warning[];
}

/** Splits the specimen into rim and core; `rimCore.detected` is false (with a reason) when there is no rim. */
export function classifyTexture(input: ClassifyInput): Classification {
  const { location, texture } = input;
  const defs = texture.maps.map((m) => FEATURES[m.name]);
  const rimCore = classifyRimCore(
    location.specimen,
    texture.maps.map((m) => m.raster),
    {
      windowPx: texture.window.windowPxWork,
      featureScale: input.featureScale ?? 1,
      center: location.centerWork,
      transforms: defs.map((d) => d.transform),
      brightness: texture.brightness,
      // a tone feature IS the brightness: normalising it by the brightness would cancel it (texture/localDarkness.ts)
      gainPowers: defs.map((d) => (d.cue === 'tone' ? 0 : d.gainPower)),
      shareScores: input.shareScores,
    },
  );
  return { rimCore, warnings: [...rimCore.warnings] };
}
