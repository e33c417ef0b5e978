/**
 * Options of the scene elements a real end-on photograph of a notched bar shows besides the fracture
 * surface: the notch flank, holders and backgrounds with a cast shadow, the SEM look, glints, colour,
 * one-sided defocus, both mating halves, a steel rule and a specimen label.
 *
 * None of them moves the fracture surface: the truth stays the outer edge of the fracture surface
 * itself (the notch root) and the band width along each ray from it. Every element is off unless
 * asked for; a render without them is byte for byte the render of earlier releases.
 * Units: lengths on the specimen or in the scene in µm (`…Um`), image things in px (`…Px`), angles
 * in degrees (0° = +x, counter-clockwise on screen), intensities in 0..1 of full scale.
 */
import type { Corner } from './options.js';

/** An RGB multiplier triple (linear intensity factors for red, green, blue). */
export type Tint = readonly [number, number, number];

/**
 * The rest of the circumferential notch, seen end-on around the fracture surface: an annulus from the
 * notch root (the fracture surface's edge) out to the bar diameter. In the axial section the surface
 * leaves the root along the viewing direction (seen edge-on), turns on an arc of the root radius ρ and
 * then runs straight: for a V notch at `inclineDeg` from the image plane (a cone sloping away from the
 * viewer, radially foreshortened by cos(incline)), for a U notch flat (a wall facing the viewer ρ below
 * the fracture plane). Machined: smooth, with fine concentric turning marks.
 */
export interface FlankOptions {
  /** notch shape: 'V' (cone) or 'U' (flat wall ρ below the fracture plane) */
  readonly kind: 'V' | 'U';
  /** bar (gross) diameter ÷ net-section (notch-root) diameter, 1.02–3 (typical 1.15–1.5) */
  readonly diameterRatio: number;
  /** V notch: flank inclination from the image plane, 10–80° (typical 30–70°); not used for U */
  readonly inclineDeg: number;
  /** notch root radius ρ, µm (the fillet at the root; for U also the depth of the flat wall) */
  readonly rootRadiusUm: number;
  /** albedo relative to the fracture surface core (1 = same, > 1 brighter, < 1 darker), 0.05–4 */
  readonly albedo: number;
  /** spacing of the concentric turning marks along the flank (feed per revolution), µm */
  readonly markSpacingUm: number;
  /** depth (amplitude) of the turning marks, µm */
  readonly markDepthUm: number;
  /** random fine roughness of the machined surface, µm */
  readonly roughnessUm: number;
  /** specular strength of the machined metal (Blinn–Phong, exponent 30), 0–3 */
  readonly gloss: number;
  /** Gaussian blur σ (px) at the deepest visible point of the flank; grows linearly with depth (depth of field), 0–20 */
  readonly defocusPx: number;
}

/** Kinds of holder or background around the specimen (besides the plain 'dark' and 'bright'). */
export type HolderKind = 'putty' | 'clamp' | 'paper';

/**
 * A holder or background with its own texture (used when `background` is 'putty', 'clamp' or 'paper').
 * - putty: modelling clay, mid-grey, lumpy relief shaded by the light, mottled;
 * - clamp: two jaws of a clamp gripping the bar, their faces knurled (diamond pattern of two crossed
 *   groove sets at ±30°), metallic, dark gap between the jaws;
 * - paper: bright, mottled (formation), fine fibres.
 */
export interface HolderOptions {
  /** mean brightness 0..1 (defaults: putty 0.45, clamp 0.5, paper 0.86) */
  readonly level: number;
  /** relative brightness mottling amplitude 0..1 */
  readonly mottle: number;
  /** mottling wavelength, µm */
  readonly mottleScaleUm: number;
  /** relief amplitude (putty lumps, paper fibres, knurl depth), µm */
  readonly reliefUm: number;
  /** clamp: knurl pitch (groove spacing), µm */
  readonly knurlPitchUm: number;
  /** clamp: direction in which the jaws close on the bar, degrees on screen */
  readonly clampAxisDeg: number;
  /** Gaussian blur σ (px) of the holder (it lies below the fracture plane: depth of field), 0–20 */
  readonly defocusPx: number;
}

