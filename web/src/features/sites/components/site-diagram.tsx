// A single-line diagram of a site, drawn from the site file alone:
// grid → conductors, with a CT on each → meter (current and voltage inputs) → RS-485 bus →
// gateway → generation groups on their phases. Faults found by the rules are marked where the
// findings point. Grid on the left, loads and generation to the right, so "toward-load" points right.
import type { Conductor, CurrentTerminal, Finding, Severity, Site, VoltageTerminal } from '../../../../../shared/site/types.ts';
import { hasNeutral } from '../../../../../shared/electrical/conductors.ts';
import { FAULT_LABEL, TERMINALS, drawnConductors, locateFaults, siteLiveConductors, worstSeverity, type CtFault } from '../lib/site-faults.ts';

const ROW_TOP = 70;
const ROW_GAP = 46;
const LINE_START = 120;
const CT_X: Record<CurrentTerminal, number> = { I1: 230, I2: 305, I3: 380 };
const MISSING_X = 170;
const V_X: Record<VoltageTerminal, number> = { V1: 460, V2: 500, V3: 540, N: 580 };
const METER_X = 196;
const METER_W = 420;
const GATEWAY_X = 700;
const GATEWAY_W = 170;
const GEN_X = 930;
const GEN_W = 118;
const GEN_GAP = 16;
const BOX_H = 104;

/** A white outline behind text drawn over lines, so it stays readable. */
const HALO = { paintOrder: 'stroke', stroke: 'white', strokeWidth: 4, strokeLinejoin: 'round' } as const;

const SEV_STROKE: Record<Severity, string> = { error: 'stroke-sev-error', warning: 'stroke-sev-warning-line', info: 'stroke-sev-info' };
const SEV_FILL: Record<Severity, string> = { error: 'fill-sev-error', warning: 'fill-sev-warning', info: 'fill-sev-info' };

