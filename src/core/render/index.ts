/** Synthetic fractographs with known truth (pure, deterministic, seeded). */
export { renderFractograph, type RenderResult, type RenderTruth } from './fractograph.js';
export {
  resolveRenderOptions,
  DEFAULT_CORE,
  DEFAULT_LIGHT,
  DEFAULT_RIM,
  DEFAULT_SCALE_BAR,
  DEFAULT_SPECIMEN,
  type RenderOptions,
  type ResolvedRenderOptions,
  type Harmonic,
  type AngleSector,
  type SpecimenOptions,
  type RimOptions,
  type CoreOptions,
  type LightOptions,
  type ScaleBarOptions,
  type Corner,
} from './options.js';
export { autoBarLabel, layoutScaleBar, type ScaleBarTruth, type BoxPx } from './scalebar.js';
export { createRng, type Rng } from './rng.js';
