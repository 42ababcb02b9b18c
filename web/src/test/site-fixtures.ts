// Invented demo sites for component tests. The base is a sound three-phase site; each fault
// variant changes one thing, and the real engine (checkSite) produces the findings.
import { checkSite } from '../../../shared/index.ts';

export const SOUND_SITE = `weir: 1
site:
  id: orchard-row-dairy
  name: Orchard Row Dairy
agreement:
  reference: TEST-0001
  exportLimitKw: 5
  profile: gb-g100
service:
  arrangement: three-phase-4w
  voltageLn: 230
  voltageLl: 400
  frequencyHz: 50
  mainBreakerA: 80
meter:
  serial: EM-1001
  position: grid-connection
  modbus: { address: 1, baud: 9600, parity: even, stopBits: 1 }
  voltageInputs: { V1: L1, V2: L2, V3: L3, N: N }
  currentInputs:
    I1: { ct: ct-1, conductor: L1 }
    I2: { ct: ct-2, conductor: L2 }
    I3: { ct: ct-3, conductor: L3 }
cts:
  - { id: ct-1, ratedPrimaryA: 100, secondary: 333mV, accuracyClass: "1", arrow: toward-load }
  - { id: ct-2, ratedPrimaryA: 100, secondary: 333mV, accuracyClass: "1", arrow: toward-load }
  - { id: ct-3, ratedPrimaryA: 100, secondary: 333mV, accuracyClass: "1", arrow: toward-load }
gateway:
  serial: GW-2002
  bus:
    lengthM: 20
    baud: 9600
    terminations: [gateway, meter]
    devices: 2
generation:
  - { id: roof-east, units: 8, unitAcKw: 0.4, phase: L1 }
  - { id: roof-south, units: 8, unitAcKw: 0.4, phase: L2 }
  - { id: roof-west, units: 8, unitAcKw: 0.4, phase: L3 }
export:
  control: enabled
  scope: aggregate
  limitKw: 5
  failSafe: { action: curtail-to-limit, afterS: 5 }
`;

/** ct-2 on current input I2 is clamped on L3 while V2 is wired to L2 (meter-ct-phase-pair). */
export const WRONG_PHASE_SITE = SOUND_SITE.replace('I2: { ct: ct-2, conductor: L2 }', 'I2: { ct: ct-2, conductor: L3 }');

/** ct-3 faces the grid (ct-arrow-toward-grid). */
export const REVERSED_SITE = SOUND_SITE.replace(
  '{ id: ct-3, ratedPrimaryA: 100, secondary: 333mV, accuracyClass: "1", arrow: toward-load }',
  '{ id: ct-3, ratedPrimaryA: 100, secondary: 333mV, accuracyClass: "1", arrow: toward-grid }',
);

/** No current input on L3 (meter-ct-missing). */
export const MISSING_CT_SITE = SOUND_SITE.replace('    I3: { ct: ct-3, conductor: L3 }\n', '');

export function checked(text: string) {
  const result = checkSite(text);
  if (!result.site) throw new Error(`fixture did not pass the schema: ${JSON.stringify(result.findings)}`);
  return { site: result.site, findings: result.findings };
}
