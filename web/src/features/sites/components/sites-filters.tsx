import { useEffect, useState } from 'react';
import { SelectField, TextField } from '../../../components/field.tsx';
import { STATE_LABEL } from '../../../components/badges.tsx';
import { SITE_STATES, type SiteSort, type SitesParams } from '../api/get-sites.ts';

const SORT_LABEL: Record<SiteSort, string> = {
  '-updated': 'Last change, newest first',
  updated: 'Last change, oldest first',
  name: 'Name, A to Z',
  '-name': 'Name, Z to A',
  '-errors': 'Most errors first',
  errors: 'Fewest errors first',
};

export function SitesFilters({ params, onChange }: { params: SitesParams; onChange: (patch: Partial<SitesParams>) => void }) {
  const [q, setQ] = useState(params.q);
  useEffect(() => setQ(params.q), [params.q]);
  // Ask the server once typing pauses, not on every key.
  useEffect(() => {
    if (q === params.q) return;
    const timer = setTimeout(() => onChange({ q, page: 1 }), 300);
    return () => clearTimeout(timer);
  }, [q, params.q, onChange]);

  return (
    <form role="search" aria-label="Filter sites" className="mb-4 grid gap-3 sm:grid-cols-[minmax(0,2fr)_minmax(0,1fr)_minmax(0,1fr)]" onSubmit={(e) => { e.preventDefault(); onChange({ q, page: 1 }); }}>
      <TextField label="Search" type="search" name="q" placeholder="Site name or id" value={q} onChange={(e) => setQ(e.target.value)} />
      <SelectField label="State" name="state" value={params.state} onChange={(e) => onChange({ state: e.target.value as SitesParams['state'], page: 1 })}>
        <option value="">All states</option>
        {SITE_STATES.map((s) => <option key={s} value={s}>{STATE_LABEL[s]}</option>)}
      </SelectField>
      <SelectField label="Sort" name="sort" value={params.sort} onChange={(e) => onChange({ sort: e.target.value as SiteSort, page: 1 })}>
        {(Object.keys(SORT_LABEL) as SiteSort[]).map((s) => <option key={s} value={s}>{SORT_LABEL[s]}</option>)}
      </SelectField>
    </form>
  );
}
