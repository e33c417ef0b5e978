/**
 * Vite build of the web app: root src/app, static files from public/, output dist-app/.
 * The engine runs in a module Web Worker (worker format 'es'). A small plugin copies one bundled
 * invented sample image from samples/ into the build (sample/…) with what its manifest row says
 * (scale, strain rate, material sheet), so the app opens with it ready to measure.
 */
import { defineConfig, type Plugin } from 'vite';
import react from '@vitejs/plugin-react';
import { existsSync, readFileSync, readdirSync } from 'node:fs';
import { basename, join, resolve } from 'node:path';

const here = resolve(import.meta.dirname ?? '.');

/** The bundled sample and what its manifest row says about it (scale, strain rate, material). */
interface SamplePick {
  file: string;
  truth: string | null;
  barLengthUm: number | null;
  pixelSizeUm: number | null;
  strainRatePerS: number | null;
  /** Material sheet in samples/ and the material's name (`material` column, FILE:NAME). */
  material: { file: string; name: string } | null;
}

const numberOrNull = (v: string | undefined): number | null => (v !== undefined && v.trim() !== '' && Number.isFinite(Number(v)) ? Number(v) : null);

/** Picks the bundled sample: first row of samples/manifest.csv (with its settings), else the first image in samples/. */
function pickSample(): SamplePick | null {
  const dir = join(here, 'samples');
  if (!existsSync(dir)) return null;
  const images = readdirSync(dir).filter((f) => /\.(png|jpe?g|tiff?)$/i.test(f)).sort();
  if (images.length === 0) return null;
  const pick: SamplePick = { file: images[0], truth: null, barLengthUm: null, pixelSizeUm: null, strainRatePerS: null, material: null };
  const manifest = join(dir, 'manifest.csv');
  if (existsSync(manifest)) {
    // the sample manifest has no quoted commas (plain split is enough for it)
    const lines = readFileSync(manifest, 'utf8').split(/\r?\n/).filter((l) => l.trim() !== '' && !l.startsWith('#'));
    const head = (lines[0] ?? '').split(',').map((c) => c.trim());
    const row = lines.slice(1).map((l) => l.split(',').map((c) => c.trim())).find((cells) => images.includes(basename(cells[head.indexOf('file')] ?? '')));
    if (row) {
      const get = (k: string) => row[head.indexOf(k)];
      pick.file = basename(get('file'));
      pick.barLengthUm = numberOrNull(get('bar_length_um'));
      pick.pixelSizeUm = numberOrNull(get('pixel_size_um'));
      pick.strainRatePerS = numberOrNull(get('strain_rate_per_s'));
      const ref = get('material') ?? '';
      const at = ref.lastIndexOf(':');
      if (at > 0 && existsSync(join(dir, ref.slice(0, at)))) pick.material = { file: ref.slice(0, at), name: ref.slice(at + 1) };
    }
  }
  const stem = pick.file.replace(/\.[^.]+$/, '');
  pick.truth = readdirSync(dir).find((f) => f === `${stem}.truth.json`) ?? null;
  return pick;
}

function bundledSample(): Plugin {
  return {
    name: 'fractozone-bundled-sample',
    apply: 'build',
    generateBundle() {
      const s = pickSample();
      const asset = (name: string) => this.emitFile({ type: 'asset', fileName: `sample/${name}`, source: readFileSync(join(here, 'samples', name)) });
      const info = {
        note: 'Invented sample: invented alloy, invented specimen (rendered test image, not a real fracture).',
        file: s ? `sample/${s.file}` : null,
        truth: s?.truth ? `sample/${s.truth}` : null,
        barLengthUm: s?.barLengthUm ?? null,
        pixelSizeUm: s?.pixelSizeUm ?? null,
        strainRatePerS: s?.strainRatePerS ?? null,
        materials: s?.material ? { file: `sample/${s.material.file}`, name: s.material.name } : null,
      };
      if (s) {
        asset(s.file);
        if (s.truth) asset(s.truth);
        if (s.material) asset(s.material.file);
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
