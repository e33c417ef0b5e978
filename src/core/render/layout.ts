/**
 * Where things go in the frame: the image area (above an SEM data strip), the specimen or the two
 * mating halves (their centres, mirror, rotation and the columns each one's passes cover), and the
 * scale bar (in its corner, or inside the data strip).
 */
import { createRng } from '../random.js';
import type { SpecimenLayer } from './canvas.js';
import { buildGeometry, defaultPlacement } from './geometry.js';
import type { Harmonic, ResolvedRenderOptions, ScaleBarOptions } from './options.js';
import { labelScaleFor, layoutScaleBar, type BoxPx, type ScaleBarTruth } from './scalebar.js';

/** A placed specimen with what the truth says about its place. */
export interface PlacedSpecimen extends SpecimenLayer {
  readonly id: 'A' | 'B';
  readonly description: string;
  readonly mirrored: boolean;
  readonly rotationDeg: number;
  /** outer radius of the bar (the notch flank's outer edge, or the fracture surface without a flank), px, largest over directions */
  readonly barRadiusPx: number;
}

/** The scale bar as laid out, with the options and label scale used to burn it. */
export interface BarLayout {
  readonly truth: ScaleBarTruth;
  readonly options: ScaleBarOptions;
  readonly labelScale: number;
}

export interface SceneLayout {
  /** the image area: the frame above the SEM data strip */
  readonly area: { readonly width: number; readonly height: number };
  readonly strip: BoxPx | null;
  readonly specimens: readonly PlacedSpecimen[];
  readonly bar: BarLayout | null;
}

/** Outer radius of the bar in px (largest over directions: the finer pixel size). */
export function barRadiusPx(o: ResolvedRenderOptions): number {
  const ratio = o.flank ? o.flank.diameterRatio : 1;
  return ((o.specimen.diameterUm / 2) * ratio) / Math.min(o.umPerPx, o.umPerPxY);
}

/** Small differences of the second half's band: three harmonics with seeded phases. */
function differenceHarmonics(pct: number, seed: number): Harmonic[] {
  if (pct <= 0) return [];
  const rng = createRng(seed, 'sfc32').fork('halves');
  return [
    { order: 2, amplitudePct: 0.5 * pct, phaseDeg: 360 * rng.nextFloat() },
    { order: 3, amplitudePct: 0.35 * pct, phaseDeg: 360 * rng.nextFloat() },
    { order: 5, amplitudePct: 0.25 * pct, phaseDeg: 360 * rng.nextFloat() },
  ];
}

function placeSpecimens(o: ResolvedRenderOptions, areaHeight: number): PlacedSpecimen[] {
  const W = o.widthPx;
  const rb = barRadiusPx(o);
  const single = defaultPlacement(o, areaHeight);
  if (!o.halves) {
    return [{ index: 0, id: 'A', description: 'the fracture surface', mirrored: false, rotationDeg: 0, g: buildGeometry(o, single), x0: 0, x1: W, barRadiusPx: rb }];
  }
  const sep = 2 * rb + o.halves.gapUm / o.umPerPx;
  const ax = o.specimen.centrePx ? single.cx : (W - 1) / 2 - sep / 2;
  const bx = ax + sep;
  const mid = Math.max(0, Math.min(W, Math.round((ax + bx) / 2)));
  const a = buildGeometry(o, { ...single, cx: ax });
  const b = buildGeometry(o, { cx: bx, cy: single.cy, mirror: true, rotationDeg: o.halves.rotationDeg, widthHarmonics: differenceHarmonics(o.halves.differencePct, o.seed) });
  return [
    { index: 0, id: 'A', description: 'first half (left)', mirrored: false, rotationDeg: 0, g: a, x0: 0, x1: mid, barRadiusPx: rb },
    { index: 1, id: 'B', description: 'mating half (right): mirror image of A, rotated, complementary relief, band up to small differences', mirrored: true, rotationDeg: o.halves.rotationDeg, g: b, x0: mid, x1: W, barRadiusPx: rb },
  ];
}

/** Scale bar inside the SEM data strip: light, no plate, label above the bar, right-aligned. */
function barInStrip(b: ScaleBarOptions, strip: BoxPx, W: number, umPerPx: number): ScaleBarOptions {
  const h = strip.y1 - strip.y0 + 1;
  const thick = Math.min(b.thicknessPx, Math.max(2, Math.round(h / 7)));
  const scale = b.labelScale > 0 ? b.labelScale : Math.max(1, Math.round(h / 28));
  const gap = Math.max(2, Math.round(thick * 0.8));
  const block = 7 * scale + gap + thick;
  const lengthPx = Math.round(b.lengthUm / umPerPx);
  const margin = Math.max(4, Math.round(W * 0.02));
  const y0 = strip.y0 + Math.max(0, Math.floor((h - block) / 2)) + 7 * scale + gap;
  return { ...b, positionPx: { x0: Math.max(0, W - margin - lengthPx), y0 }, plate: false, polarity: 'light', thicknessPx: thick, labelScale: scale };
}

/** Lay out the frame of a render (throws BAD_PARAMETER when the scale bar does not fit). */
export function layoutScene(o: ResolvedRenderOptions): SceneLayout {
  const W = o.widthPx;
  const H = o.heightPx;
  const stripH = o.sem ? o.sem.stripHeightPx : 0;
  const strip: BoxPx | null = stripH > 0 ? { x0: 0, y0: H - stripH, x1: W - 1, y1: H - 1 } : null;
  const area = { width: W, height: H - stripH };
  let bar: BarLayout | null = null;
  if (o.scaleBar) {
    const options = strip && o.scaleBar.positionPx === null ? barInStrip(o.scaleBar, strip, W, o.umPerPx) : o.scaleBar;
    bar = { truth: layoutScaleBar(options, W, H, o.umPerPx), options, labelScale: labelScaleFor(options, W, H) };
  }
  return { area, strip, specimens: placeSpecimens(o, area.height), bar };
}
