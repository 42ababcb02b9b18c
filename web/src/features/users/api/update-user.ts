import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import type { Role, User } from '../../../types/api.ts';

export interface UpdateUserInput {
  id: User['id'];
  role?: Role;
  disabled?: boolean;
  name?: string;
}

export function updateUser({ id, ...patch }: UpdateUserInput): Promise<{ user: User }> {
  return api<{ user: User }>(`/users/${encodeURIComponent(String(id))}`, { method: 'PATCH', json: patch });
}

export function useUpdateUser() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: updateUser, onSuccess: () => qc.invalidateQueries({ queryKey: ['users'] }) });
}
