/**
 * Teach mode's flows: teaching a pixel model from the strokes of every image (in the engine), the
 * class-map preview of the shown image, saving and opening model files, and measuring every open
 * image with the model. The model and the previews are view state (the engine holds the models);
 * the model the series is measured with is a series input (undoable).
 */
import { canonicalJson } from '../../core/index.js';
import type { ClassMapView, ModelInfo, TeachInput } from '../worker/protocol.js';
import type { Doc } from '../state/document.js';
import { LABEL_COLOURS, missingClasses } from '../state/labels.js';
import { scaleOf } from '../state/scale.js';
import { paramsOf } from '../state/results.js';
import { activeDoc, notice, say, type AppState } from '../state/store.js';
import { apply } from '../state/actions/types.js';
import { useModelForSeries } from '../state/actions/teach.js';
import { findBoundary } from './measure.js';
import { download } from './save.js';
import { rgbaCanvas, wordsOf, type FlowContext } from './context.js';

/** The model teach mode shows: taught from the strokes, or read from a file. */
export interface TeachModel extends ModelInfo {
  name: string;
  origin: 'taught' | 'file';
}

/** One image's class map as shown. */
export interface ClassMapShown {
  canvas: HTMLCanvasElement;
  sha256: string;
  /** Fraction of the image in each class: outside, rim band, core. */
  fractions: [number, number, number];
  /** Engine time of the class map, and from the end of the stroke to the map on screen (teaching included), ms. */
  mapMs: number;
  /** Grid spacing (working px) the forest was evaluated at; the map is interpolated between. */
  stride: number;
  totalMs: number | null;
}

export interface TeachView {
  model: TeachModel | null;
  /** The strokes (and scales) the model was taught from; a change teaches again. */
  taughtKey: string | null;
  /** Models taught before, by the key of their strokes (undo / redo show them again without teaching). */
  byKey: Record<string, TeachModel>;
  maps: Record<string, ClassMapShown>;
  /** Per image: the scale and windows the engine has made it ready for (working copy, feature tables, the class-map grid's features). */
  prepared: Record<string, string>;
  busy: 'preparing' | 'teaching' | 'mapping' | null;
  /** When the teaching in progress (or the last one) started (performance.now()). */
  startedAt: number | null;
  error: string | null;
}

export const emptyTeach = (): TeachView => ({ model: null, taughtKey: null, byKey: {}, maps: {}, prepared: {}, busy: null, startedAt: null, error: null });

/** Key of what an image is made ready for. */
function preparedKey(scale: TeachInput['scale'], windowsUm: number[] | null): string {
  return canonicalJson({ scale, windowsUm });
}

/** What the engine teaches from: the images with strokes and a scale. */
export function teachInputs(s: AppState): { inputs: TeachInput[]; unscaled: string[] } {
  const inputs: TeachInput[] = [];
  const unscaled: string[] = [];
  for (const d of s.docs) {
    if (d.labels.length === 0) continue;
    if (!scaleOf(d).ok) unscaled.push(d.image.name);
    else inputs.push({ docId: d.id, scale: paramsOf(d, s.series).scale, strokes: d.labels });
  }
  return { inputs, unscaled };
}

/** The next thing teach mode should ask the engine for, or null. */
export function nextTeachStep(s: AppState, t: TeachView): { kind: 'teach'; key: string; inputs: TeachInput[] } | { kind: 'map'; doc: Doc } | { kind: 'prepare'; doc: Doc; key: string; windowsUm: number[] | null } | null {
  if (!s.view.teach.on || t.busy) return null;
  // not while a stroke is being painted
  if (s.docs.some((d) => d.history.drag)) return null;
  const { inputs, unscaled } = teachInputs(s);
  if (inputs.length > 0 && unscaled.length === 0 && missingClasses(s.docs).length === 0) {
    const key = canonicalJson(inputs);
    if (key !== t.taughtKey) return { kind: 'teach', key, inputs };
  }
  const doc = activeDoc(s);
  if (doc && t.model && scaleOf(doc).ok && t.maps[doc.id]?.sha256 !== t.model.sha256) return { kind: 'map', doc };
  // nothing else to do: make the shown image ready, so that the strokes to come only cost the forest
  if (doc && scaleOf(doc).ok) {
    const windowsUm = t.model ? t.model.windowsUm : null;
    const key = preparedKey(paramsOf(doc, s.series).scale, windowsUm);
    if (t.prepared[doc.id] !== key) return { kind: 'prepare', doc, key, windowsUm };
  }
  return null;
}

/** Class map → canvas in the label colours (opacity is set where it is drawn). */
export function classMapCanvas(m: ClassMapView): { canvas: HTMLCanvasElement; fractions: [number, number, number] } {
  const rgba = new Uint8ClampedArray(m.width * m.height * 4);
  const n = [0, 0, 0, 0];
  for (let i = 0; i < m.values.length; i++) {
    n[m.values[i]]++;
    const c = LABEL_COLOURS[m.values[i] as 1 | 2 | 3] ?? [0, 0, 0];
    rgba[4 * i] = c[0];
    rgba[4 * i + 1] = c[1];
    rgba[4 * i + 2] = c[2];
    rgba[4 * i + 3] = 255;
  }
  const all = Math.max(1, m.values.length);
  return { canvas: rgbaCanvas(m.width, m.height, rgba), fractions: [n[1] / all, n[2] / all, n[3] / all] };
}

export interface TeachContext extends FlowContext {
  getTeach(): TeachView;
  setTeach(f: (t: TeachView) => TeachView): void;
}

