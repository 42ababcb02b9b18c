// A seeded generator of varied site files for the benchmarks. It starts from the demo fleet's
// site files (examples/*.yaml that pass the schema) plus two built-in bases, and varies ids,
// names, ratings, lengths, generation and evidence through the YAML document, so comments and
// layout of the base survive. Every file it writes passes the schema; some are given a fault on
// purpose (a reversed CT, a limit typed in W, a long bus, ...) so that the rules find things.
//
//   npx tsx bench/generate-sites.ts --count 1000 --seed 7 --out bench/.out/sites
import { mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { isMap, isSeq, parseDocument, Scalar, type Document } from 'yaml';
import { parseSite } from '../shared/index.ts';

const repoRoot = fileURLToPath(new URL('..', import.meta.url));

export interface GeneratedSite {
  /** File name, `<site id>.yaml`. */
  file: string;
  id: string;
  text: string;
}

export interface BaseSite {
  name: string;
  text: string;
}

/** mulberry32: a tiny, well-mixed 32-bit generator; enough for test data, not for secrets. */
export function createRng(seed: number) {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return {
    next,
    int: (min: number, max: number) => min + Math.floor(next() * (max - min + 1)),
    pick: <T>(items: readonly T[]): T => items[Math.floor(next() * items.length)],
    chance: (p: number) => next() < p,
    /** A value scaled by a factor in [1 - spread, 1 + spread], rounded to `digits`. */
    jitter: (value: number, spread: number, digits = 2) => round(value * (1 + (next() * 2 - 1) * spread), digits),
  };
}
type Rng = ReturnType<typeof createRng>;

const round = (v: number, digits: number) => Math.round(v * 10 ** digits) / 10 ** digits;

/** One independent stream per file, so file i is the same whatever the count. */
const fileSeed = (seed: number, index: number) => Math.imul(seed ^ 0x9e3779b9, 0x85ebca6b) ^ Math.imul(index + 1, 0xc2b2ae35);

// Invented words for invented sites; none of them is a real firm, person or street.
const NAME_FIRST = ['Alder', 'Bramble', 'Copper', 'Dunmore', 'Elmstead', 'Fernhill', 'Gorse', 'Hazel', 'Ivybank', 'Juniper', 'Kestrel', 'Larch', 'Moorfield', 'Nettle', 'Oakridge', 'Pebble', 'Quarry', 'Rushby', 'Sorrel', 'Thistle', 'Upton', 'Vetch', 'Willowby', 'Yarrow'];
const NAME_SECOND = ['Bakery', 'Barns', 'Cottage', 'Dairy', 'Farm', 'Garage', 'Hall', 'House', 'Library', 'Mill', 'Nursery', 'Pavilion', 'Rectory', 'School', 'Stores', 'Studio', 'Surgery', 'Workshop'];
const STREET = ['Kestrelmoor Lane', 'Quillby Road', 'Orchardine Way', 'Brackenfold Row', 'Tansy Close', 'Wrenholt Street'];

const BUILT_IN_BASES: BaseSite[] = [
  {
    name: 'built-in: three-phase-4w',
    text: `# yaml-language-server: $schema=../schemas/site.schema.json
weir: 1
site:
  id: alder-bakery
  name: Alder Bakery
  address: 14 Kestrelmoor Lane
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
  - id: ct-2
    ratedPrimaryA: 100
    secondary: 5A
    accuracyClass: "1"
    ratedBurdenVa: 2.5
    lead: { lengthM: 4, csaMm2: 2.5 }
    arrow: toward-load
  - id: ct-3
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
    units: 4
    unitAcKw: 0.4
    phase: L1
  - id: roof-south
    units: 4
    unitAcKw: 0.4
    phase: L2
  - id: roof-west
    units: 4
    unitAcKw: 0.4
    phase: L3
export:
  control: enabled
  scope: aggregate
  limitKw: 5
  failSafe: { action: curtail-to-limit, afterS: 5 }
commissioning:
  date: "2026-11-20"
  readings:
    - label: loads-on-generation-off
      expect: import
      L1: { v: 231, a: 12.1, kw: 2.62 }
      L2: { v: 229, a: 8.0, kw: 1.75 }
      L3: { v: 232, a: 5.2, kw: 1.15 }
  exportTest: { observedMaxKw: 4.9, settleS: 8 }
  failSafeTest: { observedS: 4 }
`,
  },
  {
    name: 'built-in: single-phase',
    text: `# yaml-language-server: $schema=../schemas/site.schema.json
weir: 1
site:
  id: hazel-cottage
  name: Hazel Cottage
agreement:
  reference: NOA-3107
  exportLimitKw: 3.68
  profile: gb-g100
service:
  arrangement: single-phase
  voltageLn: 230
  frequencyHz: 50
  mainBreakerA: 60
meter:
  serial: EM-11802
  position: grid-connection
  modbus: { address: 2, baud: 9600, parity: none, stopBits: 2 }
  voltageInputs: { V1: L1, N: N }
  currentInputs:
    I1: { ct: ct-1, conductor: L1 }
cts:
  - id: ct-1
    ratedPrimaryA: 100
    secondary: 333mV
    accuracyClass: "1"
    arrow: toward-load
gateway:
  serial: GW-7710
  bus:
    lengthM: 12
    baud: 9600
    terminations: [gateway, meter]
    devices: 2
generation:
  - id: garage-roof
    units: 8
    unitAcKw: 0.6
    phase: L1
export:
  control: enabled
  scope: aggregate
  limitKw: 3.68
  failSafe: { action: curtail-to-zero, afterS: 10 }
`,
  },
];

/** The bases: the two built-in ones, then every example that passes the schema. */
export function loadBases(examplesDir = join(repoRoot, 'examples')): BaseSite[] {
  const bases = [...BUILT_IN_BASES];
  let names: string[] = [];
  try {
    names = readdirSync(examplesDir).filter((n) => /\.ya?ml$/.test(n)).sort();
  } catch {
    // No demo fleet yet: the built-in bases are enough to vary.
  }
  for (const name of names) {
    const text = readFileSync(join(examplesDir, name), 'utf8');
    if (parseSite(text).site) bases.push({ name: `examples/${name}`, text });
  }
  return bases;
}

type Path = (string | number)[];

function setNumber(doc: Document, path: Path, value: number) {
  if (doc.hasIn(path)) doc.setIn(path, value);
}

function getNumber(doc: Document, path: Path): number | undefined {
  const v = doc.getIn(path);
  return typeof v === 'number' ? v : undefined;
}

function seqLength(doc: Document, path: Path): number {
  const node = doc.getIn(path, true);
  return isSeq(node) ? node.items.length : 0;
}

function quoted(value: string) {
  const s = new Scalar(value);
  s.type = Scalar.QUOTE_DOUBLE;
  return s;
}

function vary(doc: Document, rng: Rng, id: string, name: string) {
  doc.setIn(['site', 'id'], id);
  doc.setIn(['site', 'name'], name);
  if (doc.hasIn(['site', 'address']) || rng.chance(0.5)) doc.setIn(['site', 'address'], `${rng.int(1, 240)} ${rng.pick(STREET)}`);

  doc.setIn(['agreement', 'reference'], `NOA-${rng.int(1000, 99999)}`);
  const agreed = getNumber(doc, ['agreement', 'exportLimitKw']) ?? 5;
  const newAgreed = rng.pick([agreed, agreed, 0, 3.68, 5, 10, 15]);
  setNumber(doc, ['agreement', 'exportLimitKw'], newAgreed);
  if (rng.chance(0.15)) doc.setIn(['agreement', 'profile'], rng.pick(['gb-g100', 'au-4777', 'de-4105', 'us-pcs', 'generic']));

  setNumber(doc, ['service', 'mainBreakerA'], rng.pick([60, 63, 80, 100]));

  doc.setIn(['meter', 'serial'], `EM-${rng.int(10000, 99999)}`);
  setNumber(doc, ['meter', 'modbus', 'address'], rng.int(1, 247));

  const ctRated = rng.pick([100, 100, 120, 150, 200]);
  for (let i = 0; i < seqLength(doc, ['cts']); i++) {
    setNumber(doc, ['cts', i, 'ratedPrimaryA'], ctRated);
    setNumber(doc, ['cts', i, 'lead', 'lengthM'], rng.int(1, 6));
  }

  doc.setIn(['gateway', 'serial'], `GW-${rng.int(1000, 9999)}`);
  setNumber(doc, ['gateway', 'bus', 'lengthM'], rng.int(3, 400));

  // One inverter model per site and about as many on each group, as installers balance phases.
  const units = rng.int(2, 12);
  const unitAcKw = rng.pick([0.3, 0.4, 0.6, 0.8, 1.2]);
  for (let i = 0; i < seqLength(doc, ['generation']); i++) {
    setNumber(doc, ['generation', i, 'units'], Math.max(1, units + rng.int(-1, 1)));
    setNumber(doc, ['generation', i, 'unitAcKw'], unitAcKw);
  }

  const limit = Math.min(newAgreed, getNumber(doc, ['export', 'limitKw']) ?? newAgreed);
  setNumber(doc, ['export', 'limitKw'], limit);
  for (const phase of ['L1', 'L2', 'L3']) {
    const perPhase = getNumber(doc, ['export', 'perPhaseLimitKw', phase]);
    if (perPhase !== undefined) setNumber(doc, ['export', 'perPhaseLimitKw', phase], round(Math.min(perPhase, limit / 3), 2));
  }
  setNumber(doc, ['export', 'failSafe', 'afterS'], rng.int(2, 12));

  if (doc.hasIn(['commissioning'])) {
    if (rng.chance(0.2)) {
      doc.deleteIn(['commissioning']);
    } else {
      doc.setIn(['commissioning', 'date'], quoted(`2026-${String(rng.int(1, 12)).padStart(2, '0')}-${String(rng.int(1, 28)).padStart(2, '0')}`));
      for (let r = 0; r < seqLength(doc, ['commissioning', 'readings']); r++) {
        for (const phase of ['L1', 'L2', 'L3']) {
          for (const key of ['v', 'a', 'kw']) {
            const v = getNumber(doc, ['commissioning', 'readings', r, phase, key]);
            if (v !== undefined) setNumber(doc, ['commissioning', 'readings', r, phase, key], key === 'v' ? rng.jitter(v, 0.02, 0) : rng.jitter(v, 0.1));
          }
        }
      }
      const observed = getNumber(doc, ['commissioning', 'exportTest', 'observedMaxKw']);
      if (observed !== undefined) setNumber(doc, ['commissioning', 'exportTest', 'observedMaxKw'], round(limit * (0.9 + rng.next() * 0.08), 2));
      setNumber(doc, ['commissioning', 'failSafeTest', 'observedS'], 1);
    }
  }

  // Faults the rules should find, each in a few files.
  if (rng.chance(0.05) && doc.hasIn(['cts', 0, 'arrow'])) doc.setIn(['cts', 0, 'arrow'], 'toward-grid');
  if (rng.chance(0.04)) setNumber(doc, ['export', 'limitKw'], limit * 1000);
  if (rng.chance(0.04)) setNumber(doc, ['gateway', 'bus', 'lengthM'], rng.int(1001, 1500));
  if (rng.chance(0.04)) setNumber(doc, ['gateway', 'bus', 'baud'], 19200);
  if (rng.chance(0.04)) setNumber(doc, ['export', 'failSafe', 'afterS'], rng.int(40, 90));
}

/** `count` site files for `seed`: the same seed always gives the same files. */
export function generateSites(count: number, seed: number, bases: BaseSite[] = loadBases(), firstIndex = 0): GeneratedSite[] {
  const parsed = bases.map((b) => parseDocument(b.text, { version: '1.2' }));
  const out: GeneratedSite[] = [];
  for (let index = firstIndex; index < firstIndex + count; index++) {
    const rng = createRng(fileSeed(seed, index));
    const base = parsed[Math.floor(rng.next() * parsed.length)];
    const doc = base.clone();
    const words = [rng.pick(NAME_FIRST), rng.pick(NAME_SECOND)];
    const id = `${words.join('-').toLowerCase()}-${seed.toString(36)}-${index.toString(36).padStart(4, '0')}`;
    vary(doc, rng, id, `${words.join(' ')} ${index + 1}`);
    if (!isMap(doc.contents)) throw new Error('a base site file is not a mapping');
    out.push({ file: `${id}.yaml`, id, text: doc.toString({ lineWidth: 0 }) });
  }
  return out;
}

/** Writes `count` files for `seed` into `dir` (emptied first) and returns them. */
export function writeSites(dir: string, count: number, seed: number, bases?: BaseSite[]): GeneratedSite[] {
  rmSync(dir, { recursive: true, force: true });
  mkdirSync(dir, { recursive: true });
  const sites = generateSites(count, seed, bases);
  for (const s of sites) writeFileSync(join(dir, s.file), s.text);
  return sites;
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const arg = (name: string, fallback: string) => {
    const i = process.argv.indexOf(`--${name}`);
    return i > 0 && process.argv[i + 1] ? process.argv[i + 1] : fallback;
  };
  const count = Number(arg('count', '1000'));
  const seed = Number(arg('seed', '1'));
  const dir = resolve(arg('out', join(repoRoot, 'bench/.out/sites')));
  if (!Number.isInteger(count) || count < 1 || !Number.isInteger(seed)) {
    console.error('usage: tsx bench/generate-sites.ts [--count N] [--seed S] [--out DIR]');
    process.exitCode = 2;
  } else {
    const bases = loadBases();
    writeSites(dir, count, seed, bases);
    console.log(`${count} site files (seed ${seed}, ${bases.length} bases) in ${dir}`);
  }
}
