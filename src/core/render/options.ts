/**
 * Options of the synthetic fractograph renderer and their defaults (validation: resolve.ts; the scene
 * elements: sceneOptions.ts). Lengths a user thinks of physically are in µm (`…Um`), image things in
 * px (`…Px`), angles in degrees with the project convention (0° = +x, counter-clockwise on screen).
 */
import type {
  ColourOptions,
  DefocusOptions,
  FlankOptions,
  GlintOptions,
  HalvesOptions,
  HolderKind,
  HolderOptions,
  LabelOptions,
  RuleOptions,
  SemOptions,
  ShadowOptions,
} from './sceneOptions.js';

/** One Fourier term of an angular variation: amplitudePct/100 · cos(order·α − phaseDeg). */
export interface Harmonic {
  /** integer order k ≥ 1 (k = 1 shifts, k = 2 ovalises, higher k makes waves) */
  readonly order: number;
  /** amplitude in % of the mean value */
  readonly amplitudePct: number;
  /** phase in degrees */
  readonly phaseDeg: number;
}

/** An angular sector from `fromDeg` counter-clockwise to `toDeg` (may wrap through 0°). */
export interface AngleSector {
  readonly fromDeg: number;
  readonly toDeg: number;
}

export interface SpecimenOptions {
  /** net-section diameter, µm */
  readonly diameterUm: number;
  /** specimen centre in px; null = canvas centre. May lie so that the frame cuts the specimen. */
  readonly centrePx: { readonly x: number; readonly y: number } | null;
  /** view tilt in degrees (0 = end-on); the disc projects to an ellipse with minor/major = cos(tilt) */
  readonly tiltDeg: number;
  /** direction of the tilt axis on screen (the unshortened direction), degrees */
  readonly tiltAxisDeg: number;
  /** small harmonic wobble of the outline radius (on the specimen's own angle α) */
  readonly wobble: readonly Harmonic[];
}

export interface RimOptions {
  /** mean radial band width on the specimen surface, µm */
  readonly widthUm: number;
  /** angular variation of the width (on the specimen angle α) */
  readonly harmonics: readonly Harmonic[];
  /** sectors of the specimen angle α with no band at all */
  readonly absentSectors: readonly AngleSector[];
  /** width of the fuzzy rim→core transition, µm (truth boundary at the 50 % blend) */
  readonly transitionUm: number;
  /** outward slope of the band (shear-lip-like), degrees */
  readonly slopeDeg: number;
  /** fine relief amplitude, µm */
  readonly reliefUm: number;
  /** fine relief wavelength, µm */
  readonly reliefScaleUm: number;
  /** radial striation strength 0..1 (0 = none) */
  readonly striations: number;
  /** spacing of striations along the circumference, µm */
  readonly striationSpacingUm: number;
}

export interface CoreOptions {
  /** fractal relief amplitude, µm */
  readonly reliefUm: number;
  /** base wavelength of the fractal relief, µm */
  readonly reliefScaleUm: number;
  /** octaves of the fractal relief */
  readonly octaves: number;
  /** dimple (cell) size, µm */
  readonly dimpleSizeUm: number;
  /** dimple depth, µm */
  readonly dimpleDepthUm: number;
  /** radial ridge height, µm (0 = none) */
  readonly ridgeUm: number;
  /** ridge spacing along the circumference at the rim, µm */
  readonly ridgeSpacingUm: number;
  /** number of macro-cracks */
  readonly cracks: number;
  /** crack width, µm */
  readonly crackWidthUm: number;
}

export interface LightOptions {
  /** direction the light comes from, degrees (0° = from the right, CCW on screen) */
  readonly azimuthDeg: number;
  /** light elevation above the image plane, degrees */
  readonly elevationDeg: number;
  /** ambient fraction 0..1 */
  readonly ambient: number;
}

export type Corner = 'tl' | 'tr' | 'bl' | 'br';

export interface ScaleBarOptions {
  /** bar length, µm; drawn length = round(lengthUm / umPerPxX) px */
  readonly lengthUm: number;
  /** corner used when positionPx is null */
  readonly corner: Corner;
  /** explicit top-left pixel of the bar (column x0, row y0), or null for the corner layout */
  readonly positionPx: { readonly x0: number; readonly y0: number } | null;
  /** 'light' = light bar (on a dark plate); 'dark' = dark bar (on a light plate) */
  readonly polarity: 'light' | 'dark';
  /** bar thickness in px (rows y0..y1) */
  readonly thicknessPx: number;
  /** draw a contrasting plate behind bar and label */
  readonly plate: boolean;
  /** label text, '' for none; null = automatic ("500 µm", "1 mm") */
  readonly label: string | null;
  /** integer font scale for the label; 0 = automatic */
  readonly labelScale: number;
}

