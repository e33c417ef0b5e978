/**
 * Both halves in one frame: each specimen found and measured on its own, the halves compared, and
 * the result blocks (top level = A, specimens[], halves, CSV row) kept consistent by the re-measure
 * paths the app uses. Truth: our own renderer (src/core/render), invented specimens, and the
 * independent generator's scenes (scripts/fixtures/make_external_scenes.py, sharing no code with ours).
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { findScene, renderFractograph } from '../../../src/core/render/index.js';
import { encodeGrayRaster } from '../../../src/core/encode/index.js';
import type { GrayRaster } from '../../../src/core/image/raster.js';
import { analyseImage, compareHalves, defaultParams, remeasure, type MeasureParams, type MeasureResult, type ResultSpecimenRecord } from '../../../src/core/pipeline/index.js';
import { recompute } from '../../../src/core/pipeline/recompute.js';
import { listSpecimens } from '../../../src/core/segment/index.js';
import { entryRow } from '../../../src/core/report/csv.js';
import { imageEntry } from '../../../src/core/report/imageReport.js';
import { card } from '../../../src/core/report/html.js';
import { resultOverlay } from '../../../src/core/report/resultOverlay.js';
import { specimenLines } from '../../../src/core/report/summary.js';

function params(umPerPx: number, patch: Partial<MeasureParams> = {}): MeasureParams {
  const p = defaultParams();
  p.bootstrap = 200;
  return { ...p, scale: { useMetadata: false, pixelSizeUm: umPerPx }, ...patch };
}

async function measure(raster: GrayRaster, p: MeasureParams, file: string): Promise<MeasureResult> {
  const bytes = encodeGrayRaster(raster, { format: 'png', bitDepth: 8 });
  return (await analyseImage(bytes, { file, sha256: 'test' }, p)).result;
}

/** Two rendered specimens side by side (left, right), each on its own dark background. */
function sideBySide(a: GrayRaster, b: GrayRaster): GrayRaster {
  const width = a.width + b.width;
  const height = Math.max(a.height, b.height);
  const data = new Float32Array(width * height);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < a.width; x++) data[y * width + x] = y < a.height ? a.data[y * a.width + x] : 0;
    for (let x = 0; x < b.width; x++) data[y * width + a.width + x] = y < b.height ? b.data[y * b.width + x] : 0;
  }
  return { width, height, data };
}

const rel = (got: number, want: number): number => Math.abs(got - want) / want;

