/** The flows bound to the app: opening files, and those of the shown image (see panels/types.ts). */
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import type { FeatureName } from '../../core/index.js';
import type { Engine } from '../worker/client.js';
import type { DocFlows } from '../components/panels/types.js';
import { rgbaCanvas, type FlowContext, type TextureView } from '../flows/context.js';
import { openFiles, openSample } from '../flows/open.js';
import { findBar, findBoundary, showTexture } from '../flows/measure.js';
import { openMaterialSheet, openSession, save, type ExportKind } from '../flows/save.js';
import { notice } from '../state/store.js';
import { applyModelToAll, emptyTeach, openModel, saveModel, teachStep, type TeachContext, type TeachView } from '../flows/teach.js';
import type { Store } from './useStore.js';

/** Texture map → canvas with a dark-blue → yellow ramp (monotone in lightness). */
export function textureCanvas(w: number, h: number, values: Uint8Array): HTMLCanvasElement {
  const rgba = new Uint8ClampedArray(w * h * 4);
  for (let i = 0; i < values.length; i++) {
    const t = values[i] / 255;
    rgba[4 * i] = 255 * Math.min(1, 1.6 * t);
    rgba[4 * i + 1] = 255 * t * t;
    rgba[4 * i + 2] = 255 * (0.55 - 0.5 * t);
    rgba[4 * i + 3] = 255;
  }
  return rgbaCanvas(w, h, rgba);
}

export interface AppFlows {
  previews: Record<string, HTMLCanvasElement>;
  textures: Record<string, TextureView>;
  openFiles(files: File[]): void;
  openSample(): void;
  forget(docId: string): void;
  /** Teach mode: the model shown and the class maps. */
  teach: TeachView;
  saveModel(): void;
  openModel(file: File): void;
  /** Measures every open image with the model shown (`use` false: without a model). */
  applyModel(use: boolean): void;
  /** Flows of one image. */
  forDoc(docId: string): DocFlows;
}

export function useFlows(engine: Engine | null, store: Store, done: () => void): AppFlows {
  const [previews, setPreviews] = useState<Record<string, HTMLCanvasElement>>({});
  const [textures, setTextures] = useState<Record<string, TextureView>>({});
  const [teach, setTeachState] = useState<TeachView>(emptyTeach);
  const teachRef = useRef(teach);
  const setTeach = useCallback((f: (t: TeachView) => TeachView) => {
    teachRef.current = f(teachRef.current);
    setTeachState(teachRef.current);
  }, []);
  const ctx = useMemo<TeachContext | null>(
    () =>
      engine && {
        engine,
        get: store.get,
        update: store.update,
        setPreview: (id, c) => setPreviews((m) => ({ ...m, [id]: c })),
        setTexture: (id, t) =>
          setTextures((m) => {
            const { [id]: _old, ...rest } = m;
            return t ? { ...rest, [id]: t } : rest;
          }),
        done,
        getTeach: () => teachRef.current,
        setTeach,
      },
    [engine, store.get, store.update, done, setTeach],
  );
  // teach mode follows the strokes: one engine request at a time, the next one decided afresh
  const stepping = useRef(false);
  const [kick, setKick] = useState(0);
  const state = store.state;
  useEffect(() => {
    if (!ctx || stepping.current) return;
    stepping.current = true;
    void teachStep(ctx)
      .catch(() => false)
      .then((asked) => {
        stepping.current = false;
        // something was done: look again (the inputs may have moved on meanwhile)
        if (asked) setKick((k) => k + 1);
      });
  }, [ctx, state, teach, kick]);
  return useMemo<AppFlows>(() => {
    const fail = (e: unknown) => store.update((s) => notice(s, e instanceof Error ? e.message : String(e)));
    const run = (p: Promise<void>) => void p.catch(fail);
    return {
      previews,
      textures,
      teach,
      saveModel: () => ctx && saveModel(ctx),
      openModel: (file) => ctx && run(openModel(ctx, file)),
      applyModel: (use) => ctx && run(applyModelToAll(ctx, use)),
      openFiles: (files) => ctx && run(openFiles(ctx, files)),
      openSample: () => ctx && run(openSample(ctx)),
      forget: (id) => {
        engine?.request({ type: 'close', docId: id }).catch(() => undefined);
        ctx?.setTexture(id, null);
      },
      forDoc: (id) => ({
        findBar: (len: number | null) => ctx && run(findBar(ctx, id, len)),
        findBoundary: () => ctx && run(findBoundary(ctx, id)),
        showTexture: (f: FeatureName) => ctx && run(showTexture(ctx, id, f, textureCanvas)),
        hideTexture: () => ctx?.setTexture(id, null),
        save: (kind: ExportKind) => ctx && run(save(ctx, id, kind)),
        openSession: (file: File) => ctx && run(openSession(ctx, id, file)),
        openMaterialSheet: (file: File) => ctx && run(openMaterialSheet(ctx, id, file)),
      }),
    };
  }, [ctx, engine, previews, textures, teach, store.update]);
}
