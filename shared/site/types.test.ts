// The TypeScript types, the JSON Schema and site-format.md must describe one format. This file
// checks them against each other, checks that the generated validator is the schema's, and that
// shared/ stays free of Node-only imports (the reviewer bundles it for the browser).
import { readFileSync, readdirSync, statSync } from 'node:fs';
import { builtinModules } from 'node:module';
import { fileURLToPath } from 'node:url';
import { describe, expect, expectTypeOf, it } from 'vitest';
import { parse } from 'yaml';
import { createSiteAjv, siteValidatorSource } from '../../scripts/site-ajv.ts';
import { validateSite } from './site-validator.generated.js';
import {
  SITE_KEYS, type Agreement, type Bus, type BusStub, type Commissioning, type Ct, type CtLead, type CurrentInput, type ExportPolicy,
  type FailSafe, type Gateway, type GenerationGroup, type Meter, type ModbusSettings, type Reading, type Service, type Site,
  type SiteIdentity, type Snapshot,
} from './types.ts';
import { baseThreePhaseSite, mutated } from '../test-support/base-site.ts';

const root = fileURLToPath(new URL('../../', import.meta.url));
type JsonSchema = Record<string, unknown> & { properties?: Record<string, JsonSchema>; items?: JsonSchema; $ref?: string; enum?: unknown[] };
const schema = JSON.parse(readFileSync(`${root}schemas/site.schema.json`, 'utf8')) as JsonSchema;

