import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { defaultParams } from '../../src/core/pipeline/params.js';
import { makeSession, parseSession, sessionText, SESSION_SCHEMA } from '../../src/core/session.js';
import { parseMaterialSheet } from '../../src/core/tcd/materials.js';

const image = { file: 'invented.png', sha256: 'ab'.repeat(32), widthPx: 800, heightPx: 600 };

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

  it('missing parameters take the defaults', () => {
    const s = JSON.parse(sessionText(makeSession(image, defaultParams(), null, false)));
    s.params = { scale: { useMetadata: true, pixelSizeUm: 3 } };
    const back = parseSession(JSON.stringify(s), { sha256: image.sha256 });
    expect(back.params).toEqual({ ...defaultParams(), scale: { useMetadata: true, pixelSizeUm: 3 } });
  });
});
