import { useState } from 'react';
import { Button } from '../../../components/button.tsx';
import { ApiError } from '../../../lib/api-client.ts';
import { InlineError, Loading, Notice } from '../../../components/feedback.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import { useOutbox } from '../api/get-outbox.ts';

const FIRST = 8;

export function OutboxList() {
  const outbox = useOutbox();
  const [all, setAll] = useState(false);
  if (outbox.isPending) return <Loading label="Loading the outbox…" />;
  if (outbox.isError) {
    if (outbox.error instanceof ApiError && outbox.error.status === 404) return <Notice>The mail outbox is kept in demo mode only; this server sends real mail.</Notice>;
    return <InlineError error={outbox.error} title="The outbox could not be loaded." />;
  }
  if (outbox.data.items.length === 0) return <Notice>No mail sent yet.</Notice>;
  const items = all ? outbox.data.items : outbox.data.items.slice(0, FIRST);
  return (
    <>
    <p className="mb-2 text-caption text-ink-700">Newest first. In demo mode mail is kept here instead of being sent.</p>
    <ul className="flex flex-col gap-2">
      {items.map((m) => (
        <li key={m.id}>
          <details className="rounded-md border border-ink-200 bg-white px-3 py-2">
            <summary className="cursor-pointer">
              <span className="font-medium">{m.subject}</span>{' '}
              <span className="text-caption text-ink-600">to {m.to} · {formatDateTime(m.date)}</span>
            </summary>
            <pre className="mt-2 whitespace-pre-wrap break-words font-mono text-caption text-ink-800">{m.text}</pre>
          </details>
        </li>
      ))}
    </ul>
    {outbox.data.items.length > FIRST && (
      <Button variant="quiet" className="mt-2" onClick={() => setAll(!all)}>
        {all ? 'Show the newest only' : `Show all ${outbox.data.items.length} messages`}
      </Button>
    )}
    </>
  );
}
