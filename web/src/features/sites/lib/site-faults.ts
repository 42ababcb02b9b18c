// Where the findings point, in terms of what the diagram draws: meter terminals, conductors,
// generation groups, the meter and the bus. Pure, so the diagram stays a function of its input.
import type { Conductor, CurrentTerminal, Finding, LiveConductor, Severity, Site } from '../../../../../shared/site/types.ts';
import { hasNeutral, liveConductors } from '../../../../../shared/electrical/conductors.ts';
import { parsePath } from '../../../../../shared/site/locate.ts';

export type CtFault = 'wrong-phase' | 'reversed' | 'unknown-ct';

export interface TerminalMarks {
  faults: Set<CtFault>;
  findings: Finding[];
}

export interface SiteFaults {
  terminals: Record<CurrentTerminal, TerminalMarks>;
  /** Live conductors that no current input measures (meter-ct-missing). */
  missing: LiveConductor[];
  meter: Finding[];
  bus: Finding[];
  /** The export policy, which the gateway enforces. */
  exportPolicy: Finding[];
  generation: Finding[][];
  /** Findings the diagram cannot place (the chart, the export policy, …). */
  elsewhere: Finding[];
}

export const TERMINALS: readonly CurrentTerminal[] = ['I1', 'I2', 'I3'];
const LIVE: readonly string[] = ['L1', 'L2', 'L3'];
const SEVERITY_RANK: Record<Severity, number> = { error: 3, warning: 2, info: 1 };

export function worstSeverity(findings: readonly Finding[]): Severity | null {
  let worst: Severity | null = null;
  for (const f of findings) if (!worst || SEVERITY_RANK[f.severity] > SEVERITY_RANK[worst]) worst = f.severity;
  return worst;
}

export function siteLiveConductors(site: Site): LiveConductor[] {
  return liveConductors(site.service?.arrangement ?? 'three-phase-4w');
}

/** The conductor rows to draw: the live ones, N where the service has one, and any other the meter names. */
export function drawnConductors(site: Site): Conductor[] {
  const rows: Conductor[] = [...siteLiveConductors(site)];
  if (hasNeutral(site.service?.arrangement ?? 'three-phase-4w')) rows.push('N');
  const named = [
    ...Object.values(site.meter?.currentInputs ?? {}).map((i) => i?.conductor),
    ...Object.values(site.meter?.voltageInputs ?? {}),
  ];
  for (const c of named) if (c && !rows.includes(c)) rows.push(c);
  return rows;
}

export function missingConductors(site: Site): LiveConductor[] {
  const clamped = new Set(Object.values(site.meter?.currentInputs ?? {}).map((i) => i?.conductor));
  return siteLiveConductors(site).filter((c) => !clamped.has(c));
}

export function locateFaults(site: Site, findings: readonly Finding[]): SiteFaults {
  const terminals = Object.fromEntries(TERMINALS.map((t) => [t, { faults: new Set<CtFault>(), findings: [] as Finding[] }])) as Record<CurrentTerminal, TerminalMarks>;
  const out: SiteFaults = { terminals, missing: [], meter: [], bus: [], exportPolicy: [], generation: (site.generation ?? []).map(() => []), elsewhere: [] };
  const inputs = site.meter?.currentInputs ?? {};
  const terminalsOfCt = (id: string | undefined) => TERMINALS.filter((t) => id !== undefined && inputs[t]?.ct === id);
  const terminalsOnConductor = (c: string) => TERMINALS.filter((t) => inputs[t]?.conductor === c);
  const mark = (list: CurrentTerminal[], finding: Finding, fault?: CtFault) => {
    for (const t of list) {
      terminals[t].findings.push(finding);
      if (fault) terminals[t].faults.add(fault);
    }
    return list.length > 0;
  };

  let missingReported = false;
  for (const finding of findings) {
    const at = parsePath(finding.path ?? '');
    let placed = false;
    if (finding.ruleId === 'meter-ct-missing') {
      missingReported = true;
      placed = true;
    } else if (at[0] === 'meter' && at[1] === 'currentInputs' && TERMINALS.includes(at[2] as CurrentTerminal)) {
      const fault: CtFault | undefined = finding.ruleId === 'meter-ct-phase-pair' ? 'wrong-phase' : finding.ruleId === 'meter-ct-unknown' ? 'unknown-ct' : undefined;
      placed = mark([at[2] as CurrentTerminal], finding, fault);
    } else if (at[0] === 'cts' && typeof at[1] === 'number') {
      const fault: CtFault | undefined = finding.ruleId === 'ct-arrow-toward-grid' ? 'reversed' : undefined;
      placed = mark(terminalsOfCt(site.cts?.[at[1]]?.id), finding, fault);
    } else if (at[0] === 'commissioning' && at[1] === 'readings' && LIVE.includes(String(at[3]))) {
      // A reading on a conductor says something about the CT clamped on that conductor.
      const fault: CtFault | undefined = finding.ruleId === 'reading-ct-reversed' ? 'reversed' : finding.ruleId === 'reading-cross-phase' ? 'wrong-phase' : undefined;
      placed = mark(terminalsOnConductor(String(at[3])), finding, fault);
    } else if (at[0] === 'meter') {
      out.meter.push(finding);
      placed = true;
    } else if (at[0] === 'gateway') {
      out.bus.push(finding);
      placed = true;
    } else if (at[0] === 'export') {
      out.exportPolicy.push(finding);
      placed = true;
    } else if (at[0] === 'generation' && typeof at[1] === 'number' && out.generation[at[1]]) {
      out.generation[at[1]].push(finding);
      placed = true;
    }
    if (!placed) out.elsewhere.push(finding);
  }
  // The rule's path is the whole currentInputs block; which conductor lacks a CT follows from the site.
  if (missingReported) out.missing = missingConductors(site);
  return out;
}

export const FAULT_LABEL: Record<CtFault | 'missing', string> = {
  'wrong-phase': 'wrong phase',
  reversed: 'reversed',
  'unknown-ct': 'unknown CT',
  missing: 'no CT',
};
