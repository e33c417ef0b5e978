import { describe, expect, it } from 'vitest';
import { makeResult } from '../../helpers/result.js';
import { escapeXml, histogramSvg, niceTicks, polarProfileSvg, seriesPlotSvg } from '../../../src/core/report/svg.js';
import { buildReportHtml, CAUTION_TEXT } from '../../../src/core/report/html.js';
import { analyseSeries } from '../../../src/core/report/series.js';

describe('svg plots', () => {
  it('nice ticks are 1-2-5 steps covering the range (Heckbert 1990)', () => {
    expect(niceTicks(0, 97, 5)).toEqual([0, 20, 40, 60, 80, 100]);
    expect(niceTicks(0.3, 0.82, 5)).toEqual([0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9]);
  });

  it('escapes markup in text', () => {
    expect(escapeXml(`<a href="x">&'`)).toBe('&lt;a href=&quot;x&quot;&gt;&amp;&#39;');
  });

  it('histogram has one bar per bin (Sturges: ⌈log2 n⌉ + 1) holding all values', () => {
    const svg = histogramSvg([1, 2, 2, 3, 3, 3, 4, 4]); // n = 8 → 4 bins
    const titles = [...svg.matchAll(/: (\d+) rays<\/title>/g)].map((m) => Number(m[1]));
    expect(titles.length).toBe(4);
    expect(titles.reduce((a, b) => a + b, 0)).toBe(8);
    expect(svg).toContain('band width (µm)');
  });

  it('polar profile follows the project angle convention: 90° is drawn above the centre', () => {
    const svg = polarProfileSvg(
      [
        { angleDeg: 90, widthUm: 100, valid: true },
        { angleDeg: 91, widthUm: 100, valid: true },
      ],
      { size: 200 },
    );
    const pts = /<polyline points="([^"]+)"/.exec(svg)![1].split(' ').map((p) => p.split(',').map(Number));
    expect(pts[0][0]).toBeCloseTo(100, 0); // x = centre
    expect(pts[0][1]).toBeLessThan(100); // y above the centre (screen y grows downwards)
  });

  it('series plot uses a log axis: decades are equally spaced', () => {
    const entries = [1e-2, 1, 100].map((r, i) => ({
      file: `f${i}`,
      safeName: `f${i}`,
      sha256: '',
      status: 'ok' as const,
      metadata: { notch: 'U' },
      strainRatePerS: r,
      material: null,
      overlay: null,
      result: makeResult({ meanUm: 100 + i, L_um: 90 }),
    }));
    const svg = seriesPlotSvg(analyseSeries(entries));
    const xs = [...svg.matchAll(/<circle class="series-point" cx="([\d.]+)"/g)].map((m) => Number(m[1]));
    expect(xs.length).toBe(3);
    expect(xs[1] - xs[0]).toBeCloseTo(xs[2] - xs[1], 1);
    expect(svg).toContain('log scale');
  });

  it('a series without strain rates is one line, not a blank plot of full height', () => {
    const svg = seriesPlotSvg(analyseSeries([]));
    expect(svg).toContain('no image with both a strain rate and a band width');
    expect(Number(/height="(\d+)"/.exec(svg)![1])).toBeLessThanOrEqual(40);
  });

  it('the HTML report holds the caution, one row per entry, no script and no external resource', () => {
    const html = buildReportHtml({
      entries: [
        { file: 'x<y>.png', safeName: 'x', sha256: 'ff', status: 'error', error: { code: 'NOT_AN_IMAGE', message: 'no' }, metadata: {}, strainRatePerS: null, material: null, overlay: null, result: null },
      ],
      series: analyseSeries([]),
      thumbnails: {},
      params: { nRays: 360 },
      toolVersion: '9.9.9',
    });
    expect(html).toContain(CAUTION_TEXT);
    expect(html.match(/class="image-row"/g)!.length).toBe(1);
    expect(html).toContain('x&lt;y&gt;.png');
    expect(html).not.toMatch(/<script|(src|href)="(https?:)?\/\/|url\(/i);
  });
});
