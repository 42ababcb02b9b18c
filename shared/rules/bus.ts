import { BUS_LIMIT_M, BUS_WARN_ABOVE_M } from '../site/summary.ts';
import { defineRule, fmt, type RawFinding } from './rule.ts';

const MODBUS = 'Modbus over Serial Line V1.02';
/** Modbus over Serial Line V1.02 §3.2 and common serial speeds. */
export const MODBUS_BAUD_RATES = [1200, 2400, 4800, 9600, 19200, 38400, 57600, 115200] as const;
/** §3.4.3: at most 20 m per stub. */
export const MAX_STUB_M = 20;
/** §3.4.1; TIA/EIA-485-A: 32 unit loads without a repeater. */
export const MAX_UNIT_LOADS = 32;

export const modbusAddress = defineRule({
  id: 'modbus-address',
  severity: 'error',
  title: 'The meter\'s Modbus address is 1–247',
  source: `${MODBUS} §2.2`,
  check({ site }) {
    const a = site.meter.modbus.address;
    if (a >= 1 && a <= 247) return [];
    return [{
      at: ['meter', 'modbus', 'address'],
      message: a === 0 ? 'Modbus address 0 is the broadcast address; a meter needs 1–247' : `Modbus address ${a} is outside 1–247${a >= 248 && a <= 255 ? ' (248–255 are reserved)' : ''}`,
      hint: 'set the meter and the gateway to the same address between 1 and 247',
    }];
  },
});

export const modbusBaud = defineRule({
  id: 'modbus-baud',
  severity: 'error',
  title: 'The baud rate is a standard serial speed',
  source: `${MODBUS} §3.2 (9600 and 19200 Bd required)`,
  check({ site }) {
    const out: RawFinding[] = [];
    const check = (baud: number, at: (string | number)[]) => {
      if ((MODBUS_BAUD_RATES as readonly number[]).includes(baud)) return;
      out.push({ at, message: `${fmt(baud)} Bd is not a standard rate (${MODBUS_BAUD_RATES.join(', ')})`, hint: '9600 or 19200 Bd are supported by every Modbus device' });
    };
    check(site.meter.modbus.baud, ['meter', 'modbus', 'baud']);
    if (site.gateway.bus.baud !== site.meter.modbus.baud) check(site.gateway.bus.baud, ['gateway', 'bus', 'baud']);
    return out;
  },
});

export const modbusFraming = defineRule({
  id: 'modbus-framing',
  severity: 'warning',
  title: 'The character is 11 bits: parity with 1 stop bit, or no parity with 2',
  source: `${MODBUS} §2.5.1`,
  check({ site }) {
    const { parity, stopBits } = site.meter.modbus;
    if (parity === 'none' && stopBits === 1) {
      return [{ at: ['meter', 'modbus', 'stopBits'], message: 'no parity with 1 stop bit makes a 10-bit character; Modbus RTU needs 11 bits', hint: 'use 2 stop bits without parity, or even parity with 1 stop bit' }];
    }
    if (parity !== 'none' && stopBits === 2) {
      return [{ at: ['meter', 'modbus', 'stopBits'], message: `${parity} parity with 2 stop bits makes a 12-bit character; Modbus RTU needs 11 bits`, hint: `use ${parity} parity with 1 stop bit` }];
    }
    return [];
  },
});

export const busBaudMismatch = defineRule({
  id: 'bus-baud-mismatch',
  severity: 'error',
  title: 'The gateway and the meter use the same baud rate',
  check({ site }) {
    if (site.gateway.bus.baud === site.meter.modbus.baud) return [];
    return [{ at: ['gateway', 'bus', 'baud'], message: `the gateway runs the bus at ${fmt(site.gateway.bus.baud)} Bd but the meter is set to ${fmt(site.meter.modbus.baud)} Bd`, hint: 'set both to the same rate' }];
  },
});

export const busTooLong = defineRule({
  id: 'bus-too-long',
  severity: 'warning',
  title: 'The RS-485 trunk is within 1000 m (warning) and 1200 m (error)',
  source: `${MODBUS} §3.4.3 (1000 m at 9600 Bd, AWG26); TIA/EIA-485-A (about 1200 m)`,
  check({ site }) {
    const length = site.gateway.bus.lengthM;
    if (length > BUS_LIMIT_M) {
      return [{ at: ['gateway', 'bus', 'lengthM'], severity: 'error', message: `the trunk is ${fmt(length)} m, beyond the ${BUS_LIMIT_M} m that RS-485 can carry`, hint: 'add a repeater or move the gateway closer to the meter' }];
    }
    if (length > BUS_WARN_ABOVE_M) {
      return [{ at: ['gateway', 'bus', 'lengthM'], message: `the trunk is ${fmt(length)} m, beyond the ${BUS_WARN_ABOVE_M} m Modbus allows at 9600 Bd with AWG26 cable`, hint: 'use thicker cable or a lower baud rate, or add a repeater' }];
    }
    return [];
  },
});

export const busStubTooLong = defineRule({
  id: 'bus-stub-too-long',
  severity: 'warning',
  title: 'Each stub is at most 20 m',
  source: `${MODBUS} §3.4.3`,
  check({ site }) {
    return (site.gateway.bus.stubs ?? []).flatMap((stub, i): RawFinding[] => stub.lengthM > MAX_STUB_M ? [{
      at: ['gateway', 'bus', 'stubs', i, 'lengthM'],
      message: `the stub to ${stub.device} is ${fmt(stub.lengthM)} m; Modbus allows at most ${MAX_STUB_M} m`,
      hint: 'run the trunk to the device (daisy chain) instead of a long branch',
    }] : []);
  },
});

export const busTermination = defineRule({
  id: 'bus-termination',
  severity: 'warning',
  title: 'The trunk has a terminator at each end, two in all',
  source: `${MODBUS} §3.4.5`,
  check({ site }) {
    const n = site.gateway.bus.terminations.length;
    if (n === 2) return [];
    return [{
      at: ['gateway', 'bus', 'terminations'],
      message: n < 2 ? `the trunk has ${n} terminator${n === 1 ? '' : 's'}; it needs one at each end` : `the trunk has ${n} terminators; at most 2, one at each end`,
      hint: 'fit 120 Ω (with 1 nF in series) or 150 Ω at the two ends of the trunk only',
    }];
  },
});

export const busDeviceCount = defineRule({
  id: 'bus-device-count',
  severity: 'error',
  title: 'At most 32 unit loads on the trunk',
  source: `${MODBUS} §3.4.1; TIA/EIA-485-A`,
  check({ site }) {
    const n = site.gateway.bus.devices;
    if (!(n > MAX_UNIT_LOADS)) return [];
    return [{ at: ['gateway', 'bus', 'devices'], message: `${n} unit loads on one trunk; RS-485 allows ${MAX_UNIT_LOADS} without a repeater`, hint: 'split the bus or add a repeater' }];
  },
});

export const busRules = [modbusAddress, modbusBaud, modbusFraming, busBaudMismatch, busTooLong, busStubTooLong, busTermination, busDeviceCount];
