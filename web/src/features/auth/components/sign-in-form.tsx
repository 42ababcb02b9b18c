import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/button.tsx';
import { TextField } from '../../../components/field.tsx';
import { ApiError } from '../../../lib/api-client.ts';
import { useSignIn } from '../api/sign-in.ts';

function describe(error: unknown): string {
  if (error instanceof ApiError) {
    if (error.status === 401) return 'That e-mail and password do not match an active account. Check both and try again.';
    if (error.status === 429) return 'Too many sign-in attempts. Wait a minute, then try again.';
    if (error.status === 400 || error.status === 422) return error.message;
    if (error.status === 0) return error.message;
    return `The server could not sign you in (${error.message}).`;
  }
  return 'Sign-in failed. Try again.';
}

export function SignInForm({ onSignedIn, notice }: { onSignedIn: () => void; notice?: string | null }) {
  const signIn = useSignIn();
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');
  const [missing, setMissing] = useState<{ email?: string; password?: string }>({});

  const submit = (event: FormEvent) => {
    event.preventDefault();
    const problems: typeof missing = {};
    if (!email.trim()) problems.email = 'Enter your e-mail address.';
    else if (!/^[^\s@]+@[^\s@]+$/.test(email.trim())) problems.email = 'Enter an e-mail address like name@example.test.';
    if (!password) problems.password = 'Enter your password.';
    setMissing(problems);
    if (problems.email || problems.password) return;
    signIn.mutate({ email: email.trim(), password }, { onSuccess: onSignedIn });
  };

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4" aria-describedby={signIn.isError ? 'sign-in-error' : undefined}>
      {notice && !signIn.isError && (
        <p className="rounded-md border border-ink-300 bg-ink-50 px-3 py-2 text-body text-ink-800" role="status">{notice}</p>
      )}
      {signIn.isError && (
        <p id="sign-in-error" className="rounded-md border border-sev-error/40 bg-sev-error-bg px-3 py-2 text-body text-sev-error" role="alert">
          {describe(signIn.error)}
        </p>
      )}
      <TextField
        label="E-mail"
        type="email"
        name="email"
        autoComplete="username"
        value={email}
        onChange={(e) => setEmail(e.target.value)}
        error={missing.email}
        autoFocus
      />
      <TextField
        label="Password"
        type="password"
        name="password"
        autoComplete="current-password"
        value={password}
        onChange={(e) => setPassword(e.target.value)}
        error={missing.password}
      />
      <Button type="submit" disabled={signIn.isPending} className="mt-1 w-full">
        {signIn.isPending ? 'Signing in…' : 'Sign in'}
      </Button>
    </form>
  );
}
