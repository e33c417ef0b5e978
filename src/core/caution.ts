/**
 * The engineering caution carried by every result file, report, summary and view. Defined once
 * here; every shell and report imports it.
 */
export const CAUTION =
  'Measurements and critical-distance estimates from this tool support, and do not replace, the judgement of a qualified engineer. ' +
  "Structural assessment must follow the applicable codes, standards and the responsible organisation's procedures.";