function resolve(node: JsonSchema): { node: JsonSchema; ref?: string } {
  if (!node.$ref) return { node };
  const path = node.$ref.replace(/^#\//, '').split('/');
  let target: unknown = schema;
  for (const p of path) target = (target as Record<string, unknown>)[p];
  return { node: { ...(target as JsonSchema), ...node, $ref: undefined }, ref: node.$ref };
}

interface SchemaObject { keys: string[]; ref?: string }

/** Every object with `properties` in the schema, by location in the SITE_KEYS notation (`cts[]`, `gateway.bus`). */
function schemaObjects(): Map<string, SchemaObject> {
  const out = new Map<string, SchemaObject>();
  const walk = (raw: JsonSchema, location: string, ref?: string) => {
    const { node, ref: ownRef } = resolve(raw);
    if (node.properties) {
      out.set(location, { keys: Object.keys(node.properties), ref: ownRef ?? ref });
      for (const [key, child] of Object.entries(node.properties)) walk(child, location === '' ? key : `${location}.${key}`);
    }
    if (node.items) walk(node.items, `${location}[]`);
  };
  walk(schema, '');
  return out;
}

/** The schema node at a SITE_KEYS-style location, resolved. */
function schemaAt(location: string): JsonSchema {
  let node = schema;
  if (location === '') return node;
  for (const part of location.split('.')) {
    const array = part.endsWith('[]');
    const key = array ? part.slice(0, -2) : part;
    node = resolve(node.properties![key]).node;
    if (array) node = resolve(node.items!).node;
  }
  return node;
}

describe('SITE_KEYS agree with the schema', () => {
  const objects = schemaObjects();

  it.each(Object.entries(SITE_KEYS))('%s has the schema\'s keys', (location, keys) => {
    const inSchema = objects.get(location);
    expect(inSchema, `schema has no object at ${location || 'the top'}`).toBeDefined();
    expect([...keys].sort()).toEqual([...inSchema!.keys].sort());
  });

  it('every object in the schema is in SITE_KEYS, or is a $ref to one that is', () => {
    const listed = new Set(Object.keys(SITE_KEYS));
    const coveredRefs = new Set([...objects].filter(([loc]) => listed.has(loc)).map(([, o]) => o.ref).filter(Boolean));
    const missing = [...objects].filter(([loc, o]) => !listed.has(loc) && !(o.ref && coveredRefs.has(o.ref))).map(([loc]) => loc);
    expect(missing).toEqual([]);
  });

  it('the interfaces have exactly the keys of SITE_KEYS (checked by tsc: npm run typecheck)', () => {
    type Keys<L extends keyof typeof SITE_KEYS> = (typeof SITE_KEYS)[L][number];
    expectTypeOf<keyof Site>().toEqualTypeOf<Keys<''>>();
    expectTypeOf<keyof SiteIdentity>().toEqualTypeOf<Keys<'site'>>();
    expectTypeOf<keyof Agreement>().toEqualTypeOf<Keys<'agreement'>>();
    expectTypeOf<keyof Service>().toEqualTypeOf<Keys<'service'>>();
    expectTypeOf<keyof Meter>().toEqualTypeOf<Keys<'meter'>>();
    expectTypeOf<keyof ModbusSettings>().toEqualTypeOf<Keys<'meter.modbus'>>();
    expectTypeOf<keyof Meter['voltageInputs']>().toEqualTypeOf<Keys<'meter.voltageInputs'>>();
    expectTypeOf<keyof Meter['currentInputs']>().toEqualTypeOf<Keys<'meter.currentInputs'>>();
    expectTypeOf<keyof CurrentInput>().toEqualTypeOf<Keys<'meter.currentInputs.I1'>>();
    expectTypeOf<keyof Ct>().toEqualTypeOf<Keys<'cts[]'>>();
    expectTypeOf<keyof CtLead>().toEqualTypeOf<Keys<'cts[].lead'>>();
    expectTypeOf<keyof Gateway>().toEqualTypeOf<Keys<'gateway'>>();
    expectTypeOf<keyof Bus>().toEqualTypeOf<Keys<'gateway.bus'>>();
    expectTypeOf<keyof BusStub>().toEqualTypeOf<Keys<'gateway.bus.stubs[]'>>();
    expectTypeOf<keyof GenerationGroup>().toEqualTypeOf<Keys<'generation[]'>>();
    expectTypeOf<keyof ExportPolicy>().toEqualTypeOf<Keys<'export'>>();
    expectTypeOf<keyof NonNullable<ExportPolicy['perPhaseLimitKw']>>().toEqualTypeOf<Keys<'export.perPhaseLimitKw'>>();
    expectTypeOf<keyof FailSafe>().toEqualTypeOf<Keys<'export.failSafe'>>();
    expectTypeOf<keyof Commissioning>().toEqualTypeOf<Keys<'commissioning'>>();
    expectTypeOf<keyof Snapshot>().toEqualTypeOf<Keys<'commissioning.readings[]'>>();
    expectTypeOf<keyof Reading>().toEqualTypeOf<Keys<'commissioning.readings[].L1'>>();
    expectTypeOf<keyof NonNullable<Commissioning['exportTest']>>().toEqualTypeOf<Keys<'commissioning.exportTest'>>();
    expectTypeOf<keyof NonNullable<Commissioning['failSafeTest']>>().toEqualTypeOf<Keys<'commissioning.failSafeTest'>>();
  });
});

describe('the schema\'s enums are those of site-format.md', () => {
  // Copied from site-format.md ("The site file, format 1"), the agreed shape of the file.
  const SITE_FORMAT_ENUMS: Record<string, unknown[]> = {
    'agreement.profile': ['gb-g100', 'au-4777', 'de-4105', 'us-pcs', 'generic'],
    'service.arrangement': ['single-phase', 'split-phase', 'three-phase-4w', 'three-phase-3w'],
    'service.frequencyHz': [50, 60],
    'meter.position': ['grid-connection', 'generation-feeder'],
    'meter.modbus.parity': ['none', 'even', 'odd'],
    'meter.voltageInputs.V1': ['L1', 'L2', 'L3', 'N'], // "Conductor names are L1, L2, L3 and N"
    'meter.voltageInputs.N': ['L1', 'L2', 'L3', 'N'],
    'meter.currentInputs.I1.conductor': ['L1', 'L2', 'L3', 'N'],
    'cts[].secondary': ['5A', '1A', '333mV', '100mA', '50mA', '40mA'],
    'cts[].accuracyClass': ['0.2', '0.2S', '0.5', '0.5S', '1', '3'],
    'cts[].arrow': ['toward-load', 'toward-grid'],
    'generation[].phase': ['L1', 'L2', 'L3', 'all'],
    'export.control': ['enabled', 'disabled'],
    'export.scope': ['aggregate', 'per-phase'],
    'export.failSafe.action': ['curtail-to-limit', 'curtail-to-zero', 'disconnect'],
    'commissioning.readings[].expect': ['import', 'export', 'any'],
  };

  it.each(Object.entries(SITE_FORMAT_ENUMS))('%s', (location, values) => {
    expect([...(schemaAt(location).enum ?? [])].sort()).toEqual([...values].sort());
  });

  it('weir is const 1 and the site id pattern is ^[a-z0-9][a-z0-9-]{1,62}$', () => {
    // site-format.md: `weir: 1` format version, required, const 1; site.id pattern
    expect(schemaAt('weir').const).toBe(1);
    expect(schemaAt('site.id').pattern).toBe('^[a-z0-9][a-z0-9-]{1,62}$');
  });

  it('the required keys are those of site-format.md', () => {
    // site-format.md: every top-level section is required except commissioning ("optional: evidence from site")
    expect([...(schema.required as string[])].sort()).toEqual(['agreement', 'cts', 'export', 'gateway', 'generation', 'meter', 'service', 'site', 'weir']);
    expect([...(schemaAt('site').required as string[])].sort()).toEqual(['id', 'name']);
    expect([...(schemaAt('agreement').required as string[])].sort()).toEqual(['exportLimitKw', 'profile', 'reference']);
  });

  it('the conditional rules of site-format.md hold', () => {
    const ok = (change: (s: Site) => void) => validateSite(mutated(baseThreePhaseSite(), change));
    expect(ok(() => {})).toBe(true);
    // voltageLn: required unless three-phase-3w
    expect(ok((s) => { s.service = { arrangement: 'three-phase-3w', voltageLl: 400, frequencyHz: 50, mainBreakerA: 100 }; })).toBe(true);
    expect(ok((s) => { s.service = { arrangement: 'single-phase', frequencyHz: 50, mainBreakerA: 100 }; })).toBe(false);
    // voltageLl: required for three-phase-*
    expect(ok((s) => { delete s.service.voltageLl; })).toBe(false);
    // exportLimitKw: >= 0 (0 = zero export)
    expect(ok((s) => { s.agreement.exportLimitKw = 0; })).toBe(true);
    expect(ok((s) => { s.agreement.exportLimitKw = -1; })).toBe(false);
    // generation: required, at least one entry
    expect(ok((s) => { s.generation = []; })).toBe(false);
    // perPhaseLimitKw: required when scope is per-phase
    expect(ok((s) => { s.export.scope = 'per-phase'; })).toBe(false);
    expect(ok((s) => { s.export.scope = 'per-phase'; s.export.perPhaseLimitKw = { L1: 3, L2: 3, L3: 3 }; })).toBe(true);
    // commissioning: optional
    expect(ok((s) => { delete s.commissioning; })).toBe(true);
  });

  it('accepts the example file printed in site-format.md', () => {
    // Copied from site-format.md: "This page is the agreed shape that the schema has to accept."
    const text = `
weir: 1
site:
  id: mill-lane-bakery
  name: Mill Lane Bakery
  address: 14 Mill Lane
agreement:
  reference: NOA-2291
  exportLimitKw: 5
  profile: gb-g100
service:
  arrangement: three-phase-4w
  voltageLn: 230
  voltageLl: 400
  frequencyHz: 50
  mainBreakerA: 80
meter:
  serial: EM-20931
  position: grid-connection
  modbus: { address: 1, baud: 9600, parity: even, stopBits: 1 }
  voltageInputs: { V1: L1, V2: L2, V3: L3, N: N }
  currentInputs:
    I1: { ct: ct-1, conductor: L1 }
    I2: { ct: ct-2, conductor: L2 }
    I3: { ct: ct-3, conductor: L3 }
cts:
  - id: ct-1
    ratedPrimaryA: 100
    secondary: 5A
    accuracyClass: "1"
    ratedBurdenVa: 2.5
    lead: { lengthM: 4, csaMm2: 2.5 }
    arrow: toward-load
gateway:
  serial: GW-5521
  bus:
    lengthM: 25
    baud: 9600
    terminations: [gateway, meter]
    stubs: [{ device: meter, lengthM: 0.5 }]
    devices: 2
generation:
  - id: roof-east
    units: 10
    unitAcKw: 0.4
    phase: L1
export:
  control: enabled
  scope: aggregate
  limitKw: 5
  perPhaseLimitKw: { L1: 1.6, L2: 1.6, L3: 1.6 }
  failSafe: { action: curtail-to-limit, afterS: 5 }
commissioning:
  date: 2026-11-20
  readings:
    - label: loads-on-generation-off
      expect: import
      L1: { v: 231, a: 12.1, kw: 2.62 }
      L2: { v: 229, a: 8.0, kw: 1.75 }
      L3: { v: 232, a: 5.2, kw: 1.15 }
  exportTest: { observedMaxKw: 4.9, settleS: 8 }
  failSafeTest: { observedS: 4 }
`;
    expect(validateSite(parse(text, { version: '1.2' }))).toBe(true);
  });
});

describe('shared/site/site-validator.generated.js', () => {
  it('is what scripts/build-validator.ts makes from the schema today (npm run build:validator)', () => {
    const onDisk = readFileSync(`${root}shared/site/site-validator.generated.js`, 'utf8');
    expect(onDisk === siteValidatorSource(schema), 'the generated validator is stale: run npm run build:validator').toBe(true);
  });

  it('gives the same answers and errors as the schema compiled now, on every example and on broken sites', () => {
    const live = createSiteAjv().compile(schema);
    const examples = readdirSync(`${root}examples`).filter((f) => f.endsWith('.yaml')).map((f) => parse(readFileSync(`${root}examples/${f}`, 'utf8'), { version: '1.2' }));
    const broken: unknown[] = [
      {}, null, [], 'text', 1,
      mutated(baseThreePhaseSite(), (s) => { (s as { weir: number }).weir = 2; }),
      mutated(baseThreePhaseSite(), (s) => { (s.agreement as { profile: string }).profile = 'gb-g99'; }),
      mutated(baseThreePhaseSite(), (s) => { delete (s.service as Partial<Service>).voltageLl; }),
      mutated(baseThreePhaseSite(), (s) => { (s.cts[0] as unknown as Record<string, unknown>).extra = 1; }),
      mutated(baseThreePhaseSite(), (s) => { s.export.limitKw = Number.NaN; }),
      mutated(baseThreePhaseSite(), (s) => { s.meter.modbus.address = 1.5; }),
      mutated(baseThreePhaseSite(), (s) => { s.site.id = 'Upper Case'; }),
    ];
    expect(examples.length).toBeGreaterThan(0);
    for (const data of [...examples, ...broken]) {
      const expected = live(data);
      expect(validateSite(data)).toBe(expected);
      const summary = (errors: { instancePath: string; keyword: string }[] | null | undefined) => (errors ?? []).map((e) => `${e.instancePath} ${e.keyword}`).sort();
      expect(summary((validateSite as unknown as { errors?: never[] }).errors)).toEqual(summary(live.errors as never[]));
    }
  });
});

describe('shared/ is pure', () => {
  const NODE_ONLY = new Set([...builtinModules, 'chalk', 'process']);
  const files: string[] = [];
  const walk = (dir: string) => {
    for (const name of readdirSync(dir)) {
      const full = `${dir}/${name}`;
      if (statSync(full).isDirectory()) walk(full);
      else if (/\.(ts|tsx|js|mjs|cjs|json)$/.test(name) && !/\.test\.tsx?$/.test(name)) files.push(full);
    }
  };
  walk(`${root}shared`);

  it('found the engine\'s files', () => {
    expect(files.some((f) => f.endsWith('shared/index.ts'))).toBe(true);
    expect(files.some((f) => f.endsWith('site-validator.generated.js'))).toBe(true);
  });

  it('no non-test file under shared/ imports node:*, a Node built-in, process or chalk', () => {
    const offenders: string[] = [];
    for (const file of files.filter((f) => !f.endsWith('.json'))) {
      const text = readFileSync(file, 'utf8');
      const specifiers = [
        ...text.matchAll(/\b(?:import|export)\b[^'"`;]*?\bfrom\s*['"]([^'"]+)['"]/g),
        ...text.matchAll(/\bimport\s*['"]([^'"]+)['"]/g),
        ...text.matchAll(/\b(?:require|import)\s*\(\s*['"]([^'"]+)['"]\s*\)/g),
      ].map((m) => m[1]);
      for (const s of specifiers) {
        if (s.startsWith('node:') || NODE_ONLY.has(s) || NODE_ONLY.has(s.split('/')[0])) offenders.push(`${file.slice(root.length)}: ${s}`);
      }
    }
    expect(offenders).toEqual([]);
  });

  it('no non-test file under shared/ uses Node-only globals (process, require, Buffer, __dirname)', () => {
    const offenders: string[] = [];
    for (const file of files.filter((f) => !f.endsWith('.json'))) {
      // Comments may name these words; code may not.
      const code = readFileSync(file, 'utf8').replace(/\/\*[\s\S]*?\*\//g, '').replace(/(^|[^:'"`])\/\/.*$/gm, '$1');
      for (const m of code.matchAll(/\b(process\s*[.[]|require\s*\(|Buffer\s*\.|__dirname|__filename)/g)) offenders.push(`${file.slice(root.length)}: ${m[1]}`);
    }
    expect(offenders).toEqual([]);
  });

  it('the purity check would catch an import (self-test on sample text)', () => {
    const sample = "import { readFileSync } from 'node:fs';\nimport chalk from 'chalk';\nconst x = await import('fs');";
    const found = [...sample.matchAll(/\b(?:import|export)\b[^'"`;]*?\bfrom\s*['"]([^'"]+)['"]/g), ...sample.matchAll(/\b(?:require|import)\s*\(\s*['"]([^'"]+)['"]\s*\)/g)].map((m) => m[1]);
    expect(found).toEqual(['node:fs', 'chalk', 'fs']);
  });
});
