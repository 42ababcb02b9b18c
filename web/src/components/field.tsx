import { useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes } from 'react';

export const inputClass =
  'block w-full rounded-md border border-ink-300 bg-white px-3 py-2 text-body text-ink-900 placeholder:text-ink-500 hover:border-ink-500 focus-visible:border-weir-600 aria-[invalid=true]:border-sev-error';

interface FieldShell {
  label: string;
  hint?: ReactNode;
  error?: string | null;
  className?: string;
}

function Shell({ id, label, hint, error, className = '', children }: FieldShell & { id: string; children: ReactNode }) {
  return (
    <div className={`flex flex-col gap-1 ${className}`}>
      <label htmlFor={id} className="text-caption font-medium text-ink-800">{label}</label>
      {children}
      {hint && !error && <p id={`${id}-hint`} className="text-caption text-ink-600">{hint}</p>}
      {error && <p id={`${id}-error`} className="text-caption font-medium text-sev-error" role="alert">{error}</p>}
    </div>
  );
}

function describedBy(id: string, hint: ReactNode, error: string | null | undefined): string | undefined {
  if (error) return `${id}-error`;
  if (hint) return `${id}-hint`;
  return undefined;
}

export function TextField({ label, hint, error, className, id: givenId, ...input }: FieldShell & InputHTMLAttributes<HTMLInputElement>) {
  const autoId = useId();
  const id = givenId ?? autoId;
  return (
    <Shell id={id} label={label} hint={hint} error={error} className={className}>
      <input id={id} className={`${inputClass} h-10`} aria-invalid={error ? true : undefined} aria-describedby={describedBy(id, hint, error)} {...input} />
    </Shell>
  );
}

export function SelectField({ label, hint, error, className, id: givenId, children, ...select }: FieldShell & SelectHTMLAttributes<HTMLSelectElement>) {
  const autoId = useId();
  const id = givenId ?? autoId;
  return (
    <Shell id={id} label={label} hint={hint} error={error} className={className}>
      <select id={id} className={`${inputClass} h-10`} aria-invalid={error ? true : undefined} aria-describedby={describedBy(id, hint, error)} {...select}>
        {children}
      </select>
    </Shell>
  );
}

export function TextAreaField({ label, hint, error, className, id: givenId, ...area }: FieldShell & TextareaHTMLAttributes<HTMLTextAreaElement>) {
  const autoId = useId();
  const id = givenId ?? autoId;
  return (
    <Shell id={id} label={label} hint={hint} error={error} className={className}>
      <textarea id={id} className={`${inputClass} min-h-24`} aria-invalid={error ? true : undefined} aria-describedby={describedBy(id, hint, error)} {...area} />
    </Shell>
  );
}
