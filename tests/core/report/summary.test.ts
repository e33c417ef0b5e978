/**
 * The summary figures (src/core/report/summary.ts) and the views built on them: the overlay label
 * and the batch report's summary row. Results are literal (tests/helpers/result.ts).
 */
import { describe, expect, it } from 'vitest';
import { overlayLabel } from '../../../src/core/pipeline/overlay.js';
import { formatFigure, formatValue, summarise } from '../../../src/core/report/summary.js';
import { buildReportHtml } from '../../../src/core/report/html.js';
import { analyseSeries } from '../../../src/core/report/series.js';
import type { BatchEntry } from '../../../src/core/report/csv.js';
import { makeResult } from '../../helpers/result.js';
import type { MeasureResult } from '../../../src/core/pipeline/result.js';

describe('summarise', () => {
  it('labels every figure and gives it its unit', () => {
    const s = summarise(makeResult({ meanUm: 577.25, ci95: [533.1, 621.3], umPerPx: 4.5, L_um: 554.5, ratio: 1.041 }));
    expect(s.scale.umPerPx).toEqual({ label: 'pixel size', value: 4.5, unit: 'µm/px' });
    expect(s.band.detected).toBe(true);
    if (!s.band.detected) return;
    expect(s.band.mean).toEqual({ label: 'mean width', value: 577.25, unit: 'µm' });
    expect(s.band.ci95).toEqual({ label: '95 % circumferential interval', lo: 533.1, hi: 621.3, unit: 'µm' });
    expect(s.criticalDistance?.L).toEqual({ label: 'L', value: 554.5, unit: 'µm' });
    expect(s.comparison?.ratio).toEqual({ label: 'width / L', value: 1.041, unit: '' });
    expect(s.separability?.fisher.unit).toBe('');
  });

  it('the implied toughness comes with its 95 % interval when the result has one (the app, the CLI text and the report show it)', () => {
    const r = makeResult({ meanUm: 577.25, L_um: 554.5, ratio: 1.041 });
    expect(summarise(r).comparison?.impliedToughnessInterval95).toBeNull();
    r.comparison!.impliedToughness_MPa_sqrtm = { K_MPa_sqrtm: 48.95, interval95_MPa_sqrtm: [45.32, 52.88], L_um: 577.25 };
    const c = summarise(r).comparison!;
    expect(c.impliedToughness).toEqual({ label: 'implied K', value: 48.95, unit: 'MPa·√m' });
    expect(c.impliedToughnessInterval95).toEqual({ label: '95 % interval of the implied K', lo: 45.32, hi: 52.88, unit: 'MPa·√m' });
  });

  it('a missing band gives its reason and no width figures; non-finite numbers become "not available"', () => {
    const r = makeResult({ meanUm: null });
    r.band.reason = 'no smooth rim: the rough core fills the section';
    const s = summarise(r);
    expect(s.band).toEqual({ detected: false, reason: 'no smooth rim: the rough core fills the section' });
    const m = makeResult({ meanUm: 100 });
    m.band.widthUm!.medianCi95 = [NaN, NaN]; // no bootstrap
    const sm = summarise(m);
    expect(sm.band.detected && sm.band.medianCi95).toMatchObject({ lo: null, hi: null });
  });

  it('formats a figure with its unit, and "—" when it is not available', () => {
    expect(formatFigure({ label: 'x', value: 577.25, unit: 'µm' }, 1)).toBe('577.3 µm');
    expect(formatFigure({ label: 'x', value: 1.0412, unit: '' }, 2)).toBe('1.04');
    expect(formatFigure({ label: 'x', value: null, unit: 'µm' }, 1)).toBe('—');
    expect(formatValue(NaN, 1)).toBe('—');
  });
});

