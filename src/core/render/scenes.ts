/**
 * The named scene set: rendered fractographs with the scene elements of real end-on photographs, each
 * element alone on a typical specimen and in combinations, several variants each (V and U flanks,
 * bright and dark flanks, shadows on different sides, seeds), mostly at 1000 × 760 px so tests and
 * benches stay fast, a few larger. Everything in it is invented test data.
 *
 * The typical specimen: net-section (notch-root) diameter 5 mm, a 400 µm band with a small angular
 * variation, rough core; 8.5 µm/px without a flank (the accuracy set's scale; 9.5 where a rule or a
 * label needs room), 10–12 µm/px with one (so the whole bar fits), 14 µm/px for two halves side by side.
 */
import type { RenderOptions } from './options.js';
import { SEM_DETECTOR_LIGHT } from './sceneOptions.js';

/** One scene of the set. */
export interface SceneCase {
  /** unique name (file-name safe) */
  readonly name: string;
  /** one line: what the image shows */
  readonly description: string;
  /** the scene elements it exercises (e.g. "flank", "holder", "tint", "sem", "halves") */
  readonly elements: readonly string[];
  readonly options: RenderOptions;
  /** file format to write it in */
  readonly format: 'png' | 'jpeg' | 'tiff';
  /** bits per sample (PNG/TIFF; default 8) */
  readonly bitDepth?: 8 | 16;
  /** JPEG quality (default 92) */
  readonly jpegQuality?: number;
}

const SE_DETECTOR = SEM_DETECTOR_LIGHT;

const BAND = { widthUm: 400, harmonics: [{ order: 1, amplitudePct: 6, phaseDeg: 40 }, { order: 3, amplitudePct: 4, phaseDeg: 110 }], transitionUm: 40 };

/** The typical specimen at a given pixel size and seed (1000 × 760 px unless overridden). */
function typical(seed: number, umPerPx: number, extra: RenderOptions = {}): RenderOptions {
  return {
    seed,
    widthPx: 1000,
    heightPx: 760,
    umPerPx,
    rim: BAND,
    blurSigmaPx: 0.8,
    noiseSigma: 0.012,
    scaleBar: { lengthUm: 1000, corner: 'br' },
    ...extra,
  };
}

const scene = (name: string, description: string, elements: string[], options: RenderOptions, format: SceneCase['format'] = 'png', more: Partial<SceneCase> = {}): SceneCase => ({
  name,
  description,
  elements,
  options,
  format,
  ...more,
});

