// Bundles the server (and the engine it imports from shared/) into dist/server.js. Packages stay
// external: node_modules is there at run time, and sqlite3's native part cannot be bundled.
import { build } from 'esbuild';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('..', import.meta.url));

export async function buildServer(outfile = 'dist/server.js') {
  await build({
    absWorkingDir: root,
    entryPoints: ['server/main.ts'],
    outfile,
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    packages: 'external',
    sourcemap: true,
    logLevel: 'warning',
  });
  return outfile;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  console.log(`server built: ${await buildServer()}`);
}
