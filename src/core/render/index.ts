/** Synthetic fractographs with known truth (pure, deterministic, seeded). */
export { renderFractograph, type RenderResult, type RgbRaster } from './fractograph.js';
export type { RenderTruth, SpecimenTruth, SpecimenRays, OutlineTruth, BandTruth } from './truth.js';
export type { SceneTruth, ObjectTruth, FlankTruth } from './sceneTruth.js';
export { resolveRenderOptions } from './resolve.js';
export {
  BACKGROUNDS,
  DEFAULT_CORE,
  DEFAULT_LIGHT,
  DEFAULT_RIM,
  DEFAULT_SCALE_BAR,
  DEFAULT_SPECIMEN,
  type Background,
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
export {
  DEFAULT_COLOUR,
  DEFAULT_DEFOCUS,
  DEFAULT_FLANK,
  DEFAULT_GLINTS,
  DEFAULT_HALVES,
  DEFAULT_HOLDERS,
  DEFAULT_LABEL,
  DEFAULT_RULE,
  DEFAULT_SEM,
  DEFAULT_SHADOW,
  DEFAULT_U_FLANK,
  SEM_DETECTOR_LIGHT,
  type Tint,
  type FlankOptions,
  type HolderKind,
  type HolderOptions,
  type ShadowOptions,
  type SemOptions,
  type GlintOptions,
  type ColourOptions,
  type DefocusOptions,
  type HalvesOptions,
  type RuleOptions,
  type LabelOptions,
} from './sceneOptions.js';
export { autoBarLabel, layoutScaleBar, type ScaleBarTruth, type BoxPx } from './scalebar.js';
export { encodeRender } from './encode.js';
export { SCENE_SET, findScene, type SceneCase } from './scenes.js';
