// The flags and questions of `weir init`, kept apart from their checks (init-fields.ts) so that
// the command's definition, read at every start-up, does not load the rules engine.
import type { FieldKey } from './init-fields.ts';

export interface QuestionText {
  /** Commander flag with its value name. */
  flag: string;
  /** The question at the prompt, and the flag's help line. */
  message: string;
}

export const QUESTIONS: Record<FieldKey, QuestionText> = {
  siteId: { flag: '--site-id <id>', message: 'Site id (lower-case letters, digits and hyphens)' },
  name: { flag: '--name <name>', message: 'Site name' },
  address: { flag: '--address <text>', message: 'Address (optional; leave empty for none)' },
  agreementRef: { flag: '--agreement-ref <ref>', message: 'Agreement reference from the network operator' },
  agreementLimit: { flag: '--agreement-limit <kW>', message: 'Agreed export limit, kW (0 = zero export)' },
  profile: { flag: '--profile <id>', message: 'Grid-rule profile' },
  arrangement: { flag: '--arrangement <kind>', message: 'Supply arrangement' },
  voltageLn: { flag: '--voltage-ln <V>', message: 'Line-to-neutral voltage, V' },
  voltageLl: { flag: '--voltage-ll <V>', message: 'Line-to-line voltage, V' },
  frequency: { flag: '--frequency <Hz>', message: 'Frequency, Hz' },
  mainBreaker: { flag: '--main-breaker <A>', message: 'Main breaker rating, A' },
  meterSerial: { flag: '--meter-serial <serial>', message: 'Meter serial number' },
  modbusAddress: { flag: '--modbus-address <n>', message: 'Meter Modbus address (1-247)' },
  baud: { flag: '--baud <rate>', message: 'Baud rate (the gateway uses the same)' },
  parity: { flag: '--parity <parity>', message: 'Parity (even is the Modbus default)' },
  stopBits: { flag: '--stop-bits <n>', message: 'Stop bits' },
  ctRated: { flag: '--ct-rated <A>', message: 'CT rated primary current, A' },
  ctSecondary: { flag: '--ct-secondary <output>', message: 'CT secondary (output)' },
  ctClass: { flag: '--ct-class <class>', message: 'CT accuracy class (IEC 61869-2)' },
  ctLeadLength: { flag: '--ct-lead-length <m>', message: 'CT secondary lead length, one way, m' },
  ctLeadCsa: { flag: '--ct-lead-csa <mm2>', message: 'CT lead cross-section, mm²' },
  ctBurden: { flag: '--ct-burden <VA>', message: 'CT rated burden, VA' },
  ctArrow: { flag: '--ct-arrow <direction>', message: 'CT arrow direction' },
  gatewaySerial: { flag: '--gateway-serial <serial>', message: 'Gateway serial number' },
  busLength: { flag: '--bus-length <m>', message: 'Bus trunk length, m' },
  busDevices: { flag: '--bus-devices <n>', message: 'Unit loads on the bus, gateway included' },
  generation: { flag: '--generation <id:units:kW:phase...>', message: 'Generation groups' },
  exportControl: { flag: '--export-control <state>', message: 'Export control' },
  exportScope: { flag: '--export-scope <scope>', message: 'Limit scope' },
  exportLimit: { flag: '--export-limit <kW>', message: 'Export limit the gateway enforces, kW' },
  failSafe: { flag: '--fail-safe <action>', message: 'Fail-safe action on loss of the meter or bus' },
  failSafeAfter: { flag: '--fail-safe-after <s>', message: 'Fail-safe delay, s' },
  limitL1: { flag: '--limit-l1 <kW>', message: 'Export limit on L1, kW' },
  limitL2: { flag: '--limit-l2 <kW>', message: 'Export limit on L2, kW' },
  limitL3: { flag: '--limit-l3 <kW>', message: 'Export limit on L3, kW' },
};