describe('views built on the summary', () => {
  it('the overlay label shows the file, the mean width with its CI, the pixel size and the verdict', () => {
    const label = overlayLabel(summarise(makeResult({ file: 'a.png', meanUm: 577.25, ci95: [533.1, 621.3], umPerPx: 4.5, L_um: 554.5, ratio: 1.041, verdict: 'agrees' })));
    expect(label).toEqual([
      'a.png',
      'quality: ok',
      'band width mean 577.3 µm',
      '95% circumferential interval 533.1-621.3 µm',
      'median 577.3 µm, sd 5.0 µm, n = 360 rays',
      'pixel 4.500 µm (typed)',
      'w/L = 1.04: agrees',
    ]);
    const none = makeResult({ file: 'b.png', meanUm: null });
    none.band.reason = 'no smooth rim';
    none.quality = { verdict: 'check', reasons: [{ code: 'NO_BAND_FOUND', message: 'no band' }] };
    expect(overlayLabel(summarise(none))).toEqual(['b.png', 'quality: check (NO_BAND_FOUND)', 'no smooth rim band: no smooth rim', 'pixel 2.500 µm (typed)']);
  });

  it('the overlay label gives the measurement interval first, then the circumferential interval, each by its name', () => {
    const r = makeResult({ file: 'u.png', meanUm: 577.25, ci95: [533.1, 621.3], umPerPx: 4.5 });
    const src = { sdUm: 1, sharePct: 50 };
    r.band.uncertainty = {
      measurementCi95Um: [560.04, 594.46],
      circumferentialCi95Um: [533.1, 621.3],
      parameterRangeUm: null,
      parameterRangeNote: 'none',
      variations: [],
      budget: { boundary: src, outerEdge: src, scale: src } as NonNullable<typeof r.band.uncertainty>['budget'],
    };
    const label = overlayLabel(summarise(r));
    expect(label.slice(2, 5)).toEqual([
      'band width mean 577.3 µm',
      '95% measurement interval 560.0-594.5 µm',
      '95% circumferential interval 533.1-621.3 µm',
    ]);
  });

  it('the batch report summary row shows the same figures (4 significant digits, units)', () => {
    const entry: BatchEntry = {
      file: 'a.png', safeName: 'a', sha256: 'ff', status: 'ok', metadata: {}, strainRatePerS: null, material: null, overlay: null,
      result: makeResult({ meanUm: 577.25, ci95: [533.1, 621.3], umPerPx: 4.5, L_um: 554.5, ratio: 1.041 }),
    };
    const html = buildReportHtml({ entries: [entry], series: analyseSeries([entry]), thumbnails: {}, params: {}, toolVersion: 't' });
    const row = /<tr class="image-row">(.*?)<\/tr>/.exec(html)![1];
    expect(row).toContain('577.3\u00a0µm'); // 577.25 (exact in binary) to 4 significant digits
    expect(row).toContain('533.1–621.3\u00a0µm');
    expect(row).toContain('4.5\u00a0µm/px');
    expect(row).toContain('554.5\u00a0µm');
    expect(row).toContain('1.041 <span class="muted">(0.9889–1.093)</span>'); // with the interval its verdict used
    expect(row).toContain('<td class="quality-ok">ok</td>');
  });

  it('the batch report shows the quality verdict of each image, its reasons by code, and the warnings with codes', () => {
    const r = makeResult({ file: 'b.png', meanUm: 100 });
    r.warnings = [{ code: 'WIDE_WIDTH_INTERVAL', message: 'the 95 % CI spans 40 %' }, { code: 'INVENTED_MATERIAL', message: 'demo' }];
    r.quality = { verdict: 'check', reasons: [r.warnings[0]] };
    const entry: BatchEntry = { file: 'b.png', safeName: 'b', sha256: 'ff', status: 'ok', metadata: {}, strainRatePerS: null, material: null, overlay: null, result: r };
    const html = buildReportHtml({ entries: [entry], series: analyseSeries([entry]), thumbnails: {}, params: {}, toolVersion: 't' });
    expect(html).toContain('<td class="quality-check" title="WIDE_WIDTH_INTERVAL">check</td>');
    expect(html).toContain('quality: check: look at the image and the overlay before using the numbers');
    expect(html).toContain('the 95 % CI spans 40 % <code>WIDE_WIDTH_INTERVAL</code>');
  });

  it('a result without a verdict (an older or partial file) is never shown as ok', () => {
    const r = makeResult({ meanUm: 100 }) as Partial<MeasureResult>;
    delete r.quality;
    expect(summarise(r as MeasureResult).quality.verdict).toBe('check');
  });
});
