// The questions of `weir init`, as data: each has a flag, a default, a parser and a check. The
// same check runs on a flag's value and on an answer typed at the prompt. Beyond its own range
// check, every answer is tried in a draft site file that the shared engine checks, so an answer
// that the rules would call an error is refused where it is given, with the rule's own words.
import {
  checkSite, COPPER_CLASS2_OHM_PER_KM, getProfile, liveConductors, SQRT3,
  type AccuracyClass, type Arrangement, type Arrow, type FailSafeAction, type Finding, type GenerationGroup,
  type LiveConductor, type Parity, type ProfileId, type Secondary, type Site,
} from '../../shared/index.ts';
import { MODBUS_BAUD_RATES, MAX_UNIT_LOADS } from '../../shared/rules/bus.ts';
import { QUESTIONS } from './init-flags.ts';
import { SITE_ID_PATTERN_TEXT } from './site-id.ts';
import { renderSiteYaml } from './init-yaml.ts';

export interface InitAnswers {
  siteId: string;
  name: string;
  address: string;
  agreementRef: string;
  agreementLimit: number;
  profile: ProfileId;
  arrangement: Arrangement;
  voltageLn: number;
  voltageLl: number;
  frequency: 50 | 60;
  mainBreaker: number;
  meterSerial: string;
  modbusAddress: number;
  baud: number;
  parity: Parity;
  stopBits: 1 | 2;
  ctRated: number;
  ctSecondary: Secondary;
  ctClass: AccuracyClass;
  ctLeadLength: number;
  ctLeadCsa: number;
  ctBurden: number;
  ctArrow: Arrow;
  gatewaySerial: string;
  busLength: number;
  busDevices: number;
  generation: GenerationGroup[];
  exportControl: 'enabled' | 'disabled';
  exportScope: 'aggregate' | 'per-phase';
  exportLimit: number;
  limitL1: number;
  limitL2: number;
  limitL3: number;
  failSafe: FailSafeAction;
  failSafeAfter: number;
}

export type FieldKey = keyof InitAnswers;
export type SomeAnswers = Partial<InitAnswers>;

/** The outcome of a check: the value, or why it was refused. */
export type Checked<T> = { ok: true; value: T; notes: string[] } | { ok: false; message: string };

export interface Choice {
  value: string;
  name?: string;
}

export interface Field<K extends FieldKey = FieldKey> {
  key: K;
  section: string;
  /** Commander flag, e.g. `--modbus-address <n>`. */
  flag: string;
  /** The question, and the flag's help line. */
  message: string;
  kind: 'text' | 'number' | 'choice';
  choices?: (a: SomeAnswers) => Choice[];
  /** Asked only when this holds for the answers so far. */
  when?: (a: SomeAnswers) => boolean;
  default: (a: SomeAnswers) => InitAnswers[K];
  /** Text to value, or an error message. */
  parse: (raw: string, a: SomeAnswers) => InitAnswers[K] | { error: string };
  /** Range and shape checks of the value itself. */
  check?: (value: InitAnswers[K], a: SomeAnswers) => true | string;
  /** Engine finding paths that this answer is responsible for. */
  concerns?: RegExp;
}

/** Placeholder for facts the installer may not have yet; the file passes, the text says what is missing. */
export const TO_BE_CONFIRMED = 'to be confirmed';
export const SITE_ID_PATTERN = new RegExp(SITE_ID_PATTERN_TEXT);
/**
 * Standard rated primary currents: 10, 12.5, 15, 20, 25, 30, 40, 50, 60, 75 A and their decimal
 * multiples (IEC 61869-2:2012 cl. 5.201, from memory).
 */
export const CT_PRIMARY_SERIES_A = [5, 10, 12.5, 15, 20, 25, 30, 40, 50, 60, 75, 100, 125, 150, 200, 250, 300, 400, 500, 600, 750, 1000, 1250, 1500, 2000, 2500, 3000, 4000, 5000];
/** The cross-sections that the engine has an IEC 60228:2004 resistance for, mm². */
const LEAD_CSA_MM2 = COPPER_CLASS2_OHM_PER_KM.map(([csa]) => csa);

