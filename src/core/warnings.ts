/**
 * The one registry of warning codes. Every warning core gives (in a result, a critical-distance
 * estimate or a fit) is `{ code, message }`: a stable UPPER_SNAKE code that scripts and views can
 * match on, and one plain sentence with the figures of the case. Each code has a severity, which
 * the quality verdict of a result is made from (pipeline/quality.ts):
 *
 * - `info`: worth knowing, the numbers are as good as without it (demo material, a rate law used);
 * - `check`: a person should look at the image and the overlay before using the numbers;
 * - `unreliable`: the numbers are likely wrong or meaningless as they stand.
 *
 * A new warning: add its code here with severity and description (the README table lists them
 * all; a test keeps the two equal), then give it with `warn(code, message)`.
 */

/** How much a warning weighs on the result (see the module comment). */
export type Severity = 'info' | 'check' | 'unreliable';

/** A registry entry: severity and a one-line description for the documentation. */
export interface WarningDefinition {
  severity: Severity;
  description: string;
}

/** Every warning code, with its severity and description. */
export const WARNINGS = {
  // calibration
  SCALE_BAR_NOT_FOUND: { severity: 'check', description: 'a scale-bar length was given but no bar was found; the pixel size from the file metadata was used' },
  NON_SQUARE_PIXELS: { severity: 'info', description: 'the pixels are not square; widths are converted per ray direction' },
  // specimen
  SPECIMEN_CUT_BY_FRAME: { severity: 'check', description: 'the specimen is cut by the image frame; rays reaching the frame are not measured' },
  SCALE_MARK_ON_OUTLINE: { severity: 'check', description: 'the scale bar or its plate touches the specimen outline; rays ending there are not measured' },
  OUTLINE_FROM_SILHOUETTE: { severity: 'check', description: 'no closed edge was found around the rough core; the outline is the silhouette of the part, which may include a notch flank or a shadow' },
  OUTLINE_AMBIGUOUS: { severity: 'check', description: 'two or more closed edges could bound the fracture surface and the cues do not single one out; the outline may be the wrong one (the candidates are listed in specimen.edgeSearch)' },
  OUTLINE_INNER_ROUND_EDGE: { severity: 'check', description: 'a strong round edge lies inside the outline taken; if it is the notch root, the band width is too large' },
  SECTION_DIAMETER_NOT_FOUND: { severity: 'check', description: 'no closed edge lies within 12 % of the given section diameter; the outline was chosen without it' },
  SECTION_DIAMETER_MISMATCH: { severity: 'check', description: 'the measured diameter of the fracture surface differs from the given section diameter by more than 3 %: check the pixel size' },
  HALVES_DISAGREE: { severity: 'check', description: 'both halves were measured and their mean band widths differ by more than 10 % of their average' },
  OTHER_SPECIMEN_UNSURE: { severity: 'check', description: 'another specimen in the frame (e.g. half B) has a quality verdict other than ok: the comparison of the halves is uncertain' },
  SEVERAL_SPECIMENS: { severity: 'info', description: 'more than two specimens were found in the frame: each is measured, the halves are not compared' },
  SPECIMEN_SKIPPED: { severity: 'check', description: 'a specimen found in the frame could not be outlined and is not measured' },
  OUTLINE_CORRECTED: { severity: 'info', description: 'the specimen outline was corrected by hand; centre, radius, ellipse and area are fitted to the corrected outline' },
  // rim/core classification
  WEAK_TEXTURE_CONTRAST: { severity: 'check', description: 'rim and core textures differ weakly (Fisher ratio below 4)' },
  TEXTURE_OVERLAP: { severity: 'check', description: 'the rim and core texture histograms overlap by more than 0.2' },
  BAND_MISSING_IN_PLACES: { severity: 'check', description: 'the rough core comes within about one texture window of the outer edge on more than 20 % of the circumference' },
  GLINTS_SUPPRESSED: { severity: 'info', description: 'bright specks (glints) on the specimen were replaced by their surroundings before the texture was measured' },
  SCAN_LINES_REMOVED: { severity: 'info', description: 'scan-line noise (each line of an SEM scan offset by its own amount) was found and the line offsets were removed before the texture was measured' },
  TONE_BOUNDARY_USED: { severity: 'check', description: 'the texture contrast was weak and the rim/core boundary follows the brightness step instead (rim brighter than core, as under a ring light or other light from high above); check it on the overlay' },
  FINER_WINDOW_USED: { severity: 'info', description: 'the band was narrow for the texture window (or did not separate with it) and was found again with a window half as large; the result reports that window' },
  // pixel classifier (measure --model; learn/segment.ts)
  LOW_MODEL_CONFIDENCE: { severity: 'check', description: 'the pixel classifier is unsure along the boundary or the outer edge it gives (mean class probability beside it below 0.75): the model may not fit this image' },
  // result-level rules (pipeline/quality.ts)
  NO_BAND_FOUND: { severity: 'check', description: 'no smooth rim band was found; check that there is none' },
  LOW_SCALE_BAR_CONFIDENCE: { severity: 'check', description: 'the scale comes from a detected scale bar with a confidence below 0.75' },
  FEW_VALID_RAYS: { severity: 'check', description: 'only 25–50 % of the rays gave a width' },
  VERY_FEW_VALID_RAYS: { severity: 'unreliable', description: 'fewer than 25 % of the rays gave a width: the mean describes a small part of the circumference' },
  WIDE_WIDTH_INTERVAL: { severity: 'check', description: 'the 95 % circumferential interval of the mean width is wider than 30 % of the mean' },
  MANY_OUTLIER_RAYS: { severity: 'check', description: 'more than 10 % of the measured rays are outliers' },
  WIDTH_SPREAD_INFLATED: { severity: 'info', description: 'the rays\' own placement scatter is at least half the SD of width: the SD, p05/p95 and min/max overstate how much the band varies around the circumference (the mean and its intervals allow for the scatter)' },
  // critical distance
  INVENTED_MATERIAL: { severity: 'info', description: 'the material is invented demo data' },
  L_FROM_RATE_LAW: { severity: 'info', description: 'L comes from the material\'s strain-rate law; the static toughness is not used' },
  SIGMA0_FROM_RATE_LAW: { severity: 'info', description: 'σ_0 comes from its strain-rate law, with the static fracture toughness' },
  RATE_EXTRAPOLATED: { severity: 'check', description: 'the strain rate lies outside the range of the rate law (extrapolated)' },
  // fits (fit-notches, fit-rate)
  CURVES_CROSS_MORE_THAN_ONCE: { severity: 'check', description: 'the two stress curves at failure cross more than once; the smallest L was taken' },
  FIT_AT_RANGE_EDGE: { severity: 'unreliable', description: 'the best L lies at the edge of the search range' },
  ELASTOPLASTIC_SCALED_LINEARLY: { severity: 'check', description: 'an elastoplastic stress curve was scaled linearly with the load' },
  RATE_FIT_TWO_POINTS: { severity: 'info', description: 'a rate law through two points: no standard errors or interval' },
} as const satisfies Record<string, WarningDefinition>;

/** A registered warning code. */
export type WarningCode = keyof typeof WARNINGS;

/** Every code, in registry order. */
export const WARNING_CODES = Object.keys(WARNINGS) as WarningCode[];

/** A warning as results and outputs carry it. */
export interface Warning {
  code: WarningCode;
  message: string;
}

/** A warning with its code (the message gives the figures of the case). */
export function warn(code: WarningCode, message: string): Warning {
  return { code, message };
}

/** The severity of a code; a code this version does not know (a newer file) counts as `check`. */
export function severityOf(code: WarningCode): Severity {
  return Object.prototype.hasOwnProperty.call(WARNINGS, code) ? WARNINGS[code].severity : 'check';
}

/** `list` followed by the warnings of `more` that it does not hold yet (same code and message). */
export function mergeWarnings(list: readonly Warning[], more: readonly Warning[]): Warning[] {
  const out = [...list];
  for (const w of more) if (!out.some((o) => o.code === w.code && o.message === w.message)) out.push(w);
  return out;
}
