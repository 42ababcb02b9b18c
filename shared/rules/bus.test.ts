import { describe, expect, it } from 'vitest';
import type { Site } from '../site/types.ts';
import { baseThreePhaseSite, mutated, ruleFindings } from '../test-support/base-site.ts';

const withBus = (change: (bus: Site['gateway']['bus'], s: Site) => void) => mutated(baseThreePhaseSite(), (s) => change(s.gateway.bus, s));
const withModbus = (change: (m: Site['meter']['modbus'], s: Site) => void) => mutated(baseThreePhaseSite(), (s) => change(s.meter.modbus, s));

describe('modbus-address', () => {
  const address = (a: number) => ruleFindings(withModbus((m) => { m.address = a; }), 'modbus-address');

  it.each([1, 2, 100, 246, 247])('accepts address %i', (a) => {
    // Modbus over Serial Line V1.02 §2.2: 1–247 are slave addresses
    expect(address(a)).toEqual([]);
  });

  it('rejects 0, the broadcast address, as an error', () => {
    // Modbus over Serial Line V1.02 §2.2: address 0 is broadcast
    const found = address(0);
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'meter.modbus.address' });
    expect(found[0].message).toContain('broadcast');
  });

  it.each([248, 255])('rejects %i, a reserved address', (a) => {
    // Modbus over Serial Line V1.02 §2.2: 248–255 are reserved
    const found = address(a);
    expect(found).toHaveLength(1);
    expect(found[0].message).toContain('reserved');
  });

  it.each([-1, 256, 1000])('rejects %i, outside the address byte', (a) => {
    expect(address(a)).toHaveLength(1);
  });
});

describe('modbus-baud', () => {
  const baud = (b: number) => ruleFindings(mutated(baseThreePhaseSite(), (s) => { s.meter.modbus.baud = b; s.gateway.bus.baud = b; }), 'modbus-baud');

  it.each([1200, 2400, 4800, 9600, 19200, 38400, 57600, 115200])('accepts %i Bd', (b) => {
    // rules.md modbus-baud list; Modbus over Serial Line V1.02 §3.2 requires 9600 and 19200 Bd
    expect(baud(b)).toEqual([]);
  });

  it.each([300, 14400, 28800, 9601, 230400])('rejects %i Bd as an error', (b) => {
    const found = baud(b);
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'meter.modbus.baud' });
  });
});

describe('modbus-framing', () => {
  const framing = (parity: Site['meter']['modbus']['parity'], stopBits: 1 | 2) =>
    ruleFindings(withModbus((m) => { m.parity = parity; m.stopBits = stopBits; }), 'modbus-framing');

  it.each([['even', 1], ['odd', 1], ['none', 2]] as const)('accepts %s parity with %i stop bit(s): an 11-bit character', (parity, stopBits) => {
    // Modbus over Serial Line V1.02 §2.5.1: an RTU character is 11 bits; no parity needs 2 stop bits
    expect(framing(parity, stopBits)).toEqual([]);
  });

  it.each([['none', 1], ['even', 2], ['odd', 2]] as const)('warns on %s parity with %i stop bit(s)', (parity, stopBits) => {
    // Modbus over Serial Line V1.02 §2.5.1: 10 or 12 bits is not the 11-bit RTU character
    const found = framing(parity, stopBits);
    expect(found).toHaveLength(1);
    expect(found[0].severity).toBe('warning');
  });
});

describe('bus-baud-mismatch', () => {
  it('does not fire when the gateway and meter agree', () => {
    expect(ruleFindings(baseThreePhaseSite(), 'bus-baud-mismatch')).toEqual([]);
  });

  it('fires as an error when the meter is at 19200 Bd and the bus at 9600 Bd', () => {
    const found = ruleFindings(withModbus((m) => { m.baud = 19200; }), 'bus-baud-mismatch');
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'gateway.bus.baud' });
  });
});

describe('bus-too-long', () => {
  const length = (m: number) => ruleFindings(withBus((b) => { b.lengthM = m; }), 'bus-too-long');

  it('accepts 1000 m exactly', () => {
    // Modbus over Serial Line V1.02 §3.4.3: 1000 m at up to 9600 Bd with AWG26
    expect(length(25)).toEqual([]);
    expect(length(1000)).toEqual([]);
  });

  it('warns above 1000 m up to 1200 m', () => {
    // Modbus §3.4.3 (1000 m); TIA/EIA-485-A about 1200 m (secondary source)
    expect(length(1001).map((f) => f.severity)).toEqual(['warning']);
    expect(length(1200).map((f) => f.severity)).toEqual(['warning']);
  });

  it('is an error above 1200 m', () => {
    // TIA/EIA-485-A: about 1200 m (4000 ft) is the practical limit (secondary source)
    const found = length(1201);
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'gateway.bus.lengthM' });
  });
});

describe('bus-stub-too-long', () => {
  const stub = (m: number) => ruleFindings(withBus((b) => { b.stubs = [{ device: 'meter', lengthM: m }]; }), 'bus-stub-too-long');

  it('accepts a stub of 20 m', () => {
    // Modbus over Serial Line V1.02 §3.4.3: stubs at most 20 m
    expect(stub(20)).toEqual([]);
  });

  it('warns on a stub of 20.5 m', () => {
    const found = stub(20.5);
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'warning', path: 'gateway.bus.stubs[0].lengthM' });
  });

  it('does not fire without stubs', () => {
    expect(ruleFindings(withBus((b) => { delete b.stubs; }), 'bus-stub-too-long')).toEqual([]);
  });
});

describe('bus-termination', () => {
  const terminations = (t: string[]) => ruleFindings(withBus((b) => { b.terminations = t; }), 'bus-termination');

  it('accepts exactly 2 terminations, one at each end', () => {
    // Modbus over Serial Line V1.02 §3.4.5: a termination at each end, at most 2 per pair
    expect(terminations(['gateway', 'meter'])).toEqual([]);
  });

  it.each([[[]], [['gateway']], [['gateway', 'meter', 'junction-box']]])('warns on %j', (t) => {
    const found = terminations(t);
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'warning', path: 'gateway.bus.terminations' });
  });
});

describe('bus-device-count', () => {
  const devices = (n: number) => ruleFindings(withBus((b) => { b.devices = n; }), 'bus-device-count');

  it('accepts 32 unit loads', () => {
    // Modbus over Serial Line V1.02 §3.4.1: 32 devices without a repeater; TIA/EIA-485-A 32 unit loads
    expect(devices(2)).toEqual([]);
    expect(devices(32)).toEqual([]);
  });

  it('is an error at 33 unit loads', () => {
    const found = devices(33);
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'gateway.bus.devices' });
  });
});
