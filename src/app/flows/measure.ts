/** Measuring: the scale bar, the full run ("Find boundary"), the texture map. */
import { canonicalJson, defaultWindowUm, FEATURES, windowPxFromUm, WORKING_LONG_SIDE_PX, type FeatureName, type MeasureParams } from '../../core/index.js';
import { derive, say } from '../state/store.js';
import { apply, quiet } from '../state/actions/types.js';
import { applyScaleBar } from '../state/actions/scale.js';
import { runDone } from '../state/actions/edit.js';
import { paramsOf } from '../state/results.js';
import { scaleOf, umPerPxOf } from '../state/scale.js';
import type { Analysis, Doc } from '../state/document.js';
import { wordsOf, type FlowContext } from './context.js';

let runCounter = 0;

const docOf = (ctx: FlowContext, id: string): Doc | undefined => ctx.get().docs.find((d) => d.id === id);

/** Looks for the scale bar (once per image) and uses it with the printed length typed; `setup` = no history entry. */
export async function findBar(ctx: FlowContext, id: string, lengthUm: number | null, setup = false): Promise<void> {
  const d = docOf(ctx, id);
  if (!d) return;
  try {
    const bar = d.bar === undefined ? await ctx.engine.request({ type: 'detectBar', docId: id }) : d.bar;
    ctx.update((s) => {
      const now = s.docs.find((x) => x.id === id);
      if (!now) return s;
      const c = applyScaleBar(now, lengthUm, bar);
      return apply(s, id, setup ? quiet(c) : c, 'scale');
    });
  } catch (e) {
    ctx.update((s) => say(s, id, 'scale', [{ level: 'error', text: wordsOf(e) }]));
  } finally {
    ctx.done();
  }
}

/** Runs the full measurement with `params` on image `id`; the run's identity and result. */
export async function fullRun(ctx: FlowContext, id: string, params: MeasureParams): Promise<Analysis> {
  const result = await ctx.engine.request({ type: 'analyse', docId: id, params });
  return { id: ++runCounter, result };
}

/** The key of a full run's own inputs (see state/results.ts), so its result counts as current. */
export function runKey(run: Analysis, params: MeasureParams): string {
  return canonicalJson({ base: run.id, params, outline: null });
}

/**
 * The full measurement with the image's current inputs ("Find boundary"). It becomes the base of
 * every later result; corrections made by hand on the previous run are dropped (undo brings them
 * back with the previous run).
 */
export async function findBoundary(ctx: FlowContext, id: string): Promise<void> {
  let d = docOf(ctx, id);
  if (!d || d.busy) return;
  if (d.scale.source === 'scale-bar' && d.bar === undefined) {
    await findBar(ctx, id, d.scale.barLengthUm);
    d = docOf(ctx, id);
    if (!d) return;
  }
  const scale = scaleOf(d);
  if (!scale.ok) {
    ctx.update((s) => say(s, id, 'scale', [{ level: 'error', text: scale.problem }]));
    return;
  }
  const params = paramsOf(d, ctx.get().series, { fullRun: true });
  ctx.update((s) => say(derive(s, id, { busy: 'analysing' }), id, 'analysis', []));
  try {
    const run = await fullRun(ctx, id, params);
    ctx.update((s) => {
      const now = s.docs.find((x) => x.id === id);
      if (!now) return s;
      const next = apply(s, id, runDone(now, run), 'analysis');
      return derive(next, id, { busy: null, result: run.result, resultKey: runKey(run, params), materialError: null, refused: null });
    });
  } catch (e) {
    ctx.update((s) => say(derive(s, id, { busy: null }), id, 'analysis', [{ level: 'error', text: wordsOf(e, d?.image.name) }]));
  } finally {
    ctx.done();
  }
}

/** Human label of a texture feature (core's one-sentence description, capitalised). */
export function featureLabel(f: FeatureName): string {
  const s = FEATURES[f].description;
  return s.charAt(0).toUpperCase() + s.slice(1);
}

/** The texture window the measurement uses (or would use) on this image: µm and full-resolution px. */
export function textureWindowOf(d: Doc): { um: number | null; px: number } {
  const r = d.result ?? d.base?.result;
  if (r) return { um: r.resolved.windowUm, px: r.resolved.windowPx };
  const u = umPerPxOf(d);
  const scaleFactor = Math.max(1, Math.max(d.image.widthPx, d.image.heightPx) / WORKING_LONG_SIDE_PX);
  // core's default rule; without a scale it is applied in pixels (1 "µm" per px), the rule being scale-free
  const um = defaultWindowUm({ umPerPx: u ?? 1, imageWidthPx: d.image.widthPx, imageHeightPx: d.image.heightPx, scaleFactor });
  return { um: u === null ? null : um, px: windowPxFromUm(um, u ?? 1) };
}

/** Computes the texture map of a feature with the measurement's window and shows it over the image. */
export async function showTexture(ctx: FlowContext, id: string, feature: FeatureName, toCanvas: (w: number, h: number, v: Uint8Array) => HTMLCanvasElement): Promise<void> {
  const d = docOf(ctx, id);
  if (!d) return;
  const w = textureWindowOf(d);
  try {
    const t = await ctx.engine.request({ type: 'texture', docId: id, feature, windowPx: w.px });
    const size = w.um !== null ? `${Number(w.um.toPrecision(4))} µm (${t.windowPx} px)` : `${t.windowPx} px`;
    ctx.setTexture(id, { canvas: toCanvas(t.width, t.height, t.values), label: `${featureLabel(feature)} · window ${size}` });
    ctx.update((s) => say(s, id, 'texture', []));
  } catch (e) {
    ctx.update((s) => say(s, id, 'texture', [{ level: 'error', text: wordsOf(e) }]));
  } finally {
    ctx.done();
  }
}
