// The site file, format 1, as TypeScript. Kept in step with schemas/site.schema.json by
// site/types.test.ts, which compares every object's keys with the schema's.

export type Arrangement = 'single-phase' | 'split-phase' | 'three-phase-4w' | 'three-phase-3w';
export type Conductor = 'L1' | 'L2' | 'L3' | 'N';
export type LiveConductor = 'L1' | 'L2' | 'L3';
export type ProfileId = 'gb-g100' | 'au-4777' | 'de-4105' | 'us-pcs' | 'generic';
export type Secondary = '5A' | '1A' | '333mV' | '100mA' | '50mA' | '40mA';
export type AccuracyClass = '0.2' | '0.2S' | '0.5' | '0.5S' | '1' | '3';
export type Parity = 'none' | 'even' | 'odd';
export type Arrow = 'toward-load' | 'toward-grid';
export type FailSafeAction = 'curtail-to-limit' | 'curtail-to-zero' | 'disconnect';
export type Expect = 'import' | 'export' | 'any';
export type VoltageTerminal = 'V1' | 'V2' | 'V3' | 'N';
export type CurrentTerminal = 'I1' | 'I2' | 'I3';

export interface SiteIdentity {
  id: string;
  name: string;
  address?: string;
}

export interface Agreement {
  reference: string;
  exportLimitKw: number;
  profile: ProfileId;
}

export interface Service {
  arrangement: Arrangement;
  voltageLn?: number;
  voltageLl?: number;
  frequencyHz: 50 | 60;
  mainBreakerA: number;
}

export interface ModbusSettings {
  address: number;
  baud: number;
  parity: Parity;
  stopBits: 1 | 2;
}

export interface CurrentInput {
  ct: string;
  conductor: Conductor;
}

export interface Meter {
  serial: string;
  position: 'grid-connection' | 'generation-feeder';
  inputBurdenVa?: number;
  modbus: ModbusSettings;
  voltageInputs: Partial<Record<VoltageTerminal, Conductor>>;
  currentInputs: Partial<Record<CurrentTerminal, CurrentInput>>;
}

export interface CtLead {
  lengthM: number;
  csaMm2: number;
}

export interface Ct {
  id: string;
  ratedPrimaryA: number;
  secondary: Secondary;
  accuracyClass: AccuracyClass;
  ratedBurdenVa?: number;
  lead?: CtLead;
  arrow: Arrow;
}

export interface BusStub {
  device: string;
  lengthM: number;
}

export interface Bus {
  lengthM: number;
  baud: number;
  terminations: string[];
  stubs?: BusStub[];
  devices: number;
}

export interface Gateway {
  serial: string;
  bus: Bus;
}

export interface GenerationGroup {
  id: string;
  units: number;
  unitAcKw: number;
  phase: LiveConductor | 'all';
}

export interface FailSafe {
  action: FailSafeAction;
  afterS: number;
}

export interface ExportPolicy {
  control: 'enabled' | 'disabled';
  scope: 'aggregate' | 'per-phase';
  limitKw: number;
  perPhaseLimitKw?: Partial<Record<LiveConductor, number>>;
  failSafe: FailSafe;
}

export interface Reading {
  v: number;
  a: number;
  kw: number;
  kvar?: number;
}

export interface Snapshot {
  label: string;
  expect: Expect;
  L1?: Reading;
  L2?: Reading;
  L3?: Reading;
}

export interface Commissioning {
  date?: string;
  readings?: Snapshot[];
  exportTest?: { observedMaxKw: number; settleS?: number };
  failSafeTest?: { observedS: number };
}

export interface Site {
  weir: 1;
  site: SiteIdentity;
  agreement: Agreement;
  service: Service;
  meter: Meter;
  cts: Ct[];
  gateway: Gateway;
  generation: GenerationGroup[];
  export: ExportPolicy;
  commissioning?: Commissioning;
}

/**
 * The keys of every object in the format, by schema location. types.test.ts checks this
 * against the JSON Schema, and the `satisfies` clauses check it against the interfaces above.
 */
export const SITE_KEYS = {
  '': ['weir', 'site', 'agreement', 'service', 'meter', 'cts', 'gateway', 'generation', 'export', 'commissioning'] satisfies (keyof Site)[],
  site: ['id', 'name', 'address'] satisfies (keyof SiteIdentity)[],
  agreement: ['reference', 'exportLimitKw', 'profile'] satisfies (keyof Agreement)[],
  service: ['arrangement', 'voltageLn', 'voltageLl', 'frequencyHz', 'mainBreakerA'] satisfies (keyof Service)[],
  meter: ['serial', 'position', 'inputBurdenVa', 'modbus', 'voltageInputs', 'currentInputs'] satisfies (keyof Meter)[],
  'meter.modbus': ['address', 'baud', 'parity', 'stopBits'] satisfies (keyof ModbusSettings)[],
  'meter.voltageInputs': ['V1', 'V2', 'V3', 'N'] satisfies VoltageTerminal[],
  'meter.currentInputs': ['I1', 'I2', 'I3'] satisfies CurrentTerminal[],
  'meter.currentInputs.I1': ['ct', 'conductor'] satisfies (keyof CurrentInput)[],
  'cts[]': ['id', 'ratedPrimaryA', 'secondary', 'accuracyClass', 'ratedBurdenVa', 'lead', 'arrow'] satisfies (keyof Ct)[],
  'cts[].lead': ['lengthM', 'csaMm2'] satisfies (keyof CtLead)[],
  gateway: ['serial', 'bus'] satisfies (keyof Gateway)[],
  'gateway.bus': ['lengthM', 'baud', 'terminations', 'stubs', 'devices'] satisfies (keyof Bus)[],
  'gateway.bus.stubs[]': ['device', 'lengthM'] satisfies (keyof BusStub)[],
  'generation[]': ['id', 'units', 'unitAcKw', 'phase'] satisfies (keyof GenerationGroup)[],
  export: ['control', 'scope', 'limitKw', 'perPhaseLimitKw', 'failSafe'] satisfies (keyof ExportPolicy)[],
  'export.perPhaseLimitKw': ['L1', 'L2', 'L3'] satisfies LiveConductor[],
  'export.failSafe': ['action', 'afterS'] satisfies (keyof FailSafe)[],
  commissioning: ['date', 'readings', 'exportTest', 'failSafeTest'] satisfies (keyof Commissioning)[],
  'commissioning.readings[]': ['label', 'expect', 'L1', 'L2', 'L3'] satisfies (keyof Snapshot)[],
  'commissioning.readings[].L1': ['v', 'a', 'kw', 'kvar'] satisfies (keyof Reading)[],
  'commissioning.exportTest': ['observedMaxKw', 'settleS'] satisfies (keyof NonNullable<Commissioning['exportTest']>)[],
  'commissioning.failSafeTest': ['observedS'] satisfies (keyof NonNullable<Commissioning['failSafeTest']>)[],
} as const;

export type Severity = 'error' | 'warning' | 'info';

/** One finding: a schema error, a YAML error or a rule result, located in the file. */
export interface Finding {
  ruleId: string;
  severity: Severity;
  message: string;
  /** Dotted path into the site, for example `cts[0].ratedPrimaryA`; empty for the whole file. */
  path: string;
  /** 1-based position of the offending node in the YAML text. */
  line: number;
  column: number;
  source?: string;
  hint?: string;
}
