import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import type { OutboxMail } from '../../../types/api.ts';

export function getOutbox(): Promise<{ items: OutboxMail[] }> {
  return api<{ items: OutboxMail[] }>('/outbox');
}

export const outboxQueryOptions = () => queryOptions({ queryKey: ['outbox'], queryFn: getOutbox });

export function useOutbox() {
  return useQuery(outboxQueryOptions());
}