describe('the rendered halves scene', () => {
  let result: MeasureResult;
  let truthA: number;
  let truthB: number;
  let centreAx: number;
  let umPerPx: number;

  beforeAll(async () => {
    const scene = findScene('halves')!;
    const { raster, truth } = renderFractograph(scene.options);
    umPerPx = truth.umPerPxX;
    const [a, b] = truth.specimens!;
    expect([a.id, b.id]).toEqual(['A', 'B']);
    truthA = a.band.meanWidthUm!;
    truthB = b.band.meanWidthUm!;
    centreAx = a.centre.x;
    result = await measure(raster, params(umPerPx), 'invented-halves.png');
  });

  it('finds both halves, names them A (left) and B (right), and measures each within 2 % of its truth', () => {
    const s = result.specimens!;
    expect(s.map((x) => x.id)).toEqual(['A', 'B']);
    expect(s[0].specimen.center.x).toBeLessThan(s[1].specimen.center.x);
    expect(Math.abs(s[0].specimen.center.x - centreAx)).toBeLessThan(10);
    expect(rel(s[0].band.widthUm!.mean, truthA)).toBeLessThan(0.02);
    expect(rel(s[1].band.widthUm!.mean, truthB)).toBeLessThan(0.02);
    // each its own outline: the radii agree (same bar), the centres are far apart
    expect(rel(s[1].specimen.radiusUm, s[0].specimen.radiusUm)).toBeLessThan(0.03);
    expect(s[1].specimen.center.x - s[0].specimen.center.x).toBeGreaterThan(2 * s[0].specimen.radiusPx);
  });

  it('keeps the top-level blocks equal to A and compares the halves', () => {
    const [a, b] = result.specimens!;
    expect(result.specimen).toEqual(a.specimen);
    expect(result.band).toEqual(a.band);
    const h = result.halves!;
    expect(h.ids).toEqual(['A', 'B']);
    expect(h.meanWidthsUm).toEqual([a.band.widthUm!.mean, b.band.widthUm!.mean]);
    expect(h.differenceUm).toBeCloseTo(a.band.widthUm!.mean - b.band.widthUm!.mean, 2);
    expect(Math.abs(h.relativeDifferencePct!)).toBeLessThan(10);
    expect(result.warnings.map((w) => w.code)).not.toContain('HALVES_DISAGREE');
    // key order: specimens and halves right after the band
    const keys = Object.keys(result);
    expect(keys.slice(keys.indexOf('band'), keys.indexOf('band') + 3)).toEqual(['band', 'specimens', 'halves']);
  });

  it('writes the specimen count and the halves figures into the CSV row', () => {
    const row = entryRow(imageEntry(result));
    expect(row.n_specimens).toBe(2);
    expect(row.width_mean_um).toBe(result.specimens![0].band.widthUm!.mean);
    expect(row.halves_width_mean_b_um).toBe(result.specimens![1].band.widthUm!.mean);
    expect(row.halves_difference_um).toBe(result.halves!.differenceUm);
    expect(row.halves_difference_pct).toBe(result.halves!.relativeDifferencePct);
    // the report card names both halves
    expect(card(imageEntry(result), undefined)).toContain(`halves A - B: ${result.halves!.differenceUm! >= 0 ? '+' : ''}${result.halves!.differenceUm!.toFixed(1)} µm`);
  });

  it('re-measuring with other rays applies them to every specimen and keeps A in step with the top level', () => {
    const r = remeasure(result, { nRays: 180 });
    const [a, b] = r.specimens!;
    expect(r.band.nRays).toBe(180);
    expect(a.band).toEqual(r.band);
    expect(b.band.nRays).toBe(180);
    expect(r.halves!.meanWidthsUm).toEqual([a.band.widthUm!.mean, b.band.widthUm!.mean]);
    // an edited boundary of A changes A only
    const poly = result.band.boundary!.polygon;
    const c = result.specimen.center;
    const shrunk = poly.map((q) => ({ x: c.x + 0.9 * (q.x - c.x), y: c.y + 0.9 * (q.y - c.y) }));
    const e = remeasure(result, { boundaryPolygon: shrunk });
    expect(e.specimens![0].band.widthUm!.mean).toBeGreaterThan(result.band.widthUm!.mean * 1.1);
    expect(e.specimens![1].band).toEqual(result.specimens![1].band);
    expect(e.halves!.differenceUm!).toBeGreaterThan(result.halves!.differenceUm! + 10);
  });

  it('an edited boundary of A re-measured equals a full run given that boundary (B found again)', async () => {
    const poly = result.band.boundary!.polygon;
    const c = result.specimen.center;
    const shrunk = poly.map((q) => ({ x: c.x + 0.92 * (q.x - c.x), y: c.y + 0.92 * (q.y - c.y) }));
    const edited = remeasure(result, { boundaryPolygon: shrunk });
    const { raster } = renderFractograph(findScene('halves')!.options);
    const full = await measure(raster, params(umPerPx, { boundaryPolygon: shrunk }), 'invented-halves.png');
    // A: the same widths (a re-measure keeps the separability of the automatic run, as for one specimen)
    const [ea, eb] = edited.specimens!;
    const [fa, fb] = full.specimens!;
    expect({ ...ea.band, separability: null }).toEqual({ ...fa.band, separability: null });
    expect(eb.band).toEqual(fb.band);
    expect(eb.quality).toEqual(fb.quality);
    expect(edited.halves).toEqual(full.halves);
  });

  it('recompute at another pixel size scales both halves (as a full run would)', () => {
    const o = recompute(result, params(2 * umPerPx));
    if (o.kind !== 'result') throw new Error(o.reason);
    const r = o.result;
    expect(r.specimens![0].specimen).toEqual(r.specimen);
    expect(r.specimens![1].specimen.radiusUm).toBeCloseTo(2 * result.specimens![1].specimen.radiusUm, 1);
    expect(r.specimens![1].band.widthUm!.mean).toBeCloseTo(2 * result.specimens![1].band.widthUm!.mean, 1);
    expect(r.halves!.differenceUm!).toBeCloseTo(2 * result.halves!.differenceUm!, 1);
  });

  it('draws both specimens on the overlay and names the halves in the summary lines', () => {
    const lines = specimenLines(result);
    expect(lines[0]).toMatch(/^2 specimens \(figures above: A\): A \d+\.\d µm \(\w+\), B \d+\.\d µm/);
    expect(lines[1]).toMatch(/^halves A - B: [+-]\d+\.\d µm \([+-]\d+\.\d %\)$/);
    const { raster } = renderFractograph(findScene('halves')!.options);
    const img = resultOverlay(raster, result, 800);
    // the amber boundary colour near B's boundary: B is drawn, not only A
    const k = 800 / raster.width;
    const band = img.height - Math.round(raster.height * k); // the caption band above the image
    const q = result.specimens![1].band.boundary!.polygon[0];
    const x = Math.round((q.x + 0.5) * k - 0.5);
    const y = Math.round((q.y + 0.5) * k - 0.5) + band;
    let amber = 0;
    for (let dy = -2; dy <= 2; dy++) {
      for (let dx = -2; dx <= 2; dx++) {
        const i = ((y + dy) * img.width + (x + dx)) * 4;
        if (img.data[i] > 200 && img.data[i + 1] > 120 && img.data[i + 1] < 210 && img.data[i + 2] < 90) amber++;
      }
    }
    expect(amber).toBeGreaterThan(0);
  });
});

