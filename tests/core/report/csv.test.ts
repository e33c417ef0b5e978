import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { RESULT_COLUMNS, entryRow, metadataColumns, parseCsv, toCsv, toJsonLines, type BatchEntry } from '../../../src/core/report/csv.js';
import { makeResult } from '../../helpers/result.js';

function measured(): BatchEntry['result'] {
  const r = makeResult({ meanUm: 101.25, ci95: [99.1, 103.4], umPerPx: 2.5, L_um: 95.5, ratio: 1.0602, verdict: 'agrees' });
  r.specimen.radiusUm = 2500;
  r.band.separability = { fisher: 3.2, overlap: 0.05, eta: 0.8, coreFraction: 0.6, rimFraction: 0.4 };
  Object.assign(r.band.widthUm!, { n: 300, median: 100, sd: 7.5 });
  r.criticalDistance!.interval95_um = [80, 111];
  return r;
}

function entry(over: Partial<BatchEntry> = {}): BatchEntry {
  return {
    file: 'a/b.png',
    safeName: 'a__b.png',
    sha256: 'ab'.repeat(32),
    status: 'ok',
    metadata: { specimen_id: 'S1', notch: 'U', operator: 'Doe, J.' },
    strainRatePerS: 0.001,
    material: 'QV-3 (invented alloy)',
    overlay: 'overlays/a__b.png',
    result: measured(),
    ...over,
  };
}

describe('results table rows', () => {
  it('maps the result fields to the unit-carrying columns', () => {
    const r = entryRow(entry());
    expect(r).toMatchObject({
      file: 'a/b.png',
      status: 'ok',
      um_per_px: 2.5,
      scale_source: 'typed',
      width_mean_um: 101.25,
      width_median_um: 100,
      width_sd_um: 7.5,
      width_ci95_lo_um: 99.1,
      width_ci95_hi_um: 103.4,
      radius_um: 2500,
      separability_fisher: 3.2,
      separability_overlap: 0.05,
      L_um: 95.5,
      L_lo95_um: 80,
      ratio: 1.0602,
      verdict: 'agrees',
      specimen_id: 'S1',
      notch: 'U',
      meta_operator: 'Doe, J.',
    });
  });

  it('carries the quality verdict and the warning codes (separated by ;)', () => {
    const e = entry();
    e.result!.warnings = [{ code: 'SPECIMEN_CUT_BY_FRAME', message: 'cut' }, { code: 'INVENTED_MATERIAL', message: 'demo' }];
    e.result!.quality = { verdict: 'check', reasons: [e.result!.warnings[0]] };
    expect(entryRow(e)).toMatchObject({ quality: 'check', warning_codes: 'SPECIMEN_CUT_BY_FRAME;INVENTED_MATERIAL' });
    expect(entryRow(entry())).toMatchObject({ quality: 'ok', warning_codes: '' });
    expect(entryRow(entry({ status: 'error', result: null }))).toMatchObject({ quality: null, warning_codes: null });
    expect(RESULT_COLUMNS.slice(0, 5)).toEqual(['file', 'sha256', 'status', 'quality', 'warning_codes']);
  });

  it('leaves width columns empty for no-band and error rows, and carries the error', () => {
    const noBand = makeResult({ meanUm: null });
    noBand.band.reason = 'no band found';
    const nb = entryRow(entry({ status: 'no-band', result: noBand }));
    expect(nb.width_mean_um).toBeNull();
    expect(nb.error_message).toBe('no band found');
    const er = entryRow(entry({ status: 'error', error: { code: 'CORRUPT_IMAGE', message: 'damaged' }, result: null }));
    expect(er).toMatchObject({ error_code: 'CORRUPT_IMAGE', error_message: 'damaged', width_mean_um: null, L_um: null });
  });

  it('lists extra metadata columns once, sorted, without the known ones', () => {
    const cols = metadataColumns([entry(), entry({ metadata: { zeta: '1', alpha: '2', notch: 'V' } })]);
    expect(cols).toEqual(['meta_alpha', 'meta_operator', 'meta_zeta']);
  });
});

describe('RFC 4180 CSV (RFC 4180 §2 rules, checked with papaparse as an independent reader)', () => {
  const cols = ['a', 'b', 'c'];
  const rows = [
    { a: 'plain', b: 1.5, c: null },
    { a: 'comma, inside', b: 'quote " inside', c: 'line\nbreak' },
    { a: '', b: -0.000123, c: 'crlf\r\nend' },
  ];
  it('writes CRLF lines and quotes only what needs it', () => {
    const text = toCsv(cols, rows);
    expect(text).toBe('a,b,c\r\nplain,1.5,\r\n"comma, inside","quote "" inside","line\nbreak"\r\n,-0.000123,"crlf\r\nend"\r\n');
  });
  it('papaparse reads back exactly what was written', () => {
    const parsed = Papa.parse<string[]>(toCsv(cols, rows), { skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.data).toEqual([cols, ['plain', '1.5', ''], ['comma, inside', 'quote " inside', 'line\nbreak'], ['', '-0.000123', 'crlf\r\nend']]);
  });
  it('parseCsv agrees with papaparse and records starting line numbers', () => {
    const text = '\ufefffile,x\na.png,"1,5"\n\n"multi\nline",2\nlast,"q""q"';
    const mine = parseCsv(text);
    const theirs = Papa.parse<string[]>(text.slice(1), { skipEmptyLines: true }).data;
    expect(mine.map((r) => r.fields)).toEqual(theirs);
    expect(mine.map((r) => r.line)).toEqual([1, 2, 4, 6]);
    // CRLF files give the same records (papaparse detects the line end per file)
    const crlf = text.replace(/\n/g, '\r\n');
    expect(parseCsv(crlf).map((r) => r.fields)).toEqual(Papa.parse<string[]>(crlf.slice(1), { skipEmptyLines: true }).data.map((f) => f.map((c) => c.replace(/\r\n/g, '\r\n'))));
  });
  it('parseCsv names the line of an unclosed quote', () => {
    expect(() => parseCsv('a,b\n1,"open\n2,3\n')).toThrow(/line 2/);
  });
  it('JSON Lines has the same keys in column order, numbers typed, null for empty', () => {
    const lines = toJsonLines(cols, rows).trim().split('\n').map((l) => JSON.parse(l));
    expect(Object.keys(lines[0])).toEqual(cols);
    expect(lines[0]).toEqual({ a: 'plain', b: 1.5, c: null });
    // every length column names its unit
    for (const c of ['width_mean_um', 'width_median_um', 'width_sd_um', 'width_ci95_lo_um', 'width_ci95_hi_um', 'radius_um', 'L_um', 'L_lo95_um', 'L_hi95_um', 'um_per_px', 'strain_rate_per_s']) {
      expect(RESULT_COLUMNS as readonly string[]).toContain(c);
    }
  });
});
