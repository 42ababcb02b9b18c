import { useMemo } from 'react';
import { useSearchParams } from 'react-router-dom';
import { Button } from '../../components/button.tsx';
import { InlineError, Loading } from '../../components/feedback.tsx';
import { PageHeader } from '../../components/page-header.tsx';
import { Pagination } from '../../components/pagination.tsx';
import { RouteError } from '../../components/route-error.tsx';
import { queryClient } from '../../lib/query-client.ts';
import { CAN } from '../../lib/session.ts';
import { requireSession } from '../require-session.ts';
import { AUDIT_FILTER_KEYS, auditParamsFrom, auditQueryOptions, useAudit, type AuditFilters } from '../../features/audit/api/get-audit.ts';
import { useExportAuditCsv } from '../../features/audit/api/export-audit-csv.ts';
import { AuditFiltersForm } from '../../features/audit/components/audit-filters.tsx';
import { AuditTable } from '../../features/audit/components/audit-table.tsx';
import { ChainStatus } from '../../features/audit/components/chain-status.tsx';
import type { LoaderFunctionArgs } from 'react-router-dom';

export async function loader({ request }: LoaderFunctionArgs) {
  const user = await requireSession({ request });
  if (!CAN.readChangeLog(user.role)) {
    throw new Response('The change log is for auditors, lead engineers and admins.', { status: 403 });
  }
  await queryClient.ensureQueryData(auditQueryOptions(auditParamsFrom(new URL(request.url).searchParams)));
  return null;
}

export function Component() {
  const [search, setSearch] = useSearchParams();
  const params = auditParamsFrom(search);
  const audit = useAudit(params);
  const exportCsv = useExportAuditCsv();
  const actions = useMemo(() => [...new Set((audit.data?.items ?? []).map((e) => e.action))].sort(), [audit.data]);

  const apply = (filters: AuditFilters) => {
    const next = new URLSearchParams();
    for (const key of AUDIT_FILTER_KEYS) if (filters[key]) next.set(key, filters[key]);
    setSearch(next);
  };

  return (
    <>
      <PageHeader title="Change log" eyebrow="Audit">
        <Button variant="secondary" onClick={() => exportCsv.mutate(params)} disabled={exportCsv.isPending}>
          {exportCsv.isPending ? 'Preparing CSV…' : '⇩ Export CSV'}
        </Button>
      </PageHeader>
      <div className="mb-4"><ChainStatus /></div>
      {exportCsv.isError && <div className="mb-3"><InlineError error={exportCsv.error} title="Export failed:" /></div>}
      <AuditFiltersForm value={params} onApply={apply} actions={actions} />
      {audit.isError && <InlineError error={audit.error} title="The change log could not be loaded." />}
      {audit.isPending && <Loading label="Loading the change log…" />}
      {audit.data && (
        <>
          <AuditTable items={audit.data.items} busy={audit.isFetching} />
          <Pagination
            page={params.page}
            limit={params.limit}
            total={audit.data.total}
            label="Change log pages"
            onPage={(page) => setSearch((current) => {
              const next = new URLSearchParams(current);
              if (page === 1) next.delete('page');
              else next.set('page', String(page));
              return next;
            })}
          />
        </>
      )}
    </>
  );
}

export const ErrorBoundary = RouteError;
