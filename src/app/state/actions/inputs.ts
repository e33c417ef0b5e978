/**
 * Analysis settings, material and strain rate. Settings and material belong to the series unless
 * the image has its own; an edit goes to whichever the image uses.
 */
import type { Material } from '../../../core/index.js';
import type { AnalysisSettings, Doc, MaterialForm, Series, TypedValue } from '../document.js';
import { docEdit, positiveNumber, refuse, seriesEdit, unchanged, type Change } from './types.js';

/** Checks a settings change; returns a sentence for the analysis panel when it is not valid. */
function settingsProblem(p: Partial<AnalysisSettings>): string | null {
  if (p.windowUm !== undefined && p.windowUm !== null && positiveNumber(p.windowUm) === null) return 'The texture window is a positive length in µm (leave it empty for the automatic window).';
  if (p.nRays !== undefined && !(Number.isInteger(p.nRays) && p.nRays >= 8 && p.nRays <= 36000)) return 'The number of rays is a whole number from 8 to 36000.';
  if (p.outlierK !== undefined && positiveNumber(p.outlierK) === null) return 'The outlier threshold k is a positive number (3.5 is usual).';
  if (p.features !== undefined && p.features.length === 0) return 'Choose at least one roughness feature.';
  return null;
}

/** Changes analysis settings (the image's own, or the series'). */
export function setSettings(doc: Doc, series: Series, p: Partial<AnalysisSettings>): Change {
  const problem = settingsProblem(p);
  if (problem) return refuse('analysis', problem);
  if (doc.settings) return docEdit('settings of this image', { settings: { ...doc.settings, ...p } });
  return seriesEdit('settings of all images', { settings: { ...series.settings, ...p } });
}

/** Gives the image its own settings (a copy of the series') or returns it to the series settings. */
export function ownSettings(doc: Doc, series: Series, own: boolean): Change {
  if (own === (doc.settings !== null)) return unchanged;
  return docEdit(own ? 'own settings' : 'settings of all images', { settings: own ? { ...series.settings } : null });
}

function typedProblem(v: TypedValue | null, what: string): string | null {
  if (v === null) return null;
  if (positiveNumber(v.value) === null) return `${what} is a positive number.`;
  if (v.sd !== null && !(Number.isFinite(v.sd) && v.sd >= 0)) return `The sd of ${what.toLowerCase()} is zero or positive.`;
  return null;
}

/** Checks a material change; a sentence for the material form when it is not valid. */
function materialFormProblem(p: Partial<MaterialForm>): string | null {
  if (p.toughness !== undefined) return typedProblem(p.toughness, 'The fracture toughness K_c');
  if (p.strength !== undefined) return typedProblem(p.strength, 'The inherent strength σ₀');
  if (p.rateLaw && p.rateLaw.A !== null && positiveNumber(p.rateLaw.A) === null) return 'A of the rate law is a positive length in µm.';
  if (p.rateLaw && p.rateLaw.B !== null && !Number.isFinite(p.rateLaw.B)) return 'B of the rate law is a number (often small and negative).';
  if (p.tolerancePct !== undefined && positiveNumber(p.tolerancePct) === null) return 'The tolerance is a positive percentage (20 is usual).';
  return null;
}

/** Changes material inputs (the image's own, or the series'). */
export function setMaterial(doc: Doc, series: Series, p: Partial<MaterialForm>, label = 'material'): Change {
  const problem = materialFormProblem(p);
  if (problem) return refuse('material', problem);
  if (doc.material) return docEdit(`${label} of this image`, { material: { ...doc.material, ...p } });
  return seriesEdit(`${label} of all images`, { material: { ...series.material, ...p } });
}

/** Gives the image its own material (a copy of the series') or returns it to the series material. */
export function ownMaterial(doc: Doc, series: Series, own: boolean): Change {
  if (own === (doc.material !== null)) return unchanged;
  return docEdit(own ? 'own material' : 'material of all images', { material: own ? { ...series.material } : null });
}

/** Materials read from a sheet: the first is chosen, typed values are cleared so the sheet's are used. */
export function readSheet(doc: Doc, series: Series, file: string, materials: Material[]): Change {
  if (materials.length === 0) return refuse('material', `${file} lists no material.`);
  return setMaterial(doc, series, { sheet: { file, materials, chosen: materials[0].name }, toughness: null, strength: null, rateLaw: null }, 'material sheet');
}

/** Chooses another material of the sheet. */
export function chooseSheetMaterial(doc: Doc, series: Series, form: MaterialForm, name: string): Change {
  if (!form.sheet || !form.sheet.materials.some((m) => m.name === name)) return refuse('material', `The sheet has no material named “${name}”.`);
  return setMaterial(doc, series, { sheet: { ...form.sheet, chosen: name } }, 'material');
}

/** The strain rate of this image's test (1/s), or null. */
export function setStrainRate(doc: Doc, v: number | null): Change {
  if (v !== null && positiveNumber(v) === null) return refuse('material', 'The strain rate is a positive number in 1/s (leave it empty for none).');
  if (v === doc.strainRatePerS) return unchanged;
  return docEdit('strain rate', { strainRatePerS: v });
}
