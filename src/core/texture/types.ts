/**
 * Shared types of the texture (roughness) features.
 *
 * Every feature maps a {@link GrayRaster} (gray 0..1) to a raster of the same size holding one
 * roughness value per pixel, computed over a square window of odd side `windowPx` centred on the
 * pixel. Rules that all features follow are in DEVELOPERS.md ("Texture features").
 */
import type { GrayRaster } from '../image/raster.js';
import type { WindowRule } from './window.js';

/** Options understood by {@link computeFeature}; each feature reads the fields it needs. */
export interface FeatureOptions {
  /** Odd side of the square window in pixels (≥ 3); see `windowPxFromUm`. */
  windowPx: number;
  /** localEntropy: number of histogram bins (2..256, default 32 for a 0..1 raster). */
  bins?: number;
  /** localEntropy: intensity range [lo, hi] mapped onto the bins (same units as the input). */
  range?: readonly [number, number];
  /** localEntropy: percentiles [lo, hi] (0..100) giving the range when `range` is absent (default [0.5, 99.5]). */
  percentiles?: readonly [number, number];
}

/** One entry of the feature registry. Adding a feature = one file exporting this + one registry line. */
export interface FeatureDefinition {
  /** Registry key; also the name used in parameters and reports. */
  readonly name: string;
  /** Unit of the output values, spelled for people ("gray level (0..1)", "bit", ...). */
  readonly unit: string;
  /** One sentence: what the value measures. */
  readonly description: string;
  /**
   * True when the value is a box average of a pointwise quantity, so that on a window straddling
   * two textures it is linear in their area fraction (the boundary-refinement stage relies on it).
   */
  readonly linearInAreaFraction: boolean;
  /**
   * Transform before the features are combined (segment/rimCore.ts): 'log' for values that scale
   * with the texture amplitude (std, variance, energies), 'identity' for values that are already
   * logarithmic (entropy in bits: a smooth window has entropy 0, whose log would swamp the rest).
   */
  readonly transform: 'log' | 'identity';
  /**
   * Power p of the brightness the value scales with under a multiplicative change of the light
   * (1 for a standard deviation, 2 for a variance or an energy, 0 for entropy): the classification
   * uses log f − p·log(local mean), so shading and vignetting do not read as texture.
   */
  readonly gainPower: number;
  /**
   * What the feature reads: 'texture' (roughness; the default) or 'tone' (brightness,
   * texture/localDarkness.ts). A boundary classified on tone features only is refined on the local
   * mean brightness instead of the texture step (pipeline/stages/refineBoundary.ts).
   */
  readonly cue?: 'texture' | 'tone';
  /** Rule for the window side when none is given (texture/window.ts). */
  readonly defaultWindow: WindowRule;
  /** Compute the feature map (same size as `r`). */
  readonly compute: (r: GrayRaster, opts: FeatureOptions) => GrayRaster;
}
