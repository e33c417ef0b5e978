#!/usr/bin/env node
/**
 * Render benchmark (run after `npm run build`): wall and CPU time of renderFractograph at 2 MP and
 * 12 MP, a 2-MP render with every scene element, and every scene of the named set (`--quick`: 2 MP
 * and the set's 1000 × 760 scenes only).
 */
import { renderFractograph, SCENE_SET } from '../dist/core/render/index.js';

const quick = process.argv.includes('--quick');

function time(label, opts) {
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  renderFractograph(opts);
  const c = process.cpuUsage(c0);
  const wall = performance.now() - t0;
  if (label) console.log(`${label}: wall ${wall.toFixed(0)} ms, CPU ${((c.user + c.system) / 1000).toFixed(0)} ms`);
  return wall;
}
time('2 MP warm-up', { widthPx: 1600, heightPx: 1200, umPerPx: 5 });
time('2 MP (1600×1200, 5 µm/px)', { widthPx: 1600, heightPx: 1200, umPerPx: 5 });
if (!quick) {
  time('12 MP (4000×3000, 2 µm/px)', { widthPx: 4000, heightPx: 3000, umPerPx: 2 });
  time('2 MP with every scene element (V flank, putty, shadow, glints, colour, defocus, rule, label)', {
    widthPx: 1600,
    heightPx: 1200,
    umPerPx: 9,
    flank: { kind: 'V' },
    background: 'putty',
    shadow: {},
    glints: {},
    colour: {},
    defocus: { maxSigmaPx: 3 },
    rule: { side: 'left', visibleUm: 900 },
    label: { corner: 'tr', letterUm: 35 },
  });
}
let total = 0;
let slowest = { name: '', ms: 0 };
let n = 0;
for (const s of SCENE_SET) {
  if (quick && (s.options.widthPx !== 1000 || s.options.heightPx !== 760)) continue;
  const ms = time(null, s.options);
  total += ms;
  n++;
  if (ms > slowest.ms) slowest = { name: s.name, ms };
}
console.log(`scene set (${n} scenes): wall ${(total / 1000).toFixed(1)} s in all, mean ${(total / n).toFixed(0)} ms, slowest ${slowest.name} ${slowest.ms.toFixed(0)} ms`);
