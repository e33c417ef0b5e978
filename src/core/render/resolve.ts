/**
 * Fill the renderer's defaults and validate, one phase per option group (frame, specimen, band, core,
 * light, scale bar, image effects, scene elements). Every phase throws FractozoneError('BAD_PARAMETER')
 * with one plain sentence naming the option and its unit when a value is out of range.
 */
import {
  BACKGROUNDS,
  DEFAULT_CORE,
  DEFAULT_LIGHT,
  DEFAULT_RIM,
  DEFAULT_SCALE_BAR,
  DEFAULT_SPECIMEN,
  type Background,
  type CoreOptions,
  type LightOptions,
  type RenderOptions,
  type ResolvedRenderOptions,
  type RimOptions,
  type ScaleBarOptions,
  type SpecimenOptions,
} from './options.js';
import { resolveScene } from './resolveScene.js';
import { bad, harmonics, num } from './validate.js';

interface Frame {
  readonly widthPx: number;
  readonly heightPx: number;
  readonly umPerPx: number;
  readonly umPerPxY: number;
}

function resolveFrame(o: RenderOptions): Frame {
  const widthPx = num(o.widthPx ?? 1600, 'image width (px)', 16, 20000, true);
  const heightPx = num(o.heightPx ?? 1200, 'image height (px)', 16, 20000, true);
  if (widthPx * heightPx > 100e6) bad(`image of ${widthPx}×${heightPx} px is larger than 100 megapixels`);
  const umPerPx = num(o.umPerPx ?? 5, 'pixel size (µm/px)', 1e-3, 1e4);
  const umPerPxY = o.umPerPxY == null ? umPerPx : num(o.umPerPxY, 'pixel height (µm/px)', 1e-3, 1e4);
  return { widthPx, heightPx, umPerPx, umPerPxY };
}

function resolveSpecimen(o: RenderOptions, f: Frame): SpecimenOptions {
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
  if (specimen.diameterUm / Math.max(f.umPerPx, f.umPerPxY) < 8) bad('the specimen would be smaller than 8 px across; use a smaller pixel size or a larger diameter');
  return specimen;
}

function resolveRim(o: RenderOptions, specimen: SpecimenOptions): RimOptions | false {
  if (o.rim === false) return false;
  const r = o.rim ?? {};
  const sectors = r.absentSectors ?? [];
  if (!Array.isArray(sectors)) bad('band absent sectors must be a list of {fromDeg, toDeg}');
  return {
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

function resolveCore(o: RenderOptions): CoreOptions {
  const c = o.core ?? {};
  return {
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
}

function resolveLight(o: RenderOptions): LightOptions {
  const l = o.light ?? {};
  return {
    azimuthDeg: num(l.azimuthDeg ?? DEFAULT_LIGHT.azimuthDeg, 'light azimuth (°)', -360, 360),
    elevationDeg: num(l.elevationDeg ?? DEFAULT_LIGHT.elevationDeg, 'light elevation (°)', 5, 90),
    ambient: num(l.ambient ?? DEFAULT_LIGHT.ambient, 'ambient light fraction', 0, 1),
  };
}

function resolveScaleBar(o: RenderOptions, f: Frame): ScaleBarOptions | null {
  if (o.scaleBar === null) return null;
  const b = o.scaleBar ?? {};
  const corner = b.corner ?? DEFAULT_SCALE_BAR.corner;
  if (!['tl', 'tr', 'bl', 'br'].includes(corner)) bad(`scale bar corner must be tl, tr, bl or br, got "${String(corner)}"`);
  const polarity = b.polarity ?? DEFAULT_SCALE_BAR.polarity;
  if (polarity !== 'light' && polarity !== 'dark') bad(`scale bar polarity must be light or dark, got "${String(polarity)}"`);
  const pos = b.positionPx ?? null;
  if (pos !== null) {
    num(pos.x0, 'scale bar x0 (px)', 0, f.widthPx - 1, true);
    num(pos.y0, 'scale bar y0 (px)', 0, f.heightPx - 1, true);
  }
  return {
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

function resolveBackground(o: RenderOptions): Background {
  const background = o.background ?? 'dark';
  if (!BACKGROUNDS.includes(background)) bad(`background must be ${BACKGROUNDS.join(', ')}, got "${String(background)}"`);
  return background;
}

/**
 * Fill defaults and validate. Throws FractozoneError('BAD_PARAMETER') with one plain sentence
 * naming the option and its unit when a value is out of range.
 * @returns the options with every default filled in; scene elements appear only when asked for.
 */
export function resolveRenderOptions(o: RenderOptions = {}): ResolvedRenderOptions {
  const f = resolveFrame(o);
  const specimen = resolveSpecimen(o, f);
  const rim = resolveRim(o, specimen);
  const core = resolveCore(o);
  const light = resolveLight(o);
  const scaleBar = resolveScaleBar(o, f);
  const background = resolveBackground(o);
  const base: ResolvedRenderOptions = {
    seed: num(o.seed ?? 1, 'seed', -2147483648, 4294967295, true),
    widthPx: f.widthPx,
    heightPx: f.heightPx,
    umPerPx: f.umPerPx,
    umPerPxY: f.umPerPxY,
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
  return resolveScene(o, base);
}