/** Runs one step of teach mode (see {@link nextTeachStep}); true when it asked the engine for something. */
export async function teachStep(ctx: TeachContext): Promise<boolean> {
  const step = nextTeachStep(ctx.get(), ctx.getTeach());
  if (!step) return false;
  if (step.kind === 'teach') {
    const known = ctx.getTeach().byKey[step.key];
    if (known) {
      ctx.setTeach((t) => ({ ...t, taughtKey: step.key, error: null, model: known, startedAt: null }));
      return true;
    }
    const startedAt = performance.now();
    ctx.setTeach((t) => ({ ...t, busy: 'teaching', startedAt }));
    try {
      const info = await ctx.engine.request({ type: 'teach', images: step.inputs });
      const names = step.inputs.map((i) => ctx.get().docs.find((d) => d.id === i.docId)?.image.name ?? '?');
      const model: TeachModel = { ...info, name: `taught on ${names.join(', ')}`, origin: 'taught' };
      ctx.setTeach((t) => ({ ...t, busy: null, taughtKey: step.key, error: null, model, byKey: { ...t.byKey, [step.key]: model } }));
    } catch (e) {
      ctx.setTeach((t) => ({ ...t, busy: null, taughtKey: step.key, error: wordsOf(e) }));
    } finally {
      ctx.done();
    }
    return true;
  }
  if (step.kind === 'prepare') {
    ctx.setTeach((t) => ({ ...t, busy: 'preparing' }));
    try {
      await ctx.engine.request({ type: 'prepareTeach', docId: step.doc.id, scale: paramsOf(step.doc, ctx.get().series).scale, windowsUm: step.windowsUm });
    } catch {
      // not needed for anything: the class map makes the image ready itself (and reports what fails)
    } finally {
      ctx.setTeach((t) => ({ ...t, busy: null, prepared: { ...t.prepared, [step.doc.id]: step.key } }));
      ctx.done();
    }
    return true;
  }
  const t0 = ctx.getTeach();
  const model = t0.model;
  if (!model) return false;
  ctx.setTeach((t) => ({ ...t, busy: 'mapping' }));
  try {
    const m = await ctx.engine.request({ type: 'classMap', docId: step.doc.id, scale: paramsOf(step.doc, ctx.get().series).scale, sha256: model.sha256 });
    const { canvas, fractions } = classMapCanvas(m);
    ctx.setTeach((t) => {
      const totalMs = t.startedAt !== null && t.model?.origin === 'taught' && t.model.sha256 === model.sha256 ? Math.round(performance.now() - t.startedAt) : null;
      const key = preparedKey(paramsOf(step.doc, ctx.get().series).scale, model.windowsUm);
      return { ...t, busy: null, startedAt: null, error: null, prepared: { ...t.prepared, [step.doc.id]: key }, maps: { ...t.maps, [step.doc.id]: { canvas, fractions, sha256: model.sha256, mapMs: m.ms, stride: m.stride, totalMs } } };
    });
  } catch (e) {
    ctx.setTeach((t) => ({ ...t, busy: null, error: wordsOf(e), maps: { ...t.maps, [step.doc.id]: { canvas: document.createElement('canvas'), fractions: [0, 0, 0], sha256: model.sha256, mapMs: 0, stride: 0, totalMs: null } } }));
  } finally {
    ctx.done();
  }
  return true;
}

/** Downloads the model shown (the file `fractozone.model/1`, byte for byte what its SHA-256 names). */
export function saveModel(ctx: TeachContext): void {
  const m = ctx.getTeach().model;
  if (!m) return;
  const first = ctx.get().docs.find((d) => d.labels.length > 0);
  const stem = m.origin === 'file' ? m.name.replace(/\.(model\.)?json$/i, '') : (first?.image.name.replace(/\.[^.]+$/, '') ?? 'taught');
  download(`${stem}.model.json`, m.text, 'application/json');
}

/** Reads a model file; it becomes the model shown (strokes painted later teach a new one). */
export async function openModel(ctx: TeachContext, file: File): Promise<void> {
  try {
    const info = await ctx.engine.request({ type: 'loadModel', bytes: await file.arrayBuffer() });
    ctx.setTeach((t) => ({ ...t, error: null, model: { ...info, name: file.name, origin: 'file' }, startedAt: null }));
  } catch (e) {
    ctx.setTeach((t) => ({ ...t, error: `${file.name}: ${wordsOf(e)}` }));
  } finally {
    ctx.done();
  }
}

/**
 * Measures every open image with the model shown (or without a model when `use` is false): the
 * series' model is set (one undoable edit), then each image with a scale is measured again.
 */
export async function applyModelToAll(ctx: TeachContext, use: boolean): Promise<void> {
  const m = ctx.getTeach().model;
  if (use && !m) return;
  const docId = ctx.get().activeId ?? ctx.get().docs[0]?.id;
  if (!docId) return;
  ctx.update((s) => apply(s, docId, useModelForSeries(s.series, use && m ? { name: m.name, sha256: m.sha256, text: m.text } : null), 'teach'));
  for (const d of ctx.get().docs) {
    if (!scaleOf(d).ok) {
      ctx.update((s) => say(s, d.id, 'analysis', [{ level: 'warning', text: 'Not measured with the model: this image has no scale yet.' }]));
      continue;
    }
    try {
      await findBoundary(ctx, d.id);
    } catch (e) {
      ctx.update((s) => notice(s, `${d.image.name}: ${wordsOf(e)}`));
    }
  }
}