/**
 * A soft shadow cast by the bar on the holder/background, on the side away from the light: the
 * shadow of a cylinder standing on the background is the bar's outline swept along the shadow
 * direction; its penumbra widens with the distance from the bar (finite light source).
 */
export interface ShadowOptions {
  /** direction the shadow falls toward, degrees (default: the light azimuth + 180°) */
  readonly azimuthDeg: number;
  /** how far the shadow reaches beyond the bar outline, µm */
  readonly lengthUm: number;
  /** penumbra half-width at the bar, µm (twice that at the far end) */
  readonly softnessUm: number;
  /** darkening in the umbra, 0..1 */
  readonly strength: number;
}

/**
 * Scanning-electron-microscope look: secondary-electron tilt contrast (yield ∝ 1/cos of the local
 * tilt, the "secant law", e.g. Goldstein et al., Scanning Electron Microscopy and X-Ray
 * Microanalysis, 4th ed. 2018, ch. 5 — from memory), scan-line noise (a random offset and gain per
 * row), and a data strip along the bottom with text and the scale bar. The bright edge effect is
 * `semEdge` of the base options (set by the SEM presets).
 */
export interface SemOptions {
  /** weight 0..1 of the secant-law tilt contrast against the Lambert shading */
  readonly tiltContrast: number;
  /** σ of a random additive offset per scan line (row), intensity units */
  readonly lineNoise: number;
  /** σ of a random relative gain per scan line */
  readonly lineGain: number;
  /** height of the data strip along the bottom, px (0 = none); the image area ends above it */
  readonly stripHeightPx: number;
  /** text of the data strip ('' = none) */
  readonly stripText: string;
}

/**
 * Specular glints on the slanted rim (shear lip): Blinn–Phong highlights (Blinn, SIGGRAPH 1977) of the
 * rim surface plus sparkling micro-facets with random tilts (cells of a Worley pattern).
 */
export interface GlintOptions {
  /** specular intensity at perfect alignment, 0..3 */
  readonly strength: number;
  /** Blinn–Phong exponent (larger = smaller, sharper highlights), 1–2000 */
  readonly sharpness: number;
  /** facet size, µm (0 = no facets) */
  readonly facetUm: number;
  /** largest random facet tilt, degrees */
  readonly facetTiltDeg: number;
}

/**
 * Colour output (RGB): tints per zone (e.g. heat tint or oxide colours differing between the
 * slow-grown band and the final fracture) and independent per-channel noise. Tints multiply the
 * rendered intensity; highlights stay neutral.
 */
export interface ColourOptions {
  /** rim band tint, RGB multipliers 0..3 */
  readonly rimTint: Tint;
  /** core tint */
  readonly coreTint: Tint;
  /** notch flank tint */
  readonly flankTint: Tint;
  /** holder/background tint */
  readonly backgroundTint: Tint;
  /** σ of independent noise per channel (colour noise), intensity units */
  readonly noiseSigma: number;
}

/**
 * One-sided defocus (depth of field on a tilted specimen): the blur σ grows linearly from the plane
 * of focus (geometric optics: blur-circle diameter ∝ |Δz|), across the image in one direction.
 */
export interface DefocusOptions {
  /** blur σ (px) at the far side of the image */
  readonly maxSigmaPx: number;
  /** direction in which the blur grows, degrees on screen */
  readonly directionDeg: number;
  /** where the plane of focus lies along that direction, 0..1 of the image span (sharp before it) */
  readonly focusAt: number;
}

/**
 * Both mating halves side by side: the second is the mirror image of the first (mating surfaces: its
 * relief is the complement, peaks become valleys; the rim that slopes down on one rises on the other),
 * rotated about its own centre, with the same band up to small differences.
 */
export interface HalvesOptions {
  /** gap between the two bars' outlines, µm */
  readonly gapUm: number;
  /** rotation of the second half about its centre, degrees */
  readonly rotationDeg: number;
  /** amplitude of the small band-width differences of the second half, % (0–10) */
  readonly differencePct: number;
}

