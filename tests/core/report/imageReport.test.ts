/**
 * The single-image report and the overlay drawn from a result: what the page must show (inputs, L
 * with its interval or why it has none, ratio, verdict, every warning, the caution), what it must
 * not hold (script, external resources, a raw JSON dump), and that the overlay drawn from the
 * result matches the pipeline's own overlay of the same run.
 */
import { readFileSync } from 'node:fs';
import { beforeAll, describe, expect, it } from 'vitest';
import { renderFractograph } from '../../../src/core/render/index.js';
import { encodeGrayRaster } from '../../../src/core/encode/index.js';
import { decodeImage } from '../../../src/core/decode/index.js';
import { analyseDecoded, defaultParams, type Analysis, type MeasureParams } from '../../../src/core/pipeline/index.js';
import { parseMaterialSheet } from '../../../src/core/tcd/materials.js';
import { buildImageReportHtml } from '../../../src/core/report/imageReport.js';
import { resultOverlay } from '../../../src/core/report/resultOverlay.js';
import type { GrayRaster } from '../../../src/core/image/raster.js';

let raster: GrayRaster;
let bytes: Uint8Array;
const [fz7] = parseMaterialSheet(readFileSync('samples/materials.json', 'utf8'), 'materials.json');

function run(patch: Partial<MeasureParams>): Analysis {
  const p = { ...defaultParams(), bootstrap: 200, scale: { useMetadata: true, pixelSizeUm: 8.5 }, ...patch };
  return analyseDecoded(decodeImage(bytes), { file: 'invented-report.png', sha256: 'ab'.repeat(32) }, p);
}

beforeAll(() => {
  const r = renderFractograph({ seed: 5, widthPx: 900, heightPx: 700, umPerPx: 8.5, noiseSigma: 0.01 });
  bytes = encodeGrayRaster(r.raster, { format: 'png', bitDepth: 8 });
  raster = decodeImage(bytes).raster;
});

describe('single-image report', () => {
  it('shows inputs, L with its interval, ratio, verdict, every warning and the caution; no script, no JSON dump', () => {
    const { result } = run({ material: { material: fz7 } });
    const html = buildImageReportHtml({ result, overlayDataUrl: 'data:image/png;base64,AAAA', notes: ['a note from the app'] });
    expect(result.comparison).toBeDefined();
    expect(html).toContain(`data-verdict="${result.comparison!.verdict}"`);
    expect(html).toContain('L = (1/π)(K_c/σ₀)²');
    const iv = result.criticalDistance!.interval95_um!;
    expect(html).toMatch(new RegExp(`95 % interval of L</th><td class="n">${Number(iv[0].toPrecision(4))}–${Number(iv[1].toPrecision(4))}\u00a0µm`));
    const ki = result.comparison!.impliedToughness_MPa_sqrtm!.interval95_MPa_sqrtm!;
    expect(html).toContain(`95\u00a0% interval ${Number(ki[0].toPrecision(4))}–${Number(ki[1].toPrecision(4))}\u00a0MPa·√m`);
    for (const w of result.warnings) expect(html).toContain(w.message.replace(/"/g, '&quot;'));
    expect(html).toContain(`data-quality="${result.quality.verdict}"`);
    expect(html).toContain('invented demo data');
    expect(html).toContain('a note from the app');
    expect(html).toContain(result.caution.replace(/'/g, '&#39;').slice(0, 60));
    expect(html).toContain('<img src="data:image/png;base64,AAAA"');
    expect(html).not.toMatch(/<script|<link|(src|href)="https?:/);
    expect(html).not.toContain('"schema": "fractozone.result/1"');
    expect(html.length).toBeLessThan(120_000);
  });

  it('with L from a strain-rate law says why L has no interval', () => {
    const { result } = run({ material: { material: fz7 }, strainRatePerS: 1 });
    const html = buildImageReportHtml({ result, overlayDataUrl: null });
    expect(result.criticalDistance!.basis).toBe('strain-rate law for L');
    expect(html).toContain('L from the strain-rate law');
    expect(html).toContain('L has no interval: the law gives none');
    expect(html).toContain('rate law for L');
  });

  it('the headline names both intervals of the mean: the measurement interval of this specimen first, then the circumferential one', () => {
    const { result } = run({});
    const html = buildImageReportHtml({ result, overlayDataUrl: null });
    const head = html.slice(html.indexOf('Mean band width'), html.indexOf('rays).') + 6);
    const u = result.band.uncertainty!;
    const w = result.band.widthUm!;
    expect(u.measurementCi95Um[0]).not.toBe(w.ci95[0]);
    const m = head.indexOf('95\u00a0% measurement interval');
    const c = head.indexOf('95\u00a0% circumferential interval');
    expect(m).toBeGreaterThan(0);
    expect(c).toBeGreaterThan(m);
    expect(head).not.toMatch(/% CI /);
  });

  it('without a material says there is no comparison', () => {
    const { result } = run({});
    const html = buildImageReportHtml({ result, overlayDataUrl: null });
    expect(html).toContain('none given: no comparison with L');
    expect(html).not.toContain('data-verdict');
  });
});

describe('overlay drawn from a result', () => {
  it('matches the pipeline overlay of the same run (rays from the rounded profile: ≥ 99.5 % equal pixels)', () => {
    const { result, overlay } = run({});
    const mine = resultOverlay(raster, result);
    expect([mine.width, mine.height]).toEqual([overlay.width, overlay.height]);
    let same = 0;
    for (let i = 0; i < mine.data.length; i += 4) {
      if (mine.data[i] === overlay.data[i] && mine.data[i + 1] === overlay.data[i + 1] && mine.data[i + 2] === overlay.data[i + 2]) same++;
    }
    expect(same / (mine.data.length / 4)).toBeGreaterThan(0.995);
  });
});