describe('halves of different band widths', () => {
  let result: MeasureResult;

  beforeAll(async () => {
    const base = { widthPx: 560, heightPx: 560, umPerPx: 12, scaleBar: null, noiseSigma: 0.01, blurSigmaPx: 0.8 } as const;
    const a = renderFractograph({ ...base, seed: 81, rim: { widthUm: 320, transitionUm: 30 } });
    const b = renderFractograph({ ...base, seed: 82, rim: { widthUm: 450, transitionUm: 30 } });
    result = await measure(sideBySide(a.raster, b.raster), params(12), 'invented-unequal-halves.png');
    expect(a.truth.band.meanWidthUm).toBeCloseTo(320, 0);
    expect(b.truth.band.meanWidthUm).toBeCloseTo(450, 0);
  });

  it('measures each half on its own and says that they disagree', () => {
    const [a, b] = result.specimens!;
    expect(rel(a.band.widthUm!.mean, 320)).toBeLessThan(0.03);
    expect(rel(b.band.widthUm!.mean, 450)).toBeLessThan(0.03);
    expect(result.halves!.relativeDifferencePct!).toBeLessThan(-10);
    expect(result.warnings.map((w) => w.code)).toContain('HALVES_DISAGREE');
    expect(result.quality.verdict).not.toBe('ok');
  });
});

describe('halves laid touching each other', () => {
  it('are cut apart and each measured within 2 %', async () => {
    const scene = findScene('halves')!;
    const { raster, truth } = renderFractograph({ ...scene.options, halves: { gapUm: 0 } });
    const result = await measure(raster, params(truth.umPerPxX), 'invented-touching-halves.png');
    const s = result.specimens!;
    expect(s.length).toBe(2);
    s.forEach((x, i) => {
      expect(rel(x.band.widthUm!.mean, truth.specimens![i].band.meanWidthUm!)).toBeLessThan(0.02);
      // each outline is its own disc, not the pair: its radius is the half's (truth mean outer radius)
      const rays = truth.specimens![i].outerRadiusPxByAngle;
      expect(rel(x.specimen.radiusPx, rays.reduce((a, v) => a + v, 0) / rays.length)).toBeLessThan(0.01);
    });
    expect(rel(s[0].specimen.radiusUm, s[1].specimen.radiusUm)).toBeLessThan(0.01);
    expect(s[1].specimen.center.x - s[0].specimen.center.x).toBeGreaterThan(1.9 * s[0].specimen.radiusPx);
  });
});

describe('three specimens in a row', () => {
  it('measures each (A, B, C left to right), compares no halves and says so', async () => {
    const base = { widthPx: 420, heightPx: 420, umPerPx: 16, scaleBar: null, noiseSigma: 0.01, blurSigmaPx: 0.8 } as const;
    const widths = [300, 380, 340];
    const r = widths.map((w, i) => renderFractograph({ ...base, seed: 90 + i, rim: { widthUm: w, transitionUm: 30 } }).raster);
    const result = await measure(sideBySide(sideBySide(r[0], r[1]), r[2]), params(16), 'invented-three.png');
    const s = result.specimens!;
    expect(s.map((x) => x.id)).toEqual(['A', 'B', 'C']);
    s.forEach((x, i) => expect(rel(x.band.widthUm!.mean, widths[i])).toBeLessThan(0.04));
    expect(result.halves).toBeUndefined();
    expect(result.warnings.map((w) => w.code)).toContain('SEVERAL_SPECIMENS');
    expect(entryRow(imageEntry(result)).n_specimens).toBe(3);
    expect(entryRow(imageEntry(result)).halves_difference_um).toBeNull();
  });
});