function plural(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? '' : 's'}`;
}

function listMessages(findings: readonly Finding[]): string {
  return findings.map((f) => `${f.severity} ${f.ruleId}: ${f.message}`).join('\n');
}

function FindingFlag({ x, y, findings, label }: { x: number; y: number; findings: readonly Finding[]; label: string }) {
  const worst = worstSeverity(findings);
  if (!worst) return null;
  return (
    <g role="img" aria-label={`${label}: ${plural(findings.length, 'finding')}`} data-severity={worst}>
      <title>{`${label}\n${listMessages(findings)}`}</title>
      <rect x={x} y={y - 11} width={26} height={18} rx={9} className={SEV_FILL[worst]} />
      <text x={x + 13} y={y + 2} textAnchor="middle" className="fill-white text-[11px] font-semibold">{worst === 'error' ? '✕' : '!'}{findings.length}</text>
    </g>
  );
}

export interface SiteDiagramProps {
  site: Site;
  findings: readonly Finding[];
  /** Shown in the diagram's accessible name. */
  title?: string;
}

export function SiteDiagram({ site, findings, title }: SiteDiagramProps) {
  const rows = drawnConductors(site);
  const live = siteLiveConductors(site);
  const rowY = (c: Conductor | undefined) => ROW_TOP + Math.max(0, rows.indexOf(c ?? 'N')) * ROW_GAP;
  const lastRowY = ROW_TOP + (rows.length - 1) * ROW_GAP;
  const meterY = lastRowY + 64;
  const generation = site.generation ?? [];
  const width = Math.max(GEN_X + generation.length * (GEN_W + GEN_GAP) + 10, 1100);
  const height = meterY + BOX_H + 52;
  const faults = locateFaults(site, findings);
  const inputs = site.meter?.currentInputs ?? {};
  const voltages = site.meter?.voltageInputs ?? {};
  const bus = site.gateway?.bus;
  const ctById = new Map((site.cts ?? []).map((ct) => [ct.id, ct]));

  const marked: string[] = [];
  for (const t of TERMINALS) {
    const { faults: set } = faults.terminals[t];
    if (set.size > 0) marked.push(`${inputs[t]?.ct ?? t} on ${t}: ${[...set].map((f) => FAULT_LABEL[f]).join(', ')}`);
  }
  for (const c of faults.missing) marked.push(`${c}: no CT`);

  const svgLabel = `Single-line diagram${title ? ` of ${title}` : ''}. ${marked.length ? `Marked faults: ${marked.join('; ')}.` : 'No CT faults marked.'}`;

  return (
    <svg
      viewBox={`0 0 ${width} ${height}`}
      role="group"
      aria-label={svgLabel}
      className="h-auto w-full min-w-[960px] font-sans"
      data-testid="site-diagram"
    >
      <defs>
        <marker id="arrow-head" viewBox="0 0 10 10" refX="8" refY="5" markerWidth="7" markerHeight="7" orient="auto-start-reverse">
          <path d="M0 0L10 5L0 10z" className="fill-ink-600" />
        </marker>
      </defs>

      {/* Grid supply */}
      <g aria-label="Grid supply" role="img">
        <title>{`Grid supply: ${site.service?.arrangement ?? '?'}, ${site.service?.voltageLn ?? '–'}/${site.service?.voltageLl ?? '–'} V, ${site.service?.frequencyHz ?? '–'} Hz, main breaker ${site.service?.mainBreakerA ?? '–'} A`}</title>
        <rect x={16} y={ROW_TOP - 30} width={84} height={lastRowY - ROW_TOP + 60} rx={8} className="fill-ink-900" />
        <path d={`M30 ${(ROW_TOP + lastRowY) / 2} q 14 -16 28 0 t 28 0`} className="fill-none stroke-weir-500" strokeWidth={3} />
        <text x={58} y={ROW_TOP - 10} textAnchor="middle" className="fill-white text-[13px] font-semibold">Grid</text>
        <text x={58} y={lastRowY + 22} textAnchor="middle" className="fill-ink-200 text-[10px]">{site.service?.mainBreakerA ?? '–'} A main</text>
      </g>
      <text x={16} y={24} className="fill-ink-700 text-[12px]">
        {`${site.service?.arrangement ?? ''} · ${site.service?.voltageLn ?? '–'}/${site.service?.voltageLl ?? '–'} V · ${site.service?.frequencyHz ?? '–'} Hz · agreement ${site.agreement?.reference ?? '–'}: export ≤ ${site.agreement?.exportLimitKw ?? '–'} kW`}
      </text>

      {/* Conductors */}
      {rows.map((c) => {
        const y = rowY(c);
        const inService = c === 'N' ? hasNeutral(site.service?.arrangement ?? 'three-phase-4w') : live.includes(c);
        return (
          <g key={c} data-conductor={c}>
            <line x1={100} y1={y} x2={width - 12} y2={y} className={c === 'N' ? 'stroke-ink-500' : 'stroke-ink-800'} strokeWidth={c === 'N' ? 2 : 3} strokeDasharray={inService ? undefined : '3 5'} />
            <text x={LINE_START - 12} y={y - 7} className="fill-ink-900 text-[13px] font-semibold" {...HALO}>{c}</text>
            {!inService && <text x={LINE_START + 20} y={y - 7} className="fill-sev-error text-[11px]" {...HALO}>not a conductor of this service</text>}
          </g>
        );
      })}

      {/* Meter */}
      <g role="img" aria-label={`Meter ${site.meter?.serial ?? ''}`}>
        <title>{`Meter ${site.meter?.serial ?? ''} at the ${site.meter?.position ?? '?'}`}</title>
        <rect x={METER_X} y={meterY} width={METER_W} height={BOX_H} rx={10} className="fill-white stroke-ink-800" strokeWidth={2} />
        <text x={METER_X + 14} y={meterY + 50} className="fill-ink-950 text-[14px] font-semibold">Meter {site.meter?.serial}</text>
        <text x={METER_X + 14} y={meterY + 68} className="fill-ink-700 text-[11px]">
          {`${site.meter?.position ?? ''} · Modbus ${site.meter?.modbus?.address ?? '–'} · ${site.meter?.modbus?.baud ?? '–'} Bd ${site.meter?.modbus?.parity ?? ''} ${site.meter?.modbus?.stopBits ?? ''}`}
        </text>
        {site.meter?.position === 'generation-feeder' && (
          <text x={METER_X + 14} y={meterY + 88} className="fill-sev-error text-[11px] font-semibold">on the generation feeder, not the grid connection</text>
        )}
      </g>
      <FindingFlag x={METER_X + METER_W - 36} y={meterY + 50} findings={faults.meter} label={`Meter ${site.meter?.serial ?? ''}`} />

      {/* Voltage inputs: a tap on the conductor, down to the meter terminal */}
      {(Object.keys(V_X) as VoltageTerminal[]).map((vt) => {
        const conductor = voltages[vt];
        const x = V_X[vt];
        return (
          <g key={vt} data-voltage-input={vt}>
            {conductor && (
              <>
                <line x1={x} y1={rowY(conductor)} x2={x} y2={meterY} className="stroke-weir-700" strokeWidth={1.5} />
                <circle cx={x} cy={rowY(conductor)} r={4} className="fill-weir-700" />
              </>
            )}
            <text x={x} y={meterY + 18} textAnchor="middle" className="fill-ink-800 text-[11px] font-semibold">{vt}</text>
            <text x={x} y={meterY + 31} textAnchor="middle" className="fill-ink-600 text-[10px]">{conductor ?? '—'}</text>
          </g>
        );
      })}

      {/* Missing CTs */}
      {faults.missing.map((c) => (
        <g key={`missing-${c}`} role="img" aria-label={`No CT on ${c}`} data-fault="missing" data-conductor={c}>
          <title>{`No CT measures ${c}: the gateway cannot see export on that conductor (meter-ct-missing)`}</title>
          <circle cx={MISSING_X} cy={rowY(c)} r={15} className="fill-sev-error-bg stroke-sev-error" strokeWidth={2} strokeDasharray="4 3" />
          <text x={MISSING_X} y={rowY(c) + 4} textAnchor="middle" className="fill-sev-error text-[11px] font-bold">?</text>
          <text x={MISSING_X} y={rowY(c) + 30} textAnchor="middle" className="fill-sev-error text-[11px] font-semibold" {...HALO}>no CT</text>
        </g>
      ))}

      {/* Current inputs: the CT on its conductor, its leads down to the meter terminal */}
      {TERMINALS.map((t) => {
        const input = inputs[t];
        const x = CT_X[t];
        const marks = faults.terminals[t];
        const worst = worstSeverity(marks.findings);
        const terminalLabel = (
          <>
            <text x={x} y={meterY + 18} textAnchor="middle" className="fill-ink-800 text-[11px] font-semibold">{t}</text>
            <text x={x} y={meterY + 31} textAnchor="middle" className="fill-ink-600 text-[10px]">{input ? `${input.ct} · ${input.conductor}` : 'unused'}</text>
          </>
        );
        if (!input) return <g key={t} data-current-input={t}>{terminalLabel}</g>;
        const ct = ctById.get(input.ct);
        const y = rowY(input.conductor);
        const faultList = [...marks.faults] as CtFault[];
        const faulty = faultList.length > 0;
        const reversed = marks.faults.has('reversed') || ct?.arrow === 'toward-grid';
        const ringClass = faulty ? 'stroke-sev-error fill-sev-error-bg' : worst ? `${SEV_STROKE[worst]} fill-white` : 'stroke-ink-900 fill-white';
        const label = [
          `CT ${input.ct} on ${input.conductor}, current input ${t}`,
          ct ? `${ct.ratedPrimaryA} A / ${ct.secondary}, class ${ct.accuracyClass}, arrow ${ct.arrow}` : 'not listed in cts',
          ...faultList.map((f) => FAULT_LABEL[f]),
        ].join(', ');
        const voltage = voltages[`V${t.slice(1)}` as VoltageTerminal];
        return (
          <g key={t} data-current-input={t}>
            <line x1={x} y1={y + 15} x2={x} y2={meterY} className={faulty ? 'stroke-sev-error' : 'stroke-ink-600'} strokeWidth={1.5} strokeDasharray="5 3" />
            <g role="img" aria-label={label} data-ct={input.ct} data-fault={faulty ? faultList.join(' ') : undefined}>
              <title>{marks.findings.length ? `${label}\n${listMessages(marks.findings)}` : label}</title>
              <circle cx={x} cy={y} r={15} className={ringClass} strokeWidth={faulty ? 3 : 2} fillOpacity={faulty ? 1 : 0.9} />
              {/* The arrow inside the ring shows which way the CT faces */}
              <path d={reversed ? `M${x + 7} ${y - 6}L${x - 7} ${y}L${x + 7} ${y + 6}z` : `M${x - 7} ${y - 6}L${x + 7} ${y}L${x - 7} ${y + 6}z`} className={reversed ? 'fill-sev-error' : 'fill-ink-800'} />
              <text x={x} y={y - 21} textAnchor="middle" className="fill-ink-900 text-[11px] font-semibold" {...HALO}>{input.ct}</text>
            </g>
            {marks.faults.has('wrong-phase') && (
              <text x={x} y={y + 30} textAnchor="middle" className="fill-sev-error text-[11px] font-semibold" data-fault-label="wrong-phase" {...HALO}>
                {`✕ ${t} on ${input.conductor}, V${t.slice(1)} on ${voltage ?? '—'}`}
              </text>
            )}
            {marks.faults.has('reversed') && (
              <text x={x} y={y + (marks.faults.has('wrong-phase') ? 43 : 30)} textAnchor="middle" className="fill-sev-error text-[11px] font-semibold" data-fault-label="reversed" {...HALO}>⇄ reversed</text>
            )}
            {marks.faults.has('unknown-ct') && (
              <text x={x} y={y + 30} textAnchor="middle" className="fill-sev-error text-[11px] font-semibold" data-fault-label="unknown-ct" {...HALO}>? not in cts</text>
            )}
            {terminalLabel}
          </g>
        );
      })}

      {/* RS-485 bus from meter to gateway */}
      <g role="img" aria-label={`RS-485 bus, ${bus?.lengthM ?? '–'} m at ${bus?.baud ?? '–'} Bd`} data-severity={worstSeverity(faults.bus) ?? undefined}>
        <title>{`RS-485 bus: ${bus?.lengthM ?? '–'} m, ${bus?.baud ?? '–'} Bd, terminated at ${(bus?.terminations ?? []).join(' and ') || 'nowhere'}, ${bus?.devices ?? '–'} unit loads${faults.bus.length ? `\n${listMessages(faults.bus)}` : ''}`}</title>
        <line x1={METER_X + METER_W} y1={meterY + BOX_H / 2} x2={GATEWAY_X} y2={meterY + BOX_H / 2} className={faults.bus.length ? SEV_STROKE[worstSeverity(faults.bus)!] : 'stroke-weir-700'} strokeWidth={3} strokeDasharray="10 4" />
        <text x={(METER_X + METER_W + GATEWAY_X) / 2} y={meterY + BOX_H / 2 - 10} textAnchor="middle" className="fill-ink-800 text-[11px] font-semibold">RS-485</text>
        <text x={(METER_X + METER_W + GATEWAY_X) / 2} y={meterY + BOX_H / 2 + 20} textAnchor="middle" className="fill-ink-700 text-[10px]">{`${bus?.lengthM ?? '–'} m · ${bus?.baud ?? '–'} Bd`}</text>
        {(bus?.terminations ?? []).includes('meter') && <rect x={METER_X + METER_W + 4} y={meterY + BOX_H / 2 - 5} width={8} height={10} className="fill-weir-700" />}
        {(bus?.terminations ?? []).includes('gateway') && <rect x={GATEWAY_X - 12} y={meterY + BOX_H / 2 - 5} width={8} height={10} className="fill-weir-700" />}
      </g>
      <FindingFlag x={(METER_X + METER_W + GATEWAY_X) / 2 - 13} y={meterY + BOX_H / 2 + 38} findings={faults.bus} label="RS-485 bus and gateway" />

      {/* Gateway */}
      <g role="img" aria-label={`Gateway ${site.gateway?.serial ?? ''}`}>
        <rect x={GATEWAY_X} y={meterY} width={GATEWAY_W} height={BOX_H} rx={10} className="fill-ink-900" />
        <text x={GATEWAY_X + 14} y={meterY + 30} className="fill-white text-[14px] font-semibold">Gateway</text>
        <text x={GATEWAY_X + 14} y={meterY + 48} className="fill-ink-200 text-[11px]">{site.gateway?.serial}</text>
        <text x={GATEWAY_X + 14} y={meterY + 70} className="fill-weir-500 text-[11px] font-semibold">
          {site.export?.control === 'enabled' ? `limit ${site.export?.limitKw} kW ${site.export?.scope ?? ''}` : 'export control disabled'}
        </text>
        <text x={GATEWAY_X + 14} y={meterY + 88} className="fill-ink-300 text-[10px]">{`fail-safe: ${site.export?.failSafe?.action ?? '–'} after ${site.export?.failSafe?.afterS ?? '–'} s`}</text>
      </g>

      <FindingFlag x={GATEWAY_X + GATEWAY_W - 36} y={meterY + 28} findings={faults.exportPolicy} label="Export policy" />

      {/* Control from the gateway to the generation */}
      {generation.length > 0 && (
        <path
          d={`M${GATEWAY_X + GATEWAY_W} ${meterY + BOX_H / 2} H${GEN_X - 8}`}
          className="fill-none stroke-ink-600"
          strokeWidth={1.5}
          strokeDasharray="2 4"
          markerEnd="url(#arrow-head)"
        />
      )}
      {generation.length > 0 && <text x={GATEWAY_X + GATEWAY_W + 8} y={meterY + BOX_H / 2 - 8} className="fill-ink-600 text-[10px]">control</text>}

      {/* Generation groups on their phases */}
      {generation.map((g, i) => {
        const x = GEN_X + i * (GEN_W + GEN_GAP);
        const cx = x + GEN_W / 2;
        const phases: Conductor[] = g.phase === 'all' ? live : [g.phase];
        const onService = g.phase === 'all' ? live.length > 1 : live.includes(g.phase);
        const top = Math.min(...phases.map((p) => (rows.includes(p) ? rowY(p) : ROW_TOP)));
        const groupFindings = faults.generation[i] ?? [];
        const worst = worstSeverity(groupFindings);
        const kva = (g.units ?? 0) * (g.unitAcKw ?? 0);
        return (
          <g key={`${g.id}-${i}`} data-generation={g.id} role="img" aria-label={`Generation ${g.id}: ${g.units} × ${g.unitAcKw} kW on ${g.phase}${onService ? '' : ', not a live conductor of this service'}`} data-fault={onService ? undefined : 'phase-invalid'}>
            <title>{`Generation ${g.id}: ${g.units} × ${g.unitAcKw} kW = ${kva.toFixed(2)} kVA on ${g.phase}${groupFindings.length ? `\n${listMessages(groupFindings)}` : ''}`}</title>
            <line x1={cx} y1={top} x2={cx} y2={meterY} className={onService ? 'stroke-ink-800' : 'stroke-sev-error'} strokeWidth={2} />
            {phases.filter((p) => rows.includes(p)).map((p) => <circle key={p} cx={cx} cy={rowY(p)} r={4.5} className="fill-ink-900" />)}
            <rect x={x} y={meterY} width={GEN_W} height={BOX_H} rx={10} className={worst ? `fill-white ${SEV_STROKE[worst]}` : 'fill-weir-50 stroke-weir-700'} strokeWidth={worst ? 2.5 : 1.5} />
            {/* A small PV panel glyph */}
            <path d={`M${x + 12} ${meterY + 14}h24l-4 14h-24z`} className="fill-weir-700" />
            <path d={`M${x + 18} ${meterY + 14}l-4 14M${x + 26} ${meterY + 14}l-4 14M${x + 10} ${meterY + 21}h24`} className="stroke-weir-50" strokeWidth={1} />
            <text x={x + 44} y={meterY + 26} className="fill-ink-950 text-[12px] font-semibold">{g.phase === 'all' ? '3-phase' : g.phase}</text>
            <text x={x + 10} y={meterY + 50} className="fill-ink-950 text-[12px] font-semibold">{g.id.length > 15 ? `${g.id.slice(0, 14)}…` : g.id}</text>
            <text x={x + 10} y={meterY + 68} className="fill-ink-700 text-[11px]">{`${g.units} × ${g.unitAcKw} kW`}</text>
            <text x={x + 10} y={meterY + 86} className="fill-ink-700 text-[11px]">{`${Number(kva.toFixed(2))} kVA`}</text>
            {!onService && <text x={x + 10} y={meterY + BOX_H + 16} className="fill-sev-error text-[11px] font-semibold">✕ phase not live</text>}
          </g>
        );
      })}

      {/* Legend */}
      <g transform={`translate(16 ${height - 16})`} className="text-[11px]" aria-hidden="true">
        <path d="M0 -5L12 0L0 5z" className="fill-ink-800" />
        <text x={18} y={4} className="fill-ink-700">CT facing the load</text>
        <circle cx={150} cy={0} r={7} className="fill-sev-error-bg stroke-sev-error" strokeWidth={2} />
        <text x={162} y={4} className="fill-ink-700">CT with a fault (see labels)</text>
        <circle cx={350} cy={0} r={7} className="fill-none stroke-sev-error" strokeWidth={2} strokeDasharray="3 2" />
        <text x={362} y={4} className="fill-ink-700">missing CT</text>
        <circle cx={460} cy={0} r={4} className="fill-weir-700" />
        <text x={470} y={4} className="fill-ink-700">voltage tap</text>
        <line x1={560} y1={0} x2={590} y2={0} className="stroke-weir-700" strokeWidth={3} strokeDasharray="6 3" />
        <text x={596} y={4} className="fill-ink-700">RS-485 bus (■ termination)</text>
      </g>
    </svg>
  );
}

/** The same marks in words, beside the picture. */
export function DiagramFaultList({ site, findings }: SiteDiagramProps) {
  const faults = locateFaults(site, findings);
  const items: { key: string; text: string }[] = [];
  for (const t of TERMINALS) {
    const input = site.meter?.currentInputs?.[t];
    for (const f of faults.terminals[t].faults) {
      const voltage = site.meter?.voltageInputs?.[`V${t.slice(1)}` as VoltageTerminal];
      const text = f === 'wrong-phase'
        ? `CT ${input?.ct} on current input ${t} is clamped on ${input?.conductor}, but V${t.slice(1)} is wired to ${voltage ?? 'nothing'}: wrong phase.`
        : f === 'reversed'
          ? `CT ${input?.ct} on ${input?.conductor} faces the grid: reversed.`
          : `Current input ${t} names CT ${input?.ct}, which is not in the site file.`;
      items.push({ key: `${t}-${f}`, text });
    }
  }
  for (const c of faults.missing) items.push({ key: `missing-${c}`, text: `No CT measures ${c}.` });
  (site.generation ?? []).forEach((g, i) => {
    if ((faults.generation[i] ?? []).some((f) => f.ruleId === 'generation-phase-invalid')) items.push({ key: `gen-${i}`, text: `Generation ${g.id} is on ${g.phase}, not a live conductor of this service.` });
  });
  if (items.length === 0) return <p className="mt-2 text-caption text-ink-600">No wiring faults marked on the diagram.</p>;
  return (
    <div className="mt-3">
      <h3 className="text-body font-semibold text-ink-900">Marked on the diagram</h3>
      <ul className="mt-1 list-disc space-y-0.5 pl-5 text-body text-sev-error">
        {items.map((i) => <li key={i.key}>{i.text}</li>)}
      </ul>
    </div>
  );
}
