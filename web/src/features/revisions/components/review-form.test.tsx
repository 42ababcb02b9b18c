// @vitest-environment happy-dom
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { cleanup, render, screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { ApprovalBlocker, RevisionDetail } from '../../../types/api.ts';
import { ReviewForm } from './review-form.tsx';

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

function revision(blockers: ApprovalBlocker[]): RevisionDetail {
  return {
    id: 7, siteId: 'orchard-row-dairy', number: 3, state: 'pending', sha256: 'ab'.repeat(32), message: 'swap meter', parentId: 5,
    errorCount: 0, warningCount: 0, infoCount: 1, author: { id: 2, name: 'Ada Installer', email: 'installer@example.test' },
    createdAt: '2026-01-01T10:00:00.000Z', yaml: '', findings: [], summary: null, diff: [], reviews: [], approvalBlockers: blockers,
  };
}

function renderForm(blockers: ApprovalBlocker[]) {
  const client = new QueryClient({ defaultOptions: { mutations: { retry: false } } });
  return render(<QueryClientProvider client={client}><ReviewForm revision={revision(blockers)} /></QueryClientProvider>);
}

describe('ReviewForm', () => {
  it.each<[ApprovalBlocker, RegExp]>([
    ['own-revision', /your own revision/],
    ['has-errors', /error findings/],
    ['not-pending', /no longer pending/],
    ['stale-parent', /older approval/],
  ])('when approval is blocked by %s, then the approve button is disabled and says why', (blocker, reason) => {
    renderForm([blocker]);
    const button = screen.getByRole('button', { name: reason });
    expect((button as HTMLButtonElement).disabled).toBe(true);
    expect(button.textContent).toMatch(/^Cannot approve:/);
    expect(document.querySelector(`[data-blocker="${blocker}"]`)).toBeTruthy();
  });

  it('when returning without a comment, then it asks for one and sends nothing', async () => {
    const fetch = vi.fn();
    vi.stubGlobal('fetch', fetch);
    renderForm([]);
    await userEvent.click(screen.getByRole('button', { name: /Return to author/ }));
    expect(screen.getByRole('alert').textContent).toMatch(/comment is required to return/);
    expect(fetch).not.toHaveBeenCalled();
  });

  it('when approving, then it posts the decision and says it is done', async () => {
    const fetch = vi.fn(async () => new Response(JSON.stringify({ revision: { id: 7 }, review: { id: 1 } }), { status: 200, headers: { 'Content-Type': 'application/json' } }));
    vi.stubGlobal('fetch', fetch);
    renderForm([]);
    await userEvent.type(screen.getByLabelText('Comment'), 'Checked against the photos.');
    await userEvent.click(screen.getByRole('button', { name: '✓ Approve' }));
    expect(await screen.findByText('Revision 3 approved.')).toBeTruthy();
    const [url, init] = fetch.mock.calls[0] as unknown as [string, RequestInit];
    expect(url).toBe('/api/revisions/7/review');
    expect(JSON.parse(String(init.body))).toEqual({ decision: 'approve', comment: 'Checked against the photos.' });
  });

  it('when the server refuses, then its message is shown beside the form', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => new Response(JSON.stringify({ error: { code: 'stale-parent', message: 'a newer revision was approved since this one was made' } }), { status: 409 })));
    renderForm([]);
    await userEvent.click(screen.getByRole('button', { name: '✓ Approve' }));
    expect((await screen.findByRole('alert')).textContent).toContain('a newer revision was approved since this one was made');
  });
});
