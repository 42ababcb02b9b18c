import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import type { Role, User } from '../../../types/api.ts';

export interface CreateUserInput {
  email: string;
  name: string;
  role: Role;
  password: string;
}

export function createUser(input: CreateUserInput): Promise<{ user: User }> {
  return api<{ user: User }>('/users', { method: 'POST', json: input });
}

export function useCreateUser() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: createUser,
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: ['users'] }), qc.invalidateQueries({ queryKey: ['outbox'] })]),
  });
}
