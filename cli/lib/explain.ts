// The summary figures of a site (rules.md, "Summary figures") as a small table for
// `weir check --explain`.
import type { SiteSummary } from '../../shared/index.ts';
import { fmt } from '../../shared/rules/rule.ts';
import type { Colour } from './colour.ts';
import { makeFiguresTable } from './table.ts';

export function figureRows(s: SiteSummary): [string, string][] {
  const rows: [string, string][] = [];
  const perPhase = s.liveConductors.map((c) => `${c} ${fmt(s.generationKva[c], 3)}`).join(' · ');
  const imbalance = s.imbalanceKva === null ? '' : `; spread ${fmt(s.imbalanceKva, 3)} kVA${s.profile.maxImbalanceKva === null ? '' : ` of ${fmt(s.profile.maxImbalanceKva, 3)} allowed`}`;
  rows.push(['generation', `${perPhase} kVA; total ${fmt(s.generationTotalKva, 3)} kVA${imbalance}`]);
  rows.push(['service capacity', `${fmt(s.serviceCapacityKva, 2)} kVA`]);
  const currents = s.liveConductors.map((c) => `${c} ${fmt(s.exportLimitCurrentA[c] ?? NaN, 2)} A`).join(' · ');
  rows.push(['export limit', `${fmt(s.exportLimitKw, 3)} kW (agreed ${fmt(s.agreementLimitKw, 3)} kW) = ${currents}`]);
  for (const ct of s.cts) {
    const where = ct.conductor ? ` on ${ct.conductor}` : '';
    const parts: string[] = [];
    if (ct.percentOfRatedAtLimit !== null) {
      const error = ct.ratioErrorLimitPercent === null ? 'ratio error not defined there' : `ratio error ±${fmt(ct.ratioErrorLimitPercent, 2)} %`;
      parts.push(`${fmt(ct.percentOfRatedAtLimit, 2)} % of ${fmt(ct.ratedPrimaryA)} A at the limit (${error})`);
    } else {
      parts.push(`${fmt(ct.ratedPrimaryA)} A`);
    }
    if (ct.totalBurdenVa !== null) {
      parts.push(`burden ${fmt(ct.totalBurdenVa, 3)} VA (leads ${fmt(ct.leadBurdenVa ?? 0, 3)} VA)${ct.ratedBurdenVa === null ? '' : ` of ${fmt(ct.ratedBurdenVa, 3)} VA rated`}`);
    }
    rows.push([`CT ${ct.id}${where}`, parts.join('; ')]);
  }
  rows.push(['bus', `${fmt(s.bus.lengthM)} m of ${s.bus.limitM} m (${fmt(s.bus.percentOfLimit, 1)} %; warning above ${s.bus.warnAboveM} m)`]);
  rows.push(['profile', `${s.profile.id}: fail-safe within ${s.profile.maxResponseS === null ? '(not set)' : `${s.profile.maxResponseS} s`}, export tolerance ${fmt(s.profile.exportTolerance * 100, 1)} %`]);
  return rows;
}

export function explainTable(title: string, summary: SiteSummary, c: Colour): string {
  const table = makeFiguresTable();
  for (const [label, value] of figureRows(summary)) table.push([c.dim(label), value]);
  return `${c.bold(title)}\n${table.toString()}`;
}
