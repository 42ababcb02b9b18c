// Severity and state are always written out in words (and severity has a glyph), never colour alone.
import type { Severity } from '../../../shared/index.ts';
import type { RevisionState, SiteStatus } from '../types/api.ts';

export const SEVERITY_LABEL: Record<Severity, string> = { error: 'Error', warning: 'Warning', info: 'Info' };

const SEVERITY_STYLE: Record<Severity, string> = {
  error: 'bg-sev-error-bg text-sev-error border-sev-error/40',
  warning: 'bg-sev-warning-bg text-sev-warning border-sev-warning-line/60',
  info: 'bg-sev-info-bg text-sev-info border-sev-info/30',
};

export function SeverityIcon({ severity, className = 'size-4' }: { severity: Severity; className?: string }) {
  if (severity === 'error') {
    return (
      <svg viewBox="0 0 16 16" className={className} aria-hidden="true">
        <circle cx="8" cy="8" r="7" fill="currentColor" />
        <path d="M5.5 5.5l5 5M10.5 5.5l-5 5" stroke="white" strokeWidth="1.8" strokeLinecap="round" />
      </svg>
    );
  }
  if (severity === 'warning') {
    return (
      <svg viewBox="0 0 16 16" className={className} aria-hidden="true">
        <path d="M8 1.5l7 13H1z" fill="currentColor" />
        <path d="M8 6v4" stroke="white" strokeWidth="1.8" strokeLinecap="round" />
        <circle cx="8" cy="12.3" r="1" fill="white" />
      </svg>
    );
  }
  return (
    <svg viewBox="0 0 16 16" className={className} aria-hidden="true">
      <rect x="1" y="1" width="14" height="14" rx="3" fill="currentColor" />
      <path d="M8 7v5" stroke="white" strokeWidth="1.8" strokeLinecap="round" />
      <circle cx="8" cy="4.5" r="1" fill="white" />
    </svg>
  );
}

export function SeverityBadge({ severity, count }: { severity: Severity; count?: number }) {
  return (
    <span className={`inline-flex items-center gap-1 whitespace-nowrap rounded border px-1.5 py-0.5 text-caption font-medium ${SEVERITY_STYLE[severity]}`}>
      <SeverityIcon severity={severity} className="size-3.5" />
      {count === undefined ? SEVERITY_LABEL[severity] : `${count} ${count === 1 ? SEVERITY_LABEL[severity].toLowerCase() : `${SEVERITY_LABEL[severity].toLowerCase()}s`}`}
    </span>
  );
}

export function CountCell({ severity, count }: { severity: Severity; count: number }) {
  if (count === 0) return <span className="text-ink-500" aria-label={`no ${severity}s`}>0</span>;
  return <SeverityBadge severity={severity} count={count} />;
}

type AnyState = RevisionState | SiteStatus;

export const STATE_LABEL: Record<AnyState, string> = {
  pending: 'Pending review',
  approved: 'Approved',
  returned: 'Returned',
  superseded: 'Superseded',
  'never-approved': 'Never approved',
};

const STATE_STYLE: Record<AnyState, string> = {
  pending: 'bg-white text-ink-900 border-ink-700 border-dashed',
  approved: 'bg-weir-50 text-weir-800 border-weir-600',
  returned: 'bg-sev-warning-bg text-sev-warning border-sev-warning-line',
  superseded: 'bg-ink-100 text-ink-600 border-ink-300',
  'never-approved': 'bg-ink-50 text-ink-700 border-ink-400',
};

const STATE_MARK: Record<AnyState, string> = {
  pending: '◔',
  approved: '✓',
  returned: '↩',
  superseded: '⤳',
  'never-approved': '○',
};

export function StateBadge({ state }: { state: AnyState }) {
  return (
    <span className={`inline-flex items-center gap-1 whitespace-nowrap rounded-full border px-2 py-0.5 text-caption font-medium ${STATE_STYLE[state] ?? STATE_STYLE.pending}`}>
      <span aria-hidden="true">{STATE_MARK[state] ?? '•'}</span>
      <span>{STATE_LABEL[state] ?? state}</span>
    </span>
  );
}
