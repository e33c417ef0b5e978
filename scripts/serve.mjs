#!/usr/bin/env node
/**
 * Tiny static server for the built web app (dist-app/). Local only (127.0.0.1), no external
 * requests, correct MIME types (incl. application/wasm). Usage:
 *   node scripts/serve.mjs [--port 5178] [--root dist-app]     (or PORT=5178)
 * Exported: startServer({ root, port, host }) → Promise<{ url, port, close() }> for the e2e tests.
 */
import { createServer } from 'node:http';
import { createReadStream, existsSync, statSync } from 'node:fs';
import { extname, join, normalize, resolve, sep } from 'node:path';
import { fileURLToPath } from 'node:url';

const MIME = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.wasm': 'application/wasm',
  '.png': 'image/png',
  '.jpg': 'image/jpeg',
  '.jpeg': 'image/jpeg',
  '.tif': 'image/tiff',
  '.tiff': 'image/tiff',
  '.svg': 'image/svg+xml',
  '.ico': 'image/x-icon',
  '.csv': 'text/csv; charset=utf-8',
  '.txt': 'text/plain; charset=utf-8',
  '.map': 'application/json; charset=utf-8',
};

const defaultRoot = resolve(fileURLToPath(new URL('..', import.meta.url)), 'dist-app');

/**
 * Starts the static server.
 * @param {{root?: string, port?: number, host?: string}} [opts] port 0 = any free port
 * @returns {Promise<{url: string, port: number, close: () => Promise<void>}>}
 */
export function startServer(opts = {}) {
  const root = resolve(opts.root ?? defaultRoot);
  const host = opts.host ?? '127.0.0.1';
  const port = opts.port ?? 5178;
  if (!existsSync(join(root, 'index.html'))) {
    return Promise.reject(new Error(`no built app in ${root}: run "npm run build:app" first`));
  }
  const server = createServer((req, res) => {
    if (req.method !== 'GET' && req.method !== 'HEAD') {
      res.writeHead(405, { 'content-type': 'text/plain' }).end('method not allowed');
      return;
    }
    let pathname;
    try {
      pathname = decodeURIComponent(new URL(req.url ?? '/', 'http://localhost').pathname);
    } catch {
      res.writeHead(400, { 'content-type': 'text/plain' }).end('bad request');
      return;
    }
    if (pathname.endsWith('/')) pathname += 'index.html';
    const file = normalize(join(root, pathname));
    if (file !== root && !file.startsWith(root + sep)) {
      res.writeHead(403, { 'content-type': 'text/plain' }).end('forbidden');
      return;
    }
    let st;
    try {
      st = statSync(file);
    } catch {
      st = null;
    }
    if (!st || !st.isFile()) {
      res.writeHead(404, { 'content-type': 'text/plain' }).end('not found');
      return;
    }
    res.writeHead(200, {
      'content-type': MIME[extname(file).toLowerCase()] ?? 'application/octet-stream',
      'content-length': st.size,
      'cache-control': 'no-cache',
      'x-content-type-options': 'nosniff',
    });
    if (req.method === 'HEAD') {
      res.end();
      return;
    }
    createReadStream(file).pipe(res);
  });
  return new Promise((resolvePromise, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => {
      const addr = server.address();
      const actual = typeof addr === 'object' && addr ? addr.port : port;
      resolvePromise({
        url: `http://${host}:${actual}/`,
        port: actual,
        close: () =>
          new Promise((r) => {
            server.closeAllConnections?.();
            server.close(() => r());
          }),
      });
    });
  });
}

function parseArgs(argv) {
  const out = { port: process.env.PORT ? Number(process.env.PORT) : 5178, root: undefined };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === '--help' || a === '-h') {
      process.stdout.write('usage: node scripts/serve.mjs [--port N] [--root DIR]\nServes the built web app on 127.0.0.1 (default port 5178 or $PORT).\n');
      process.exit(0);
    } else if (a === '--port' || a.startsWith('--port=')) {
      const v = a.includes('=') ? a.slice(7) : argv[++i];
      out.port = Number(v);
    } else if (a === '--root' || a.startsWith('--root=')) {
      out.root = a.includes('=') ? a.slice(7) : argv[++i];
    } else {
      process.stderr.write(`serve: unknown option ${a}\n`);
      process.exit(2);
    }
  }
  if (!Number.isInteger(out.port) || out.port < 0 || out.port > 65535) {
    process.stderr.write('serve: --port must be an integer 0..65535\n');
    process.exit(2);
  }
  return out;
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const args = parseArgs(process.argv.slice(2));
  startServer(args).then(
    (s) => {
      process.stdout.write(`fractozone app: ${s.url}\n(Ctrl+C to stop; everything runs in your browser, nothing is uploaded)\n`);
      const stop = () => {
        s.close().then(() => process.exit(0));
        setTimeout(() => process.exit(0), 1000).unref();
      };
      process.on('SIGINT', stop);
      process.on('SIGTERM', stop);
    },
    (e) => {
      process.stderr.write(`serve: ${e.message}\n`);
      process.exit(1);
    },
  );
}
