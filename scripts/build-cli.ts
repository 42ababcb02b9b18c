// Bundles the CLI with esbuild into dist/cli/: index.js holds the command definitions (and
// commander), and each command's action with its heavy dependencies (yaml, the engine,
// inquirer, chalk) is a chunk that is loaded only when that command runs. bin/weir.js imports
// dist/cli/index.js; dist/cli/check-worker.js is the worker thread of a large `weir check`. The metafile (dist/cli/meta.json) lets tests check what start-up loads.
import { build } from 'esbuild';
import { readFileSync, rmSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('..', import.meta.url));
const pkg = JSON.parse(readFileSync(`${root}package.json`, 'utf8')) as { version: string };
const outdir = `${root}dist/cli`;

rmSync(outdir, { recursive: true, force: true });
const result = await build({
  absWorkingDir: root,
  entryPoints: { index: 'cli/index.ts', 'check-worker': 'cli/check-worker.ts' },
  outdir,
  bundle: true,
  splitting: true,
  platform: 'node',
  format: 'esm',
  target: 'node20',
  minify: true,
  legalComments: 'none',
  chunkNames: 'chunks/[name]-[hash]',
  metafile: true,
  logLevel: 'warning',
  define: { __WEIR_VERSION__: JSON.stringify(pkg.version) },
  // CommonJS dependencies (cli-table3, cli-progress) call require() for Node built-ins.
  banner: { js: "import{createRequire as __weirRequire}from'node:module';const require=__weirRequire(import.meta.url);" },
});
writeFileSync(`${outdir}/meta.json`, JSON.stringify(result.metafile));
const bytes = Object.entries(result.metafile.outputs)
  .filter(([file]) => file.endsWith('.js'))
  .map(([file, out]) => `${file.replace(/^dist\/cli\//, '')} ${(out.bytes / 1024).toFixed(1)} kB`);
console.log(`weir CLI built: ${bytes.length} files in dist/cli (${bytes.find((b) => b.startsWith('index.js'))})`);
