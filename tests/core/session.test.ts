import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { defaultParams } from '../../src/core/pipeline/params.js';
import { makeSession, parseSession, sessionText, SESSION_SCHEMA } from '../../src/core/session.js';
import { parseMaterialSheet } from '../../src/core/tcd/materials.js';
import { PIXEL_FEATURE_SET, pixelFeatureNames } from '../../src/core/learn/features.js';
import { trainForest } from '../../src/core/learn/forest.js';
import { forestRecord, sealModel, serialiseModel } from '../../src/core/learn/model.js';

const image = { file: 'invented.png', sha256: 'ab'.repeat(32), widthPx: 800, heightPx: 600 };

/** A small real model file (fractozone.model/1), taught on a tiny invented feature set. */
function modelText(): string {
  const F = pixelFeatureNames([40]).length;
  const n = 60;
  const X = new Float32Array(n * F);
  const y = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    y[i] = i % 3;
    for (let f = 0; f < F; f++) X[i * F + f] = y[i] + 0.01 * ((i * 7 + f * 3) % 11);
  }
  const forest = trainForest(X, y, F, 3, { nTrees: 2, maxDepth: 3, minSplit: 2, mtry: 2, seed: 1 }).forest;
  const counts = { outside: 20, rim: 20, core: 20 };
  return serialiseModel(
    sealModel({
      featureSet: PIXEL_FEATURE_SET,
      features: pixelFeatureNames([40]),
      windowsUm: [40],
      classes: ['outside', 'rim', 'core'],
      training: { images: [], labelledWorkingPixels: counts, pixelsPerClass: counts, oobAccuracy: 1, oobAccuracyByClass: { outside: 1, rim: 1, core: 1 }, seed: 1, nTrees: 2, maxDepth: 3, minSplit: 2, mtry: 2, samplesPerClass: 20 },
      forest: forestRecord(forest),
    }),
  );
}

function fullParams() {
  const p = defaultParams();
  const [fz7] = parseMaterialSheet(readFileSync('samples/materials.json', 'utf8'), 'materials.json');
  p.scale = { useMetadata: true, twoPoint: { p0: { x: 10, y: 20 }, p1: { x: 210, y: 20 }, distanceUm: 1000 } };
  p.windowUm = 80;
  p.exclude = [[350, 10]];
  p.boundaryPolygon = [
    { x: 1, y: 2 },
    { x: 30, y: 2 },
    { x: 15, y: 40 },
  ];
  p.material = { material: fz7, toughness: { value: 50, sd: 2, source: 'typed in the app' } };
  p.strainRatePerS = 1e-3;
  p.reference = 'L/2';
  return p;
}

describe('session files', () => {
  it('round trip: every parameter, the corrected outline and the measured flag come back', () => {
    const outline = [
      { x: 5, y: 5 },
      { x: 50, y: 5 },
      { x: 50, y: 50 },
    ];
    const s = makeSession(image, fullParams(), outline, true);
    const back = parseSession(sessionText(s), { sha256: image.sha256 });
    expect(back).toEqual(s);
    expect(back.schema).toBe(SESSION_SCHEMA);
  });

  it('refuses a session of another image, naming it', () => {
    const t = sessionText(makeSession(image, defaultParams(), null, false));
    expect(() => parseSession(t, { sha256: 'cd'.repeat(32) })).toThrow(/another image \(invented\.png/);
  });

  it('refuses other files and wrong fields with one sentence naming the field', () => {
    expect(() => parseSession('{"schema":"fractozone.result/1"}', { sha256: image.sha256 })).toThrow(/not a fractozone\.session\/2 file/);
    expect(() => parseSession('no json', { sha256: image.sha256 })).toThrow(/not valid JSON/);
    const s = JSON.parse(sessionText(makeSession(image, defaultParams(), null, false)));
    s.params.scale = { pixelSizeUm: -4 };
    expect(() => parseSession(JSON.stringify(s), { sha256: image.sha256 })).toThrow(/params\.scale\.pixelSizeUm must be positive/);
    s.params.scale = {};
    s.params.exclude = [[1, 'x']];
    expect(() => parseSession(JSON.stringify(s), { sha256: image.sha256 })).toThrow(/params\.exclude\[0\]\[1\] must be a number/);
  });

  it('keeps the pixel model: its SHA-256 in the parameters and the model file itself', () => {
    const model = { name: 'series.model.json', sha256: '3c'.repeat(32), text: modelText() };
    const p = { ...defaultParams(), modelSha256: model.sha256 };
    const s = makeSession(image, p, null, true, model);
    const back = parseSession(sessionText(s), { sha256: image.sha256 });
    expect(back).toEqual(s);
    expect(back.params.modelSha256).toBe(model.sha256);
    expect(back.model?.text).toBe(model.text);
    // the parameters and the model must agree, and the model must read
    expect(() => makeSession(image, p, null, true)).toThrow(/needs the model its parameters name/);
    const raw = JSON.parse(sessionText(s));
    expect(() => parseSession(JSON.stringify({ ...raw, model: undefined }), { sha256: image.sha256 })).toThrow(/does not hold it \(model\)/);
    expect(() => parseSession(JSON.stringify({ ...raw, model: { ...raw.model, sha256: '4d'.repeat(32) } }), { sha256: image.sha256 })).toThrow(/is not the model the parameters name/);
    expect(() => parseSession(JSON.stringify({ ...raw, model: { ...raw.model, text: raw.model.text.slice(0, 200) } }), { sha256: image.sha256 })).toThrow(/session file: model\.text: .*not valid JSON/);
    expect(() => parseSession(JSON.stringify({ ...raw, params: { ...raw.params, modelSha256: 'xyz' } }), { sha256: image.sha256 })).toThrow(/params\.modelSha256 must be a SHA-256/);
  });

  it('missing parameters take the defaults', () => {
    const s = JSON.parse(sessionText(makeSession(image, defaultParams(), null, false)));
    s.params = { scale: { useMetadata: true, pixelSizeUm: 3 } };
    const back = parseSession(JSON.stringify(s), { sha256: image.sha256 });
    expect(back.params).toEqual({ ...defaultParams(), scale: { useMetadata: true, pixelSizeUm: 3 } });
  });
});
