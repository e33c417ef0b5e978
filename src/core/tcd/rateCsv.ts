/**
 * (strain rate, value) pairs from CSV text, for fitting a strain-rate law.
 *
 * Format (our own): `#` comment lines; a two-column header naming units, the first column a strain
 * rate in 1/s (`strain_rate_1/s`, `rate [1/s]`), the second a length (`L_um`, `L [mm]`: fits L) or a
 * stress (`sigma0_MPa`: fits σ_0); separators comma, semicolon or tab; at least 2 data rows.
 */
import { FractozoneError } from '../errors.js';
import { unitFactor } from './quantities.js';

/** Parsed pairs in engine units: rate 1/s, value µm (length) or MPa (stress). */
export interface RatePairs {
  quantity: 'L' | 'sigma0';
  /** Engine unit of the values: 'um' or 'MPa'. */
  unit: 'um' | 'MPa';
  pairs: { rate: number; value: number }[];
}

function headerUnit(cell: string): string | undefined {
  const c = cell.trim().replace(/^"|"$/g, '');
  const m = /[[(]\s*([^\])]+?)\s*[\])]\s*$/.exec(c) ?? /_([^_\s]+)$/.exec(c) ?? /\s([^\s]+)$/.exec(c);
  return m ? m[1] : undefined;
}

/**
 * Parse a CSV of (strain rate, L or σ_0) pairs.
 * @param text file contents
 * @param fileName used in messages (`pairs.csv line 4: ...`)
 * @throws FractozoneError BAD_PARAMETER naming the line
 */
export function parseRatePairsCsv(text: string, fileName: string): RatePairs {
  const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/);
  let head: { q: RatePairs['quantity']; f: number } | undefined;
  const pairs: { rate: number; value: number }[] = [];
  const fail = (no: number, msg: string): never => {
    throw new FractozoneError('BAD_PARAMETER', `${fileName} line ${no}: ${msg}`);
  };
  for (let i = 0; i < lines.length; i++) {
    const raw = lines[i].trim();
    const no = i + 1;
    if (raw === '' || raw.startsWith('#')) continue;
    const sep = raw.includes('\t') ? '\t' : raw.includes(';') ? ';' : ',';
    const cells = raw.split(sep).map((c) => c.trim());
    if (cells.length !== 2) fail(no, `expected 2 columns (strain rate, value), found ${cells.length}`);
    if (!head) {
      const ru = (headerUnit(cells[0]) ?? '').replace(/\s+/g, '');
      if (!['1/s', 's^-1', 's-1', '/s'].includes(ru)) fail(no, `strain-rate column "${cells[0]}" must name the unit 1/s (e.g. strain_rate_1/s)`);
      const vu = headerUnit(cells[1]);
      const fl = vu !== undefined ? unitFactor(vu, 'distance') : undefined;
      const fs = vu !== undefined ? unitFactor(vu, 'stress') : undefined;
      if (fl === undefined && fs === undefined) fail(no, `value column "${cells[1]}" must name a length unit (um, mm, m) or a stress unit (MPa, GPa, ksi)`);
      head = fl !== undefined ? { q: 'L', f: fl * 1e6 } : { q: 'sigma0', f: fs as number };
      continue;
    }
    const num = (c: string, what: string): number => {
      if (c === '') fail(no, `${what} is empty`);
      const v = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/.test(c) ? Number(c) : NaN;
      if (!Number.isFinite(v)) fail(no, `${what} "${c}" is not a number`);
      if (v <= 0) fail(no, `${what} ${c} must be positive (a log–log fit needs positive values)`);
      return v;
    };
    pairs.push({ rate: num(cells[0], 'strain rate'), value: num(cells[1], head.q === 'L' ? 'L' : 'σ_0') * head.f });
  }
  if (!head) throw new FractozoneError('BAD_PARAMETER', `${fileName}: no header line (e.g. strain_rate_1/s,L_um)`);
  if (pairs.length < 2) throw new FractozoneError('BAD_PARAMETER', `${fileName}: needs at least 2 data rows to fit a power law, found ${pairs.length}`);
  return { quantity: head.q, unit: head.q === 'L' ? 'um' : 'MPa', pairs };
}
