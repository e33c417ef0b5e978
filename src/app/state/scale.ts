/**
 * The scale of an image: the user's choice → core's ScaleParams, and the scale core's precedence
 * rules give for it on this image (with the bar and metadata the image has), or why there is none,
 * in the app's words.
 */
import { chooseScale, isFractozoneError, type MetadataScale, type Scale, type ScaleBar, type ScaleParams } from '../../core/index.js';
import type { Doc, ScaleChoice } from './document.js';

/**
 * Scale parameters for a choice. `useMetadata` stays true (the command line's default) except for
 * "no scale": typed, two-point and bar scales take precedence over metadata anyway, so the same
 * choice gives the same parameter object as the command line (e.g. `--pixel-size 5um`).
 */
export function scaleParamsOf(c: ScaleChoice): ScaleParams {
  switch (c.source) {
    case 'none':
      return { useMetadata: false };
    case 'metadata':
      return { useMetadata: true };
    case 'typed':
      return { useMetadata: true, pixelSizeUm: c.umPerPx };
    case 'two-point':
      return { useMetadata: true, twoPoint: { p0: { ...c.p0 }, p1: { ...c.p1 }, distanceUm: c.distanceUm } };
    case 'scale-bar':
      return { useMetadata: true, barLengthUm: c.barLengthUm };
  }
}

/** The choice a parameter object stands for (same precedence as core: typed > two points > bar > metadata). */
export function scaleChoiceOf(p: ScaleParams): ScaleChoice {
  if (p.pixelSizeUm !== undefined) return { source: 'typed', umPerPx: p.pixelSizeUm };
  if (p.twoPoint) return { source: 'two-point', p0: { ...p.twoPoint.p0 }, p1: { ...p.twoPoint.p1 }, distanceUm: p.twoPoint.distanceUm };
  if (p.barLengthUm !== undefined) return { source: 'scale-bar', barLengthUm: p.barLengthUm };
  return p.useMetadata === false ? { source: 'none' } : { source: 'metadata' };
}

/** The scale an image has now, or a sentence saying what to do to get one. */
export type ScaleState = { ok: true; scale: Scale } | { ok: false; problem: string };

function metadataOf(doc: Doc): MetadataScale | null {
  const m = doc.image.metadataScale;
  return m ? { umPerPxX: m.umPerPxX, umPerPxY: m.umPerPxY, source: m.source, ...(m.note ? { note: m.note } : {}) } : null;
}

/** The scale of a document under core's rules, or what is missing (the app's words). */
export function scaleOf(doc: Doc): ScaleState {
  const c = doc.scale;
  if (c.source === 'none') return { ok: false, problem: 'No scale yet: type the pixel size, find the scale bar (with its printed length), or draw a line along a known length.' };
  if (c.source === 'scale-bar' && doc.bar === undefined) return { ok: false, problem: 'Press “Find bar” to look for the scale bar.' };
  if (c.source === 'scale-bar' && doc.bar === null) return { ok: false, problem: 'No scale bar was found in this image: type the pixel size or draw a line along a known length.' };
  const p = scaleParamsOf(c);
  const bar: ScaleBar | null = doc.bar ?? null;
  try {
    const typed = p.pixelSizeUm;
    return { ok: true, scale: chooseScale({ typed, twoPoint: p.twoPoint, barLengthUm: p.barLengthUm, bar, metadata: p.useMetadata === false ? null : metadataOf(doc) }) };
  } catch (e) {
    if (isFractozoneError(e)) return { ok: false, problem: `The scale cannot be set: ${e.message}.` };
    throw e;
  }
}

/** µm per pixel of the document's scale, or null. */
export function umPerPxOf(doc: Doc): number | null {
  const s = scaleOf(doc);
  return s.ok ? s.scale.umPerPx : null;
}
