// The build (scripts/build-cli.ts) replaces __WEIR_VERSION__ with package.json's version, so
// `weir --version` reads no file at start-up.
declare const __WEIR_VERSION__: string | undefined;

export const VERSION: string = typeof __WEIR_VERSION__ === 'string' ? __WEIR_VERSION__ : '0.0.0-dev';
