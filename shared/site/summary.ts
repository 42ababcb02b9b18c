// Summary figures of a site (rules.md, "Summary figures"), shown by `weir check --explain`
// and on the reviewer's site page.
import { liveConductors } from '../electrical/conductors.ts';
import { leadBurdenVa, ratioErrorLimitPercent, DEFAULT_METER_INPUT_BURDEN_VA } from '../electrical/ct.ts';
import { SQRT3 } from '../electrical/voltage.ts';
import { getProfile, type Profile } from '../profiles/index.ts';
import type { Conductor, CurrentTerminal, LiveConductor, Site } from './types.ts';

/** Bus limits: 1000 m at 9600 Bd with AWG26 (Modbus over Serial Line V1.02 §3.4.3); about 1200 m (TIA/EIA-485-A). */
export const BUS_WARN_ABOVE_M = 1000;
export const BUS_LIMIT_M = 1200;

export interface CtFigures {
  id: string;
  index: number;
  conductor: Conductor | null;
  ratedPrimaryA: number;
  /** Current at the export limit as % of rated primary; null when the CT is on no live conductor. */
  percentOfRatedAtLimit: number | null;
  /** Interpolated ratio-error limit (± %) at that current; null where the class does not define it. */
  ratioErrorLimitPercent: number | null;
  leadBurdenVa: number | null;
  totalBurdenVa: number | null;
  ratedBurdenVa: number | null;
}

export interface SiteSummary {
  liveConductors: LiveConductor[];
  /** Generation per live conductor in kVA (units·unitAcKw; `all` units split evenly). */
  generationKva: Record<LiveConductor, number>;
  generationTotalKva: number;
  /** Largest minus smallest per-phase generation, kVA; null for a single-phase service. */
  imbalanceKva: number | null;
  serviceCapacityKva: number;
  exportLimitKw: number;
  agreementLimitKw: number;
  /** Export limit as a current on each live conductor, A. */
  exportLimitCurrentA: Partial<Record<LiveConductor, number>>;
  cts: CtFigures[];
  bus: { lengthM: number; warnAboveM: number; limitM: number; percentOfLimit: number };
  profile: Profile;
}

/** V_LN, or V_LL/√3 for a 3-wire service without neutral. */
export function effectiveVoltageLn(site: Site): number {
  const { voltageLn, voltageLl } = site.service;
  if (voltageLn !== undefined) return voltageLn;
  return (voltageLl ?? 0) / SQRT3;
}

/** S_svc in kVA (rules.md, "Export policy"). */
export function serviceCapacityKva(site: Site): number {
  const { arrangement, mainBreakerA, voltageLl } = site.service;
  const vLn = effectiveVoltageLn(site);
  if (arrangement === 'three-phase-4w' || arrangement === 'three-phase-3w') return (SQRT3 * (voltageLl ?? vLn * SQRT3) * mainBreakerA) / 1000;
  if (arrangement === 'split-phase') return ((voltageLl ?? 2 * vLn) * mainBreakerA) / 1000;
  return (vLn * mainBreakerA) / 1000;
}

/** G per live conductor. Groups on a conductor that is not live are left out (generation-phase-invalid reports them). */
export function generationPerPhaseKva(site: Site): Record<LiveConductor, number> {
  const live = liveConductors(site.service.arrangement);
  const out: Record<LiveConductor, number> = { L1: 0, L2: 0, L3: 0 };
  for (const g of site.generation) {
    const kva = g.units * g.unitAcKw;
    if (g.phase === 'all') {
      if (live.length < 2) continue;
      for (const c of live) out[c] += kva / live.length;
    } else if (live.includes(g.phase)) {
      out[g.phase] += kva;
    }
  }
  return out;
}

/** G = Σ units·unitAcKw over every group. */
export function totalGenerationKva(site: Site): number {
  return site.generation.reduce((sum, g) => sum + g.units * g.unitAcKw, 0);
}

/** I_lim per live conductor: limitKw·1000/(n·V_LN) for aggregate scope, the per-phase value otherwise. */
export function exportLimitCurrentA(site: Site): Partial<Record<LiveConductor, number>> {
  const live = liveConductors(site.service.arrangement);
  const vLn = effectiveVoltageLn(site);
  const out: Partial<Record<LiveConductor, number>> = {};
  for (const c of live) {
    const perPhase = site.export.perPhaseLimitKw?.[c];
    const kw = site.export.scope === 'per-phase' && perPhase !== undefined ? perPhase : site.export.limitKw / live.length;
    out[c] = (kw * 1000) / vLn;
  }
  return out;
}

/** Which conductor each CT is clamped on, from the meter's current inputs. */
export function ctConductors(site: Site): Map<string, Conductor> {
  const out = new Map<string, Conductor>();
  for (const terminal of ['I1', 'I2', 'I3'] as CurrentTerminal[]) {
    const input = site.meter.currentInputs[terminal];
    if (input && !out.has(input.ct)) out.set(input.ct, input.conductor);
  }
  return out;
}

export function summarizeSite(site: Site): SiteSummary {
  const live = liveConductors(site.service.arrangement);
  const generationKva = generationPerPhaseKva(site);
  const perLive = live.map((c) => generationKva[c]);
  const limitCurrent = exportLimitCurrentA(site);
  const conductors = ctConductors(site);
  const aggregateCurrent = (site.export.limitKw * 1000) / (live.length * effectiveVoltageLn(site));
  const inputBurden = site.meter.inputBurdenVa ?? DEFAULT_METER_INPUT_BURDEN_VA;

  const cts: CtFigures[] = site.cts.map((ct, index) => {
    const conductor = conductors.get(ct.id) ?? null;
    const current = conductor && conductor !== 'N' ? limitCurrent[conductor] ?? null : conductor === null ? aggregateCurrent : null;
    const percent = current === null ? null : (current / ct.ratedPrimaryA) * 100;
    const lead = ct.lead ? leadBurdenVa(ct.secondary, ct.lead) : null;
    return {
      id: ct.id,
      index,
      conductor,
      ratedPrimaryA: ct.ratedPrimaryA,
      percentOfRatedAtLimit: percent,
      ratioErrorLimitPercent: percent === null ? null : ratioErrorLimitPercent(ct.accuracyClass, percent),
      leadBurdenVa: lead,
      totalBurdenVa: lead === null ? null : lead + inputBurden,
      ratedBurdenVa: ct.ratedBurdenVa ?? null,
    };
  });

  return {
    liveConductors: live,
    generationKva,
    generationTotalKva: totalGenerationKva(site),
    imbalanceKva: live.length < 2 ? null : Math.max(...perLive) - Math.min(...perLive),
    serviceCapacityKva: serviceCapacityKva(site),
    exportLimitKw: site.export.limitKw,
    agreementLimitKw: site.agreement.exportLimitKw,
    exportLimitCurrentA: limitCurrent,
    cts,
    bus: {
      lengthM: site.gateway.bus.lengthM,
      warnAboveM: BUS_WARN_ABOVE_M,
      limitM: BUS_LIMIT_M,
      percentOfLimit: (site.gateway.bus.lengthM / BUS_LIMIT_M) * 100,
    },
    profile: getProfile(site.agreement.profile),
  };
}
