import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/button.tsx';
import { InlineError } from '../../../components/feedback.tsx';
import { inputClass } from '../../../components/field.tsx';
import { ROLES, type Role, type User } from '../../../types/api.ts';
import { useResetPassword } from '../api/reset-password.ts';
import { useUpdateUser } from '../api/update-user.ts';
import { ROLE_LABEL } from './role-label.ts';

function ResetPassword({ user }: { user: User }) {
  const reset = useResetPassword();
  const [open, setOpen] = useState(false);
  const [password, setPassword] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const [done, setDone] = useState(false);
  const id = `reset-${user.id}`;

  const submit = (event: FormEvent) => {
    event.preventDefault();
    if (password.length < 8) {
      setProblem('At least 8 characters.');
      return;
    }
    setProblem(null);
    reset.mutate({ id: user.id, password }, { onSuccess: () => { setDone(true); setOpen(false); setPassword(''); } });
  };

  if (!open) {
    return (
      <div className="flex flex-col items-start gap-1">
        <Button variant="quiet" className="text-caption" onClick={() => { setOpen(true); setDone(false); }} aria-label={`Reset password of ${user.name}`}>Reset password</Button>
        {done && <span className="text-caption text-weir-800" role="status">Password reset.</span>}
      </div>
    );
  }
  return (
    <form onSubmit={submit} className="flex flex-col gap-1" aria-label={`New password for ${user.name}`}>
      <label htmlFor={id} className="text-caption font-medium">New password for {user.name}</label>
      <div className="flex gap-1">
        <input id={id} type="password" autoComplete="new-password" className={`${inputClass} py-1`} value={password} onChange={(e) => setPassword(e.target.value)} aria-invalid={problem ? true : undefined} autoFocus />
        <Button type="submit" disabled={reset.isPending} className="py-1">Set</Button>
        <Button variant="secondary" className="py-1" onClick={() => { setOpen(false); setProblem(null); }}>Cancel</Button>
      </div>
      {problem && <span className="text-caption text-sev-error" role="alert">{problem}</span>}
      {reset.isError && <InlineError error={reset.error} />}
    </form>
  );
}

function UserRow({ user, isSelf }: { user: User; isSelf: boolean }) {
  const update = useUpdateUser();
  const roleId = `role-${user.id}`;
  return (
    <tr className={`border-b border-ink-100 align-top last:border-0 ${user.disabled ? 'bg-ink-50 text-ink-600' : ''}`}>
      <th scope="row" className="px-3 py-2 text-left font-medium">
        {user.name}{isSelf && <span className="ml-1 text-caption text-ink-600">(you)</span>}
        <div className="text-caption font-normal text-ink-600">{user.email}</div>
      </th>
      <td className="px-3 py-2">
        <label htmlFor={roleId} className="sr-only">Role of {user.name}</label>
        <select
          id={roleId}
          className={`${inputClass} py-1`}
          value={user.role}
          disabled={update.isPending || isSelf}
          onChange={(e) => update.mutate({ id: user.id, role: e.target.value as Role })}
        >
          {ROLES.map((r) => <option key={r} value={r}>{ROLE_LABEL[r]}</option>)}
        </select>
      </td>
      <td className="px-3 py-2">
        <span className={user.disabled ? 'font-medium text-sev-error' : 'text-weir-800'}>{user.disabled ? '⊘ Disabled' : '● Active'}</span>
      </td>
      <td className="px-3 py-2">
        <div className="flex flex-wrap items-start gap-3">
          <Button
            variant={user.disabled ? 'secondary' : 'danger'}
            className="py-1 text-caption"
            disabled={update.isPending || isSelf}
            onClick={() => update.mutate({ id: user.id, disabled: !user.disabled })}
            aria-label={`${user.disabled ? 'Enable' : 'Disable'} ${user.name}`}
          >
            {user.disabled ? 'Enable' : 'Disable'}
          </Button>
          <ResetPassword user={user} />
        </div>
        {update.isError && <div className="mt-1"><InlineError error={update.error} /></div>}
      </td>
    </tr>
  );
}

export function UsersTable({ users, selfId }: { users: User[]; selfId: User['id'] | undefined }) {
  return (
    <div className="overflow-x-auto rounded-lg border border-ink-200 bg-white">
      <table className="w-full min-w-[720px] border-collapse text-body">
        <caption className="sr-only">Accounts</caption>
        <thead className="border-b border-ink-200 bg-ink-50 text-caption text-ink-700">
          <tr>
            <th scope="col" className="px-3 py-2 text-left font-medium">Person</th>
            <th scope="col" className="px-3 py-2 text-left font-medium">Role</th>
            <th scope="col" className="px-3 py-2 text-left font-medium">Status</th>
            <th scope="col" className="px-3 py-2 text-left font-medium">Actions</th>
          </tr>
        </thead>
        <tbody>
          {users.map((u) => <UserRow key={u.id} user={u} isSelf={String(u.id) === String(selfId)} />)}
        </tbody>
      </table>
    </div>
  );
}
