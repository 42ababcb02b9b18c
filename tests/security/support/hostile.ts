// Hostile site files and values, shared by the API property tests and the `weir check` test so
// that both face the same inputs. Each generator starts from the valid fixture site file and
// breaks it in one way, so a refusal is about that one thing.
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import fc from 'fast-check';

const here = path.dirname(fileURLToPath(import.meta.url));
export const FIXTURE = readFileSync(path.join(here, '../../api/fixtures/mill-lane.yaml'), 'utf8');
export const FIXTURE_LINES = FIXTURE.split('\n');

/** Keys that reach the prototype when code copies an object carelessly. */
export const PROTOTYPE_KEYS = ['__proto__', 'constructor', 'prototype'];

/** Path and SQL fragments an attacker tries in ids and names. */
export const ID_FRAGMENTS = [
  '../', '..\\', '../../etc/passwd', '%2e%2e%2f', '..%2f', '/etc/passwd', 'C:\\Windows\\win.ini',
  "' OR '1'='1", "1; DROP TABLE sites; --", '" OR ""="', '1 OR 1=1', "'); DELETE FROM revisions; --", 'UNION SELECT * FROM users',
  '\u0000', '\r\nX-Injected: 1', '<script>alert(1)</script>', '${7*7}', '{{7*7}}', '%00', '*', '?', '#',
];

/** Markup that must stay text wherever a name is shown. */
export const HTML_NAMES = [
  '<script>window.__weirXss = 1</script>',
  '<img src=x onerror="window.__weirXss = 2">',
  '"><svg onload="window.__weirXss = 3">',
  "<a href=\"javascript:window.__weirXss = 4\">click</a>",
  '<iframe srcdoc="<script>parent.__weirXss = 5</script>"></iframe>',
];

/** Numbers YAML reads as not-a-number or infinite. */
export const NON_FINITE = ['.nan', '.NaN', '.NAN', '.inf', '-.inf', '+.inf', '.Inf', '-.INF', '1e999', '-1e999'];

/** Magnitudes no real site has: a typo (watts for kW) or an attack on the arithmetic. */
export const ABSURD = ['1e300', '9007199254740993'];

/** Each `key: number` in the fixture, as [offset, key, number text]. */
export const NUMERIC_FIELDS: [number, string, string][] = [...FIXTURE.matchAll(/\b([A-Za-z][A-Za-z0-9]*): (-?\d+(?:\.\d+)?)\b/g)]
  .filter((m) => m[1] !== 'weir')
  .map((m) => [m.index! + m[1].length + 2, m[1], m[2]]);

