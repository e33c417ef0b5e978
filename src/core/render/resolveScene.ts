/**
 * Defaults and validation of the scene elements (sceneOptions.ts). An element appears in the resolved
 * options only when asked for, so a plain render resolves (and echoes in its truth) exactly as before.
 */
import type { RenderOptions, ResolvedRenderOptions } from './options.js';
import {
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
  type ColourOptions,
  type DefocusOptions,
  type FlankOptions,
  type GlintOptions,
  type HalvesOptions,
  type HolderKind,
  type HolderOptions,
  type LabelOptions,
  type RuleOptions,
  type SemOptions,
  type ShadowOptions,
} from './sceneOptions.js';
import { bad, num, oneOf, text, tint } from './validate.js';

function flank(f: Partial<FlankOptions>): FlankOptions {
  const kind = oneOf(f.kind ?? DEFAULT_FLANK.kind, 'notch flank kind', ['V', 'U'] as const);
  const d: FlankOptions = kind === 'U' ? { ...DEFAULT_FLANK, ...DEFAULT_U_FLANK } : DEFAULT_FLANK;
  return {
    kind,
    diameterRatio: num(f.diameterRatio ?? d.diameterRatio, 'notch flank diameter ratio (bar ÷ net diameter)', 1.02, 3),
    inclineDeg: num(f.inclineDeg ?? d.inclineDeg, 'notch flank inclination (°)', 10, 80),
    rootRadiusUm: num(f.rootRadiusUm ?? d.rootRadiusUm, 'notch root radius (µm)', 0, 1e6),
    albedo: num(f.albedo ?? d.albedo, 'notch flank albedo (relative to the core)', 0.05, 4),
    markSpacingUm: num(f.markSpacingUm ?? d.markSpacingUm, 'turning mark spacing (µm)', 1e-3, 1e6),
    markDepthUm: num(f.markDepthUm ?? d.markDepthUm, 'turning mark depth (µm)', 0, 1e4),
    roughnessUm: num(f.roughnessUm ?? d.roughnessUm, 'notch flank roughness (µm)', 0, 1e4),
    gloss: num(f.gloss ?? d.gloss, 'notch flank gloss', 0, 3),
    defocusPx: num(f.defocusPx ?? d.defocusPx, 'notch flank defocus (px)', 0, 20),
  };
}

function holder(kind: HolderKind, h: Partial<HolderOptions>): HolderOptions {
  const d = DEFAULT_HOLDERS[kind];
  return {
    level: num(h.level ?? d.level, `${kind} brightness`, 0, 1),
    mottle: num(h.mottle ?? d.mottle, `${kind} mottling`, 0, 1),
    mottleScaleUm: num(h.mottleScaleUm ?? d.mottleScaleUm, `${kind} mottling wavelength (µm)`, 1, 1e7),
    reliefUm: num(h.reliefUm ?? d.reliefUm, `${kind} relief (µm)`, 0, 1e5),
    knurlPitchUm: num(h.knurlPitchUm ?? d.knurlPitchUm, 'knurl pitch (µm)', 10, 1e6),
    clampAxisDeg: num(h.clampAxisDeg ?? d.clampAxisDeg, 'clamp axis (°)', -360, 360),
    defocusPx: num(h.defocusPx ?? d.defocusPx, `${kind} defocus (px)`, 0, 20),
  };
}

function shadow(s: Partial<ShadowOptions>, lightAzimuthDeg: number): ShadowOptions {
  return {
    azimuthDeg: num(s.azimuthDeg ?? (((lightAzimuthDeg + 180) % 360) + 360) % 360, 'shadow direction (°)', -360, 360),
    lengthUm: num(s.lengthUm ?? DEFAULT_SHADOW.lengthUm, 'shadow length (µm)', 0, 1e7),
    softnessUm: num(s.softnessUm ?? DEFAULT_SHADOW.softnessUm, 'shadow softness (µm)', 0, 1e7),
    strength: num(s.strength ?? DEFAULT_SHADOW.strength, 'shadow strength', 0, 1),
  };
}

function sem(s: Partial<SemOptions>, heightPx: number): SemOptions {
  return {
    tiltContrast: num(s.tiltContrast ?? DEFAULT_SEM.tiltContrast, 'SEM tilt contrast', 0, 1),
    lineNoise: num(s.lineNoise ?? DEFAULT_SEM.lineNoise, 'SEM scan-line noise', 0, 0.5),
    lineGain: num(s.lineGain ?? DEFAULT_SEM.lineGain, 'SEM scan-line gain noise', 0, 0.5),
    stripHeightPx: num(s.stripHeightPx ?? DEFAULT_SEM.stripHeightPx, 'SEM data strip height (px)', 0, Math.floor(heightPx / 3), true),
    stripText: text(s.stripText ?? DEFAULT_SEM.stripText, 'SEM data strip text', 200),
  };
}

function glints(g: Partial<GlintOptions>): GlintOptions {
  return {
    strength: num(g.strength ?? DEFAULT_GLINTS.strength, 'glint strength', 0, 3),
    sharpness: num(g.sharpness ?? DEFAULT_GLINTS.sharpness, 'glint sharpness (Blinn–Phong exponent)', 1, 2000),
    facetUm: num(g.facetUm ?? DEFAULT_GLINTS.facetUm, 'glint facet size (µm)', 0, 1e5),
    facetTiltDeg: num(g.facetTiltDeg ?? DEFAULT_GLINTS.facetTiltDeg, 'glint facet tilt (°)', 0, 60),
  };
}

