import type { SiteSummary } from '../../../../../shared/site/summary.ts';
import { formatNumber } from '../../../lib/format.ts';

function Figure({ label, value, unit, note }: { label: string; value: string; unit?: string; note?: string }) {
  return (
    <div className="rounded-md border border-ink-200 bg-ink-50 px-3 py-2">
      <dt className="text-caption text-ink-700">{label}</dt>
      <dd className="text-title font-semibold text-ink-950">
        {value}{unit && <span className="ml-1 text-body font-normal text-ink-700">{unit}</span>}
      </dd>
      {note && <dd className="text-caption text-ink-600">{note}</dd>}
    </div>
  );
}

export function SummaryFigures({ summary }: { summary: SiteSummary }) {
  const phases = summary.liveConductors;
  const busOver = summary.bus.lengthM > summary.bus.warnAboveM;
  return (
    <div className="flex flex-col gap-4">
      <dl className="grid grid-cols-2 gap-3 md:grid-cols-4">
        <Figure label="Generation, total" value={formatNumber(summary.generationTotalKva)} unit="kVA" note={phases.map((p) => `${p} ${formatNumber(summary.generationKva[p])}`).join(' · ')} />
        <Figure label="Service capacity" value={formatNumber(summary.serviceCapacityKva, 1)} unit="kVA" />
        <Figure label="Export limit" value={formatNumber(summary.exportLimitKw)} unit="kW" note={`agreement allows ${formatNumber(summary.agreementLimitKw)} kW`} />
        <Figure
          label="Bus length"
          value={formatNumber(summary.bus.lengthM, 1)}
          unit="m"
          note={`${formatNumber(summary.bus.percentOfLimit, 1)} % of ${summary.bus.limitM} m${busOver ? ' · over the 1000 m guide' : ''}`}
        />
      </dl>
      <div>
        <h3 className="mb-1 text-body font-semibold text-ink-900">Export limit as a current</h3>
        <p className="text-body text-ink-800">
          {phases.map((p) => `${p}: ${formatNumber(summary.exportLimitCurrentA[p])} A`).join(' · ')}
        </p>
      </div>
      <div className="overflow-x-auto">
        <table className="w-full min-w-[560px] text-body">
          <caption className="mb-1 text-left text-body font-semibold text-ink-900">CTs at the export limit</caption>
          <thead className="border-b border-ink-200 text-caption text-ink-700">
            <tr>
              <th scope="col" className="py-1.5 pr-3 text-left font-medium">CT</th>
              <th scope="col" className="py-1.5 pr-3 text-left font-medium">Conductor</th>
              <th scope="col" className="py-1.5 pr-3 text-right font-medium">Rated</th>
              <th scope="col" className="py-1.5 pr-3 text-right font-medium">% of rated at limit</th>
              <th scope="col" className="py-1.5 pr-3 text-right font-medium">Ratio error limit</th>
              <th scope="col" className="py-1.5 pr-3 text-right font-medium">Lead burden</th>
              <th scope="col" className="py-1.5 text-right font-medium">Total / rated burden</th>
            </tr>
          </thead>
          <tbody>
            {summary.cts.map((ct) => (
              <tr key={`${ct.id}-${ct.index}`} className="border-b border-ink-100 last:border-0">
                <th scope="row" className="py-1.5 pr-3 text-left font-mono font-medium">{ct.id}</th>
                <td className="py-1.5 pr-3">{ct.conductor ?? '—'}</td>
                <td className="py-1.5 pr-3 text-right">{ct.ratedPrimaryA} A</td>
                <td className="py-1.5 pr-3 text-right">{ct.percentOfRatedAtLimit === null ? '—' : `${formatNumber(ct.percentOfRatedAtLimit, 1)} %`}</td>
                <td className="py-1.5 pr-3 text-right">{ct.ratioErrorLimitPercent === null ? '—' : `± ${formatNumber(ct.ratioErrorLimitPercent, 2)} %`}</td>
                <td className="py-1.5 pr-3 text-right">{ct.leadBurdenVa === null ? '—' : `${formatNumber(ct.leadBurdenVa, 3)} VA`}</td>
                <td className="py-1.5 text-right">
                  {ct.totalBurdenVa === null ? '—' : `${formatNumber(ct.totalBurdenVa, 3)} VA`}
                  {ct.ratedBurdenVa !== null && ` / ${formatNumber(ct.ratedBurdenVa, 2)} VA`}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}
