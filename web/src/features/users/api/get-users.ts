import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import type { User } from '../../../types/api.ts';

export function getUsers(): Promise<{ items: User[] }> {
  return api<{ items: User[] }>('/users');
}

export const usersQueryOptions = () => queryOptions({ queryKey: ['users', 'list'], queryFn: getUsers });

export function useUsers() {
  return useQuery(usersQueryOptions());
}
