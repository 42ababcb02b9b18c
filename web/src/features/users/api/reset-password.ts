import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import type { User } from '../../../types/api.ts';

export function resetPassword({ id, password }: { id: User['id']; password: string }): Promise<unknown> {
  return api(`/users/${encodeURIComponent(String(id))}/password`, { method: 'POST', json: { password } });
}

export function useResetPassword() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: resetPassword, onSuccess: () => qc.invalidateQueries({ queryKey: ['outbox'] }) });
}
