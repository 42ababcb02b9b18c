import { Button } from './button.tsx';

export function Pagination({ page, limit, total, onPage, label = 'Pages' }: { page: number; limit: number; total: number; onPage: (page: number) => void; label?: string }) {
  const pages = Math.max(1, Math.ceil(total / limit));
  const first = total === 0 ? 0 : (page - 1) * limit + 1;
  const last = Math.min(total, page * limit);
  return (
    <nav aria-label={label} className="mt-3 flex flex-wrap items-center justify-between gap-3 text-caption text-ink-700">
      <p aria-live="polite">{total === 0 ? 'Nothing to show' : `${first}–${last} of ${total}`}</p>
      <div className="flex items-center gap-2">
        <Button variant="secondary" disabled={page <= 1} onClick={() => onPage(page - 1)}>← Previous</Button>
        <span>Page {page} of {pages}</span>
        <Button variant="secondary" disabled={page >= pages} onClick={() => onPage(page + 1)}>Next →</Button>
      </div>
    </nav>
  );
}
