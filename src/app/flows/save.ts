/**
 * Saving and reading files: result JSON (the command line's format), CSV row (the batch columns),
 * overlay PNG and HTML report (core's single-image report, overlay drawn from the result), session
 * files, material sheets. Nothing leaves the machine: downloads are made from blobs in the page.
 */
import { buildImageReportHtml, entryRow, imageEntry, isFractozoneError, makeSession, parseMaterialSheet, parseSession, RESULT_COLUMNS, sessionText, toCsv, type MeasureResult } from '../../core/index.js';
import { materialOf, type Doc } from '../state/document.js';
import { materialProblem } from '../state/material.js';
import { paramsOf, resultStateOf } from '../state/results.js';
import { derive, say } from '../state/store.js';
import { apply } from '../state/actions/types.js';
import { readSheet } from '../state/actions/inputs.js';
import { reopenSession } from '../state/actions/session.js';
import { useModelForSeries } from '../state/actions/teach.js';
import { withoutCliHints } from '../state/words.js';
import { fullRun, runKey } from './measure.js';
import { wordsOf, type FlowContext } from './context.js';

export type ExportKind = 'json' | 'csv' | 'png' | 'html' | 'session';

/** Result JSON text exactly as the command line writes it (2-space indent, trailing newline). */
export function resultJsonText(result: MeasureResult): string {
  return JSON.stringify(result, null, 2) + '\n';
}

/** One CSV header + row, the same columns as the batch results.csv. */
export function resultCsvText(result: MeasureResult): string {
  return toCsv(RESULT_COLUMNS, [entryRow(imageEntry(result))]);
}

/** Starts a download of `content` in the browser. */
export function download(name: string, content: string | Blob, type = 'application/octet-stream'): void {
  const blob = typeof content === 'string' ? new Blob([content], { type }) : content;
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

async function pngDataUrl(png: Uint8Array): Promise<string> {
  const blob = new Blob([png.slice().buffer], { type: 'image/png' });
  return new Promise((resolve, reject) => {
    const r = new FileReader();
    r.onload = () => resolve(String(r.result));
    r.onerror = () => reject(new Error('the overlay picture could not be embedded'));
    r.readAsDataURL(blob);
  });
}

/** Notes the app adds to the report: why the material was not applied. */
function reportNotes(doc: Doc, ctx: FlowContext): string[] {
  const problem = materialProblem(materialOf(doc, ctx.get().series), doc.strainRatePerS);
  const notes: string[] = [];
  if (problem) notes.push(`Material not applied: ${problem}`);
  if (doc.materialError) notes.push(`Material not applied: ${withoutCliHints(doc.materialError)}`);
  return notes;
}

/** Saves one kind of file for a document; results only when current (the buttons say so too). */
export async function save(ctx: FlowContext, id: string, kind: ExportKind): Promise<void> {
  const s = ctx.get();
  const doc = s.docs.find((d) => d.id === id);
  if (!doc) return;
  const stem = doc.image.name.replace(/\.[^.]+$/, '');
  if (kind === 'session') {
    const model = s.series.model;
    const session = makeSession({ file: doc.image.name, sha256: doc.image.sha256, widthPx: doc.image.widthPx, heightPx: doc.image.heightPx }, paramsOf(doc, s.series), doc.outline, doc.base !== null, model ? { name: model.name, sha256: model.sha256, text: model.text } : undefined);
    download(`${stem}.session.json`, sessionText(session), 'application/json');
    return;
  }
  const r = doc.result;
  if (!r || resultStateOf(doc, s.series).state !== 'current') {
    ctx.update((st) => say(st, id, 'save', [{ level: 'error', text: 'The result is out of date: wait until it is current (or press “Find boundary”), then save.' }]));
    return;
  }
  try {
    if (kind === 'json') download(`${stem}.result.json`, resultJsonText(r), 'application/json');
    if (kind === 'csv') download(`${stem}.csv`, resultCsvText(r), 'text/csv');
    if (kind === 'png' || kind === 'html') {
      const png = await ctx.engine.request({ type: 'overlay', docId: id, result: r });
      if (kind === 'png') download(`${stem}.overlay.png`, new Blob([png.slice().buffer], { type: 'image/png' }));
      else download(`${stem}.report.html`, buildImageReportHtml({ result: r, overlayDataUrl: await pngDataUrl(png), notes: reportNotes(doc, ctx) }), 'text/html');
    }
    ctx.update((st) => say(st, id, 'save', []));
  } catch (e) {
    ctx.update((st) => say(st, id, 'save', [{ level: 'error', text: wordsOf(e) }]));
  } finally {
    ctx.done();
  }
}

/** Reopens a session file on the shown image; measures again when the session was measured. */
export async function openSession(ctx: FlowContext, id: string, file: File): Promise<void> {
  const doc = ctx.get().docs.find((d) => d.id === id);
  if (!doc) return;
  try {
    const session = parseSession(await file.text(), { sha256: doc.image.sha256 });
    // the session's model: loaded in the engine (its SHA-256 checked there) and made the series' model
    const model = session.model;
    if (model) {
      const info = await ctx.engine.request({ type: 'loadModel', bytes: new TextEncoder().encode(model.text).buffer });
      if (info.sha256 !== model.sha256) throw new Error(`the model in the session file is damaged (its SHA-256 is ${info.sha256.slice(0, 12)}…, the file says ${model.sha256.slice(0, 12)}…)`);
      ctx.update((s) => apply(s, id, useModelForSeries(s.series, { name: model.name, sha256: model.sha256, text: model.text }), 'session'));
    }
    // measured sessions are measured again first, so reopening is one step (and one undo)
    const full = { ...session.params, boundaryPolygon: null };
    if (session.measured) ctx.update((s) => derive(s, id, { busy: 'analysing' }));
    const run = session.measured ? await fullRun(ctx, id, full) : null;
    ctx.update((s) => {
      const d = s.docs.find((x) => x.id === id);
      const next = d ? apply(s, id, reopenSession(d, s.series, session, file.name, run), 'session') : s;
      return derive(next, id, run ? { busy: null, result: run.result, resultKey: runKey(run, full), refused: null } : { busy: null });
    });
  } catch (e) {
    ctx.update((s) => derive(s, id, { busy: null }));
    const text = isFractozoneError(e) ? `${file.name}: ${withoutCliHints(e.message)}` : wordsOf(e, file.name);
    ctx.update((s) => say(s, id, 'session', [{ level: 'error', text }]));
  } finally {
    ctx.done();
  }
}

/** Reads a material sheet (JSON or CSV) into the material the shown image uses. */
export async function openMaterialSheet(ctx: FlowContext, id: string, file: File): Promise<void> {
  try {
    const materials = parseMaterialSheet(await file.text(), file.name);
    ctx.update((s) => {
      const d = s.docs.find((x) => x.id === id);
      return d ? apply(s, id, readSheet(d, s.series, file.name, materials), 'material') : s;
    });
  } catch (e) {
    const text = isFractozoneError(e) ? withoutCliHints(e.message) : wordsOf(e, file.name);
    ctx.update((s) => say(s, id, 'material', [{ level: 'error', text }]));
  }
}
