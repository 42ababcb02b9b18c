// Generation per phase against the profile's imbalance limit (rules.md, phase-imbalance):
// no phase may sit more than maxImbalanceKva above the lowest one.
import type { SiteSummary } from '../../../../../shared/site/summary.ts';
import { formatNumber } from '../../../lib/format.ts';

const W = 520;
const H = 240;
const PAD_L = 48;
const PAD_B = 34;
const PAD_T = 20;

export function PhaseBalanceChart({ summary }: { summary: SiteSummary }) {
  const phases = summary.liveConductors;
  const values = phases.map((p) => summary.generationKva[p] ?? 0);
  const limit = summary.profile?.maxImbalanceKva ?? null;
  const lowest = values.length ? Math.min(...values) : 0;
  const ceiling = limit === null ? null : lowest + limit;
  const top = Math.max(1, ...values, ceiling ?? 0) * 1.15;
  const plotH = H - PAD_T - PAD_B;
  const y = (v: number) => PAD_T + plotH - (v / top) * plotH;
  const slot = (W - PAD_L - 16) / Math.max(1, phases.length);
  const barW = Math.min(72, slot * 0.55);
  const imbalance = summary.imbalanceKva;
  const over = limit !== null && imbalance !== null && imbalance > limit;
  const ticks = [0, top / 3, (2 * top) / 3].map((t) => Number(t.toFixed(1)));

  const description = phases.length < 2
    ? `Single-phase service: ${formatNumber(values[0] ?? 0)} kVA on L1; imbalance does not apply.`
    : `${phases.map((p, i) => `${p} ${formatNumber(values[i])} kVA`).join(', ')}. Imbalance ${formatNumber(imbalance)} kVA; ${limit === null ? 'the profile sets no imbalance limit' : `the profile allows ${formatNumber(limit)} kVA${over ? ', so it is over the limit' : ''}`}.`;

  return (
    <figure className="m-0">
      <svg viewBox={`0 0 ${W} ${H}`} role="img" aria-label={`Phase balance. ${description}`} className="h-auto w-full max-w-[560px] font-sans">
        {ticks.map((t) => (
          <g key={t}>
            <line x1={PAD_L} x2={W - 8} y1={y(t)} y2={y(t)} className="stroke-ink-200" />
            <text x={PAD_L - 6} y={y(t) + 4} textAnchor="end" className="fill-ink-600 text-[11px]">{t}</text>
          </g>
        ))}
        <text x={8} y={PAD_T - 6} className="fill-ink-600 text-[11px]">kVA</text>
        {phases.map((p, i) => {
          const v = values[i];
          const x = PAD_L + slot * i + (slot - barW) / 2;
          const high = ceiling !== null && v > ceiling;
          return (
            <g key={p} data-phase={p} data-over={high || undefined}>
              <rect x={x} y={y(v)} width={barW} height={Math.max(0, y(0) - y(v))} rx={4} className={high ? 'fill-sev-error' : 'fill-weir-600'} />
              {high && <path d={`M${x} ${y(v)}h${barW}`} className="stroke-sev-error" strokeWidth={3} />}
              <text x={x + barW / 2} y={y(v) - 6} textAnchor="middle" className={high ? 'fill-sev-error text-[12px] font-semibold' : 'fill-ink-900 text-[12px] font-semibold'}>{formatNumber(v)}{high ? ' ✕' : ''}</text>
              <text x={x + barW / 2} y={H - PAD_B + 18} textAnchor="middle" className="fill-ink-900 text-[13px] font-semibold">{p}</text>
            </g>
          );
        })}
        {ceiling !== null && phases.length > 1 && (
          <g>
            <line x1={PAD_L} x2={W - 8} y1={y(ceiling)} y2={y(ceiling)} className="stroke-sev-warning-line" strokeWidth={2} strokeDasharray="6 4" />
            <text x={W - 10} y={y(ceiling) - 6} textAnchor="end" className="fill-sev-warning text-[11px] font-semibold">
              {`lowest phase + ${formatNumber(limit)} kVA allowed`}
            </text>
          </g>
        )}
        <line x1={PAD_L} x2={W - 8} y1={y(0)} y2={y(0)} className="stroke-ink-700" />
      </svg>
      <figcaption className="mt-2 text-caption text-ink-700">
        {description}{' '}
        {summary.profile && <span>Profile {summary.profile.title}{summary.profile.sources?.maxImbalanceKva ? ` (${summary.profile.sources.maxImbalanceKva})` : ''}.</span>}
      </figcaption>
    </figure>
  );
}
