import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/button.tsx';
import { InlineError } from '../../../components/feedback.tsx';
import { SelectField, TextField } from '../../../components/field.tsx';
import { ROLES, type Role } from '../../../types/api.ts';
import { useCreateUser } from '../api/create-user.ts';
import { ROLE_LABEL } from './role-label.ts';

const MIN_PASSWORD = 8;

export function CreateUserForm() {
  const create = useCreateUser();
  const [form, setForm] = useState({ name: '', email: '', role: 'installer' as Role, password: '' });
  const [errors, setErrors] = useState<Partial<Record<keyof typeof form, string>>>({});
  const [done, setDone] = useState<string | null>(null);

  const submit = (event: FormEvent) => {
    event.preventDefault();
    setDone(null);
    const problems: typeof errors = {};
    if (!form.name.trim()) problems.name = 'Enter the person’s name.';
    if (!/^[^\s@]+@[^\s@]+$/.test(form.email.trim())) problems.email = 'Enter an e-mail address.';
    if (form.password.length < MIN_PASSWORD) problems.password = `At least ${MIN_PASSWORD} characters.`;
    setErrors(problems);
    if (Object.keys(problems).length) return;
    create.mutate({ ...form, name: form.name.trim(), email: form.email.trim() }, {
      onSuccess: ({ user }) => {
        setDone(`Account made for ${user.name} (${ROLE_LABEL[user.role] ?? user.role}).`);
        setForm({ name: '', email: '', role: 'installer', password: '' });
      },
    });
  };

  return (
    <form onSubmit={submit} noValidate className="grid gap-3 sm:grid-cols-2 lg:grid-cols-[repeat(4,minmax(0,1fr))_auto] lg:items-start" aria-label="New account">
      <TextField label="Name" name="name" value={form.name} onChange={(e) => setForm({ ...form, name: e.target.value })} error={errors.name} autoComplete="off" />
      <TextField label="E-mail" name="new-email" type="email" value={form.email} onChange={(e) => setForm({ ...form, email: e.target.value })} error={errors.email} autoComplete="off" />
      <SelectField label="Role" name="role" value={form.role} onChange={(e) => setForm({ ...form, role: e.target.value as Role })}>
        {ROLES.map((r) => <option key={r} value={r}>{ROLE_LABEL[r]}</option>)}
      </SelectField>
      <TextField label="First password" name="new-password" type="password" value={form.password} onChange={(e) => setForm({ ...form, password: e.target.value })} error={errors.password} hint={`${MIN_PASSWORD}+ characters; they change it after signing in.`} autoComplete="new-password" />
      <Button type="submit" disabled={create.isPending} className="lg:mt-6">{create.isPending ? 'Creating…' : 'Create account'}</Button>
      <div className="sm:col-span-2 lg:col-span-5" aria-live="polite">
        {create.isError && <InlineError error={create.error} title="Not created:" />}
        {done && <p className="text-body font-medium text-weir-800" role="status">{done}</p>}
      </div>
    </form>
  );
}
