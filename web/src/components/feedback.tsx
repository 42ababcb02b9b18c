import type { ReactNode } from 'react';
import { ApiError } from '../lib/api-client.ts';

export function Loading({ label = 'Loading…' }: { label?: string }) {
  return (
    <div role="status" className="flex items-center gap-2 py-6 text-ink-600">
      <span className="size-4 animate-spin rounded-full border-2 border-ink-300 border-t-weir-600" aria-hidden="true" />
      {label}
    </div>
  );
}

export function errorMessage(error: unknown): string {
  if (error instanceof ApiError) return error.message;
  if (error instanceof Error) return error.message;
  return 'Something went wrong.';
}

export function InlineError({ error, title }: { error: unknown; title?: string }) {
  if (!error) return null;
  return (
    <div role="alert" className="rounded-md border border-sev-error/40 bg-sev-error-bg px-3 py-2 text-body text-sev-error">
      {title && <strong className="mr-1">{title}</strong>}
      {errorMessage(error)}
    </div>
  );
}

export function Notice({ children }: { children: ReactNode }) {
  return <p className="rounded-md border border-ink-200 bg-ink-50 px-3 py-2 text-body text-ink-700">{children}</p>;
}
