// The demo fleet's README is its specification: this test reads the table in examples/README.md
// and checks every example against it, so the README can never drift from what the engine says.
// Findings are compared as a multiset of `ruleId (severity)`: the README writes `×3` for a finding
// that comes three times (say, once per CT), so a count that changes is caught too.
import { readFileSync, readdirSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { RULES, checkSite } from '../shared/index.ts';

const examplesDir = fileURLToPath(new URL('../examples/', import.meta.url));
const SCHEMA_LINE = '# yaml-language-server: $schema=../schemas/site.schema.json';

interface Row {
  file: string;
  what: string;
  expected: string[];
}

/** Splits one markdown table row into trimmed cells (no cell of ours holds a literal `|`). */
const cells = (line: string) => line.trim().replace(/^\|/, '').replace(/\|$/, '').split('|').map((c) => c.trim());

/** `ruleId (severity)` once per occurrence, sorted: `\`ct-undersized\` (error) ×3` gives three. */
function parseExpected(cell: string): string[] {
  if (/^none$/i.test(cell)) return [];
  const pattern = /`([a-z0-9-]+)`\s*\((error|warning|info)\)(?:\s*×\s*(\d+))?/g;
  const out: string[] = [];
  for (const m of cell.matchAll(pattern)) {
    const times = m[3] === undefined ? 1 : Number(m[3]);
    for (let i = 0; i < times; i++) out.push(`${m[1]} (${m[2]})`);
  }
  // Anything but commas left over is a typo in the README, not something to skip.
  if (out.length === 0 || cell.replace(pattern, '').replace(/[,\s]/g, '') !== '') {
    throw new Error(`cannot read the expected findings "${cell}"`);
  }
  return out.sort();
}

function readTable(markdown: string): Row[] {
  const lines = markdown.split(/\r?\n/);
  const header = lines.findIndex((l) => /^\|\s*file\s*\|/i.test(l));
  if (header < 0) throw new Error('examples/README.md has no table with a `file` column');
  const names = cells(lines[header]).map((c) => c.toLowerCase());
  const fileCol = names.indexOf('file');
  const whatCol = names.indexOf('what it is');
  const expectedCol = names.indexOf('expected findings');
  const rows: Row[] = [];
  for (const line of lines.slice(header + 2)) {
    if (!line.trim().startsWith('|')) break;
    const c = cells(line);
    rows.push({ file: c[fileCol].replace(/`/g, ''), what: c[whatCol], expected: parseExpected(c[expectedCol]) });
  }
  return rows;
}

const rows = readTable(readFileSync(`${examplesDir}README.md`, 'utf8'));
const yamlFiles = readdirSync(examplesDir).filter((f) => f.endsWith('.yaml') || f.endsWith('.yml')).sort();
const actual = (text: string) => checkSite(text).findings.map((f) => `${f.ruleId} (${f.severity})`).sort();

describe('examples/README.md', () => {
  it('lists every example file exactly once, and only files that exist', () => {
    expect(rows.map((r) => r.file).sort()).toEqual(yamlFiles);
  });

  it('has at least 12 sites, at least 6 of them with an error', () => {
    expect(rows.length).toBeGreaterThanOrEqual(12);
    expect(rows.filter((r) => r.expected.some((e) => e.endsWith('(error)'))).length).toBeGreaterThanOrEqual(6);
  });

  it('names only rule ids that exist, with a severity the rule can give', () => {
    const ids = new Set(RULES.map((r) => r.id));
    for (const row of rows) for (const e of row.expected) expect(ids.has(e.replace(/ \(.*\)$/, '')), `${row.file}: ${e}`).toBe(true);
  });

  it('reads counts and "none"', () => {
    expect(parseExpected('none')).toEqual([]);
    expect(parseExpected('`ct-undersized` (error) ×2, `ct-arrow-toward-grid` (warning)')).toEqual([
      'ct-arrow-toward-grid (warning)', 'ct-undersized (error)', 'ct-undersized (error)',
    ]);
    expect(() => parseExpected('`ct-undersized` (eror)')).toThrow();
  });
});

describe.each(rows)('examples/$file', ({ file, expected }) => {
  const text = readFileSync(`${examplesDir}${file}`, 'utf8');

  it('starts with the schema line and a comment saying what the site is', () => {
    const [first, second] = text.split(/\r?\n/);
    expect(first).toBe(SCHEMA_LINE);
    expect(second).toMatch(/^# \S/);
  });

  it('passes the schema and the YAML reader', () => {
    const check = checkSite(text);
    expect(check.findings.filter((f) => f.ruleId === 'schema' || f.ruleId === 'yaml-syntax')).toEqual([]);
    expect(check.site).not.toBeNull();
  });

  it(`gives exactly: ${expected.length ? expected.join(', ') : 'no finding'}`, () => {
    expect(actual(text)).toEqual(expected);
  });

  it('uses its file name as its site id', () => {
    expect(checkSite(text).site?.site.id).toBe(file.replace(/\.ya?ml$/, ''));
  });
});

describe('the "kW typed as W?" example', () => {
  it('carries the hint on its export-limit-over-agreement finding', () => {
    // rules.md export-limit-over-agreement: if the value /1000 would fit, the hint says "kW typed as W?"
    const text = readFileSync(`${examplesDir}heron-wharf-chandlery.yaml`, 'utf8');
    const finding = checkSite(text).findings.find((f) => f.ruleId === 'export-limit-over-agreement');
    expect(finding?.hint).toContain('kW typed as W?');
  });
});

describe('the fleet', () => {
  it('covers the arrangements and profiles the demo promises', () => {
    const sites = yamlFiles.map((f) => checkSite(readFileSync(`${examplesDir}${f}`, 'utf8')).site!);
    const arrangements = new Set(sites.map((s) => s.service.arrangement));
    expect([...arrangements].sort()).toEqual(['single-phase', 'split-phase', 'three-phase-3w', 'three-phase-4w']);
    expect(sites.some((s) => s.export.scope === 'per-phase')).toBe(true);
    expect(sites.some((s) => s.agreement.exportLimitKw === 0)).toBe(true);
    expect(sites.filter((s) => s.commissioning).length).toBeGreaterThan(sites.length / 2);
  });

  it('uses only the example.test domain for any e-mail address', () => {
    for (const f of [...yamlFiles, 'README.md']) {
      for (const m of readFileSync(`${examplesDir}${f}`, 'utf8').matchAll(/[\w.+-]+@([\w-]+(?:\.[\w-]+)+)/g)) {
        expect(m[1], f).toBe('example.test');
      }
    }
  });
});