/** A readable path for a numeric field: the block keys above it, the flow mapping it is in, its key. */
export function fieldLabel([at, key]: [number, string, string]): string {
  const before = FIXTURE.slice(0, at);
  const lines = before.split('\n');
  const line = lines.pop()!;
  const indent = /^\s*/.exec(line)![0].length;
  const blocks: string[] = [];
  let depth = indent;
  for (const l of lines.reverse()) {
    const m = /^(\s*)([A-Za-z]\w*):\s*$/.exec(l);
    if (m && m[1].length < depth) {
      blocks.unshift(m[2]);
      depth = m[1].length;
    }
  }
  const parent = [...line.matchAll(/(\w+): [[{]/g)].pop()?.[1];
  return [...blocks, parent, key].filter(Boolean).join('.');
}

/** The fixture with the number at `field` replaced by `value`. */
export function withNumber(field: [number, string, string], value: string): string {
  const [at, , old] = field;
  return FIXTURE.slice(0, at) + value + FIXTURE.slice(at + old.length);
}

/** A YAML alias bomb ("billion laughs"): `depth` levels, each `width` aliases of the one before. */
export function aliasBomb(width: number, depth: number): string {
  const lines = [`l0: &l0 [${Array(width).fill('"lol"').join(', ')}]`];
  for (let i = 1; i <= depth; i++) lines.push(`l${i}: &l${i} [${Array(width).fill(`*l${i - 1}`).join(', ')}]`);
  return lines.join('\n') + '\n';
}

/** `depth` levels of nesting, in flow or block form, under a key of the fixture. */
export function deepNesting(depth: number, form: 'flow-seq' | 'flow-map' | 'block-seq'): string {
  const value = form === 'flow-seq' ? '['.repeat(depth) + ']'.repeat(depth) : form === 'flow-map' ? '{a: '.repeat(depth) + '1' + '}'.repeat(depth) : '- '.repeat(depth) + 'x';
  return FIXTURE.replace('  name: Mill Lane Bakery', form === 'block-seq' ? `  name: Mill Lane Bakery\n  notes:\n    ${value}` : `  name: Mill Lane Bakery\n  notes: ${value}`);
}

/** Invalid UTF-8: a lone continuation byte, an overlong form, a surrogate, a cut-off sequence, … */
export const BAD_UTF8: number[][] = [[0xff], [0xfe], [0x80], [0xc0, 0x80], [0xc1, 0xbf], [0xed, 0xa0, 0x80], [0xf8, 0x88, 0x80, 0x80, 0x80], [0xe2, 0x82], [0xf4, 0x90, 0x80, 0x80]];

const fixtureBytes = Buffer.from(FIXTURE, 'utf8');

export const arbitraries = {
  randomBytes: fc.uint8Array({ minLength: 1, maxLength: 4096 }).map((a) => Buffer.from(a)),

  invalidUtf8: fc.tuple(fc.nat({ max: fixtureBytes.length }), fc.constantFrom(...BAD_UTF8)).map(([at, bad]) => Buffer.concat([fixtureBytes.subarray(0, at), Buffer.from(bad), fixtureBytes.subarray(at)])),

  aliasBomb: fc.tuple(fc.integer({ min: 6, max: 12 }), fc.integer({ min: 5, max: 9 }), fc.boolean()).map(([w, d, alone]) => (alone ? aliasBomb(w, d) : `${FIXTURE}${aliasBomb(w, d).replace(/^l/gm, 'x-l')}`)),

  /** The fixture with one `key:` line written twice, at the same indentation. */
  duplicateKey: fc.constantFrom(...FIXTURE_LINES.map((l, i) => [l, i] as const).filter(([l]) => /^\s*[A-Za-z]+:/.test(l))).map(([line, i]) => {
    const lines = [...FIXTURE_LINES];
    const key = /^(\s*[A-Za-z]+:)/.exec(line)![1];
    lines.splice(i + 1, 0, `${key} duplicated`);
    return lines.join('\n');
  }),

  /** `__proto__` and friends as keys, at the top or inside a mapping, with an object or a value. */
  prototypeKey: fc.tuple(fc.constantFrom(...PROTOTYPE_KEYS), fc.constantFrom('', 'site:', 'service:', 'meter:', 'export:'), fc.constantFrom('{ polluted: true }', 'true', '{ prototype: { polluted: true } }', '[1, 2]')).map(([key, under, value]) => {
    if (!under) return `${key}: ${value}\n${FIXTURE}`;
    return FIXTURE.replace(`\n${under}\n`, `\n${under}\n  ${key}: ${value}\n`);
  }),

  nonFinite: fc.tuple(fc.constantFrom(...NUMERIC_FIELDS), fc.constantFrom(...NON_FINITE)).map(([f, v]) => withNumber(f, v)),





  /** A site id with at least one path or SQL fragment in it, quoted so that YAML reads one string. */
  hostileSiteId: fc.tuple(fc.string({ maxLength: 6 }), fc.constantFrom(...ID_FRAGMENTS), fc.string({ maxLength: 6 })).map((parts) => FIXTURE.replace('id: mill-lane-bakery', `id: ${JSON.stringify(parts.join(''))}`)),

  /**
   * A path segment that names nothing: a fragment, an odd number, or random text. Plain digits
   * are left out, since they may be the id of a real revision.
   */
  hostileSegment: fc.oneof(fc.constantFrom(...ID_FRAGMENTS, '0', '-1', '1.5', '1e3', '0x10', '99999999999999999999', ' 1', '1 ', '١'), fc.string({ minLength: 1, maxLength: 30 }).filter((s) => !/^\d+$/.test(s))),

  /** JSON that is not a review body: anything fast-check makes, minus the two valid shapes. */
  notAReview: fc.jsonValue({ maxDepth: 4 }).filter((v) => !(v && typeof v === 'object' && !Array.isArray(v) && ['approve', 'return'].includes((v as { decision?: unknown }).decision as string))),
};

/** A body nested `depth` deep, in JSON. */
export const deepJson = (depth: number) => `{"decision":${'['.repeat(depth)}${']'.repeat(depth)}}`;

/** The few hostile files `weir check` is run on (each run starts a process, so a handful). */
export function hostileFiles(): Record<string, Buffer | string> {
  return {
    'random-bytes.yaml': Buffer.from(Array.from({ length: 2048 }, (_, i) => (i * 7919 + 13) % 256)),
    'invalid-utf8.yaml': Buffer.concat([fixtureBytes.subarray(0, 60), Buffer.from([0xc0, 0x80, 0xff]), fixtureBytes.subarray(60)]),
    'alias-bomb.yaml': aliasBomb(10, 9),
    'deep-nesting.yaml': deepNesting(20_000, 'flow-seq'),
    'deep-block.yaml': deepNesting(20_000, 'block-seq'),
    'huge-string.yaml': FIXTURE.replace('name: Mill Lane Bakery', `name: ${'x'.repeat(3 * 1024 * 1024)}`),
    'duplicate-key.yaml': FIXTURE.replace('  name: Mill Lane Bakery', '  name: Mill Lane Bakery\n  name: Mill Lane Bakery Two'),
    'proto-key.yaml': `__proto__: { polluted: true }\nconstructor: { prototype: { polluted: true } }\n${FIXTURE}`,
    'not-a-number.yaml': FIXTURE.replace('mainBreakerA: 80', 'mainBreakerA: .nan').replace('limitKw: 5\n  failSafe', 'limitKw: .inf\n  failSafe'),
    'negative.yaml': FIXTURE.replace('mainBreakerA: 80', 'mainBreakerA: -80'),
    'path-id.yaml': FIXTURE.replace('id: mill-lane-bakery', 'id: "../../etc/passwd\'; DROP TABLE sites; --"'),
  };
}