/** Everything the renderer accepts; every field optional (defaults in {@link DEFAULT_RENDER_OPTIONS}). */
export interface RenderOptions {
  readonly seed?: number;
  readonly widthPx?: number;
  readonly heightPx?: number;
  /** pixel size along x, µm per px (square pixels unless umPerPxY is given) */
  readonly umPerPx?: number;
  readonly umPerPxY?: number | null;
  readonly specimen?: Partial<SpecimenOptions>;
  /** false = no smooth rim at all (core texture up to the edge) */
  readonly rim?: Partial<RimOptions> | false;
  readonly core?: Partial<CoreOptions>;
  readonly light?: Partial<LightOptions>;
  /** make rim and core mean intensity equal (only texture separates them) */
  readonly equalMeanBrightness?: boolean;
  /** rim brightness relative to the core when not equalised (+0.2 = 20 % brighter, −0.2 darker) */
  readonly rimBrightness?: number;
  /** 'dark', 'bright', or a textured holder (see {@link HolderOptions}) */
  readonly background?: Background;
  /** background noise amplitude (intensity units 0..1) */
  readonly backgroundNoise?: number;
  /** vignetting strength 0..1 (intensity loss at the frame corners) */
  readonly vignetting?: number;
  /** Gaussian blur σ in px (0 = none) */
  readonly blurSigmaPx?: number;
  /** additive Gaussian noise σ (intensity units) */
  readonly noiseSigma?: number;
  /** signal-dependent noise: variance += noiseSignal² · intensity */
  readonly noiseSignal?: number;
  /** SEM-like bright edge strength 0..1 (0 = none) */
  readonly semEdge?: number;
  /** null = no scale bar */
  readonly scaleBar?: Partial<ScaleBarOptions> | null;
  // ---- scene elements (sceneOptions.ts); each off unless given ----
  /** the notch flank around the fracture surface */
  readonly flank?: Partial<FlankOptions>;
  /** parameters of a textured holder ('putty', 'clamp' or 'paper' background) */
  readonly holder?: Partial<HolderOptions>;
  /** a soft shadow cast by the bar on the background */
  readonly shadow?: Partial<ShadowOptions>;
  /** SEM look: tilt contrast, scan-line noise, data strip */
  readonly sem?: Partial<SemOptions>;
  /** specular glints on the slanted rim */
  readonly glints?: Partial<GlintOptions>;
  /** colour output with zone tints and colour noise */
  readonly colour?: Partial<ColourOptions>;
  /** one-sided defocus across the image */
  readonly defocus?: Partial<DefocusOptions>;
  /** both mating halves side by side */
  readonly halves?: Partial<HalvesOptions>;
  /** a steel rule along one side */
  readonly rule?: Partial<RuleOptions>;
  /** a paper specimen label */
  readonly label?: Partial<LabelOptions>;
}

/** Options with every default filled in (echoed in the truth). */
export interface ResolvedRenderOptions {
  readonly seed: number;
  readonly widthPx: number;
  readonly heightPx: number;
  readonly umPerPx: number;
  readonly umPerPxY: number;
  readonly specimen: SpecimenOptions;
  readonly rim: RimOptions | false;
  readonly core: CoreOptions;
  readonly light: LightOptions;
  readonly equalMeanBrightness: boolean;
  readonly rimBrightness: number;
  readonly background: Background;
  readonly backgroundNoise: number;
  readonly vignetting: number;
  readonly blurSigmaPx: number;
  readonly noiseSigma: number;
  readonly noiseSignal: number;
  readonly semEdge: number;
  readonly scaleBar: ScaleBarOptions | null;
  // Scene elements: present only when asked for, so the echo of a plain render's options (in its
  // truth file) is unchanged.
  readonly flank?: FlankOptions;
  /** present when `background` is a holder kind */
  readonly holder?: HolderOptions;
  readonly shadow?: ShadowOptions;
  readonly sem?: SemOptions;
  readonly glints?: GlintOptions;
  readonly colour?: ColourOptions;
  readonly defocus?: DefocusOptions;
  readonly halves?: HalvesOptions;
  readonly rule?: RuleOptions;
  readonly label?: LabelOptions;
}

/** Background kinds: plain dark or bright (mottled), or a textured holder. */
export type Background = 'dark' | 'bright' | HolderKind;
/** Every background kind, for validation and the command line. */
export const BACKGROUNDS: readonly Background[] = ['dark', 'bright', 'putty', 'clamp', 'paper'];

export const DEFAULT_SPECIMEN: SpecimenOptions = { diameterUm: 5000, centrePx: null, tiltDeg: 0, tiltAxisDeg: 0, wobble: [] };
export const DEFAULT_RIM: RimOptions = {
  widthUm: 400,
  harmonics: [
    { order: 1, amplitudePct: 8, phaseDeg: 30 },
    { order: 3, amplitudePct: 5, phaseDeg: 100 },
    { order: 7, amplitudePct: 3, phaseDeg: 200 },
  ],
  absentSectors: [],
  transitionUm: 40,
  slopeDeg: 20,
  reliefUm: 1.5,
  reliefScaleUm: 60,
  striations: 0.4,
  striationSpacingUm: 40,
};
export const DEFAULT_CORE: CoreOptions = {
  reliefUm: 30,
  reliefScaleUm: 400,
  octaves: 6,
  dimpleSizeUm: 45,
  dimpleDepthUm: 10,
  ridgeUm: 12,
  ridgeSpacingUm: 120,
  cracks: 3,
  crackWidthUm: 8,
};
export const DEFAULT_LIGHT: LightOptions = { azimuthDeg: 135, elevationDeg: 40, ambient: 0.35 };
export const DEFAULT_SCALE_BAR: ScaleBarOptions = {
  lengthUm: 1000,
  corner: 'br',
  positionPx: null,
  polarity: 'light',
  thicknessPx: 8,
  plate: true,
  label: null,
  labelScale: 0,
};