const PROFILES: ProfileId[] = ['gb-g100', 'au-4777', 'de-4105', 'us-pcs', 'generic'];
const ARRANGEMENTS: Arrangement[] = ['single-phase', 'split-phase', 'three-phase-4w', 'three-phase-3w'];
const SECONDARIES: Secondary[] = ['5A', '1A', '333mV', '100mA', '50mA', '40mA'];
const CLASSES: AccuracyClass[] = ['0.2', '0.2S', '0.5', '0.5S', '1', '3'];
const PARITIES: Parity[] = ['even', 'none', 'odd'];
const FAIL_SAFE_ACTIONS: FailSafeAction[] = ['curtail-to-zero', 'curtail-to-limit', 'disconnect'];

const choicesOf = (values: readonly (string | number)[]): Choice[] => values.map((v) => ({ value: String(v) }));

// ---- parsers ---------------------------------------------------------------------------------

const text = (what: string, max = 200) => (raw: string): string | { error: string } => {
  const v = raw.trim();
  if (v === '') return { error: `${what} may not be empty` };
  if (v.length > max) return { error: `${what} may have at most ${max} characters` };
  return v;
};

const number = (what: string, { min, exclusiveMin, integer }: { min?: number; exclusiveMin?: number; integer?: boolean }) => (raw: string): number | { error: string } => {
  const v = raw.trim().replace(/,/g, '.');
  if (v === '' || !/^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i.test(v)) return { error: `${what} must be a number${integer ? ' (a whole number)' : ''}, not "${raw.trim()}"` };
  const n = Number(v);
  if (!Number.isFinite(n)) return { error: `${what} must be a finite number` };
  if (integer && !Number.isInteger(n)) return { error: `${what} must be a whole number` };
  if (exclusiveMin !== undefined && !(n > exclusiveMin)) return { error: `${what} must be more than ${exclusiveMin}` };
  if (min !== undefined && n < min) return { error: `${what} must be at least ${min}` };
  return n;
};

function oneOf<T extends string | number>(what: string, values: readonly T[]) {
  return (raw: string): T | { error: string } => {
    const found = values.find((v) => String(v).toLowerCase() === raw.trim().toLowerCase());
    return found === undefined ? { error: `${what} must be one of: ${values.join(', ')}` } : found;
  };
}

// ---- defaults ----------------------------------------------------------------------------------

const live = (a: SomeAnswers): LiveConductor[] => liveConductors(a.arrangement ?? 'three-phase-4w');

/** Nominal pairs of IEC 60038:2009 Table 1 (secondary source): V_LN to the usual V_LL. */
const NOMINAL_LL: Record<number, number> = { 120: 208, 230: 400, 277: 480, 347: 600, 400: 690 };

function defaultVoltageLl(a: SomeAnswers): number {
  if (a.arrangement === 'split-phase') return 2 * (a.voltageLn ?? 120);
  if (a.arrangement === 'three-phase-3w') return 400;
  const ln = a.voltageLn ?? 230;
  return NOMINAL_LL[ln] ?? Math.round(SQRT3 * ln);
}

/** The smallest standard CT rating at or above the main breaker (ct-undersized, common practice). */
export function defaultCtRating(mainBreakerA: number): number {
  return CT_PRIMARY_SERIES_A.find((r) => r >= mainBreakerA) ?? Math.ceil(mainBreakerA / 100) * 100;
}

const needsBurden = (a: SomeAnswers) => a.ctSecondary === '5A' || a.ctSecondary === '1A';
const perPhaseOn = (c: LiveConductor) => (a: SomeAnswers) => a.exportScope === 'per-phase' && live(a).includes(c);

/** An even share of the limit per live conductor, rounded down so that the shares never add up to more. */
function share(a: SomeAnswers): number {
  const n = live(a).length;
  return Math.floor(((a.exportLimit ?? 0) / n) * 1000) / 1000;
}

export function defaultGeneration(a: SomeAnswers): GenerationGroup[] {
  return [{ id: 'pv-1', units: 10, unitAcKw: 0.4, phase: live(a).length > 1 ? 'all' : 'L1' }];
}

// ---- the questions ---------------------------------------------------------------------------

