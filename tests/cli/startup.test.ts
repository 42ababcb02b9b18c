// What keeps the CLI quick, checked as facts rather than timings (timings are `npm run bench`'s
// job): what start-up loads, and that splitting a large check over threads changes nothing.
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { EXAMPLES, ROOT, WEIR, assertBuilt, tempDir, weir } from './run-weir.ts';

interface Metafile {
  outputs: Record<string, { imports: { path: string; kind: string; external?: boolean }[]; inputs: Record<string, unknown> }>;
}

const tmp = tempDir('weir-perf-');
beforeAll(assertBuilt);
afterAll(() => tmp.remove());

describe('start-up', () => {
  it('loads only commander and the command definitions: no yaml, ajv, inquirer, chalk or engine', () => {
    const meta = JSON.parse(readFileSync(path.join(ROOT, 'dist', 'cli', 'meta.json'), 'utf8')) as Metafile;
    const seen = new Set<string>();
    const stack = ['dist/cli/index.js'];
    while (stack.length) {
      const out = stack.pop()!;
      if (seen.has(out)) continue;
      seen.add(out);
      for (const i of meta.outputs[out].imports) if (i.kind === 'import-statement' && !i.external) stack.push(i.path);
    }
    const inputs = [...seen].flatMap((o) => Object.keys(meta.outputs[o].inputs));
    expect(inputs.some((i) => i.includes('node_modules/commander/'))).toBe(true);
    expect(inputs.filter((i) => /node_modules\/(yaml|ajv|inquirer|@inquirer|chalk|cli-table3|cli-progress|tinyglobby)\//.test(i))).toEqual([]);
    expect(inputs.filter((i) => i.startsWith('shared/'))).toEqual([]);
    // The check action and its engine are a chunk of their own, loaded on demand.
    const dynamic = meta.outputs['dist/cli/index.js'].imports.filter((i) => i.kind === 'dynamic-import');
    expect(dynamic.length).toBeGreaterThanOrEqual(10);
  });

  it('prints the version of package.json', async () => {
    const r = await weir(['--version']);
    expect(r.stdout).toBe(JSON.parse(readFileSync(path.join(ROOT, 'package.json'), 'utf8')).version);
  });
});

describe('1 000 site files', () => {
  const folder = path.join(tmp.dir, 'fleet');

  beforeAll(() => {
    mkdirSync(folder);
    // Copies of one clean example under new ids; without the commissioning date, which js-yaml
    // (inside ajv-cli, YAML 1.1) would read as a Date and call invalid.
    const text = readFileSync(path.join(EXAMPLES, 'kiln-yard-workshop.yaml'), 'utf8').replace(/^\s+date:.*\n/m, '');
    for (let i = 0; i < 1000; i++) writeFileSync(path.join(folder, `site-${String(i).padStart(4, '0')}.yaml`), text.replace(/^(\s+id:) kiln-yard-workshop$/m, `$1 site-${i}`));
  });

  it('gives the same report with one thread as with several', async () => {
    const one = await weir(['check', '--format', 'json', folder], { env: { WEIR_CHECK_THREADS: '1' } });
    const many = await weir(['check', '--format', 'json', folder], { env: { WEIR_CHECK_THREADS: '3' } });
    expect(one.exitCode).toBe(0);
    expect(many.exitCode).toBe(0);
    expect(many.stdout).toBe(one.stdout);
    const report = JSON.parse(one.stdout);
    expect(report.summary.files).toBe(1000);
    expect(report.files[999].site).toBe('site-999');
  }, 120_000);
});
