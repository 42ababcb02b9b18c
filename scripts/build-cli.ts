// Bundles the CLI with esbuild into dist/cli/: index.js holds the command definitions (and
// commander), and each command's action with its heavy dependencies (yaml, the engine,
// inquirer, chalk) is a chunk that is loaded only when that command runs. bin/weir.js imports
// dist/cli/index.js; dist/cli/check-worker.js is the worker thread of a large `weir check`.
// The metafile (dist/cli/meta.json) lets tests check what start-up loads.
import { build, type BuildOptions } from 'esbuild';
import { createHash } from 'node:crypto';
import { readFileSync, rmSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('..', import.meta.url));
const pkg = JSON.parse(readFileSync(`${root}package.json`, 'utf8')) as { version: string };
const outdir = `${root}dist/cli`;

const options: BuildOptions = {
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
  // CommonJS dependencies (cli-table3, cli-progress) call require() for Node built-ins.
  banner: { js: "import{createRequire as __weirRequire}from'node:module';const require=__weirRequire(import.meta.url);" },
};

// The check cache is valid for one engine build only: its id is a hash of every source file
// that goes into the bundle (the engine, the schema's validator, the yaml package, the CLI).
const dry = await build({ ...options, write: false, define: { __WEIR_VERSION__: '""', __WEIR_ENGINE_ID__: '""' } });
const hash = createHash('sha256').update(pkg.version);
for (const input of Object.keys(dry.metafile!.inputs).sort()) hash.update(input).update(readFileSync(`${root}${input}`));
const engineId = hash.digest('base64url').slice(0, 22);

rmSync(outdir, { recursive: true, force: true });
const result = await build({ ...options, define: { __WEIR_VERSION__: JSON.stringify(pkg.version), __WEIR_ENGINE_ID__: JSON.stringify(engineId) } });
writeFileSync(`${outdir}/meta.json`, JSON.stringify(result.metafile));
const entry = result.metafile!.outputs['dist/cli/index.js'];
const files = Object.keys(result.metafile!.outputs).filter((f) => f.endsWith('.js')).length;
console.log(`weir CLI built: ${files} files in dist/cli (start-up entry ${(entry.bytes / 1024).toFixed(1)} kB), engine ${engineId}`);
