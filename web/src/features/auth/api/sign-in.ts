import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import { queryClient } from '../../../lib/query-client.ts';
import { setSession, type Session } from '../../../lib/session.ts';

export interface SignInInput {
  email: string;
  password: string;
}

export function signIn(input: SignInInput): Promise<Session> {
  return api<Session>('/auth/login', { method: 'POST', json: input, skipAuthRedirect: true });
}

export function useSignIn() {
  return useMutation({
    mutationFn: signIn,
    onSuccess: (session) => {
      // Nothing cached for a previous user may show to this one.
      queryClient.clear();
      setSession(session);
    },
  });
}

export function signOut(): void {
  setSession(null);
  queryClient.clear();
}
