// `weir check`, run as built, over the demo fleet and over files written for the test.
import { createHash } from 'node:crypto';
import { chmodSync, existsSync, mkdirSync, readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { checkSite } from '../../shared/index.ts';
import { ANSI, EXAMPLES, ROOT, assertBuilt, tempDir, weir } from './run-weir.ts';

interface JsonReport {
  files: { path: string; site: string | null; findings: { ruleId: string; severity: string; message: string; path: string; line: number; column: number; source?: string; hint?: string }[] }[];
  summary: { files: number; errors: number; warnings: number; infos: number };
}

/** examples/README.md's table: file -> "rule-id (severity)" entries, counted. */
function expectedFromReadme(): Map<string, string[]> {
  const text = readFileSync(path.join(EXAMPLES, 'README.md'), 'utf8');
  const out = new Map<string, string[]>();
  for (const line of text.split('\n')) {
    const m = /^\| `([\w-]+\.yaml)` \|[^|]*\| (.*) \|$/.exec(line);
    if (!m) continue;
    const entries: string[] = [];
    for (const e of m[2].matchAll(/`([a-z0-9-]+)` \((error|warning|info)\)(?: ×(\d+))?/g)) {
      for (let i = 0; i < Number(e[3] ?? 1); i++) entries.push(`${e[1]} (${e[2]})`);
    }
    out.set(m[1], entries.sort());
  }
  return out;
}

const exampleFiles = readdirSync(EXAMPLES).filter((f) => f.endsWith('.yaml')).sort();
const engineFindings = (file: string) => checkSite(readFileSync(path.join(EXAMPLES, file), 'utf8')).findings;

const tmp = tempDir('weir-check-');
beforeAll(assertBuilt);
afterAll(() => tmp.remove());

describe('weir check over examples/', () => {
  it('prints one compiler-style line per finding, grouped by file, with hints and a summary; exits 1', async () => {
    const r = await weir(['check', 'examples']);
    expect(r.exitCode).toBe(1);
    expect(r.stderr).toBe('');
    expect(r.stdout).not.toMatch(ANSI); // not a terminal: no colour
    const lines = r.stdout.trimEnd().split('\n');
    const summary = lines.at(-1)!;
    const findingLine = /^(examples\/[\w-]+\.yaml):(\d+):(\d+): (error|warning|info) ([a-z0-9-]+) (.+)$/;
    const seenFiles: string[] = [];
    let total = 0;
    let previous = '';
    for (const line of lines.slice(0, -1)) {
      if (line === '') continue;
      if (line.startsWith('    hint: ')) {
        expect(previous).toMatch(findingLine); // a hint follows its finding
        continue;
      }
      const m = findingLine.exec(line);
      expect(m, line).not.toBeNull();
      total++;
      if (seenFiles.at(-1) !== m![1]) {
        expect(seenFiles).not.toContain(m![1]); // each file's findings come together
        seenFiles.push(m![1]);
      }
      previous = line;
    }
    const all = exampleFiles.flatMap(engineFindings);
    expect(total).toBe(all.length);
    const count = (s: string) => all.filter((f) => f.severity === s).length;
    expect(summary).toBe(`${exampleFiles.length} files checked: ${count('error')} errors, ${count('warning')} warnings, ${count('info')} infos in ${seenFiles.length} files`);
    // every hint the engine gives is printed
    expect(lines.filter((l) => l.startsWith('    hint: ')).length).toBe(all.filter((f) => f.hint).length);
  });

  it('gives, in JSON, exactly the findings that examples/README.md lists for each file', async () => {
    const r = await weir(['check', '--format', 'json', 'examples']);
    expect(r.exitCode).toBe(1);
    const report = JSON.parse(r.stdout) as JsonReport;
    const expected = expectedFromReadme();
    expect(report.files.map((f) => f.path)).toEqual(exampleFiles.map((f) => `examples/${f}`));
    for (const file of report.files) {
      const name = path.basename(file.path);
      expect(expected.has(name), `${name} is in examples/README.md`).toBe(true);
      expect(file.findings.map((f) => `${f.ruleId} (${f.severity})`).sort(), name).toEqual(expected.get(name));
      const yamlId = /^\s+id: ([a-z0-9-]+)/m.exec(readFileSync(path.join(EXAMPLES, name), 'utf8'))![1];
      expect(file.site).toBe(yamlId);
      for (const f of file.findings) {
        expect(Object.keys(f).every((k) => ['ruleId', 'severity', 'message', 'path', 'line', 'column', 'source', 'hint'].includes(k))).toBe(true);
        expect(f.line).toBeGreaterThanOrEqual(1);
        expect(f.column).toBeGreaterThanOrEqual(1);
      }
    }
    const all = report.files.flatMap((f) => f.findings);
    expect(report.summary).toEqual({
      files: exampleFiles.length,
      errors: all.filter((f) => f.severity === 'error').length,
      warnings: all.filter((f) => f.severity === 'warning').length,
      infos: all.filter((f) => f.severity === 'info').length,
    });
  });

  it('exits 0 for every example without error findings, and 1 for each with one', async () => {
    const expected = expectedFromReadme();
    for (const name of exampleFiles) {
      const r = await weir(['check', '--format', 'json', `examples/${name}`]);
      const hasError = expected.get(name)!.some((e) => e.endsWith('(error)'));
      expect(r.exitCode, name).toBe(hasError ? 1 : 0);
    }
  });

  it('writes SARIF 2.1.0 with one result per finding at its line and column', async () => {
    const [sarif, json] = await Promise.all([weir(['check', '--format', 'sarif', 'examples']), weir(['check', '--format', 'json', 'examples'])]);
    expect(sarif.exitCode).toBe(1);
    const log = JSON.parse(sarif.stdout);
    const report = JSON.parse(json.stdout) as JsonReport;
    expect(log.version).toBe('2.1.0');
    expect(log.runs).toHaveLength(1);
    const run = log.runs[0];
    expect(run.tool.driver.name).toBe('weir');
    const ruleIds = run.tool.driver.rules.map((r: { id: string }) => r.id);
    expect(ruleIds).toContain('schema');
    expect(ruleIds).toContain('yaml-syntax');
    expect(ruleIds).toContain('ct-burden-exceeded');
    const flat = report.files.flatMap((f) => f.findings.map((x) => ({ ...x, file: f.path })));
    expect(run.results).toHaveLength(flat.length);
    run.results.forEach((res: any, i: number) => {
      const f = flat[i];
      expect(res.ruleId).toBe(f.ruleId);
      expect(run.tool.driver.rules[res.ruleIndex].id).toBe(f.ruleId);
      expect(res.level).toBe(f.severity === 'info' ? 'note' : f.severity);
      const loc = res.locations[0].physicalLocation;
      expect(loc.artifactLocation.uri).toBe(f.file);
      expect(loc.artifactLocation.uriBaseId).toBe('SRCROOT');
      expect(loc.region).toEqual({ startLine: f.line, startColumn: f.column });
    });
    expect(run.originalUriBaseIds.SRCROOT.uri).toBe(`file://${ROOT.endsWith('/') ? ROOT : `${ROOT}/`}`);
  });

  it('takes globs that the shell did not expand', async () => {
    const r = await weir(['check', '--format', 'json', 'examples/q*.yaml', 'examples/k*.yaml']);
    expect(r.exitCode).toBe(0);
    expect((JSON.parse(r.stdout) as JsonReport).files.map((f) => f.path)).toEqual(['examples/quarry-row-cottage.yaml', 'examples/kiln-yard-workshop.yaml']);
  });

  it('--explain shows the summary figures of each site', async () => {
    const r = await weir(['check', '--explain', 'examples/kiln-yard-workshop.yaml']);
    expect(r.exitCode).toBe(0);
    for (const label of ['generation', 'service capacity', 'export limit', 'CT ', 'bus', 'profile']) expect(r.stdout).toContain(label);
    // S_svc = √3·V_LL·I_main/1000 (rules.md, "Export policy"): 230/400 V at 100 A is 69.28 kVA
    const text = readFileSync(path.join(EXAMPLES, 'kiln-yard-workshop.yaml'), 'utf8');
    const summary = checkSite(text).summary!;
    expect(r.stdout).toContain(`${Number(summary.serviceCapacityKva.toFixed(2))} kVA`);
    const json = JSON.parse((await weir(['check', '--format', 'json', '--explain', 'examples/kiln-yard-workshop.yaml'])).stdout);
    expect(json.files[0].figures.serviceCapacityKva).toBeCloseTo(summary.serviceCapacityKva, 9);
  });
});

describe('weir check on files with problems', () => {
  const base = readFileSync(path.join(EXAMPLES, 'kiln-yard-workshop.yaml'), 'utf8');

  it('reports a YAML syntax error with its line and exits 1', async () => {
    const file = path.join(tmp.dir, 'broken.yaml');
    writeFileSync(file, 'weir: 1\nsite:\n  id: broken-site\n  name: [unclosed\n');
    const r = await weir(['check', '--format', 'json', file]);
    expect(r.exitCode).toBe(1);
    const findings = (JSON.parse(r.stdout) as JsonReport).files[0].findings;
    expect(findings.length).toBeGreaterThan(0);
    expect(findings.every((f) => f.ruleId === 'yaml-syntax' && f.severity === 'error')).toBe(true);
    expect(findings[0].line).toBeGreaterThanOrEqual(4);
  });

  it('reports a value out of its enum at its own line and column (site-format.md)', async () => {
    const lines = base.split('\n');
    const at = lines.findIndex((l) => /^\s+arrangement:/.test(l));
    lines[at] = lines[at].replace(/arrangement: \S+/, 'arrangement: four-wire');
    const file = path.join(tmp.dir, 'enum.yaml');
    writeFileSync(file, lines.join('\n'));
    const r = await weir(['check', '--format', 'json', file]);
    expect(r.exitCode).toBe(1);
    const schema = (JSON.parse(r.stdout) as JsonReport).files[0].findings.filter((f) => f.ruleId === 'schema');
    const enumFinding = schema.find((f) => f.path === 'service.arrangement')!;
    expect(enumFinding.severity).toBe('error');
    expect(enumFinding.line).toBe(at + 1);
    expect(enumFinding.column).toBe(lines[at].indexOf('four-wire') + 1);
  });

  it("reports a missing required key at its parent's line (site-format.md)", async () => {
    const lines = base.split('\n');
    const parent = lines.findIndex((l) => /^meter:/.test(l));
    const serial = lines.findIndex((l, i) => i > parent && /^\s+serial:/.test(l));
    lines.splice(serial, 1);
    const file = path.join(tmp.dir, 'missing.yaml');
    writeFileSync(file, lines.join('\n'));
    const r = await weir(['check', '--format', 'json', file]);
    expect(r.exitCode).toBe(1);
    const missing = (JSON.parse(r.stdout) as JsonReport).files[0].findings.find((f) => f.ruleId === 'schema' && f.message.includes('serial'))!;
    expect(missing.line).toBe(parent + 1);
  });

  it('finds *.yaml and *.yml in nested folders, but not in hidden folders or node_modules', async () => {
    const tree = path.join(tmp.dir, 'tree');
    for (const d of ['a/b', '.git', 'node_modules/x']) mkdirSync(path.join(tree, d), { recursive: true });
    writeFileSync(path.join(tree, 'a', 'one.yaml'), base);
    writeFileSync(path.join(tree, 'a', 'b', 'two.yml'), base.replace('kiln-yard-workshop', 'kiln-yard-two'));
    writeFileSync(path.join(tree, 'a', 'notes.txt'), 'not a site');
    writeFileSync(path.join(tree, '.git', 'hidden.yaml'), 'x: [');
    writeFileSync(path.join(tree, 'node_modules', 'x', 'dep.yaml'), 'x: [');
    const r = await weir(['check', '--format', 'json', 'tree'], { cwd: tmp.dir });
    expect(r.exitCode).toBe(0);
    expect((JSON.parse(r.stdout) as JsonReport).files.map((f) => f.path)).toEqual(['tree/a/b/two.yml', 'tree/a/one.yaml']);
  });

  it('checks the current folder when no path is given', async () => {
    const folder = path.join(tmp.dir, 'cwd');
    mkdirSync(folder);
    writeFileSync(path.join(folder, 'site.yaml'), base);
    const r = await weir(['check', '--format', 'json'], { cwd: folder });
    expect(r.exitCode).toBe(0);
    expect((JSON.parse(r.stdout) as JsonReport).files.map((f) => f.path)).toEqual(['site.yaml']);
  });
});

describe('weir check usage and I/O problems exit 2 with one line on stderr', () => {
  const oneLine = (stderr: string) => {
    expect(stderr.trim().split('\n')).toHaveLength(1);
    expect(stderr).not.toMatch(/\n\s+at /); // no stack trace
  };

  it('a path that does not exist', async () => {
    const r = await weir(['check', 'examples/no-such-site.yaml']);
    expect(r.exitCode).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toContain('examples/no-such-site.yaml');
    oneLine(r.stderr);
  });

  it('a path that cannot be read (a file used as a folder)', async () => {
    const r = await weir(['check', 'examples/quarry-row-cottage.yaml/site.yaml']);
    expect(r.exitCode).toBe(2);
    oneLine(r.stderr);
  });

  it.skipIf(process.getuid?.() === 0)('a file without read permission', async () => {
    const file = path.join(tmp.dir, 'locked.yaml');
    writeFileSync(file, readFileSync(path.join(EXAMPLES, 'kiln-yard-workshop.yaml')));
    chmodSync(file, 0o000);
    const r = await weir(['check', file]);
    expect(r.exitCode).toBe(2);
    expect(r.stderr).toContain('permission denied');
  });

  it('a glob that matches nothing, and a folder without site files', async () => {
    const glob = await weir(['check', 'examples/nothing-*.yaml']);
    expect(glob.exitCode).toBe(2);
    expect(glob.stderr).toContain('no files match');
    oneLine(glob.stderr);
    const empty = path.join(tmp.dir, 'empty');
    mkdirSync(empty);
    const folder = await weir(['check', empty]);
    expect(folder.exitCode).toBe(2);
    oneLine(folder.stderr);
  });

  it('an unknown format or option', async () => {
    const format = await weir(['check', '--format', 'xml', 'examples']);
    expect(format.exitCode).toBe(2);
    expect(format.stderr).toContain('xml');
    const option = await weir(['check', '--colour', 'examples']);
    expect(option.exitCode).toBe(2);
  });

  it('a path with I/O trouble stops the check even when other files are fine', async () => {
    const r = await weir(['check', '--format', 'json', 'examples/quarry-row-cottage.yaml', 'examples/missing.yaml']);
    expect(r.exitCode).toBe(2);
    expect(r.stdout).toBe('');
  });
});

describe('colour', () => {
  const file = 'examples/heron-wharf-chandlery.yaml';

  it('is on when forced, and off with NO_COLOR or --no-color', async () => {
    expect((await weir(['check', file], { env: { FORCE_COLOR: '1' } })).stdout).toMatch(ANSI);
    expect((await weir(['check', file], { env: { FORCE_COLOR: '1', NO_COLOR: '1' } })).stdout).not.toMatch(ANSI);
    expect((await weir(['check', '--no-color', file], { env: { FORCE_COLOR: '1' } })).stdout).not.toMatch(ANSI);
  });

  it('never colours JSON', async () => {
    const r = await weir(['check', '--format', 'json', file], { env: { FORCE_COLOR: '1' } });
    expect(r.stdout).not.toMatch(ANSI);
    expect(() => JSON.parse(r.stdout)).not.toThrow();
  });
});

describe('the check cache', () => {
  const cacheHome = path.join(tmp.dir, 'cache-home');
  const cacheFile = path.join(cacheHome, 'weir', 'check-cache.json');
  const env = { XDG_CACHE_HOME: cacheHome };
  const args = ['check', '--cache', '--format', 'json', 'examples'];

  it('is written on the first run (0600) and gives the same report on the next', async () => {
    const cold = await weir(args, { env });
    expect(existsSync(cacheFile)).toBe(true);
    expect(statSync(cacheFile).mode & 0o777).toBe(0o600);
    const warm = await weir(args, { env });
    expect(warm.exitCode).toBe(cold.exitCode);
    expect(warm.stdout).toBe(cold.stdout);
    const fresh = await weir(['check', '--format', 'json', 'examples'], { env });
    expect(fresh.stdout).toBe(cold.stdout);
  });

  it('is read with --cache, and a run without it or with WEIR_NO_CACHE goes around it', async () => {
    // Plant a false result for one file's exact text: only a run that reads the cache can show it.
    const cache = JSON.parse(readFileSync(cacheFile, 'utf8'));
    const text = readFileSync(path.join(EXAMPLES, 'quarry-row-cottage.yaml'), 'utf8');
    const key = createHash('sha256').update(text, 'utf8').digest('base64url');
    expect(cache.entries[key]).toBeDefined();
    cache.entries[key] = { s: 'planted', f: [] };
    writeFileSync(cacheFile, JSON.stringify(cache));
    const file = ['check', '--cache', '--format', 'json', 'examples/quarry-row-cottage.yaml'];
    expect(JSON.parse((await weir(file, { env })).stdout).files[0].site).toBe('planted');
    expect(JSON.parse((await weir(file.filter((a) => a !== '--cache'), { env })).stdout).files[0].site).toBe('quarry-row-cottage');
    expect(JSON.parse((await weir(file, { env: { ...env, WEIR_NO_CACHE: '1' } })).stdout).files[0].site).toBe('quarry-row-cottage');
  });

  it('is ignored when another engine build wrote it, or when it is not JSON', async () => {
    const cache = JSON.parse(readFileSync(cacheFile, 'utf8'));
    writeFileSync(cacheFile, JSON.stringify({ ...cache, engine: 'another-build' }));
    const file = ['check', '--cache', '--format', 'json', 'examples/quarry-row-cottage.yaml'];
    expect(JSON.parse((await weir(file, { env })).stdout).files[0].site).toBe('quarry-row-cottage');
    writeFileSync(cacheFile, '{ not json');
    const r = await weir(['check', '--cache', '--format', 'json', 'examples/heron-wharf-chandlery.yaml'], { env });
    expect(r.exitCode).toBe(1);
    const errors = checkSite(readFileSync(path.join(EXAMPLES, 'heron-wharf-chandlery.yaml'), 'utf8')).counts.error;
    expect(errors).toBeGreaterThan(0);
    expect(JSON.parse(r.stdout).summary.errors).toBe(errors);
  });
});