/** Each element alone on the typical specimen (several variants per element). */
const SINGLE: SceneCase[] = [
  scene('plain', 'the typical specimen on a dark background, no other element (reference)', [], typical(11, 8.5)),
  scene('flank-v-bright', 'V-notch flank, 45°, bar/net diameter 1.3, brighter than the rim (light from the upper left)', ['flank'], typical(12, 11, { flank: { kind: 'V', inclineDeg: 45, diameterRatio: 1.3, albedo: 1.35 } })),
  scene('flank-v-dark', 'V-notch flank, 60°, ratio 1.4, darker than the rim under a low light from the right', ['flank'], typical(13, 12, { light: { azimuthDeg: 350, elevationDeg: 25 }, flank: { kind: 'V', inclineDeg: 60, diameterRatio: 1.4, albedo: 0.7 } })),
  scene('flank-v-shallow', 'V-notch flank, 30°, ratio 1.15, light from below', ['flank'], typical(14, 10, { light: { azimuthDeg: 260 }, flank: { kind: 'V', inclineDeg: 30, diameterRatio: 1.15, albedo: 1.1 } })),
  scene('flank-v-steep', 'V-notch flank, 70°, ratio 1.5 (strongly foreshortened cone)', ['flank'], typical(15, 12, { light: { azimuthDeg: 60 }, flank: { kind: 'V', inclineDeg: 70, diameterRatio: 1.5, albedo: 1.0 } })),
  scene('flank-u-bright', 'U-notch flank: flat wall below the fracture plane, slightly out of focus, brighter than the rim', ['flank'], typical(16, 11, { flank: { kind: 'U', diameterRatio: 1.3, albedo: 1.3 } })),
  scene('flank-u-dark', 'U-notch flank, ratio 1.2, darker than the rim, more out of focus', ['flank'], typical(17, 10, { light: { azimuthDeg: 220 }, flank: { kind: 'U', diameterRatio: 1.2, albedo: 0.75, defocusPx: 2.5 } })),
  scene('holder-putty', 'specimen pressed into mid-grey putty, soft shadow to the lower right', ['holder', 'shadow'], typical(18, 8.5, { background: 'putty', shadow: {} })),
  scene('holder-putty-b', 'putty holder, light from the right: shadow to the left', ['holder', 'shadow'], typical(19, 8.5, { background: 'putty', holder: { level: 0.55 }, light: { azimuthDeg: 10 }, shadow: { lengthUm: 2200 } })),
  scene('holder-clamp', 'knurled clamp jaws gripping the bar left and right, dark gap above and below', ['holder'], typical(20, 8.5, { background: 'clamp' })),
  scene('holder-clamp-b', 'knurled clamp closing at 70°, brighter steel', ['holder'], typical(21, 8.5, { background: 'clamp', holder: { clampAxisDeg: 70, level: 0.55 }, light: { azimuthDeg: 100 } })),
  scene('holder-paper', 'bright mottled paper background, shadow to the upper left', ['holder', 'shadow'], typical(22, 8.5, { background: 'paper', light: { azimuthDeg: 315 }, shadow: {} })),
  scene('shadow-bright', 'bright plain background with a long soft shadow to the lower left', ['shadow'], typical(23, 8.5, { background: 'bright', light: { azimuthDeg: 45 }, shadow: { lengthUm: 2500, softnessUm: 350 } })),
  scene('sem', 'SEM look: tilt contrast, edge glow, scan-line noise, signal noise, data strip with scale bar (16-bit TIFF)', ['sem'], typical(24, 8.5, { sem: { stripHeightPx: 56 }, semEdge: 0.6, noiseSignal: 0.04, noiseSigma: 0.02, vignetting: 0.03, light: SE_DETECTOR }), 'tiff', { bitDepth: 16 }),
  scene('glints', 'glints on a 30° slanted rim: a highlight crescent and sparkling facets on the lit side', ['glints'], typical(25, 8.5, { rim: { ...BAND, slopeDeg: 30 }, glints: {} })),
  scene('glints-b', 'glints under a higher light from the lower right, finer facets', ['glints'], typical(26, 8.5, { light: { azimuthDeg: 300, elevationDeg: 55 }, rim: { ...BAND, slopeDeg: 25 }, glints: { facetUm: 15, strength: 0.8 } })),
  scene('tint', 'colour: straw/bronze heat tint on the band, neutral grey core (RGB)', ['tint'], typical(27, 8.5, { colour: {} })),
  scene('tint-blue', 'colour: bluish oxide tint on the band, warm core, equal mean brightness (RGB)', ['tint'], typical(28, 8.5, { equalMeanBrightness: true, colour: { rimTint: [0.86, 0.94, 1.12], coreTint: [1.04, 1, 0.94] } })),
  scene('colour-noise', 'colour image with independent per-channel noise', ['colour-noise'], typical(29, 8.5, { colour: { rimTint: [1, 1, 1], coreTint: [1, 1, 1], noiseSigma: 0.03 } })),
  scene('defocus', 'one-sided defocus: sharp on the left, blur growing to σ = 4 px on the right', ['defocus'], typical(30, 8.5, { defocus: { maxSigmaPx: 4, directionDeg: 0, focusAt: 0.3 } })),
  scene('defocus-b', 'one-sided defocus growing downward to σ = 3 px on a tilted (20°) specimen', ['defocus'], typical(31, 8.5, { specimen: { tiltDeg: 20, tiltAxisDeg: 0 }, defocus: { maxSigmaPx: 3, directionDeg: 270, focusAt: 0.2 } })),
  scene('halves', 'both mating halves side by side (the right one mirrored, rotated, complementary relief)', ['halves'], typical(32, 14, { halves: {} })),
  scene('rule', 'steel rule with half-millimetre graduations along the top edge', ['rule'], typical(33, 9.5, { rule: { side: 'top', visibleUm: 750 } })),
  scene('label', 'paper specimen label with printed text in the top-left corner', ['label'], typical(34, 9.5, { label: { text: 'FZ7-V-11\nINVENTED', letterUm: 38 } })),
  scene('narrow-band', 'narrow band, 150 µm ≈ 1.5 texture windows (default window 1/25 of the radius)', ['narrow'], typical(35, 8.5, { rim: { ...BAND, widthUm: 150, transitionUm: 25 } })),
  scene('noisy-jpeg', 'strong noise (σ = 0.04) saved as JPEG quality 60', ['noise', 'jpeg'], typical(36, 8.5, { noiseSigma: 0.04 }), 'jpeg', { jpegQuality: 60 }),
];