export const FIELDS: Field[] = [
  {
    key: 'siteId', section: 'Site', ...QUESTIONS.siteId, kind: 'text',
    default: () => 'new-site',
    parse: (raw) => raw.trim(),
    check: (v) => SITE_ID_PATTERN.test(v) || 'a site id is 2 to 63 lower-case letters, digits and hyphens, starting with a letter or digit',
    concerns: /^site\.id$/,
  } satisfies Field<'siteId'>,
  {
    key: 'name', section: 'Site', ...QUESTIONS.name, kind: 'text',
    default: (a) => (a.siteId ?? 'new-site').split('-').filter(Boolean).map((w) => w[0].toUpperCase() + w.slice(1)).join(' '),
    parse: text('the site name'),
    concerns: /^site\.name$/,
  } satisfies Field<'name'>,
  {
    key: 'address', section: 'Site', ...QUESTIONS.address, kind: 'text',
    default: () => '',
    parse: (raw) => raw.trim(),
    check: (v) => v.length <= 300 || 'the address may have at most 300 characters',
    concerns: /^site\.address$/,
  } satisfies Field<'address'>,
  {
    key: 'agreementRef', section: 'Connection agreement', ...QUESTIONS.agreementRef, kind: 'text',
    default: () => TO_BE_CONFIRMED,
    parse: text('the agreement reference'),
    concerns: /^agreement\.reference$/,
  } satisfies Field<'agreementRef'>,
  {
    key: 'agreementLimit', section: 'Connection agreement', ...QUESTIONS.agreementLimit, kind: 'number',
    default: () => 5,
    parse: number('the agreed export limit', { min: 0 }),
    concerns: /^agreement\.exportLimitKw$/,
  } satisfies Field<'agreementLimit'>,
  {
    key: 'profile', section: 'Connection agreement', ...QUESTIONS.profile, kind: 'choice',
    choices: () => PROFILES.map((p) => ({ value: p, name: `${p}  ${getProfile(p).title}` })),
    default: () => 'gb-g100',
    parse: oneOf('the profile', PROFILES),
  } satisfies Field<'profile'>,
  {
    key: 'arrangement', section: 'Supply (service)', ...QUESTIONS.arrangement, kind: 'choice',
    choices: () => [
      { value: 'single-phase', name: 'single-phase     L1 + N' },
      { value: 'split-phase', name: 'split-phase      L1 + L2 + N' },
      { value: 'three-phase-4w', name: 'three-phase-4w   L1 + L2 + L3 + N' },
      { value: 'three-phase-3w', name: 'three-phase-3w   L1 + L2 + L3, no N' },
    ],
    default: () => 'three-phase-4w',
    parse: oneOf('the arrangement', ARRANGEMENTS),
  } satisfies Field<'arrangement'>,
  {
    key: 'voltageLn', section: 'Supply (service)', ...QUESTIONS.voltageLn, kind: 'number',
    when: (a) => a.arrangement !== 'three-phase-3w',
    default: (a) => (a.arrangement === 'split-phase' ? 120 : 230),
    parse: number('the line-to-neutral voltage', { exclusiveMin: 0 }),
    concerns: /^service\.voltageLn$/,
  } satisfies Field<'voltageLn'>,
  {
    key: 'voltageLl', section: 'Supply (service)', ...QUESTIONS.voltageLl, kind: 'number',
    when: (a) => a.arrangement !== 'single-phase',
    default: defaultVoltageLl,
    parse: number('the line-to-line voltage', { exclusiveMin: 0 }),
    concerns: /^service\.voltageLl$/,
  } satisfies Field<'voltageLl'>,
  {
    key: 'frequency', section: 'Supply (service)', ...QUESTIONS.frequency, kind: 'choice',
    choices: () => choicesOf([50, 60]),
    // 120, 277 and 347 V systems are 60 Hz systems in IEC 60038:2009 Table 1 (secondary source).
    default: (a) => (a.arrangement === 'split-phase' || [120, 277, 347].includes(a.voltageLn ?? 0) ? 60 : 50),
    parse: oneOf('the frequency', [50, 60] as const),
  } satisfies Field<'frequency'>,
  {
    key: 'mainBreaker', section: 'Supply (service)', ...QUESTIONS.mainBreaker, kind: 'number',
    default: () => 80,
    parse: number('the main breaker rating', { exclusiveMin: 0 }),
    concerns: /^service\.mainBreakerA$/,
  } satisfies Field<'mainBreaker'>,
  {
    key: 'meterSerial', section: 'Export meter', ...QUESTIONS.meterSerial, kind: 'text',
    default: () => TO_BE_CONFIRMED,
    parse: text('the meter serial'),
    concerns: /^meter\.serial$/,
  } satisfies Field<'meterSerial'>,
  {
    key: 'modbusAddress', section: 'Export meter', ...QUESTIONS.modbusAddress, kind: 'number',
    default: () => 1,
    parse: number('the Modbus address', { integer: true }),
    // Modbus over Serial Line V1.02 §2.2: 0 is broadcast, 1–247 are devices, 248–255 reserved.
    check: (v) => (v >= 1 && v <= 247) || (v === 0
      ? 'address 0 is the Modbus broadcast address; a meter needs 1-247 (Modbus over Serial Line V1.02 §2.2)'
      : `address ${v} is outside 1-247${v >= 248 && v <= 255 ? ' (248-255 are reserved)' : ''} (Modbus over Serial Line V1.02 §2.2)`),
    concerns: /^meter\.modbus\.address$/,
  } satisfies Field<'modbusAddress'>,
  {
    key: 'baud', section: 'Export meter', ...QUESTIONS.baud, kind: 'choice',
    choices: () => choicesOf(MODBUS_BAUD_RATES),
    default: () => 9600,
    parse: oneOf('the baud rate', MODBUS_BAUD_RATES),
    concerns: /^(meter\.modbus|gateway\.bus)\.baud$/,
  } satisfies Field<'baud'>,
  {
    key: 'parity', section: 'Export meter', ...QUESTIONS.parity, kind: 'choice',
    choices: () => choicesOf(PARITIES),
    default: () => 'even',
    parse: oneOf('the parity', PARITIES),
  } satisfies Field<'parity'>,
  {
    key: 'stopBits', section: 'Export meter', ...QUESTIONS.stopBits, kind: 'choice',
    choices: () => choicesOf([1, 2]),
    // Modbus over Serial Line V1.02 §2.5.1: 11-bit characters, so 2 stop bits without parity.
    default: (a) => (a.parity === 'none' ? 2 : 1),
    parse: oneOf('the stop bits', [1, 2] as const),
    concerns: /^meter\.modbus\.stopBits$/,
  } satisfies Field<'stopBits'>,
  {
    key: 'ctRated', section: 'CTs (one per live conductor)', ...QUESTIONS.ctRated, kind: 'number',
    default: (a) => defaultCtRating(a.mainBreaker ?? 80),
    parse: number('the CT rating', { exclusiveMin: 0 }),
    concerns: /^cts\[\d+\]\.ratedPrimaryA$/,
  } satisfies Field<'ctRated'>,
  {
    key: 'ctSecondary', section: 'CTs (one per live conductor)', ...QUESTIONS.ctSecondary, kind: 'choice',
    choices: () => choicesOf(SECONDARIES),
    default: () => '5A',
    parse: oneOf('the CT secondary', SECONDARIES),
  } satisfies Field<'ctSecondary'>,
  {
    key: 'ctClass', section: 'CTs (one per live conductor)', ...QUESTIONS.ctClass, kind: 'choice',
    choices: () => choicesOf(CLASSES),
    default: () => '1',
    parse: oneOf('the accuracy class', CLASSES),
  } satisfies Field<'ctClass'>,
  {
    key: 'ctLeadLength', section: 'CTs (one per live conductor)', ...QUESTIONS.ctLeadLength, kind: 'number',
    when: needsBurden,
    default: () => 2,
    parse: number('the lead length', { min: 0 }),
  } satisfies Field<'ctLeadLength'>,
  {
    key: 'ctLeadCsa', section: 'CTs (one per live conductor)', ...QUESTIONS.ctLeadCsa, kind: 'choice',
    when: needsBurden,
    choices: () => choicesOf(LEAD_CSA_MM2),
    default: () => 2.5,
    parse: number('the lead cross-section', { exclusiveMin: 0 }),
  } satisfies Field<'ctLeadCsa'>,
  {
    key: 'ctBurden', section: 'CTs (one per live conductor)', ...QUESTIONS.ctBurden, kind: 'number',
    when: needsBurden,
    // the smallest standard rated output (IEC 61869-2:2012 cl. 5.5.201: 2.5, 5, 10, 15, 30 VA)
    default: () => 2.5,
    parse: number('the rated burden', { exclusiveMin: 0 }),
    // The leads were asked before: a burden they exceed is refused here (ct-burden-exceeded).
    concerns: /^cts\[\d+\]\.(lead|ratedBurdenVa)/,
  } satisfies Field<'ctBurden'>,
  {
    key: 'ctArrow', section: 'CTs (one per live conductor)', ...QUESTIONS.ctArrow, kind: 'choice',
    choices: () => [{ value: 'toward-load', name: 'toward-load  (P1 to the grid; common practice)' }, { value: 'toward-grid', name: 'toward-grid' }],
    default: () => 'toward-load',
    parse: oneOf('the CT arrow', ['toward-load', 'toward-grid'] as const),
    concerns: /^cts\[\d+\]\.arrow$/,
  } satisfies Field<'ctArrow'>,
  {
    key: 'gatewaySerial', section: 'Gateway and RS-485 bus', ...QUESTIONS.gatewaySerial, kind: 'text',
    default: () => TO_BE_CONFIRMED,
    parse: text('the gateway serial'),
    concerns: /^gateway\.serial$/,
  } satisfies Field<'gatewaySerial'>,
  {
    key: 'busLength', section: 'Gateway and RS-485 bus', ...QUESTIONS.busLength, kind: 'number',
    default: () => 10,
    parse: number('the bus length', { exclusiveMin: 0 }),
    concerns: /^gateway\.bus\.lengthM$/,
  } satisfies Field<'busLength'>,
  {
    key: 'busDevices', section: 'Gateway and RS-485 bus', ...QUESTIONS.busDevices, kind: 'number',
    message: `${QUESTIONS.busDevices.message} (at most ${MAX_UNIT_LOADS})`,
    default: () => 2,
    parse: number('the number of unit loads', { min: 1, integer: true }),
    concerns: /^gateway\.bus\.devices$/,
  } satisfies Field<'busDevices'>,
  // generation is asked group by group (init-prompts.ts), or given as --generation specs
  {
    key: 'generation', section: 'Generation', ...QUESTIONS.generation, kind: 'text',
    default: defaultGeneration,
    parse: () => ({ error: 'generation is given with --generation' }),
    concerns: /^generation/,
  } satisfies Field<'generation'>,
  {
    key: 'exportControl', section: 'Export policy', ...QUESTIONS.exportControl, kind: 'choice',
    choices: () => choicesOf(['enabled', 'disabled']),
    default: () => 'enabled',
    parse: oneOf('export control', ['enabled', 'disabled'] as const),
    concerns: /^export\.control$/,
  } satisfies Field<'exportControl'>,
  {
    key: 'exportScope', section: 'Export policy', ...QUESTIONS.exportScope, kind: 'choice',
    choices: () => [{ value: 'aggregate', name: 'aggregate  one limit on the sum of the phases' }, { value: 'per-phase', name: 'per-phase  one limit per phase' }],
    default: () => 'aggregate',
    parse: oneOf('the scope', ['aggregate', 'per-phase'] as const),
  } satisfies Field<'exportScope'>,
  {
    key: 'exportLimit', section: 'Export policy', ...QUESTIONS.exportLimit, kind: 'number',
    default: (a) => a.agreementLimit ?? 5,
    parse: number('the export limit', { min: 0 }),
    concerns: /^export\.limitKw$/,
  } satisfies Field<'exportLimit'>,
  ...(['L1', 'L2', 'L3'] as const).map((c) => ({
    key: `limit${c}` as const, section: 'Export policy', ...QUESTIONS[`limit${c}`], kind: 'number' as const,
    when: perPhaseOn(c),
    default: share,
    parse: number(`the ${c} limit`, { min: 0 }),
  } satisfies Field<'limitL1' | 'limitL2' | 'limitL3'>)),
  {
    key: 'failSafe', section: 'Export policy', ...QUESTIONS.failSafe, kind: 'choice',
    choices: () => choicesOf(FAIL_SAFE_ACTIONS),
    default: () => 'curtail-to-zero',
    parse: oneOf('the fail-safe action', FAIL_SAFE_ACTIONS),
  } satisfies Field<'failSafe'>,
  {
    key: 'failSafeAfter', section: 'Export policy', ...QUESTIONS.failSafeAfter, kind: 'number',
    default: (a) => Math.min(5, getProfile(a.profile ?? 'generic').maxResponseS ?? 5),
    parse: number('the fail-safe delay', { min: 0 }),
    concerns: /^export\.failSafe\.afterS$/,
  } satisfies Field<'failSafeAfter'>,
] as Field[];

