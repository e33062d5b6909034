// Bundle and minify the page's TypeScript (web/src/main.ts) into web/dist/ with esbuild.
// `node scripts/build-web.mjs` builds once; tests import `buildWeb()`.
import { build } from 'esbuild';
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');

/** Build web/dist/app.js and web/dist/app.css; returns the output sizes in bytes. */
export async function buildWeb({ minify = true, quiet = false } = {}) {
  const version = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8')).version;
  const t0 = performance.now();
  const result = await build({
    entryPoints: { app: join(root, 'web/src/main.ts') },
    outdir: join(root, 'web/dist'),
    bundle: true,
    minify,
    format: 'esm',
    target: ['chrome110', 'firefox110', 'safari16'],
    sourcemap: false,
    metafile: true,
    legalComments: 'none',
    define: { __BEATFORCE_VERSION__: JSON.stringify(version) },
    logLevel: 'silent',
  });
  const sizes = Object.fromEntries(Object.entries(result.metafile.outputs).map(([f, o]) => [f.replace(/^.*web\/dist\//, ''), o.bytes]));
  if (!quiet) console.log(`web/dist built in ${Math.round(performance.now() - t0)} ms: ${Object.entries(sizes).map(([f, b]) => `${f} ${(b / 1024).toFixed(1)} kB`).join(', ')}`);
  return sizes;
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  buildWeb().catch((e) => {
    console.error(e.message ?? e);
    process.exit(1);
  });
}