/** Combinations (the harder cases), with variants. */
const COMBINED: SceneCase[] = [
  scene('flank-holder-tint', 'V flank + putty holder with shadow + band tint (RGB)', ['flank', 'holder', 'shadow', 'tint'], typical(41, 11, { flank: { kind: 'V', diameterRatio: 1.3, inclineDeg: 50 }, background: 'putty', shadow: {}, colour: {} })),
  scene('flank-holder-tint-b', 'U flank (dark) + paper with shadow to the upper right + bluish band tint (RGB)', ['flank', 'holder', 'shadow', 'tint'], typical(42, 11, { light: { azimuthDeg: 220 }, flank: { kind: 'U', diameterRatio: 1.25, albedo: 0.8 }, background: 'paper', shadow: {}, colour: { rimTint: [0.8, 0.92, 1.15] } })),
  scene('flank-clamp-glints', 'V flank (dark) in a knurled clamp, glints on the rim', ['flank', 'holder', 'glints'], typical(43, 12, { flank: { kind: 'V', diameterRatio: 1.35, albedo: 0.8, inclineDeg: 40 }, background: 'clamp', rim: { ...BAND, slopeDeg: 28 }, glints: {} })),
  scene('sem-strip-noise', 'SEM look with a data strip and heavy noise (σ = 0.04 + signal noise), 16-bit TIFF', ['sem', 'noise'], typical(44, 8.5, { sem: { stripHeightPx: 56, lineNoise: 0.03 }, semEdge: 0.7, noiseSignal: 0.06, noiseSigma: 0.04, vignetting: 0.02, light: SE_DETECTOR }), 'tiff', { bitDepth: 16 }),
  scene('sem-strip-noise-flank', 'SEM look with strip and noise around a V-notched specimen (the flank shows as a bright cone)', ['sem', 'noise', 'flank'], typical(45, 11, { sem: { stripHeightPx: 56 }, semEdge: 0.6, noiseSignal: 0.05, noiseSigma: 0.03, vignetting: 0.02, light: SE_DETECTOR, flank: { kind: 'V', diameterRatio: 1.25 } }), 'tiff', { bitDepth: 16 }),
  scene('halves-rule', 'both halves + steel rule along the top', ['halves', 'rule'], typical(46, 14, { halves: { rotationDeg: -20 }, rule: { side: 'top', visibleUm: 1100 } })),
  scene('halves-rule-flank', 'both halves with V flanks + steel rule along the bottom, scale bar top right', ['halves', 'rule', 'flank'], typical(47, 14, { halves: { gapUm: 900 }, flank: { kind: 'V', diameterRatio: 1.2 }, rule: { side: 'bottom', visibleUm: 900, angleDeg: -1 }, scaleBar: { lengthUm: 1000, corner: 'tr' } })),
  scene('narrow-band-noise', 'band of 150 µm (≈ 1.5 windows) with noise σ = 0.035', ['narrow', 'noise'], typical(48, 8.5, { rim: { ...BAND, widthUm: 150, transitionUm: 25 }, noiseSigma: 0.035 })),
  scene('narrow-band-noise-b', 'band of 120 µm (≈ 1.2 windows) with moderate noise σ = 0.02 at 6 µm/px, 1300 × 1000 px', ['narrow', 'noise'], typical(49, 6, { widthPx: 1300, heightPx: 1000, rim: { ...BAND, widthUm: 120, transitionUm: 20 }, noiseSigma: 0.02 })),
  scene('noisy-jpeg-flank', 'U flank, noise σ = 0.035, JPEG quality 55', ['flank', 'noise', 'jpeg'], typical(50, 11, { flank: { kind: 'U', diameterRatio: 1.3 }, noiseSigma: 0.035 }), 'jpeg', { jpegQuality: 55 }),
  scene('defocus-tint-label', 'one-sided defocus + band tint + specimen label + shadow on paper (RGB)', ['defocus', 'tint', 'label', 'holder', 'shadow'], typical(51, 9.5, { defocus: { maxSigmaPx: 3.5, directionDeg: 180 }, colour: {}, label: { corner: 'tr', text: 'FZ7-U-12\nINVENTED', letterUm: 36 }, background: 'paper', shadow: {} })),
];