/** The per-phase sum is judged at the last live conductor's answer, once every share is known. */
function perPhaseConcerns(field: Field, a: SomeAnswers): RegExp | undefined {
  if (!field.key.startsWith('limitL')) return field.concerns;
  const last = live(a).at(-1);
  return field.key === `limit${last}` ? /^export\.perPhaseLimitKw/ : undefined;
}

/** Every answer, with defaults for those not given; fields that do not apply are left out. */
export function resolveAnswers(given: SomeAnswers): SomeAnswers {
  const out: SomeAnswers = {};
  for (const field of FIELDS) {
    if (field.when && !field.when(out)) continue;
    const value = given[field.key] !== undefined ? given[field.key] : field.default(out);
    (out as Record<string, unknown>)[field.key] = value;
  }
  return out;
}

/** The site that the answers describe. CTs, voltage and current inputs follow the arrangement. */
export function buildSite(a: SomeAnswers): Site {
  const r = resolveAnswers(a);
  const conductors = live(r);
  const arrangement = r.arrangement!;
  const ctId = (c: LiveConductor) => `ct-${c.toLowerCase()}`;
  const voltageInputs: Site['meter']['voltageInputs'] = {};
  const currentInputs: Site['meter']['currentInputs'] = {};
  conductors.forEach((c, i) => {
    voltageInputs[`V${i + 1}` as 'V1'] = c;
    currentInputs[`I${i + 1}` as 'I1'] = { ct: ctId(c), conductor: c };
  });
  if (arrangement !== 'three-phase-3w') voltageInputs.N = 'N';
  const burden = r.ctSecondary === '5A' || r.ctSecondary === '1A';
  const perPhase = r.exportScope === 'per-phase'
    ? Object.fromEntries(conductors.map((c) => [c, r[`limit${c}`]!])) as Site['export']['perPhaseLimitKw']
    : undefined;
  return {
    weir: 1,
    site: { id: r.siteId!, name: r.name!, ...(r.address ? { address: r.address } : {}) },
    agreement: { reference: r.agreementRef!, exportLimitKw: r.agreementLimit!, profile: r.profile! },
    service: {
      arrangement,
      ...(r.voltageLn !== undefined ? { voltageLn: r.voltageLn } : {}),
      ...(r.voltageLl !== undefined ? { voltageLl: r.voltageLl } : {}),
      frequencyHz: r.frequency!,
      mainBreakerA: r.mainBreaker!,
    },
    meter: {
      serial: r.meterSerial!,
      position: 'grid-connection',
      modbus: { address: r.modbusAddress!, baud: r.baud!, parity: r.parity!, stopBits: r.stopBits! },
      voltageInputs,
      currentInputs,
    },
    cts: conductors.map((c) => ({
      id: ctId(c),
      ratedPrimaryA: r.ctRated!,
      secondary: r.ctSecondary!,
      accuracyClass: r.ctClass!,
      ...(burden ? { ratedBurdenVa: r.ctBurden!, lead: { lengthM: r.ctLeadLength!, csaMm2: r.ctLeadCsa! } } : {}),
      arrow: r.ctArrow!,
    })),
    gateway: {
      serial: r.gatewaySerial!,
      bus: { lengthM: r.busLength!, baud: r.baud!, terminations: ['gateway', 'meter'], devices: r.busDevices! },
    },
    generation: r.generation!,
    export: {
      control: r.exportControl!,
      scope: r.exportScope!,
      limitKw: r.exportLimit!,
      ...(perPhase ? { perPhaseLimitKw: perPhase } : {}),
      failSafe: { action: r.failSafe!, afterS: r.failSafeAfter! },
    },
  };
}

