// Imported from cautions.ts itself, not the engine's index, so the page does not bundle the rules.
import { SAFETY_CAUTIONS } from '../../../shared/cautions.ts';

export function SafetyCaution({ compact = false }: { compact?: boolean }) {
  return (
    <aside aria-labelledby="safety-caution-title" className="rounded-lg border-l-4 border-sev-warning-line bg-sev-warning-bg/70 px-4 py-3 text-ink-900">
      <h2 id="safety-caution-title" className="flex items-center gap-2 text-body font-semibold">
        <svg viewBox="0 0 16 16" className="size-4 text-sev-warning" aria-hidden="true">
          <path d="M8 1.5l7 13H1z" fill="currentColor" />
          <path d="M8 6v4" stroke="white" strokeWidth="1.8" strokeLinecap="round" />
          <circle cx="8" cy="12.3" r="1" fill="white" />
        </svg>
        Safety caution
      </h2>
      <ul className={`mt-1 list-disc pl-5 ${compact ? 'text-caption' : 'text-body'} space-y-0.5`}>
        {SAFETY_CAUTIONS.map((line) => <li key={line}>{line}</li>)}
      </ul>
    </aside>
  );
}
