// `weir init`, run as built and unattended (--yes and flags): the file it writes passes `weir check`.
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parse } from 'yaml';
import { SAFETY_CAUTIONS } from '../../shared/index.ts';
import { ROOT, assertBuilt, tempDir, weir } from './run-weir.ts';

const tmp = tempDir('weir-init-');
beforeAll(assertBuilt);
afterAll(() => tmp.remove());

async function checkJson(file: string) {
  const r = await weir(['check', '--format', 'json', file]);
  return { exitCode: r.exitCode, report: JSON.parse(r.stdout) as { files: { site: string; findings: { ruleId: string; severity: string }[] }[] } };
}

describe('weir init --yes', () => {
  it('shows the safety cautions on stderr and writes a commented site file that weir check passes', async () => {
    const file = path.join(tmp.dir, 'mill-lane.yaml');
    const r = await weir(['init', '--yes', file]);
    expect(r.exitCode).toBe(0);
    for (const caution of SAFETY_CAUTIONS) expect(r.stderr).toContain(caution);
    expect(r.stdout).toContain('Wrote');
    const text = readFileSync(file, 'utf8');
    expect(text.split('\n')[0]).toMatch(/^# yaml-language-server: \$schema=\S+site\.schema\.json$/);
    expect(text.match(/#/g)!.length).toBeGreaterThan(20); // commented throughout
    const { exitCode, report } = await checkJson(file);
    expect(exitCode).toBe(0);
    expect(report.files[0].findings.filter((f) => f.severity === 'error')).toEqual([]);
    // the site id comes from the file name
    expect(report.files[0].site).toBe('mill-lane');
  });

  it('points the $schema line at the nearest schemas/site.schema.json, or the shipped one as a file URL', async () => {
    const inside = path.join(ROOT, 'tests', '.tmp', `init-${process.pid}`);
    mkdirSync(inside, { recursive: true });
    try {
      const file = path.join(inside, 'inside.yaml');
      expect((await weir(['init', '--yes', file])).exitCode).toBe(0);
      const ref = /\$schema=(\S+)/.exec(readFileSync(file, 'utf8'))![1];
      expect(ref).toBe(`../../../schemas/site.schema.json`);
      expect(existsSync(path.resolve(inside, ref))).toBe(true);
    } finally {
      (await import('node:fs')).rmSync(inside, { recursive: true, force: true });
    }
    const outside = path.join(tmp.dir, 'outside.yaml');
    expect((await weir(['init', '--yes', outside])).exitCode).toBe(0);
    const ref = /\$schema=(\S+)/.exec(readFileSync(outside, 'utf8'))![1];
    expect(ref.startsWith('file://')).toBe(true);
    expect(existsSync(fileURLToPath(ref))).toBe(true);
  });

  it('takes every answer from flags: a split-phase 120/240 V site with per-phase limits', async () => {
    const file = path.join(tmp.dir, 'flags.yaml');
    const r = await weir(['init', '--yes', '--site-id', 'cedar-flags', '--name', 'Cedar: "Flags" Barn', '--address', '1 Invented Row',
      '--agreement-ref', 'NOA-0001', '--agreement-limit', '7.6', '--profile', 'us-pcs',
      '--arrangement', 'split-phase', '--voltage-ln', '120', '--voltage-ll', '240', '--frequency', '60', '--main-breaker', '200',
      '--meter-serial', 'EM-0001', '--modbus-address', '12', '--baud', '19200', '--parity', 'none', '--stop-bits', '2',
      '--ct-rated', '200', '--ct-secondary', '333mV', '--ct-class', '0.5S', '--ct-arrow', 'toward-load',
      '--gateway-serial', 'GW-0001', '--bus-length', '40', '--bus-devices', '3',
      '--generation', 'roof-a:8:0.4:L1', '--generation', 'roof-b:8:0.4:L2',
      '--export-control', 'enabled', '--export-scope', 'per-phase', '--export-limit', '7.6', '--limit-l1', '3.8', '--limit-l2', '3.8',
      '--fail-safe', 'curtail-to-limit', '--fail-safe-after', '10', file]);
    expect(r.exitCode, r.stderr).toBe(0);
    const data = parse(readFileSync(file, 'utf8'));
    expect(data.site).toEqual({ id: 'cedar-flags', name: 'Cedar: "Flags" Barn', address: '1 Invented Row' });
    expect(data.service).toEqual({ arrangement: 'split-phase', voltageLn: 120, voltageLl: 240, frequencyHz: 60, mainBreakerA: 200 });
    expect(data.meter.modbus).toEqual({ address: 12, baud: 19200, parity: 'none', stopBits: 2 });
    expect(data.meter.voltageInputs).toEqual({ V1: 'L1', V2: 'L2', N: 'N' });
    expect(data.cts.map((c: { id: string }) => c.id)).toEqual(['ct-l1', 'ct-l2']);
    expect(data.cts[0].lead).toBeUndefined(); // no burden for a 333 mV output
    expect(data.gateway.bus.baud).toBe(19200); // one rate on the bus
    expect(data.export.perPhaseLimitKw).toEqual({ L1: 3.8, L2: 3.8 });
    const { exitCode, report } = await checkJson(file);
    expect(exitCode).toBe(0);
    expect(report.files[0].findings.filter((f) => f.severity !== 'info')).toEqual([]);
  });

  it('refuses to overwrite a file without --force (exit 2), and overwrites with it', async () => {
    const file = path.join(tmp.dir, 'existing.yaml');
    writeFileSync(file, 'keep me\n');
    const r = await weir(['init', '--yes', file]);
    expect(r.exitCode).toBe(2);
    expect(r.stderr).toContain('--force');
    expect(readFileSync(file, 'utf8')).toBe('keep me\n');
    expect((await weir(['init', '--yes', '--force', file])).exitCode).toBe(0);
    expect((await checkJson(file)).exitCode).toBe(0);
  });

  it('names the file after the site id when no file is given', async () => {
    const folder = path.join(tmp.dir, 'named');
    mkdirSync(folder);
    expect((await weir(['init', '--yes', '--site-id', 'ferry-lane'], { cwd: folder })).exitCode).toBe(0);
    expect(existsSync(path.join(folder, 'ferry-lane.yaml'))).toBe(true);
  });
});

describe('weir init refuses answers that the rules call errors (exit 2, nothing written)', () => {
  const cases: [string, string[], RegExp][] = [
    // Modbus over Serial Line V1.02 §2.2: address 0 is broadcast; devices are 1-247
    ['Modbus address 0', ['--modbus-address', '0'], /broadcast/],
    ['Modbus address 248', ['--modbus-address', '248'], /reserved/],
    // Modbus over Serial Line V1.02 §3.2 and common serial speeds: 9601 Bd is no standard rate
    ['baud 9601', ['--baud', '9601'], /baud rate must be one of/],
    ['a site id with capitals', ['--site-id', 'Mill_Lane'], /site id/],
    // ct-undersized, common practice: the CT is rated at least for the main breaker
    ['a 50 A CT on an 80 A breaker', ['--main-breaker', '80', '--ct-rated', '50'], /less than the 80 A main breaker/],
    // IEC 60228 class 2, 1.5 mm² = 12.1 Ω/km: 20 m leads on 5 A give 25·2·20·0.0121 = 12.1 VA, over 2.5 VA
    ['leads beyond the rated burden', ['--ct-lead-length', '20', '--ct-lead-csa', '1.5', '--ct-burden', '2.5'], /12\.1 VA/],
    ['a limit typed in W', ['--agreement-limit', '5', '--export-limit', '5000'], /kW typed as W/],
    // Modbus §3.4.3 / TIA/EIA-485-A: about 1200 m at most
    ['a 1300 m bus', ['--bus-length', '1300'], /1200 m/],
    // gb-g100: fail-safe within 15 s (ENA EREC G100, secondary source)
    ['a fail-safe slower than the profile allows', ['--profile', 'gb-g100', '--fail-safe-after', '30'], /at most 15 s/],
    // gb-g100 allows 3.68 kVA of imbalance (16 A × 230 V, from memory): 6 kVA on L1 alone is over
    ['unbalanced generation', ['--generation', 'roof:15:0.4:L1'], /between phases/],
    ['a phase the service does not have', ['--arrangement', 'single-phase', '--generation', 'roof:5:0.4:L2'], /phase must be one of L1/],
  ];
  for (const [name, flags, message] of cases) {
    it(name, async () => {
      const file = path.join(tmp.dir, `refused-${name.replace(/\W+/g, '-')}.yaml`);
      const r = await weir(['init', '--yes', ...flags, file]);
      expect(r.exitCode).toBe(2);
      expect(r.stderr).toMatch(message);
      expect(r.stderr).not.toMatch(/\n\s+at /);
      expect(existsSync(file)).toBe(false);
    });
  }

  it('writes nothing and exits 1 when the defaults taken by --yes make a site with errors', async () => {
    // S_svc = √3·400 V·20 A = 13.9 kVA (rules.md, "Export policy"): the default limit of 100 kW
    // (the agreed one) cannot fit, and export-limit-over-service is an error
    const file = path.join(tmp.dir, 'defaults-wrong.yaml');
    const r = await weir(['init', '--yes', '--agreement-limit', '100', '--main-breaker', '20', file]);
    expect(r.exitCode).toBe(1);
    expect(r.stdout).toMatch(/defaults-wrong\.yaml:\d+:\d+: error export-limit-over-service/);
    expect(r.stdout).toContain('Nothing written');
    expect(existsSync(file)).toBe(false);
  });

  it('asks for a terminal rather than hang when an answer is missing and --yes is not given', async () => {
    const file = path.join(tmp.dir, 'no-tty.yaml');
    const r = await weir(['init', file]);
    expect(r.exitCode).toBe(2);
    expect(r.stderr).toContain('--yes');
    expect(existsSync(file)).toBe(false);
  });
});