const describe = (f: Finding) => (f.hint ? `${f.message} (${f.hint})` : f.message);

/**
 * Checks one answer: its own parse and range check, then the rules on a draft site with every
 * other answer as given so far (or its default). Warnings come back as notes.
 */
export function checkAnswer<K extends FieldKey>(field: Field<K>, value: InitAnswers[K], given: SomeAnswers, schemaRef = '../schemas/site.schema.json'): Checked<InitAnswers[K]> {
  const own = field.check?.(value, given);
  if (own !== undefined && own !== true) return { ok: false, message: own };
  const concerns = perPhaseConcerns(field as unknown as Field, resolveAnswers({ ...given, [field.key]: value }));
  if (!concerns) return { ok: true, value, notes: [] };
  const draft = renderSiteYaml(buildSite({ ...given, [field.key]: value }), { schemaRef });
  const findings = checkSite(draft).findings.filter((f) => concerns.test(f.path));
  const error = findings.find((f) => f.severity === 'error');
  if (error) return { ok: false, message: describe(error) };
  return { ok: true, value, notes: findings.filter((f) => f.severity === 'warning').map(describe) };
}

/** Parses and checks a raw answer (a flag's value or typed text). */
export function checkRaw<K extends FieldKey>(field: Field<K>, raw: string, given: SomeAnswers, schemaRef?: string): Checked<InitAnswers[K]> {
  const parsed = field.parse(raw, given);
  if (typeof parsed === 'object' && parsed !== null && 'error' in (parsed as object)) return { ok: false, message: (parsed as { error: string }).error };
  return checkAnswer(field, parsed as InitAnswers[K], given, schemaRef);
}

