// `weir check` on the same hostile files the API is fed (support/hostile.ts): each file gets a
// finding (exit 1) or the run stops with a message (exit 2); never a stack trace, never a hang,
// and `--format json` stays one parseable document. Each run starts a process, so a handful.
import { execa } from 'execa';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { FIXTURE, hostileFiles } from './support/hostile.ts';
import { assertCliBuilt, WEIR_JS } from './support/real-server.ts';

let dir: string;
const files = hostileFiles();

const weir = (args: string[]) =>
  execa('node', [WEIR_JS, ...args], { cwd: dir, reject: false, timeout: 60_000, env: { NO_COLOR: '1', WEIR_SERVER: undefined, WEIR_TOKEN: undefined, WEIR_DEBUG: undefined, XDG_CONFIG_HOME: dir }, extendEnv: true });

/** Node prints `    at fn (file:line:col)` lines in a stack trace. */
const STACK = /^\s+at .+[(:]\d+/m;

interface JsonReport {
  files: { path: string; site: string | null; findings: { ruleId: string; severity: string; message: string; line: number; column: number }[] }[];
  summary: { files: number; errors: number };
}

beforeAll(() => {
  assertCliBuilt();
  dir = mkdtempSync(path.join(os.tmpdir(), 'weir-hostile-'));
  for (const [name, content] of Object.entries(files)) writeFileSync(path.join(dir, name), content);
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('weir check on hostile files', () => {
  it('When the whole folder is checked as JSON, then exit 1, one document, and an error finding for every file', async () => {
    const res = await weir(['check', '--format', 'json', '.']);
    expect(res.stderr).not.toMatch(STACK);
    expect(res.exitCode, res.stderr).toBe(1);
    const report = JSON.parse(res.stdout) as JsonReport;
    expect(report.files.map((f) => path.basename(f.path)).sort()).toEqual(Object.keys(files).sort());
    for (const file of report.files) {
      const errors = file.findings.filter((f) => f.severity === 'error');
      expect(errors.length, `${file.path} has no error finding`).toBeGreaterThan(0);
      for (const f of errors) {
        expect(f.message).not.toMatch(STACK);
        expect(f.line).toBeGreaterThanOrEqual(1);
        expect(f.column).toBeGreaterThanOrEqual(1);
      }
    }
    expect(report.summary.files).toBe(Object.keys(files).length);
    // ajv and yaml messages, not the engine's insides.
    expect(res.stdout).not.toMatch(/RangeError|TypeError|Maximum call stack/);
  });

  it('When the files are checked one by one in human form, then each says what is wrong in one line, without a stack', async () => {
    for (const name of ['alias-bomb.yaml', 'deep-nesting.yaml', 'huge-string.yaml', 'random-bytes.yaml', 'proto-key.yaml']) {
      const res = await weir(['check', name]);
      expect([1, 2], `${name}: ${res.stderr}`).toContain(res.exitCode);
      expect(res.stderr, name).not.toMatch(STACK);
      expect(res.stdout, name).not.toMatch(STACK);
      expect(`${res.stdout}${res.stderr}`, name).toMatch(new RegExp(`${name.replace('.', '\\.')}:\\d+:\\d+`));
    }
  });

  it('When a file is not UTF-8 where the server would refuse it (a comment), then a finding or exit 2, not a pass', async () => {
    // The server answers 400 invalid-encoding for this very file (hostile-input.test.ts).
    const bytes = Buffer.concat([Buffer.from('# caf'), Buffer.from([0xe9]), Buffer.from(` (Latin-1, not UTF-8)\n${FIXTURE}`)]);
    writeFileSync(path.join(dir, 'latin1-comment.yml'), bytes);
    try {
      const res = await weir(['check', '--format', 'json', 'latin1-comment.yml']);
      expect(res.stderr).not.toMatch(STACK);
      expect([1, 2], `exit ${res.exitCode}: ${res.stdout.slice(0, 400)}`).toContain(res.exitCode);
      if (res.exitCode === 2) expect(res.stderr).toMatch(/UTF-8/);
      else expect(JSON.stringify(JSON.parse(res.stdout))).toMatch(/UTF-8/);
    } finally {
      rmSync(path.join(dir, 'latin1-comment.yml'));
    }
  });

  it('When the path itself is hostile (missing, a traversal, a NUL), then exit 2 with a message', async () => {
    for (const arg of ['../../no/such/dir/site.yaml', 'missing.yaml', 'a\u0001b.yaml']) {
      const res = await weir(['check', arg]);
      expect(res.exitCode, arg).toBe(2);
      expect(res.stderr.trim().length, arg).toBeGreaterThan(0);
      expect(res.stderr, arg).not.toMatch(STACK);
    }
  });
});