/** A few larger images (slower; benches and the command line). */
const LARGE: SceneCase[] = [
  scene('large-flank-v', 'V flank, 2000 × 1520 px at 5.5 µm/px', ['flank', 'large'], typical(61, 5.5, { widthPx: 2000, heightPx: 1520, flank: { kind: 'V', diameterRatio: 1.3 } })),
  scene('large-combo', 'U flank + putty + shadow + tint + glints + rule + label, 2000 × 1520 px at 5.5 µm/px (RGB)', ['flank', 'holder', 'shadow', 'tint', 'glints', 'rule', 'label', 'large'], typical(62, 5.5, { widthPx: 2000, heightPx: 1520, flank: { kind: 'U', diameterRatio: 1.2 }, background: 'putty', shadow: {}, colour: {}, glints: {}, rule: { side: 'left', visibleUm: 1400 }, label: { corner: 'tr', text: 'FZ7-U-62\nINVENTED' } })),
];

/** A scene of SINGLE again with the light raised to `elevationDeg` (same seed, so the same specimen). */
function underRingLight(name: string, elevationDeg: number, description: string): SceneCase {
  const base = SINGLE.find((s) => s.name === name);
  if (!base) throw new Error(`no scene ${name}`);
  const options: RenderOptions = { ...base.options, light: { ...(base.options.light ?? {}), elevationDeg } };
  return { ...base, name: `ring-${name}-${elevationDeg}`, description, elements: [...base.elements, 'ring-light'], options };
}

/**
 * A light from high above (a ring or coaxial light; the scenes above are lit at 40° or lower): the
 * core's shading texture fades with the elevation while the core turns darker than the rim
 * (pipeline/stages/band.ts, the tone cue; segment/outerEdge.ts, the notch root's groove). Added
 * 2026-12-03 after measuring ten scenes at 60/75/85° (README "Light from high above").
 */
const RING: SceneCase[] = [
  underRingLight('plain', 85, 'the typical specimen under a light from 85° (ring light): the core\'s shading texture nearly gone'),
  underRingLight('flank-v-bright', 85, 'V flank (45°, ratio 1.3) under a light from 85°'),
  underRingLight('flank-v-shallow', 60, 'V flank (30°, ratio 1.15) under a light from 60°: the root fillet a dark groove, the flank as bright as the rim'),
  underRingLight('defocus', 75, 'one-sided defocus under a light from 75°: the blurred core loses its texture'),
];

/** Every scene of the set, in a fixed order. */
export const SCENE_SET: readonly SceneCase[] = [...SINGLE, ...COMBINED, ...LARGE, ...RING];

/** The scene of that name, or undefined. */
export function findScene(name: string): SceneCase | undefined {
  return SCENE_SET.find((s) => s.name === name);
}
