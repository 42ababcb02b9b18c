import { useEffect, useState, type FormEvent } from 'react';
import { Button } from '../../../components/button.tsx';
import { SelectField, TextField } from '../../../components/field.tsx';
import { AUDIT_ACTIONS } from '../../../types/api.ts';
import type { AuditFilters } from '../api/get-audit.ts';

const EMPTY: AuditFilters = { site: '', actor: '', action: '', from: '', to: '' };

export function AuditFiltersForm({ value, onApply, actions }: { value: AuditFilters; onApply: (filters: AuditFilters) => void; actions: readonly string[] }) {
  const [draft, setDraft] = useState<AuditFilters>(value);
  useEffect(() => setDraft(value), [value.site, value.actor, value.action, value.from, value.to]); // eslint-disable-line react-hooks/exhaustive-deps
  const set = (key: keyof AuditFilters) => (e: { target: { value: string } }) => setDraft((d) => ({ ...d, [key]: e.target.value }));
  const submit = (event: FormEvent) => {
    event.preventDefault();
    onApply(draft);
  };
  const invalidRange = draft.from && draft.to && draft.from > draft.to;

  return (
    <form role="search" aria-label="Filter the change log" onSubmit={submit} className="mb-4 grid gap-3 sm:grid-cols-3 lg:grid-cols-[repeat(5,minmax(0,1fr))_auto] lg:items-end">
      <TextField label="Site" name="site" placeholder="site id" value={draft.site} onChange={set('site')} />
      <TextField label="Person" name="actor" placeholder="e-mail" value={draft.actor} onChange={set('actor')} />
      <SelectField label="Action" name="action" value={draft.action} onChange={set('action')}>
        <option value="">Any action</option>
        <option value="revision.*">Any revision action</option>
        {[...new Set([...AUDIT_ACTIONS, ...actions])].map((a) => <option key={a} value={a}>{a}</option>)}
      </SelectField>
      <TextField label="From" name="from" type="date" value={draft.from} onChange={set('from')} />
      <TextField label="To" name="to" type="date" value={draft.to} onChange={set('to')} error={invalidRange ? '“To” is before “From”.' : null} />
      <div className="flex gap-2">
        <Button type="submit" disabled={Boolean(invalidRange)}>Filter</Button>
        <Button variant="secondary" onClick={() => { setDraft(EMPTY); onApply(EMPTY); }}>Clear</Button>
      </div>
    </form>
  );
}