/** A steel rule lying along one side of the frame, its graduated edge towards the specimen. */
export interface RuleOptions {
  /** frame side the rule lies along */
  readonly side: 'top' | 'bottom' | 'left' | 'right';
  /** visible width of the rule (frame edge to graduated edge), µm */
  readonly visibleUm: number;
  /** tilt of the rule's edge against the frame side, degrees (−20…20) */
  readonly angleDeg: number;
  /** smallest graduation, µm (500 = half-millimetre marks; every 2nd mark longer, every 10th longest) */
  readonly graduationUm: number;
  /** brightness of the satin steel, 0..1 */
  readonly level: number;
}

/** A paper specimen label with printed text, lying on the background in a corner. */
export interface LabelOptions {
  readonly corner: Corner;
  /** text, lines separated by "\n" */
  readonly text: string;
  /** rotation, degrees (−45…45) */
  readonly angleDeg: number;
  /** font pixel size, µm (each 5×7 glyph cell) */
  readonly letterUm: number;
}

export const DEFAULT_FLANK: FlankOptions = {
  kind: 'V',
  diameterRatio: 1.3,
  inclineDeg: 45,
  rootRadiusUm: 120,
  albedo: 1.25,
  markSpacingUm: 90,
  markDepthUm: 3,
  roughnessUm: 0.6,
  gloss: 0.4,
  defocusPx: 2,
};
/** U-notch flank defaults that differ from {@link DEFAULT_FLANK}. */
export const DEFAULT_U_FLANK: Partial<FlankOptions> = { kind: 'U', rootRadiusUm: 250, defocusPx: 1.5 };

export const DEFAULT_HOLDERS: Record<HolderKind, HolderOptions> = {
  putty: { level: 0.45, mottle: 0.12, mottleScaleUm: 1500, reliefUm: 120, knurlPitchUm: 700, clampAxisDeg: 0, defocusPx: 1 },
  clamp: { level: 0.42, mottle: 0.08, mottleScaleUm: 2000, reliefUm: 60, knurlPitchUm: 450, clampAxisDeg: 0, defocusPx: 0.8 },
  paper: { level: 0.86, mottle: 0.06, mottleScaleUm: 900, reliefUm: 4, knurlPitchUm: 700, clampAxisDeg: 0, defocusPx: 1.2 },
};

export const DEFAULT_SHADOW: Omit<ShadowOptions, 'azimuthDeg'> = { lengthUm: 1500, softnessUm: 250, strength: 0.55 };
export const DEFAULT_SEM: SemOptions = {
  tiltContrast: 0.35,
  lineNoise: 0.02,
  lineGain: 0.03,
  stripHeightPx: 0,
  stripText: 'SE  15.0 kV  WD 14.2 mm  x20  FZ-7 (invented)',
};
/**
 * Light for an SEM look: the secondary-electron detector sits to one side, so the image looks lit from
 * the detector (Goldstein et al. 2018, ch. 5 — from memory); here from the top at 35° with little ambient.
 */
export const SEM_DETECTOR_LIGHT = { azimuthDeg: 90, elevationDeg: 35, ambient: 0.3 } as const;
export const DEFAULT_GLINTS: GlintOptions = { strength: 1.2, sharpness: 80, facetUm: 25, facetTiltDeg: 25 };
export const DEFAULT_COLOUR: ColourOptions = {
  rimTint: [1.1, 0.94, 0.74],
  coreTint: [0.98, 1, 1.03],
  flankTint: [1, 1, 1],
  backgroundTint: [1, 1, 1],
  noiseSigma: 0,
};
export const DEFAULT_DEFOCUS: DefocusOptions = { maxSigmaPx: 4, directionDeg: 0, focusAt: 0.3 };
export const DEFAULT_HALVES: HalvesOptions = { gapUm: 1200, rotationDeg: 12, differencePct: 2 };
export const DEFAULT_RULE: RuleOptions = { side: 'top', visibleUm: 1200, angleDeg: 1.5, graduationUm: 500, level: 0.72 };
export const DEFAULT_LABEL: LabelOptions = { corner: 'tl', text: 'FZ7-V-03\nINVENTED', angleDeg: -6, letterUm: 45 };
