/**
 * The warning registry (src/core/warnings.ts) and the quality stage (pipeline/stages/quality.ts):
 * verdict = worst severity of the warnings; the result-level rules; and, end to end on synthetic
 * discs (truth from the disc geometry), that a doubtful band is not reported as ok and that a
 * re-measure re-makes the rules' warnings.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import type { DecodedImage } from '../../../src/core/decode/index.js';
import { analyseDecoded, defaultParams, remeasure, type MeasureResult } from '../../../src/core/pipeline/index.js';
import { assessQuality, QUALITY_RULES, ruleWarnings } from '../../../src/core/pipeline/stages/quality.js';
import { severityOf, warn, WARNING_CODES, WARNINGS } from '../../../src/core/warnings.js';
import { makeDiscImage } from '../../helpers/discImages.js';
import { makeResult } from '../../helpers/result.js';
import { expectSameResult } from '../../helpers/sameResult.js';
import type { LocalisationBudget } from '../../../src/core/pipeline/result.js';

function decoded(img: ReturnType<typeof makeDiscImage>): DecodedImage {
  const { raster } = img;
  return { format: 'png', widthPx: raster.width, heightPx: raster.height, bitDepth: 8, channels: 1, colorType: 'gray', pageCount: 1, raster, metadataScale: null };
}

function analyse(img: ReturnType<typeof makeDiscImage>): MeasureResult {
  const p = defaultParams();
  p.scale.pixelSizeUm = 2;
  p.bootstrap = 100;
  return analyseDecoded(decoded(img), { file: 'disc.png', sha256: 'test' }, p).result;
}

describe('warning registry', () => {
  it('every code is UPPER_SNAKE with a severity and a description', () => {
    expect(WARNING_CODES.length).toBeGreaterThan(10);
    for (const c of WARNING_CODES) {
      expect(c).toMatch(/^[A-Z][A-Z0-9]*(_[A-Z0-9]+)*$/);
      expect(['info', 'check', 'unreliable']).toContain(WARNINGS[c].severity);
      expect(WARNINGS[c].description.length).toBeGreaterThan(10);
    }
    expect(severityOf('NOT_A_CODE' as 'NO_BAND_FOUND')).toBe('check'); // a newer file's code is not taken as harmless
  });

  it('the README table lists every code with its severity, and nothing else', () => {
    const readme = readFileSync(fileURLToPath(new URL('../../../README.md', import.meta.url)), 'utf8');
    const rows = [...readme.matchAll(/^\| `([A-Z0-9_]+)` \| (info|check|unreliable) \|/gm)].map((m) => [m[1], m[2]]);
    expect(Object.fromEntries(rows)).toEqual(Object.fromEntries(WARNING_CODES.map((c) => [c, WARNINGS[c].severity])));
    expect(rows.length).toBe(WARNING_CODES.length);
  });
});

describe('quality verdict', () => {
  it('is the worst severity of the warnings; info warnings give ok and are not reasons', () => {
    expect(assessQuality([])).toEqual({ verdict: 'ok', reasons: [] });
    const info = warn('INVENTED_MATERIAL', 'demo');
    const check = warn('SPECIMEN_CUT_BY_FRAME', 'cut');
    const bad = warn('VERY_FEW_VALID_RAYS', 'few');
    expect(assessQuality([info])).toEqual({ verdict: 'ok', reasons: [] });
    expect(assessQuality([info, check])).toEqual({ verdict: 'check', reasons: [check] });
    expect(assessQuality([check, info, bad])).toEqual({ verdict: 'unreliable', reasons: [check, bad] });
  });

  it('the rules fire on the figures they name and stay quiet otherwise', () => {
    const codes = (r: MeasureResult): string[] => ruleWarnings(r).map((w) => w.code);
    expect(codes(makeResult({ meanUm: 100 }))).toEqual([]);
    expect(codes(makeResult({ meanUm: null }))).toEqual(['NO_BAND_FOUND']);
    const wide = makeResult({ meanUm: 100, ci95: [80, 120] }); // 40 % of the mean
    expect(codes(wide)).toEqual(['WIDE_WIDTH_INTERVAL']);
    const few = makeResult({ meanUm: 100 });
    few.band.nValid = 120; // 33 %
    expect(codes(few)).toEqual(['FEW_VALID_RAYS']);
    few.band.nValid = 60; // 17 %
    expect(codes(few)).toEqual(['VERY_FEW_VALID_RAYS']);
    const outliers = makeResult({ meanUm: 100 });
    outliers.band.nOutliers = 40;
    expect(codes(outliers)).toEqual(['MANY_OUTLIER_RAYS']);
    const bar = makeResult({ meanUm: 100 });
    bar.scale.source = 'scale-bar';
    bar.scale.detectedBar = { x0: 1, y0: 1, x1: 100, y1: 1, lengthPx: 100, thicknessPx: 4, orientation: 'horizontal', polarity: 'light', confidence: 0.6, umPerPx: 10 };
    expect(codes(bar)).toEqual(['LOW_SCALE_BAR_CONFIDENCE']);
    // per-ray placement scatter of the two edges against the SD of width (threshold: half)
    const spread = (sBoundary: number, sOuter: number): MeasureResult => {
      const r = makeResult({ meanUm: 100 }); // SD of width 5 µm
      const term = (s: number): LocalisationBudget => ({ sdUm: 1, randomSdUm: 0.5, systematicSdUm: 0.8, perRaySdUm: s, correlationRays: 3, sharePct: 50 });
      r.band.uncertainty = {
        measurementCi95Um: [98, 102],
        circumferentialCi95Um: [99, 101],
        parameterRangeUm: null,
        parameterRangeNote: 'none',
        variations: [],
        budget: { boundary: term(sBoundary), outerEdge: term(sOuter), scale: { sdUm: 0.1, relativeSdPct: 0.1, sharePct: 1, detail: 'typed' }, combinedSdUm: 1.4, coverageFactor: 1.96 },
      };
      return r;
    };
    expect(codes(spread(2.0, 0.5))).toEqual([]); // 2.06 < 2.5
    expect(codes(spread(2.4, 0.8))).toEqual(['WIDTH_SPREAD_INFLATED']); // 2.53 ≥ 2.5
    expect(ruleWarnings(spread(4, 0))[0].message).toContain('80 % of the SD of width (5.0 µm)');
    for (const r of QUALITY_RULES) expect(WARNINGS[r.code]).toBeDefined();
  });
});

describe('quality of whole runs (synthetic discs, truth from the geometry)', () => {
  it('a clear band is ok; a "band" that differs from the core only in brightness is not', () => {
    const clear = analyse(makeDiscImage({ rimStd: 0.01, coreStd: 0.1, seed: 31 }));
    expect(clear.band.detected).toBe(true);
    expect(clear.quality).toEqual({ verdict: 'ok', reasons: [] });
    // same noise amplitude in rim and core, the rim 10 % brighter: after brightness normalisation
    // the textures differ only slightly; whatever is found must not be reported as ok
    const dim = analyse(makeDiscImage({ rimStd: 0.1, coreStd: 0.1, rimMean: 0.55, coreMean: 0.5, seed: 5 }));
    expect(dim.quality.verdict).not.toBe('ok');
    expect(dim.quality.reasons.map((w) => w.code)).toEqual(expect.arrayContaining([dim.band.detected ? 'WEAK_TEXTURE_CONTRAST' : 'NO_BAND_FOUND']));
  });

  it('a re-measure re-makes the rules: sectors excluded → FEW_VALID_RAYS, included again → ok', () => {
    const r = analyse(makeDiscImage({ rimStd: 0.01, coreStd: 0.1, seed: 31 }));
    const cut = remeasure(r, { exclude: [[0, 200]] });
    expect(cut.quality.verdict).toBe('check');
    expect(cut.quality.reasons.map((w) => w.code)).toEqual(['FEW_VALID_RAYS']);
    const back = remeasure(cut, { exclude: [] });
    expect(back.quality).toEqual({ verdict: 'ok', reasons: [] });
    expect(back.warnings).toEqual(r.warnings);
    // the band as it was; its uncertainty block recomputed from the profile (shares may move one 0.1 % step)
    expectSameResult({ band: back.band }, { band: r.band });
    expect(Object.keys(back)).toEqual(Object.keys(r));
  });
});
