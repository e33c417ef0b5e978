/**
 * Benchmark: scale-bar detection on a 12-megapixel (4000 × 3000) drawn scene.
 * Run: npx tsx scripts/bench-scalebar.ts   (prints median time over 7 runs, and the measured length)
 */
import { loadCvNode } from '../src/cli/cvNode.js';
import { detectScaleBar } from '../src/core/calibrate/index.js';
import { blank, drawBar, drawLabel, fillRect, mulberry32 } from '../tests/helpers/drawBar.js';

loadCvNode();
const W = 4000;
const H = 3000;
const r = blank(W, H, 0.08);
// coarse seeded texture disc (fast to draw at this size)
const rng = mulberry32(1);
for (let y = 0; y < H; y++) {
  for (let x = 0; x < W; x++) {
    if (Math.hypot(x - W / 2, y - H / 2) < 1100) r.data[y * W + x] = 0.35 + 0.4 * rng();
  }
}
fillRect(r, 3000, 2600, 3900, 2950, 0.2);
drawLabel(r, 3200, 2640, 80, 0.95, 6, 2);
const truth = drawBar(r, { a: 3100.4, b: 3800.9, across: 2800, thickness: 12, value: 0.95 });
const times: number[] = [];
let len = NaN;
for (let i = 0; i < 7; i++) {
  const t = performance.now();
  const bar = detectScaleBar(r);
  times.push(performance.now() - t);
  len = bar ? bar.lengthPx : NaN;
}
times.sort((a, b) => a - b);
console.log(`12 MP scale-bar detection: median ${times[3].toFixed(0)} ms (min ${times[0].toFixed(0)} ms); lengthPx ${len.toFixed(3)} vs truth ${truth.toFixed(3)}`);
