/**
 * Stage 4, classify: smooth rim against rough core on the working copy (segment/rimCore.ts):
 * brightness-normalised, winsorised z-scores of the features, Otsu's threshold, morphology, and
 * the topology of the problem (core = rough region around the centre, holes filled).
 */
import type { RimCoreResult } from '../../segment/index.js';
import { classifyRimCore } from '../../segment/index.js';
import type { SpecimenLocation } from './locateSpecimen.js';
import type { TextureMaps } from './texture.js';

/** How each feature scales with a multiplicative brightness change (see classifyRimCore). */
const GAIN_POWER: Record<string, number> = { localStd: 1, localVariance: 2, gradientEnergy: 2, highPassEnergy: 2, localEntropy: 0 };

/** Input of {@link classifyTexture}. */
export interface ClassifyInput {
  location: SpecimenLocation;
  texture: TextureMaps;
}

/** Output of {@link classifyTexture}: the rim/core split in working px. */
export interface Classification {
  rimCore: RimCoreResult;
  warnings: string[];
}

/** Splits the specimen into rim and core; `rimCore.detected` is false (with a reason) when there is no rim. */
export function classifyTexture(input: ClassifyInput): Classification {
  const { location, texture } = input;
  const names = texture.maps.map((m) => m.name);
  const rimCore = classifyRimCore(
    location.specimen,
    texture.maps.map((m) => m.raster),
    {
      windowPx: texture.window.windowPxWork,
      featureScale: 1,
      center: location.centerWork,
      transforms: names.map((n) => (n === 'localEntropy' ? 'identity' : 'log')),
      brightness: texture.brightness,
      gainPowers: names.map((n) => GAIN_POWER[n] ?? 0),
    },
  );
  return { rimCore, warnings: [...rimCore.warnings] };
}
