// Compiles schemas/site.schema.json once, ahead of time, into plain JavaScript (ajv standalone),
// so neither the CLI's start-up nor the browser (whose CSP forbids eval) compiles a schema.
import { readFileSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { siteValidatorSource } from './site-ajv.ts';

const root = fileURLToPath(new URL('..', import.meta.url));
const schema = JSON.parse(readFileSync(`${root}schemas/site.schema.json`, 'utf8'));
const target = `${root}shared/site/site-validator.generated.js`;
const next = siteValidatorSource(schema);
let previous = '';
try { previous = readFileSync(target, 'utf8'); } catch { /* first build */ }
if (previous !== next) writeFileSync(target, next);
console.log(`site validator ${previous === next ? 'up to date' : 'written'}: ${target}`);
