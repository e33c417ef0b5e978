/** Scale actions: typed pixel size, scale-bar length, two points, file metadata. */
import type { PointPx, ScaleBar } from '../../../core/index.js';
import type { Doc } from '../document.js';
import { docEdit, positiveNumber, refuse, unchanged, type Change } from './types.js';

/** Use a typed pixel size (µm per px). */
export function setTypedScale(doc: Doc, umPerPx: number | null): Change {
  const v = positiveNumber(umPerPx);
  if (v === null) return refuse('scale', 'Type the pixel size as a positive number of µm per pixel (e.g. 4.5).');
  if (doc.scale.source === 'typed' && doc.scale.umPerPx === v) return unchanged;
  return docEdit('pixel size', { scale: { source: 'typed', umPerPx: v } });
}

/**
 * Use the detected scale bar with its printed length (µm). `bar` is the detector's answer when it
 * was just asked (undefined: use what the document already knows).
 */
export function applyScaleBar(doc: Doc, lengthUm: number | null, bar?: ScaleBar | null): Change {
  const found = bar === undefined ? doc.bar : bar;
  const v = positiveNumber(lengthUm);
  if (found === null) return refuse('scale', 'No scale bar was found in this image: type the pixel size, or draw a line along a known length with the scale-line tool.');
  if (v === null) return found ? { doc: { label: 'scale bar found', patch: { bar: found }, history: 'none' } } : refuse('scale', 'Type the length printed on the scale bar, in µm.');
  return docEdit('scale bar', { bar: found, scale: { source: 'scale-bar', barLengthUm: v } });
}

/** Use two image points a known distance apart (drawn with the scale-line tool). */
export function setTwoPointScale(p0: PointPx, p1: PointPx, distanceUm: number | null): Change {
  const v = positiveNumber(distanceUm);
  if (Math.hypot(p1.x - p0.x, p1.y - p0.y) < 2) return refuse('scale', 'The line is too short: drag along a known length.');
  if (v === null) return refuse('scale', 'Type the real length of the line in µm, then draw the line (or press “Use line”).');
  return docEdit('scale line', { scale: { source: 'two-point', p0: { ...p0 }, p1: { ...p1 }, distanceUm: v } });
}

/** Use the pixel size stored in the file. */
export function applyMetadataScale(doc: Doc): Change {
  if (!doc.image.metadataScale) return refuse('scale', 'This file holds no pixel size.');
  return docEdit('file pixel size', { scale: { source: 'metadata' } });
}

/** The net-section diameter from the specimen drawing, typed in mm (null: not known). */
export function setSectionDiameter(doc: Doc, mm: number | null): Change {
  if (mm !== null && positiveNumber(mm) === null) return refuse('scale', 'Type the section diameter as a positive number of mm (e.g. 5), or leave the field empty.');
  const um = mm === null ? null : Math.round(mm * 1e6) / 1e3;
  if (um === doc.sectionDiameterUm) return unchanged;
  return docEdit(um === null ? 'no section diameter' : 'section diameter', { sectionDiameterUm: um });
}
