// Bundles the server (and the engine it imports from shared/) into dist/server.js. Packages stay
// external: node_modules is there at run time, and sqlite3's native part cannot be bundled.
import { build } from 'esbuild';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('..', import.meta.url));
await build({
  absWorkingDir: root,
  entryPoints: ['server/main.ts'],
  outfile: 'dist/server.js',
  bundle: true,
  platform: 'node',
  format: 'esm',
  target: 'node20',
  packages: 'external',
  sourcemap: true,
  logLevel: 'warning',
});
console.log('server built: dist/server.js');
