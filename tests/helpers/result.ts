/**
 * Complete, typed MeasureResult values for report / CSV / summary tests (literal figures, no
 * pipeline run): a measured band of a given mean width, optionally with a critical distance and a
 * comparison. Tests change single fields of the returned object.
 */
import { defaultParams } from '../../src/core/pipeline/params.js';
import { RESULT_SCHEMA, type Comparison, type MeasureResult } from '../../src/core/pipeline/result.js';
import { CAUTION } from '../../src/core/caution.js';
import type { ResolvedDistance } from '../../src/core/tcd/resolve.js';

export interface ResultOptions {
  file?: string;
  /** Mean band width, µm; null → no band detected. */
  meanUm?: number | null;
  /** 95 % CI of the mean (default mean ± 1 µm). */
  ci95?: [number, number];
  umPerPx?: number;
  /** Critical distance, µm (adds `criticalDistance`). */
  L_um?: number;
  /** Ratio and verdict (adds `comparison`; needs L_um). */
  ratio?: number;
  verdict?: Comparison['verdict'];
}

function criticalDistance(L: number): ResolvedDistance {
  return {
    L_um: L,
    interval95_um: [0.9 * L, 1.1 * L],
    median_um: L,
    deltaInterval95_um: [0.9 * L, 1.1 * L],
    pointDistance_um: L / 2,
    lineDistance_um: 2 * L,
    areaRadius_um: L,
    basis: 'static',
    inputs: {
      material: null,
      invented: null,
      toughness: { value: 48, unit: 'MPa·√m', sd: null, interval95: null, source: 'command line' },
      strength: { value: 1150, unit: 'MPa', sd: null, interval95: null, source: 'command line' },
      strainRate_per_s: null,
    },
    monteCarlo: null,
    warnings: [],
  };
}

/** A complete result (see the module comment). */
export function makeResult(o: ResultOptions = {}): MeasureResult {
  const mean = o.meanUm === undefined ? 100 : o.meanUm;
  const ci = o.ci95 ?? (mean === null ? [NaN, NaN] : [mean - 1, mean + 1]);
  const umPerPx = o.umPerPx ?? 2.5;
  const r: MeasureResult = {
    schema: RESULT_SCHEMA,
    tool: { name: 'fractozone', version: '0.0.0-test' },
    input: { file: o.file ?? 'test.png', sha256: 'ab'.repeat(32), format: 'png', widthPx: 1000, heightPx: 800, bitDepth: 8, channels: 1, colorType: 'gray', pageCount: 1 },
    quality: { verdict: 'ok', reasons: [] },
    params: defaultParams(),
    resolved: { windowUm: 50, windowPx: 21, workingScaleFactor: 1, features: ['localStd', 'localEntropy', 'gradientEnergy'], boundarySource: 'auto' },
    scale: { umPerPx, umPerPxX: umPerPx, umPerPxY: umPerPx, source: 'typed', detail: `typed pixel size ${umPerPx} µm/px`, metadata: null, metadataNote: null, detectedBar: null },
    specimen: {
      center: { x: 500, y: 400 },
      radiusPx: 1000,
      radiusUm: 1000 * umPerPx,
      circle: { cx: 500, cy: 400, radiusPx: 1000, radiusUm: 1000 * umPerPx, rmsResidualPx: 0.3 },
      ellipse: { cx: 500, cy: 400, semiMajorUm: 1000 * umPerPx, semiMinorUm: 1000 * umPerPx, angleDeg: 0, rmsResidualPx: 0.3 },
      areaMm2: 19.6,
      equivalentRadiusUm: 1000 * umPerPx,
      background: 'dark',
      touchesFrame: false,
      frameContactFraction: 0,
      edgeSearch: null,
      outline: [{ x: 0, y: 0 }, { x: 10, y: 0 }, { x: 10, y: 10 }],
    },
    band:
      mean === null
        ? { detected: false, reason: 'no smooth rim band was found', boundary: null, widthUm: null, normalWidthUm: null, areaEquivalentWidthUm: null, nRays: 360, nValid: 0, nOutliers: 0, profile: [], separability: null }
        : {
            detected: true,
            boundary: { source: 'auto', polygon: [{ x: 1, y: 1 }, { x: 9, y: 1 }, { x: 9, y: 9 }] },
            widthUm: { n: 360, nEff: 20, mean, median: mean, sd: 5, min: mean - 10, max: mean + 10, p05: mean - 8, p95: mean + 8, ci95: ci, medianCi95: ci },
            normalWidthUm: { mean, median: mean, n: 360 },
            areaEquivalentWidthUm: mean,
            nRays: 360,
            nValid: 360,
            nOutliers: 0,
            profile: [],
            separability: { fisher: 12, overlap: 0.02, eta: 0.8, coreFraction: 0.6, rimFraction: 0.4 },
          },
    warnings: [],
    caution: CAUTION,
    diagnostics: { timingsMs: {} },
  };
  if (o.L_um !== undefined) {
    r.criticalDistance = criticalDistance(o.L_um);
    if (o.ratio !== undefined) {
      r.comparison = {
        reference: 'L',
        referenceUm: o.L_um,
        ratio: o.ratio,
        ratioInterval95: [o.ratio * 0.95, o.ratio * 1.05],
        verdict: o.verdict ?? 'agrees',
        tolerancePct: 20,
        note: 'test',
        impliedToughness_MPa_sqrtm: null,
      };
    }
  }
  return r;
}
