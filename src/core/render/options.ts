/**
 * Options of the synthetic fractograph renderer, their defaults and validation.
 * Lengths a user thinks of physically are in µm (`…Um`), image things in px (`…Px`), angles in
 * degrees with the project convention (0° = +x, counter-clockwise on screen).
 */
import { FractozoneError } from '../errors.js';

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
  readonly background?: 'dark' | 'bright';
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
  readonly background: 'dark' | 'bright';
  readonly backgroundNoise: number;
  readonly vignetting: number;
  readonly blurSigmaPx: number;
  readonly noiseSigma: number;
  readonly noiseSignal: number;
  readonly semEdge: number;
  readonly scaleBar: ScaleBarOptions | null;
}

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

function bad(msg: string): never {
  throw new FractozoneError('BAD_PARAMETER', msg);
}
function num(v: unknown, what: string, lo: number, hi: number, integer = false): number {
  if (typeof v !== 'number' || !Number.isFinite(v)) bad(`${what} must be a finite number, got ${String(v)}`);
  if (v < lo || v > hi) bad(`${what} must be between ${lo} and ${hi}, got ${v}`);
  if (integer && !Number.isInteger(v)) bad(`${what} must be a whole number, got ${v}`);
  return v;
}
function harmonics(list: readonly Harmonic[] | undefined, what: string, fallback: readonly Harmonic[]): Harmonic[] {
  const l = list ?? fallback;
  if (!Array.isArray(l)) bad(`${what} must be a list of {order, amplitudePct, phaseDeg}`);
  return l.map((h, i) => ({
    order: num(h?.order, `${what}[${i}].order`, 1, 360, true),
    amplitudePct: num(h?.amplitudePct, `${what}[${i}].amplitudePct (%)`, -100, 100),
    phaseDeg: num(h?.phaseDeg ?? 0, `${what}[${i}].phaseDeg (°)`, -3600, 3600),
  }));
}

/**
 * Fill defaults and validate. Throws FractozoneError('BAD_PARAMETER') with one plain sentence
 * naming the option and its unit when a value is out of range.
 */
