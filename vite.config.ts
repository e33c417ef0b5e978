/**
 * Vite build of the web app: root src/app, static files from public/, output dist-app/.
 * The engine runs in a module Web Worker (worker format 'es'). A small plugin copies one bundled
 * invented sample image from samples/ into the build (sample/…), so the app opens with it.
 */
import { defineConfig, type Plugin } from 'vite';
import react from '@vitejs/plugin-react';
import { existsSync, readFileSync, readdirSync } from 'node:fs';
import { basename, join, resolve } from 'node:path';

const here = resolve(import.meta.dirname ?? '.');

/** Picks the bundled sample: first row of samples/manifest.csv, else the first image in samples/. */
function pickSample(): { file: string; truth: string | null } | null {
  const dir = join(here, 'samples');
  if (!existsSync(dir)) return null;
  const images = readdirSync(dir).filter((f) => /\.(png|jpe?g|tiff?)$/i.test(f)).sort();
  if (images.length === 0) return null;
  let file = images[0];
  const manifest = join(dir, 'manifest.csv');
  if (existsSync(manifest)) {
    const lines = readFileSync(manifest, 'utf8').split(/\r?\n/).filter((l) => l.trim() !== '' && !l.startsWith('#'));
    for (const line of lines.slice(1)) {
      const cell = line.split(',').map((c) => c.trim().replace(/^"|"$/g, '')).find((c) => images.includes(basename(c)));
      if (cell) {
        file = basename(cell);
        break;
      }
    }
  }
  const stem = file.replace(/\.[^.]+$/, '');
  const truthName = readdirSync(dir).find((f) => f === `${stem}.truth.json` || f === `${stem}.json`) ?? null;
  return { file, truth: truthName };
}

function bundledSample(): Plugin {
  return {
    name: 'fractozone-bundled-sample',
    apply: 'build',
    generateBundle() {
      const s = pickSample();
      const info: { file: string | null; truth: string | null; note: string } = {
        file: null,
        truth: null,
        note: 'Invented sample: invented alloy, invented specimen (rendered test image, not a real fracture).',
      };
      if (s) {
        this.emitFile({ type: 'asset', fileName: `sample/${s.file}`, source: readFileSync(join(here, 'samples', s.file)) });
        info.file = `sample/${s.file}`;
        if (s.truth) {
          this.emitFile({ type: 'asset', fileName: `sample/${s.truth}`, source: readFileSync(join(here, 'samples', s.truth)) });
          info.truth = `sample/${s.truth}`;
        }
      }
      this.emitFile({ type: 'asset', fileName: 'sample/sample.json', source: JSON.stringify(info, null, 2) });
    },
  };
}

export default defineConfig({
  root: resolve(here, 'src/app'),
  publicDir: resolve(here, 'public'),
  base: './',
  plugins: [react(), bundledSample()],
  worker: { format: 'es' },
  build: {
    outDir: resolve(here, 'dist-app'),
    emptyOutDir: true,
    chunkSizeWarningLimit: 12_000,
    assetsInlineLimit: 0,
    target: 'es2022',
  },
  server: { host: '127.0.0.1', port: 5178 },
});
