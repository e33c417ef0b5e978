/**
 * The layer beneath the fracture surface: the background or holder, the bar's cast shadow, the rule and
 * the label, and the notch flank around each specimen; tinted per channel and blurred with a σ that
 * follows depth (the flank's σ grows with its depth, the background lies at the holder's or the
 * flank's deepest σ). The fracture surface is composited over it afterwards and stays sharp (it is the
 * plane in focus).
 */
import type { Rng } from '../random.js';
import { variableBlurInPlace } from './blur.js';
import type { Canvas } from './canvas.js';
import { createFlankPlanes, flankPass } from './flank.js';
import { backgroundPlane } from './holder.js';
import type { SceneLayout } from './layout.js';
import type { NoiseTable } from './noise.js';
import { paintObjects } from './objectPaint.js';
import { layoutObjects, type ObjectsLayout } from './objects.js';
import type { ResolvedRenderOptions } from './options.js';
import { applyShadow } from './shadow.js';

/** What the under layer needs laid out before rendering (checked early: bad layouts fail fast). */
export interface UnderPlan {
  readonly objects: ObjectsLayout;
}

/** True when the image needs the layered composite (any element beneath or on the fracture surface). */
export function needsLayers(o: ResolvedRenderOptions): boolean {
  return !!(o.flank || o.holder || o.shadow || o.rule || o.label || o.colour || o.glints);
}

/** Lay out the objects (throws BAD_PARAMETER when one would cover the specimen or the scale bar). */
export function planUnderLayer(o: ResolvedRenderOptions, layout: SceneLayout): UnderPlan {
  return { objects: layoutObjects(o, layout) };
}

function tintOf(o: ResolvedRenderOptions, k: number, which: 'flank' | 'background'): number {
  if (!o.colour) return 1;
  return (which === 'flank' ? o.colour.flankTint : o.colour.backgroundTint)[k];
}

/**
 * Render the under layer, one plane per output channel.
 * @param stream a seeded stream per element label (independent of which other elements exist)
 */
export function underLayer(
  c: Canvas,
  o: ResolvedRenderOptions,
  layout: SceneLayout,
  plan: UnderPlan,
  tBg: NoiseTable,
  channels: 1 | 3,
  stream: (label: string) => Rng,
): Float32Array[] {
  const bg = backgroundPlane(o, tBg, layout.specimens, stream('holder'));
  applyShadow(bg, o, layout.specimens);
  paintObjects(bg, o, plan.objects, stream);
  const fp = o.flank ? createFlankPlanes(c.n) : null;
  if (fp) for (const s of layout.specimens) flankPass(c, s, o, fp, stream('flank'));
  const planes: Float32Array[] = [];
  for (let k = 0; k < channels; k++) {
    const ft = tintOf(o, k, 'flank');
    const bt = tintOf(o, k, 'background');
    const p = new Float32Array(c.n);
    for (let i = 0; i < c.n; i++) {
      const f = fp ? fp.cover[i] : 0;
      p[i] = f > 0 ? f * fp!.value[i] * ft + (1 - f) * bg[i] * bt : bg[i] * bt;
    }
    planes.push(p);
  }
  const bgSigma = Math.max(o.holder ? o.holder.defocusPx : 0, o.flank ? o.flank.defocusPx : 0);
  if (bgSigma > 0) {
    const sigma = new Float32Array(c.n);
    for (let i = 0; i < c.n; i++) {
      const f = fp ? fp.cover[i] : 0;
      sigma[i] = f * (fp ? fp.sigma[i] : 0) + (1 - f) * bgSigma;
    }
    for (const p of planes) variableBlurInPlace(p, c.W, c.H, sigma, bgSigma);
  }
  return planes;
}
