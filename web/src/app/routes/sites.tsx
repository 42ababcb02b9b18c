import { useCallback } from 'react';
import { useSearchParams, type LoaderFunctionArgs } from 'react-router-dom';
import { InlineError, Loading } from '../../components/feedback.tsx';
import { PageHeader } from '../../components/page-header.tsx';
import { Pagination } from '../../components/pagination.tsx';
import { RouteError } from '../../components/route-error.tsx';
import { queryClient } from '../../lib/query-client.ts';
import { requireSession } from '../require-session.ts';
import { sitesParamsFrom, sitesQueryOptions, useSites, type SitesParams } from '../../features/sites/api/get-sites.ts';
import { SitesFilters } from '../../features/sites/components/sites-filters.tsx';
import { SitesTable } from '../../features/sites/components/sites-table.tsx';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession({ request });
  await queryClient.ensureQueryData(sitesQueryOptions(sitesParamsFrom(new URL(request.url).searchParams)));
  return null;
}

export function Component() {
  const [search, setSearch] = useSearchParams();
  const params = sitesParamsFrom(search);
  const sites = useSites(params);

  const onChange = useCallback((patch: Partial<SitesParams>) => {
    setSearch((current) => {
      const next = new URLSearchParams(current);
      for (const [key, value] of Object.entries(patch)) {
        const isDefault = value === '' || (key === 'page' && value === 1) || (key === 'sort' && value === '-updated');
        if (isDefault) next.delete(key);
        else next.set(key, String(value));
      }
      return next;
    }, { replace: patch.q !== undefined });
  }, [setSearch]);

  return (
    <>
      <PageHeader title="Sites" eyebrow="Fleet" />
      <SitesFilters params={params} onChange={onChange} />
      {sites.isError && <InlineError error={sites.error} title="The sites could not be loaded." />}
      {sites.isPending && <Loading label="Loading sites…" />}
      {sites.data && (
        <>
          <SitesTable items={sites.data.items} sort={params.sort} onSort={(sort) => onChange({ sort, page: 1 })} busy={sites.isFetching} />
          <Pagination page={params.page} limit={sites.data.limit || params.limit} total={sites.data.total} onPage={(page) => onChange({ page })} label="Sites pages" />
        </>
      )}
    </>
  );
}

export const ErrorBoundary = RouteError;
