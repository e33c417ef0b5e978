// After `tsc`: bundles the CLI entry into one file and makes it executable (npm links `bin` to
// dist/cli/main.js).
//
// Why a bundle: Node 20 resolves, reads and compiles the ~200 ES modules of the CLI and its
// libraries one by one at every start — `fractozone --help` took 0.30 s of CPU against 0.11 s
// bundled (2026-12-02, this project's 2-core machine), and every `measure` pays it. esbuild (already
// installed for tsx) writes dist/cli/main.js with everything but opencv-wasm (a CommonJS package
// that reads its .wasm beside itself); tsc's modules stay in dist/ for the scripts, the tests and
// the batch workers (long-lived processes forked from dist/cli/batch/worker.js). `import.meta.url`
// in each bundled module is rewritten to that module's own URL in dist/, so the paths it computes
// (the batch worker, its processor module, `createRequire`) stay what they were.
// Without esbuild the unbundled entry is kept (a note says so).
import { chmodSync, existsSync, readFileSync, renameSync, rmSync } from 'node:fs';
import { dirname, relative } from 'node:path';
import { fileURLToPath } from 'node:url';

const entry = fileURLToPath(new URL('../dist/cli/main.js', import.meta.url));
const modules = fileURLToPath(new URL('../dist/cli/main.modules.js', import.meta.url));
const dist = fileURLToPath(new URL('../dist/', import.meta.url));

if (existsSync(entry)) {
  let esbuild;
  try {
    esbuild = await import('esbuild');
  } catch {
    console.error('postbuild: esbuild not found — dist/cli/main.js left unbundled (slower start-up)');
  }
  if (esbuild) {
    renameSync(entry, modules);
    const here = dirname(entry);
    const metaUrl = {
      name: 'module-import-meta-url',
      setup(b) {
        b.onLoad({ filter: /\.js$/ }, (args) => {
          if (!args.path.startsWith(dist)) return undefined;
          const src = readFileSync(args.path, 'utf8');
          if (!src.includes('import.meta.url')) return undefined;
          const rel = relative(here, args.path).split('\\').join('/');
          const own = `new URL(${JSON.stringify(rel.startsWith('.') ? rel : `./${rel}`)}, import.meta.url).href`;
          return { contents: src.split('import.meta.url').join(own), loader: 'js', resolveDir: dirname(args.path) };
        });
      },
    };
    try {
      await esbuild.build({
        entryPoints: [modules],
        outfile: entry,
        bundle: true,
        platform: 'node',
        format: 'esm',
        target: 'node20',
        external: ['opencv-wasm'],
        // CommonJS dependencies inside an ES module bundle call require()
        banner: { js: "import { createRequire as __fzCreateRequire } from 'node:module';\nconst require = __fzCreateRequire(import.meta.url);" },
        plugins: [metaUrl],
        logLevel: 'warning',
      });
      rmSync(modules);
    } catch (e) {
      renameSync(modules, entry);
      console.error(`postbuild: bundling failed (${e.message.split('\n')[0]}) — dist/cli/main.js left unbundled`);
    }
  }
  chmodSync(entry, 0o755);
}
