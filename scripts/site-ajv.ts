import Ajv2020, { type Options } from 'ajv/dist/2020.js';

/** The one Ajv set-up for the site schema: used to build the standalone validator and in tests. */
export function createSiteAjv(extra: Options = {}) {
  // allErrors: the installer sees every problem at once; verbose: errors carry their parentSchema,
  // so an unknown key can be matched against the allowed ones ("did you mean …?").
  return new Ajv2020({ allErrors: true, verbose: true, strict: true, strictRequired: false, strictNumbers: true, ...extra });
}
