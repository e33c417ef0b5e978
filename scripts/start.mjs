// `npm start` (after the build): measure the bundled invented test series, then serve the web app.
//   1. fractozone batch samples --manifest samples/manifest.csv --out out/samples --resume
//      → out/samples/results.csv, results.jsonl, report.html, one result JSON + overlay per image
//   2. the web app on http://127.0.0.1:5178/ (PORT=… or --port N) with a sample already open
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('..', import.meta.url));
const cli = fileURLToPath(new URL('../dist/cli/main.js', import.meta.url));
process.stdout.write('Measuring the bundled invented test series (samples/) …\n');
const r = spawnSync(
  process.execPath,
  [cli, 'batch', 'samples', '--manifest', 'samples/manifest.csv', '--out', 'out/samples', '--resume'],
  { cwd: root, stdio: 'inherit' },
);
if (r.status !== 0) {
  process.stderr.write(`start: the sample batch exited with ${r.status}; see the messages above\n`);
} else {
  process.stdout.write('Results: out/samples/results.csv and the report out/samples/report.html\n\n');
}
const args = process.argv.slice(2);
process.argv = [process.argv[0], fileURLToPath(new URL('./serve.mjs', import.meta.url)), ...args];
await import('./serve.mjs');
