/** The scene block of the truth: which elements the image shows and where (null for a plain render). */
import type { UnderPlan } from './layers.js';
import type { SceneLayout } from './layout.js';
import type { ResolvedRenderOptions } from './options.js';
import type { SceneTruth } from './sceneTruth.js';

/** Names of the scene elements present in resolved options, in a fixed order. */
export function sceneElements(o: ResolvedRenderOptions): string[] {
  const e: string[] = [];
  if (o.flank) e.push(`flank:${o.flank.kind}`);
  if (o.holder) e.push(`holder:${o.background}`);
  if (o.shadow) e.push('shadow');
  if (o.sem) e.push(o.sem.stripHeightPx > 0 ? 'sem+strip' : 'sem');
  if (o.glints) e.push('glints');
  if (o.colour) e.push('colour');
  if (o.defocus) e.push('defocus');
  if (o.halves) e.push('halves');
  if (o.rule) e.push('rule');
  if (o.label) e.push('label');
  return e;
}

/** The scene truth, or null when no scene element is present (the truth then keeps its plain format). */
export function sceneTruth(o: ResolvedRenderOptions, layout: SceneLayout, plan: UnderPlan | null, colour: boolean): SceneTruth | null {
  const elements = sceneElements(o);
  if (elements.length === 0) return null;
  const s = layout.specimens[0];
  return {
    elements,
    imageAreaPx: { x0: 0, y0: 0, x1: layout.area.width - 1, y1: layout.area.height - 1 },
    colour,
    flank: o.flank
      ? {
          kind: o.flank.kind,
          barDiameterUm: Math.round(o.specimen.diameterUm * o.flank.diameterRatio * 1e4) / 1e4,
          barRadiusPx: Math.round(((s.g.R0 * o.flank.diameterRatio) / Math.hypot(s.g.A, s.g.C)) * 1e4) / 1e4,
        }
      : null,
    dataStripPx: layout.strip,
    objects: plan ? plan.objects.truths : [],
    note: 'the truth outline and band widths are those of the fracture surface itself: its outer edge is the notch root, never the bar edge, a shadow edge or the holder',
  };
}
