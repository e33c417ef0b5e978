/**
 * Stress–distance curves from CSV text (e.g. a path exported from a finite-element model).
 *
 * Format (our own, documented in DEVELOPERS.md):
 * - Lines starting with `#` are comments. Two comment lines carry metadata:
 *   `# analysis: linear-elastic` or `# analysis: elastoplastic`, and
 *   `# reference load: 10kN` (or `250MPa`, a nominal stress) — the load at which the stresses were
 *   computed, used to scale the curve to "stress per unit load".
 * - The first other line is the header, two columns, each naming its unit:
 *   `distance_mm,stress_MPa`, `r [um], sigma [MPa]`, `x (m); s (GPa)`. Distance units mm, um/µm, m, in;
 *   stress units MPa, GPa, kPa, Pa, ksi, psi. Separators: comma, semicolon or tab.
 * - Then at least 3 data rows, distance strictly increasing, no empty or non-numeric cells.
 */
import { FractozoneError } from '../errors.js';
import { type Load, parseLoad, unitFactor } from './quantities.js';
import { type AnalysisKind, type StressCurve, tabulatedCurve } from './stressCurve.js';

/** A parsed curve file. */
export interface ParsedCurve {
  /** The curve (distance m → stress MPa, as written in the file, not yet scaled by a load). */
  curve: StressCurve;
  /** Distances (m) and stresses (MPa) as read. */
  r_m: number[];
  sigma_MPa: number[];
  /** Analysis kind from `# analysis:` (default linear-elastic). */
  analysis: AnalysisKind;
  /** Whether `# analysis:` was present. */
  analysisStated: boolean;
  /** Load at which the stresses were computed, from `# reference load:`, if present. */
  referenceLoad?: Load;
  /** Units written in the header. */
  distanceUnit: string;
  stressUnit: string;
}

function splitCells(line: string): string[] {
  const sep = line.includes('\t') ? '\t' : line.includes(';') ? ';' : ',';
  return line.split(sep).map((c) => c.trim());
}

/** Extract the unit of a header cell: `distance_mm`, `r [um]`, `r (mm)`, `r mm`. */
function headerUnit(cell: string): string | undefined {
  const c = cell.trim().replace(/^"|"$/g, '');
  let m = /[[(]\s*([^\])]+?)\s*[\])]\s*$/.exec(c);
  if (m) return m[1];
  m = /_([^_\s]+)$/.exec(c);
  if (m) return m[1];
  m = /\s([^\s]+)$/.exec(c);
  if (m) return m[1];
  return undefined;
}

/**
 * Parse a stress–distance curve from CSV text.
 * @param text the file contents
 * @param fileName name used in every message, e.g. "curve.csv"
 * @returns the parsed curve with its metadata
 * @throws FractozoneError BAD_CURVE naming the file and line, e.g.
 *   `curve.csv line 7: stress "abc" is not a number`
 */
export function parseCurveCsv(text: string, fileName: string): ParsedCurve {
  const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/);
  let analysis: AnalysisKind = 'linear-elastic';
  let analysisStated = false;
  let referenceLoad: Load | undefined;
  let header: { dist: number; stress: number; line: number; du: string; su: string } | undefined;
  const r: number[] = [];
  const s: number[] = [];
  const fail = (line: number, msg: string): never => {
    throw new FractozoneError('BAD_CURVE', `${fileName} line ${line}: ${msg}`);
  };
  for (let i = 0; i < lines.length; i++) {
    const no = i + 1;
    const raw = lines[i].trim();
    if (raw === '') continue;
    if (raw.startsWith('#')) {
      const meta = /^#\s*([a-zA-Z ]+?)\s*[:=]\s*(.+?)\s*$/.exec(raw);
      if (meta) {
        const key = meta[1].toLowerCase();
        if (key === 'analysis') {
          const v = meta[2].toLowerCase().replace(/[\s_]+/g, '-');
          if (v === 'linear-elastic' || v === 'elastic' || v === 'linear') analysis = 'linear-elastic';
          else if (v === 'elastoplastic' || v === 'elasto-plastic' || v === 'elastic-plastic') analysis = 'elastoplastic';
          else fail(no, `analysis "${meta[2]}" is neither linear-elastic nor elastoplastic`);
          analysisStated = true;
        } else if (key === 'reference load') {
          try {
            referenceLoad = parseLoad(meta[2], 'reference load');
          } catch (e) {
            fail(no, (e as Error).message);
          }
        }
      }
      continue;
    }
    const cells = splitCells(raw);
    if (!header) {
      if (cells.length !== 2) fail(no, `the header must have 2 columns (distance, stress), found ${cells.length}`);
      const du = headerUnit(cells[0]);
      const su = headerUnit(cells[1]);
      if (du === undefined || unitFactor(du, 'distance') === undefined) {
        fail(no, `distance column "${cells[0]}" has ${du === undefined ? 'no' : `an unknown unit "${du}"; use`} unit (e.g. distance_mm, r [um]; mm, um/µm, m or in)`);
      }
      if (su === undefined || unitFactor(su, 'stress') === undefined) {
        fail(no, `stress column "${cells[1]}" has ${su === undefined ? 'no' : `an unknown unit "${su}"; use`} unit (e.g. stress_MPa, sigma [MPa]; MPa, GPa, Pa or ksi)`);
      }
      header = { dist: unitFactor(du as string, 'distance') as number, stress: unitFactor(su as string, 'stress') as number, line: no, du: du as string, su: su as string };
      continue;
    }
    if (cells.length !== 2) fail(no, `expected 2 cells (distance, stress), found ${cells.length}`);
    const num = (cell: string, what: string): number => {
      if (cell === '') fail(no, `${what} is empty`);
      const v = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/.test(cell) ? Number(cell) : NaN;
      if (!Number.isFinite(v)) fail(no, `${what} "${cell}" is not a number`);
      return v;
    };
    const d = num(cells[0], 'distance') * header.dist;
    const st = num(cells[1], 'stress') * header.stress;
    if (d < 0) fail(no, `distance ${cells[0]} is negative; distances are measured from the notch root`);
    if (r.length > 0 && !(d > r[r.length - 1])) fail(no, `distance ${cells[0]} does not increase (distances must increase strictly)`);
    r.push(d);
    s.push(st);
  }
  if (!header) throw new FractozoneError('BAD_CURVE', `${fileName}: no header line (e.g. distance_mm,stress_MPa) and no data`);
  if (r.length < 3) {
    throw new FractozoneError(
      'BAD_CURVE',
      `${fileName}: needs at least 3 data points, found ${r.length}; fewer cannot describe the stress gradient ahead of the notch`,
    );
  }
  const curve = tabulatedCurve(r, s, fileName, analysis);
  return { curve, r_m: r, sigma_MPa: s, analysis, analysisStated, referenceLoad, distanceUnit: header.du, stressUnit: header.su };
}