export function resolveRenderOptions(o: RenderOptions = {}): ResolvedRenderOptions {
  const widthPx = num(o.widthPx ?? 1600, 'image width (px)', 16, 20000, true);
  const heightPx = num(o.heightPx ?? 1200, 'image height (px)', 16, 20000, true);
  if (widthPx * heightPx > 100e6) bad(`image of ${widthPx}×${heightPx} px is larger than 100 megapixels`);
  const umPerPx = num(o.umPerPx ?? 5, 'pixel size (µm/px)', 1e-3, 1e4);
  const umPerPxY = o.umPerPxY == null ? umPerPx : num(o.umPerPxY, 'pixel height (µm/px)', 1e-3, 1e4);
  const s = o.specimen ?? {};
  const centre = s.centrePx ?? null;
  if (centre !== null) {
    num(centre.x, 'specimen centre x (px)', -1e5, 1e5);
    num(centre.y, 'specimen centre y (px)', -1e5, 1e5);
  }
  const specimen: SpecimenOptions = {
    diameterUm: num(s.diameterUm ?? DEFAULT_SPECIMEN.diameterUm, 'specimen diameter (µm)', 1e-3, 1e7),
    centrePx: centre === null ? null : { x: centre.x, y: centre.y },
    tiltDeg: num(s.tiltDeg ?? 0, 'view tilt (°)', 0, 80),
    tiltAxisDeg: num(s.tiltAxisDeg ?? 0, 'tilt axis angle (°)', -360, 360),
    wobble: harmonics(s.wobble, 'outline wobble', DEFAULT_SPECIMEN.wobble),
  };
  if (specimen.diameterUm / Math.max(umPerPx, umPerPxY) < 8) bad('the specimen would be smaller than 8 px across; use a smaller pixel size or a larger diameter');
  let rim: RimOptions | false = false;
  if (o.rim !== false) {
    const r = o.rim ?? {};
    const sectors = r.absentSectors ?? [];
    if (!Array.isArray(sectors)) bad('band absent sectors must be a list of {fromDeg, toDeg}');
    rim = {
      widthUm: num(r.widthUm ?? DEFAULT_RIM.widthUm, 'band width (µm)', 0, specimen.diameterUm / 2),
      harmonics: harmonics(r.harmonics, 'band width harmonics', DEFAULT_RIM.harmonics),
      absentSectors: sectors.map((q, i) => ({
        fromDeg: num(q?.fromDeg, `absent sector ${i} start (°)`, -720, 720),
        toDeg: num(q?.toDeg, `absent sector ${i} end (°)`, -720, 720),
      })),
      transitionUm: num(r.transitionUm ?? DEFAULT_RIM.transitionUm, 'band transition width (µm)', 0, 1e6),
      slopeDeg: num(r.slopeDeg ?? DEFAULT_RIM.slopeDeg, 'band slope (°)', -60, 60),
      reliefUm: num(r.reliefUm ?? DEFAULT_RIM.reliefUm, 'band relief (µm)', 0, 1e5),
      reliefScaleUm: num(r.reliefScaleUm ?? DEFAULT_RIM.reliefScaleUm, 'band relief scale (µm)', 1e-3, 1e7),
      striations: num(r.striations ?? DEFAULT_RIM.striations, 'band striation strength', 0, 1),
      striationSpacingUm: num(r.striationSpacingUm ?? DEFAULT_RIM.striationSpacingUm, 'band striation spacing (µm)', 1e-3, 1e7),
    };
  }
  const c = o.core ?? {};
  const core: CoreOptions = {
    reliefUm: num(c.reliefUm ?? DEFAULT_CORE.reliefUm, 'core relief (µm)', 0, 1e5),
    reliefScaleUm: num(c.reliefScaleUm ?? DEFAULT_CORE.reliefScaleUm, 'core relief scale (µm)', 1e-3, 1e7),
    octaves: num(c.octaves ?? DEFAULT_CORE.octaves, 'core relief octaves', 1, 12, true),
    dimpleSizeUm: num(c.dimpleSizeUm ?? DEFAULT_CORE.dimpleSizeUm, 'dimple size (µm)', 1e-3, 1e7),
    dimpleDepthUm: num(c.dimpleDepthUm ?? DEFAULT_CORE.dimpleDepthUm, 'dimple depth (µm)', 0, 1e5),
    ridgeUm: num(c.ridgeUm ?? DEFAULT_CORE.ridgeUm, 'ridge height (µm)', 0, 1e5),
    ridgeSpacingUm: num(c.ridgeSpacingUm ?? DEFAULT_CORE.ridgeSpacingUm, 'ridge spacing (µm)', 1e-3, 1e7),
    cracks: num(c.cracks ?? DEFAULT_CORE.cracks, 'number of cracks', 0, 50, true),
    crackWidthUm: num(c.crackWidthUm ?? DEFAULT_CORE.crackWidthUm, 'crack width (µm)', 1e-3, 1e6),
  };
  const l = o.light ?? {};
  const light: LightOptions = {
    azimuthDeg: num(l.azimuthDeg ?? DEFAULT_LIGHT.azimuthDeg, 'light azimuth (°)', -360, 360),
    elevationDeg: num(l.elevationDeg ?? DEFAULT_LIGHT.elevationDeg, 'light elevation (°)', 5, 90),
    ambient: num(l.ambient ?? DEFAULT_LIGHT.ambient, 'ambient light fraction', 0, 1),
  };
  let scaleBar: ScaleBarOptions | null = null;
  if (o.scaleBar !== null) {
    const b = o.scaleBar ?? {};
    const corner = b.corner ?? DEFAULT_SCALE_BAR.corner;
    if (!['tl', 'tr', 'bl', 'br'].includes(corner)) bad(`scale bar corner must be tl, tr, bl or br, got "${String(corner)}"`);
    const polarity = b.polarity ?? DEFAULT_SCALE_BAR.polarity;
    if (polarity !== 'light' && polarity !== 'dark') bad(`scale bar polarity must be light or dark, got "${String(polarity)}"`);
    const pos = b.positionPx ?? null;
    if (pos !== null) {
      num(pos.x0, 'scale bar x0 (px)', 0, widthPx - 1, true);
      num(pos.y0, 'scale bar y0 (px)', 0, heightPx - 1, true);
    }
    scaleBar = {
      lengthUm: num(b.lengthUm ?? DEFAULT_SCALE_BAR.lengthUm, 'scale bar length (µm)', 1e-3, 1e8),
      corner,
      positionPx: pos === null ? null : { x0: pos.x0, y0: pos.y0 },
      polarity,
      thicknessPx: num(b.thicknessPx ?? DEFAULT_SCALE_BAR.thicknessPx, 'scale bar thickness (px)', 1, 500, true),
      plate: b.plate ?? DEFAULT_SCALE_BAR.plate,
      label: b.label === undefined ? null : b.label,
      labelScale: num(b.labelScale ?? 0, 'label scale', 0, 50, true),
    };
  }
  const background = o.background ?? 'dark';
  if (background !== 'dark' && background !== 'bright') bad(`background must be dark or bright, got "${String(background)}"`);
  return {
    seed: num(o.seed ?? 1, 'seed', -2147483648, 4294967295, true),
    widthPx,
    heightPx,
    umPerPx,
    umPerPxY,
    specimen,
    rim,
    core,
    light,
    equalMeanBrightness: o.equalMeanBrightness ?? false,
    rimBrightness: num(o.rimBrightness ?? 0.15, 'rim brightness (relative)', -0.9, 3),
    background,
    backgroundNoise: num(o.backgroundNoise ?? 0.015, 'background noise', 0, 1),
    vignetting: num(o.vignetting ?? 0.25, 'vignetting', 0, 1),
    blurSigmaPx: num(o.blurSigmaPx ?? 0.8, 'blur sigma (px)', 0, 50),
    noiseSigma: num(o.noiseSigma ?? 0.015, 'noise sigma', 0, 1),
    noiseSignal: num(o.noiseSignal ?? 0, 'signal-dependent noise', 0, 1),
    semEdge: num(o.semEdge ?? 0, 'SEM edge brightness', 0, 1),
    scaleBar,
  };
}
