/** Opening images (file picker, drop, the bundled invented sample). */
import { newDoc, type Doc, type ImageInfo, type Series } from '../state/document.js';
import { addDoc, derive, notice, type AppState } from '../state/store.js';
import { parseMaterialSheet } from '../../core/index.js';
import { apply, quiet, type Change } from '../state/actions/types.js';
import { chooseSheetMaterial, ownMaterial, readSheet, setStrainRate } from '../state/actions/inputs.js';
import { setTypedScale } from '../state/actions/scale.js';
import { findBar } from './measure.js';
import { rgbaCanvas, wordsOf, type FlowContext } from './context.js';

let docCounter = 0;

/** Opens one image; returns its document id, or null when it could not be opened (said in the notices). */
export async function openBytes(ctx: FlowContext, name: string, bytes: ArrayBuffer): Promise<string | null> {
  const docId = `doc${++docCounter}`;
  try {
    const img = await ctx.engine.request({ type: 'open', docId, name, bytes }, [bytes]);
    ctx.setPreview(docId, rgbaCanvas(img.widthPx, img.heightPx, img.rgba));
    const info: ImageInfo = { name, sha256: img.sha256, widthPx: img.widthPx, heightPx: img.heightPx, format: img.format, bitDepth: img.bitDepth, metadataScale: img.metadataScale, metadataNote: img.metadataNote };
    ctx.update((s) => addDoc(s, newDoc(docId, info)));
    // look for a scale bar at once, so the scale panel can say whether there is one
    ctx.engine.request({ type: 'detectBar', docId }).then(
      (bar) => ctx.update((s) => derive(s, docId, { bar })),
      () => undefined,
    );
    return docId;
  } catch (e) {
    ctx.update((s) => notice(s, wordsOf(e, name)));
    return null;
  } finally {
    ctx.done();
  }
}

/** Opens files one after the other (the list shows each as it comes). */
export async function openFiles(ctx: FlowContext, files: readonly File[]): Promise<void> {
  for (const f of files) await openBytes(ctx, f.name, await f.arrayBuffer());
}

/** What the build says about its bundled sample (see vite.config.ts). */
interface SampleInfo {
  file: string | null;
  barLengthUm: number | null;
  pixelSizeUm: number | null;
  strainRatePerS: number | null;
  materials: { file: string; name: string } | null;
}

function isSampleInfo(v: unknown): v is SampleInfo {
  return typeof v === 'object' && v !== null && 'file' in v;
}

/** Opens the bundled invented sample with the inputs its manifest row gives (no history for them). */
export async function openSample(ctx: FlowContext): Promise<void> {
  const res = await fetch('sample/sample.json');
  if (!res.ok) return;
  const info: unknown = await res.json();
  if (!isSampleInfo(info) || !info.file) return;
  const id = await openBytes(ctx, info.file.split('/').pop() ?? 'sample', await (await fetch(info.file)).arrayBuffer());
  if (!id) return;
  const doc = () => ctx.get().docs.find((d) => d.id === id);
  if (info.materials) {
    const text = await (await fetch(info.materials.file)).text();
    const mats = parseMaterialSheet(text, info.materials.file.split('/').pop() ?? 'materials.json');
    const name = info.materials.name;
    // the sample's own material: images opened later do not get the invented demo material
    const step = (s: AppState, f: (d: Doc, se: Series) => Change): AppState => {
      const d = s.docs.find((x) => x.id === id);
      return d ? apply(s, id, quiet(f(d, s.series)), 'material') : s;
    };
    ctx.update((s) => {
      const s1 = step(s, (d, se) => ownMaterial(d, se, true));
      const s2 = step(s1, (d, se) => readSheet(d, se, 'materials.json', mats));
      return step(s2, (d, se) => chooseSheetMaterial(d, se, d.material ?? se.material, name));
    });
  }
  const d0 = doc();
  if (d0 && info.strainRatePerS !== null) ctx.update((s) => apply(s, id, quiet(setStrainRate(d0, info.strainRatePerS)), 'material'));
  const d1 = doc();
  if (d1 && info.barLengthUm !== null) await findBar(ctx, id, info.barLengthUm, true);
  else if (d1 && info.pixelSizeUm !== null) ctx.update((s) => apply(s, id, quiet(setTypedScale(d1, info.pixelSizeUm)), 'scale'));
}