function colour(c: Partial<ColourOptions>): ColourOptions {
  return {
    rimTint: tint(c.rimTint ?? DEFAULT_COLOUR.rimTint, 'rim tint'),
    coreTint: tint(c.coreTint ?? DEFAULT_COLOUR.coreTint, 'core tint'),
    flankTint: tint(c.flankTint ?? DEFAULT_COLOUR.flankTint, 'flank tint'),
    backgroundTint: tint(c.backgroundTint ?? DEFAULT_COLOUR.backgroundTint, 'background tint'),
    noiseSigma: num(c.noiseSigma ?? DEFAULT_COLOUR.noiseSigma, 'colour noise sigma', 0, 0.5),
  };
}

function defocus(d: Partial<DefocusOptions>): DefocusOptions {
  return {
    maxSigmaPx: num(d.maxSigmaPx ?? DEFAULT_DEFOCUS.maxSigmaPx, 'defocus blur (px)', 0, 30),
    directionDeg: num(d.directionDeg ?? DEFAULT_DEFOCUS.directionDeg, 'defocus direction (°)', -360, 360),
    focusAt: num(d.focusAt ?? DEFAULT_DEFOCUS.focusAt, 'defocus plane of focus (fraction of the image)', 0, 0.95),
  };
}

function halves(h: Partial<HalvesOptions>): HalvesOptions {
  return {
    gapUm: num(h.gapUm ?? DEFAULT_HALVES.gapUm, 'gap between the halves (µm)', 0, 1e7),
    rotationDeg: num(h.rotationDeg ?? DEFAULT_HALVES.rotationDeg, 'rotation of the second half (°)', -360, 360),
    differencePct: num(h.differencePct ?? DEFAULT_HALVES.differencePct, 'band difference between the halves (%)', 0, 10),
  };
}

function rule(r: Partial<RuleOptions>): RuleOptions {
  return {
    side: oneOf(r.side ?? DEFAULT_RULE.side, 'rule side', ['top', 'bottom', 'left', 'right'] as const),
    visibleUm: num(r.visibleUm ?? DEFAULT_RULE.visibleUm, 'visible rule width (µm)', 1, 1e7),
    angleDeg: num(r.angleDeg ?? DEFAULT_RULE.angleDeg, 'rule angle (°)', -20, 20),
    graduationUm: num(r.graduationUm ?? DEFAULT_RULE.graduationUm, 'rule graduation (µm)', 1, 1e6),
    level: num(r.level ?? DEFAULT_RULE.level, 'rule brightness', 0, 1),
  };
}

function label(l: Partial<LabelOptions>): LabelOptions {
  const t = text(l.text ?? DEFAULT_LABEL.text, 'label text', 120);
  if (t.split('\n').length > 6) bad('label text must have at most 6 lines');
  if (t.trim() === '') bad('label text must not be empty');
  return {
    corner: oneOf(l.corner ?? DEFAULT_LABEL.corner, 'label corner', ['tl', 'tr', 'bl', 'br'] as const),
    text: t,
    angleDeg: num(l.angleDeg ?? DEFAULT_LABEL.angleDeg, 'label angle (°)', -45, 45),
    letterUm: num(l.letterUm ?? DEFAULT_LABEL.letterUm, 'label letter pixel (µm)', 1e-3, 1e5),
  };
}

function object<T>(v: unknown, what: string): Partial<T> {
  if (typeof v !== 'object' || v === null || Array.isArray(v)) bad(`${what} options must be an object`);
  return v as Partial<T>;
}

/**
 * Resolve the scene elements given in `o` and append them to the resolved base options.
 * @param o the caller's options
 * @param base the resolved base options (frame, specimen, light, …)
 */
export function resolveScene(o: RenderOptions, base: ResolvedRenderOptions): ResolvedRenderOptions {
  const bg = base.background;
  const isHolder = bg === 'putty' || bg === 'clamp' || bg === 'paper';
  if (o.holder !== undefined && !isHolder) bad(`holder options need background putty, clamp or paper, got "${bg}"`);
  return {
    ...base,
    ...(o.flank !== undefined ? { flank: flank(object(o.flank, 'notch flank')) } : {}),
    ...(isHolder ? { holder: holder(bg, object(o.holder ?? {}, 'holder')) } : {}),
    ...(o.shadow !== undefined ? { shadow: shadow(object(o.shadow, 'shadow'), base.light.azimuthDeg) } : {}),
    ...(o.sem !== undefined ? { sem: sem(object(o.sem, 'SEM'), base.heightPx) } : {}),
    ...(o.glints !== undefined ? { glints: glints(object(o.glints, 'glint')) } : {}),
    ...(o.colour !== undefined ? { colour: colour(object(o.colour, 'colour')) } : {}),
    ...(o.defocus !== undefined ? { defocus: defocus(object(o.defocus, 'defocus')) } : {}),
    ...(o.halves !== undefined ? { halves: halves(object(o.halves, 'halves')) } : {}),
    ...(o.rule !== undefined ? { rule: rule(object(o.rule, 'rule')) } : {}),
    ...(o.label !== undefined ? { label: label(object(o.label, 'label')) } : {}),
  };
}
