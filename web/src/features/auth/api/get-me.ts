import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import type { User } from '../../../types/api.ts';

export function getMe(): Promise<{ user: User }> {
  // The app layout's loader handles a 401 here itself (back to sign-in, then back here).
  return api<{ user: User }>('/me', { skipAuthRedirect: true });
}

export const meQueryOptions = () => queryOptions({ queryKey: ['me'], queryFn: getMe, staleTime: 60_000 });

export function useMe() {
  return useQuery(meQueryOptions());
}
