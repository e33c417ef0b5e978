/**
 * The serialisable parameter object shared by the CLI, the batch runner and the web app; every
 * result echoes it whole. The result itself is typed in result.ts.
 * Every length a user sees is in µm (names end in `Um`), pixel quantities end in `Px`.
 */
import type { PointPx } from '../image/geometry.js';
import type { FeatureName } from '../texture/registry.js';

export type { PointPx };
export { RESULT_SCHEMA } from './result.js';

/** How the scale is set. Precedence: typed pixel size > two points > scale bar (length given) > metadata. */
export interface ScaleParams {
  /** Typed pixel size, µm per pixel (X; Y equal unless `pixelSizeYUm`). */
  pixelSizeUm?: number;
  pixelSizeYUm?: number;
  /** Real length of the burned-in scale bar, µm: the bar is found automatically. */
  barLengthUm?: number;
  /** Two points on the image and their real distance. */
  twoPoint?: { p0: PointPx; p1: PointPx; distanceUm: number };
  /** Take the pixel size from TIFF/PNG metadata when it describes a physical size (default true). */
  useMetadata?: boolean;
}

/**
 * What the critical distance is computed from: a material sheet entry (as parsed by
 * `parseMaterialSheet`) and/or typed values in MPa·√m and MPa with optional sd. Typed values win.
 */
export interface MaterialParams {
  material?: import('../tcd/materials.js').Material;
  toughness?: import('../tcd/resolve.js').QuantityInput;
  strength?: import('../tcd/resolve.js').QuantityInput;
}

export interface MeasureParams {
  scale: ScaleParams;
  /** Texture window side in µm; null = automatic from the specimen size (rule in DEVELOPERS.md). */
  windowUm: number | null;
  /** Roughness features combined for the classification (default texture/registry.ts DEFAULT_FEATURES). */
  features: FeatureName[];
  /** Number of rays around the circumference. */
  nRays: number;
  /** Angular exclusion sectors, degrees [from, to], wrap-around allowed. */
  exclude: [number, number][];
  /** Drop MAD outliers from the statistics (they always stay flagged in the profile). */
  dropOutliers: boolean;
  /** Outlier threshold k in |w − median| > k·1.4826·MAD. */
  outlierK: number;
  /** Bootstrap resamples for the CI of the median, and the seed. */
  bootstrap: number;
  seed: number;
  /**
   * SHA-256 of the pixel-classifier model file the image is segmented with (`--model`; the model
   * itself is passed to `analyseDecoded` beside the parameters). Absent: the fixed rules.
   */
  modelSha256?: string;
  /**
   * Net-section diameter of the specimen at the notch root, µm, when the user knows it from the
   * specimen drawing (`--section-diameter`): a prior for choosing the fracture surface's own edge among
   * concentric edges, and a cross-check of the scale (warning above 3 % difference). Absent: no prior.
   */
  sectionDiameterUm?: number;
  /** Manual boundary polygon (px) in place of the automatic one: re-measured without re-segmenting. */
  boundaryPolygon: PointPx[] | null;
  /** Pixel budget for decoding. */
  maxPixels: number;
  /** Critical-distance comparison (optional). */
  material: MaterialParams | null;
  strainRatePerS: number | null;
  reference: 'L' | 'L/2' | '2L';
  tolerancePct: number;
}

/** The file being measured, as the shell names it. */
export interface InputInfo {
  /** File name as the user gave it. */
  file: string;
  /** SHA-256 of the file's bytes, hex (computed by the shell). */
  sha256: string;
}

/** Progress callback: the next stage's name and the fraction of the work done (0..1). */
export type ProgressFn = (stage: string, fraction: number) => void;