describe('listing the specimens', () => {
  /** Bright discs / boxes on a dark ground. */
  function scene(shapes: { kind: 'disc' | 'box'; x: number; y: number; r: number }[]): GrayRaster {
    const width = 900;
    const height = 500;
    const data = new Float32Array(width * height).fill(0.1);
    for (let y = 0; y < height; y++) {
      for (let x = 0; x < width; x++) {
        for (const s of shapes) {
          const inside = s.kind === 'disc' ? Math.hypot(x - s.x, y - s.y) <= s.r : Math.abs(x - s.x) <= s.r && Math.abs(y - s.y) <= s.r;
          if (inside) data[y * width + x] = 0.7;
        }
      }
    }
    return { width, height, data };
  }

  it('gives nothing for one specimen, and ignores a square and a much smaller disc', () => {
    expect(listSpecimens(scene([{ kind: 'disc', x: 450, y: 250, r: 150 }]))).toEqual([]);
    expect(listSpecimens(scene([{ kind: 'disc', x: 300, y: 250, r: 150 }, { kind: 'box', x: 700, y: 250, r: 130 }]))).toEqual([]);
    expect(listSpecimens(scene([{ kind: 'disc', x: 300, y: 250, r: 150 }, { kind: 'disc', x: 700, y: 250, r: 60 }]))).toEqual([]);
  });

  it('lists similar discs left to right', () => {
    const boxes = listSpecimens(scene([{ kind: 'disc', x: 700, y: 260, r: 110 }, { kind: 'disc', x: 200, y: 240, r: 120 }, { kind: 'disc', x: 450, y: 250, r: 100 }]));
    expect(boxes.length).toBe(3);
    const centres = boxes.map((b) => b.x + b.w / 2);
    expect(centres[0]).toBeCloseTo(200, -1);
    expect(centres[1]).toBeCloseTo(450, -1);
    expect(centres[2]).toBeCloseTo(700, -1);
    expect(boxes[0].w).toBeGreaterThan(220);
    expect(boxes[0].w).toBeLessThan(260);
  });
});

describe('compareHalves', () => {
  const rec = (id: string, mean: number | null): ResultSpecimenRecord =>
    ({ id, band: { detected: mean !== null, widthUm: mean === null ? null : { mean } } }) as unknown as ResultSpecimenRecord;

  it('signs the difference A − B and relates it to the average of the two', () => {
    const h = compareHalves(rec('A', 300), rec('B', 330));
    expect(h.differenceUm).toBe(-30);
    expect(h.relativeDifferencePct).toBeCloseTo((-30 / 315) * 100, 2);
  });

  it('gives no difference when one half has no band', () => {
    const h = compareHalves(rec('A', 300), rec('B', null));
    expect(h.meanWidthsUm).toEqual([300, null]);
    expect(h.differenceUm).toBeNull();
    expect(h.relativeDifferencePct).toBeNull();
  });
});

describe('both halves on images of the independent generator (tests/fixtures/external/scenes)', () => {
  const DIR = fileURLToPath(new URL('../../fixtures/external/scenes/', import.meta.url));
  interface SceneTruth {
    file: string;
    umPerPx: number;
    specimens: { center: { x: number; y: number }; band: { meanWidthUm: number } }[];
  }

  async function each(name: string): Promise<{ truth: SceneTruth; result: MeasureResult }> {
    const truth = JSON.parse(readFileSync(`${DIR}${name}.truth.json`, 'utf8')) as SceneTruth;
    const bytes = new Uint8Array(readFileSync(`${DIR}${truth.file}`));
    const result = (await analyseImage(bytes, { file: truth.file, sha256: 'test' }, params(truth.umPerPx))).result;
    return { truth, result };
  }

  /** Each measured specimen against the truth half nearest its centre (whole-circumference truth mean). */
  function errors(truth: SceneTruth, result: MeasureResult): number[] {
    return result.specimens!.map((s) => {
      const c = s.specimen.center;
      const t = truth.specimens.reduce((a, b) => (Math.hypot(b.center.x - c.x, b.center.y - c.y) < Math.hypot(a.center.x - c.x, a.center.y - c.y) ? b : a));
      return rel(s.band.widthUm!.mean, t.band.meanWidthUm);
    });
  }

  it('halves alone: both measured, each within 2 %, A the left one', async () => {
    const { truth, result } = await each('halves');
    expect(result.specimens!.length).toBe(2);
    expect(result.specimens![0].specimen.center.x).toBeLessThan(result.specimens![1].specimen.center.x);
    for (const e of errors(truth, result)) expect(e).toBeLessThan(0.02);
  });

  it('halves with a steel rule along the frame (larger than either half): both measured, each within 4 %', async () => {
    const { truth, result } = await each('halves_rule');
    expect(result.specimens!.length).toBe(2);
    for (const e of errors(truth, result)) expect(e).toBeLessThan(0.04);
  });
});
