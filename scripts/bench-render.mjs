#!/usr/bin/env node
/** Render benchmark (run after `npm run build`): wall and CPU time of renderFractograph at 2 MP and 12 MP. */
import { renderFractograph } from '../dist/core/render/index.js';

function time(label, opts) {
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  renderFractograph(opts);
  const c = process.cpuUsage(c0);
  console.log(`${label}: wall ${(performance.now() - t0).toFixed(0)} ms, CPU ${((c.user + c.system) / 1000).toFixed(0)} ms`);
}
time('2 MP warm-up', { widthPx: 1600, heightPx: 1200, umPerPx: 5 });
time('2 MP (1600×1200, 5 µm/px)', { widthPx: 1600, heightPx: 1200, umPerPx: 5 });
time('12 MP (4000×3000, 2 µm/px)', { widthPx: 4000, heightPx: 3000, umPerPx: 2 });
