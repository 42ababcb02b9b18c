import { Button } from '../../../components/button.tsx';
import { InlineError } from '../../../components/feedback.tsx';
import type { AuditVerify } from '../../../types/api.ts';
import { useAuditVerify } from '../api/get-audit-verify.ts';

function describeEvent(event: AuditVerify['firstBadEvent']): string {
  if (!event) return 'an unknown event';
  return `event ${event.seq} (${event.reason}): ${event.message}`;
}

export function ChainStatus() {
  const verify = useAuditVerify();
  return (
    <div className="flex flex-wrap items-center gap-3" aria-live="polite" data-testid="chain-status">
      {verify.isPending && <span className="text-body text-ink-600">Checking the chain…</span>}
      {verify.isError && <InlineError error={verify.error} title="The chain could not be checked:" />}
      {verify.data && verify.data.ok && (
        <p className="inline-flex items-center gap-2 rounded-md border border-weir-600/50 bg-weir-50 px-3 py-1.5 text-body font-medium text-weir-800" data-chain="verified">
          <span aria-hidden="true">✓</span> Chain verified: {verify.data.events} event{verify.data.events === 1 ? '' : 's'}, none altered.
        </p>
      )}
      {verify.data && !verify.data.ok && (
        <p className="inline-flex items-center gap-2 rounded-md border border-sev-error/50 bg-sev-error-bg px-3 py-1.5 text-body font-medium text-sev-error" role="alert" data-chain="broken">
          <span aria-hidden="true">✕</span> Chain broken. First altered event: {describeEvent(verify.data.firstBadEvent)}
        </p>
      )}
      <Button variant="quiet" onClick={() => verify.refetch()} disabled={verify.isFetching}>{verify.isFetching ? 'Checking…' : 'Check again'}</Button>
    </div>
  );
}
