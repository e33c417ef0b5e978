/**
 * Synthetic fractograph renderer: an end-on view of the fracture surface of a round,
 * circumferentially notched bar, with a known truth (outline, band boundary, band width by angle,
 * scale bar). Pure and deterministic (seeded); everything physical is in µm so a different pixel
 * size shows the same surface.
 *
 * Image formation, one phase per file: lay out the frame (layout.ts); a height field h(X, Y) in µm on
 * the specimen plane (surface.ts: fractal gradient noise, cellular dimples and radial ridges in the
 * core; fine relief, striations and an outward slope in the band), shaded with a Lambertian
 * directional light plus ambient times a zone albedo (shading.ts), glints (glints.ts), cracks
 * (cracks.ts); composited over the plain background or the layer of scene elements beneath the
 * fracture surface — holder, cast shadow, notch flank, rule, label (layers.ts); then defocus, blur,
 * scan lines and noise (finish.ts), the SEM data strip and the burned-in scale bar (marks.ts); and the
 * truth from the same geometry tables (truth.ts).
 */
import { createRaster, type GrayRaster } from '../image/raster.js';
import { createRng, type Rng } from '../random.js';
import { createCanvas, createTables, type Tables } from './canvas.js';
import { compositeLayers, compositePlain, surfaceTints, zoneGains } from './composite.js';
import { applyCracks } from './cracks.js';
import { finishPlanes, REC709 } from './finish.js';
import { glintPass } from './glints.js';
import { needsLayers, planUnderLayer, underLayer } from './layers.js';
import { layoutScene, type SceneLayout } from './layout.js';
import { burnMarks } from './marks.js';
import type { RenderOptions, ResolvedRenderOptions } from './options.js';
import { resolveRenderOptions } from './resolve.js';
import { sceneTruth } from './sceneSummary.js';
import { shadingPass } from './shading.js';
import { surfacePass } from './surface.js';
import { assembleTruth, specimenRays, type RenderTruth, type SpecimenTruth } from './truth.js';

/** An RGB raster: interleaved R, G, B per pixel, Float32 0..1, row-major. */
export interface RgbRaster {
  readonly width: number;
  readonly height: number;
  readonly data: Float32Array;
}

/** Result of {@link renderFractograph}. */
export interface RenderResult {
  /** gray 0..1; for a colour render the Rec. 709 luma of `rgb` */
  readonly raster: GrayRaster;
  /** the colour image when colour was asked for (`colour` option), else null */
  readonly rgb: RgbRaster | null;
  readonly truth: RenderTruth;
}

/** A stream of the scene elements that does not depend on which other elements are present. */
function sceneStream(t: Tables, label: string): Rng {
  return createRng(t.sceneSeed, 'sfc32').fork(label);
}

/** Height field, shading, glints and cracks of every specimen, then the zone gains. */
function renderSurfaces(o: ResolvedRenderOptions, layout: SceneLayout, t: Tables): ReturnType<typeof createCanvas> {
  const c = createCanvas(o.widthPx, o.heightPx);
  for (const s of layout.specimens) surfacePass(c, s, t, o);
  shadingPass(c, o);
  if (o.glints) for (const s of layout.specimens) glintPass(c, s, o, sceneStream(t, 'glints'));
  for (const s of layout.specimens) applyCracks(c, o, s.g, t.crackSeed);
  return c;
}

/** Interleave three planes into an RGB raster and compute its luma. */
function toOutput(planes: readonly Float32Array[], W: number, H: number): { raster: GrayRaster; rgb: RgbRaster | null } {
  if (planes.length === 1) return { raster: createRaster(W, H, planes[0]), rgb: null };
  const [r, g, b] = planes;
  const n = W * H;
  const rgb = new Float32Array(3 * n);
  const luma = new Float32Array(n);
  for (let i = 0; i < n; i++) {
    rgb[3 * i] = r[i];
    rgb[3 * i + 1] = g[i];
    rgb[3 * i + 2] = b[i];
    luma[i] = REC709[0] * r[i] + REC709[1] * g[i] + REC709[2] * b[i];
  }
  return { raster: createRaster(W, H, luma), rgb: { width: W, height: H, data: rgb } };
}

/**
 * Render a synthetic fractograph with its exact truth.
 *
 * @param options see {@link RenderOptions}; all optional. Lengths in µm, pixel sizes in µm/px,
 *   angles in degrees (0° = +x, counter-clockwise on screen). Scene elements (flank, holder, shadow,
 *   SEM, glints, colour, defocus, halves, rule, label) are off unless given.
 * @returns `raster`: Float32 gray 0..1 (quantise to 8 or 16 bits yourself); `rgb`: the colour image
 *   when `colour` is given; `truth`: schema "fractozone.truth/1", computed along the 360 rays from the
 *   same geometry tables the pixels use (one record per half in `specimens` when both halves are shown).
 * @throws FractozoneError BAD_PARAMETER for out-of-range options or objects that would cover the specimen.
 */
export function renderFractograph(options: RenderOptions = {}): RenderResult {
  const o = resolveRenderOptions(options);
  const W = o.widthPx;
  const H = o.heightPx;
  const layout = layoutScene(o);
  const t = createTables(o);
  const plan = needsLayers(o) ? planUnderLayer(o, layout) : null;
  const c = renderSurfaces(o, layout, t);
  const gains = zoneGains(c, o);
  const channels = o.colour ? 3 : 1;
  let planes: Float32Array[];
  if (plan) {
    const under = underLayer(c, o, layout, plan, t.background, channels, (label) => sceneStream(t, label));
    planes = compositeLayers(c, under, gains, surfaceTints(o, channels));
  } else {
    compositePlain(c, o, t.background, gains);
    planes = [c.out];
  }
  finishPlanes(planes, W, H, o, { noise: t.noise, scanLines: () => sceneStream(t, 'scan-lines'), colourNoise: () => sceneStream(t, 'colour-noise') });
  burnMarks(planes, W, H, o, layout);
  const out = toOutput(planes, W, H);
  const rays: SpecimenTruth[] = layout.specimens.map((s) => ({
    id: s.id,
    description: s.description,
    mirrored: s.mirrored,
    rotationDeg: s.rotationDeg,
    ...specimenRays(o, s.g, layout.area),
  }));
  const scene = sceneTruth(o, layout, plan, channels === 3);
  return { ...out, truth: assembleTruth(o, rays, layout.bar ? layout.bar.truth : null, scene) };
}
