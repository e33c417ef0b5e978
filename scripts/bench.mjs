// `npm run bench`: every speed and memory target of the project, each in its own process so that
// peak-RSS figures do not mix. Prints each benchmark's own report. Python references (scikit-image,
// SciPy, OpenCV from Debian) are used when installed; otherwise their lines say so.
//   npm run bench                 # all
//   npm run bench -- --quick      # smaller inputs (texture 3 MP, batch 8 images)
import { spawnSync } from 'node:child_process';

const quick = process.argv.includes('--quick');
const here = new URL('.', import.meta.url).pathname;
const steps = [
  ['whole process vs native OpenCV reference, 12 MP; 48 MP', ['bench-process.mjs', ...(quick ? ['--runs', '3', '--no-48'] : [])]],
  ['whole pipeline, 12 MP', ['bench-pipeline.mjs']],
  ['texture features vs scikit-image / SciPy / OpenCV', ['bench-texture.mjs', ...(quick ? ['--quick'] : [])]],
  ['batch throughput, 1 vs 2 workers', ['bench-batch.mjs', ...(quick ? ['--images', '8'] : [])]],
  ['rendered fractograph generator', ['bench-render.mjs']],
  ['pixel classifier: teach and measure --model, 12 MP', ['bench-learn.mjs', ...(quick ? ['--runs', '1'] : [])]],
  ['teach mode in Chromium: stroke → class map, 2 MP', ['bench-teach-app.mjs', ...(quick ? ['--strokes', '3'] : [])]],
];
let failed = 0;
for (const [title, [script, ...args]] of steps) {
  process.stdout.write(`\n=== ${title} (${script}) ===\n`);
  const r = spawnSync(process.execPath, [here + script, ...args], { stdio: 'inherit' });
  if (r.status !== 0) {
    failed++;
    process.stdout.write(`!!! ${script} exited with ${r.status}\n`);
  }
}
process.exitCode = failed ? 1 : 0;