// ---- generation groups -------------------------------------------------------------------------

const GROUP_ID = /^[A-Za-z0-9][A-Za-z0-9._-]{0,63}$/;

export function checkGroupId(id: string, taken: readonly GenerationGroup[]): true | string {
  if (!GROUP_ID.test(id)) return 'a group id is 1 to 64 letters, digits, dots, hyphens or underscores';
  if (taken.some((g) => g.id === id)) return `there is already a group ${id}`;
  return true;
}

export function phaseChoices(a: SomeAnswers): Choice[] {
  const conductors = live(a);
  const out: Choice[] = conductors.map((c) => ({ value: c }));
  if (conductors.length > 1) out.push({ value: 'all', name: `all  (a unit on ${conductors.join(' + ')})` });
  return out;
}

/** `roof-east:10:0.4:L1`, the --generation form: id, units, kW per unit, phase. */
export function parseGroupSpec(spec: string, a: SomeAnswers, taken: readonly GenerationGroup[]): GenerationGroup | { error: string } {
  const parts = spec.split(':');
  if (parts.length !== 4) return { error: `--generation ${spec}: expected id:units:kW:phase, for example roof-east:10:0.4:L1` };
  const [id, unitsRaw, kwRaw, phaseRaw] = parts.map((p) => p.trim());
  const idOk = checkGroupId(id, taken);
  if (idOk !== true) return { error: `--generation ${spec}: ${idOk}` };
  const units = number('units', { min: 1, integer: true })(unitsRaw);
  if (typeof units !== 'number') return { error: `--generation ${spec}: ${units.error}` };
  const kw = number('the kW per unit', { exclusiveMin: 0 })(kwRaw);
  if (typeof kw !== 'number') return { error: `--generation ${spec}: ${kw.error}` };
  const phases = phaseChoices(a).map((c) => c.value);
  const phase = phases.find((p) => p.toLowerCase() === phaseRaw.toLowerCase());
  if (!phase) return { error: `--generation ${spec}: the phase must be one of ${phases.join(', ')} for a ${a.arrangement} service` };
  return { id, units, unitAcKw: kw, phase: phase as GenerationGroup['phase'] };
}
